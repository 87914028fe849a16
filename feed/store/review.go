package store

import (
	"database/sql"
	"encoding/json"
	"errors"
	"math"
	"slices"
	"time"

	"dragdeck/model"
)

// The two series of a tail (DESIGN.md §4.12).
const (
	SeriesAirframe = "airframe"
	SeriesEngine   = "engine"
)

// State is what a review saw: each tail's flags and steps, per series. A
// mark keeps it, and the next review compares with it.
type State struct {
	Tails []TailState `json:"tails"`
}

// TailState is one series of one tail at a review.
type TailState struct {
	Tail   string      `json:"tail"`
	Series string      `json:"series"`
	Flags  []string    `json:"flags"`
	Steps  []StepState `json:"steps"`
}

// StepState is a step at a review: its first day (UTC) and size, pp.
type StepState struct {
	Date    time.Time `json:"date"`
	SizePct float64   `json:"size_pct"`
}

// Mark is a recorded review: when, and what it saw.
type Mark struct {
	ID    int64
	Time  time.Time
	State State
}

// MarkReview records a review of state now and returns it.
func (s *Store) MarkReview(st State) (Mark, error) {
	js, err := json.Marshal(st)
	if err != nil {
		return Mark{}, err
	}
	now := s.now()
	r, err := s.db.Exec("INSERT INTO reviews (time, state) VALUES (?, ?)", now.UnixNano(), string(js))
	if err != nil {
		return Mark{}, err
	}
	id, err := r.LastInsertId()
	return Mark{ID: id, Time: now, State: st}, err
}

// LastMark returns the latest review mark, nil before the first.
func (s *Store) LastMark() (*Mark, error) {
	var m Mark
	var t int64
	var js string
	err := s.db.QueryRow("SELECT id, time, state FROM reviews ORDER BY id DESC LIMIT 1").Scan(&m.ID, &t, &js)
	if errors.Is(err, sql.ErrNoRows) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	m.Time = unixTime(t)
	if err := json.Unmarshal([]byte(js), &m.State); err != nil {
		return nil, err
	}
	return &m, nil
}

// StoredEvent is an event with the time it was imported.
type StoredEvent struct {
	Tail     string
	Time     time.Time
	Kind     string
	Note     string
	Imported time.Time
}

// EventsSince returns the events imported after t (all of them for a zero
// t), in time order.
func (s *Store) EventsSince(t time.Time) ([]StoredEvent, error) {
	since := int64(math.MinInt64)
	if !t.IsZero() {
		since = t.UnixNano()
	}
	rows, err := s.db.Query("SELECT tail, time, kind, note, imported FROM events WHERE imported > ? ORDER BY time, tail", since)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var out []StoredEvent
	for rows.Next() {
		var e StoredEvent
		var at, imp int64
		if err := rows.Scan(&e.Tail, &at, &e.Kind, &e.Note, &imp); err != nil {
			return nil, err
		}
		e.Time, e.Imported = unixTime(at), unixTime(imp)
		out = append(out, e)
	}
	return out, rows.Err()
}

// FlagChange is a flag raised or cleared since the last review.
type FlagChange struct {
	Tail, Series, Flag string
}

// StepChange is a step found since the last review.
type StepChange struct {
	Tail, Series string
	Date         time.Time
	SizePct      float64
}

// StepTolerance is how far a step's date may move between two reviews and
// still be the same step: the segmentation places it again with the new
// data, often a few days off (common practice for weekly reviews; our
// choice, not from a source).
const StepTolerance = 14 * 24 * time.Hour

// Changes is what changed between the state of a mark (nil: no review
// yet, so everything is new) and the current one.
type Changes struct {
	FlagsRaised, FlagsCleared []FlagChange
	StepsNew                  []StepChange
}

// Compare returns the flags raised and cleared and the steps new in cur
// since prev (nil before the first review: every flag and step is new).
func Compare(prev *State, cur State) Changes {
	var ch Changes
	type key struct{ tail, series string }
	old := map[key]TailState{}
	if prev != nil {
		for _, t := range prev.Tails {
			old[key{t.Tail, t.Series}] = t
		}
	}
	now := map[key]bool{}
	for _, t := range cur.Tails {
		k := key{t.Tail, t.Series}
		now[k] = true
		was := old[k]
		for _, f := range t.Flags {
			if !slices.Contains(was.Flags, f) {
				ch.FlagsRaised = append(ch.FlagsRaised, FlagChange{t.Tail, t.Series, f})
			}
		}
		for _, f := range was.Flags {
			if !slices.Contains(t.Flags, f) {
				ch.FlagsCleared = append(ch.FlagsCleared, FlagChange{t.Tail, t.Series, f})
			}
		}
		for _, s := range t.Steps {
			if !slices.ContainsFunc(was.Steps, func(o StepState) bool { return sameStep(o, s) }) {
				ch.StepsNew = append(ch.StepsNew, StepChange{t.Tail, t.Series, s.Date, s.SizePct})
			}
		}
	}
	if prev != nil {
		for _, t := range prev.Tails { // a series gone (its tail left the data): its flags are cleared
			if !now[key{t.Tail, t.Series}] {
				for _, f := range t.Flags {
					ch.FlagsCleared = append(ch.FlagsCleared, FlagChange{t.Tail, t.Series, f})
				}
			}
		}
	}
	return ch
}

// sameStep: the same direction, dates within StepTolerance.
func sameStep(a, b StepState) bool {
	d := a.Date.Sub(b.Date)
	return (a.SizePct > 0) == (b.SizePct > 0) && d <= StepTolerance && d >= -StepTolerance
}

// WorkSince returns the ids of the items opened and of those closed or
// dismissed after t (every item for a zero t).
func WorkSince(items []WorkItem, t time.Time) (opened, closed []int64) {
	opened, closed = []int64{}, []int64{}
	for _, w := range items {
		if w.Opened.After(t) {
			opened = append(opened, w.ID)
		}
		if Final(w.Status) && w.Updated.After(t) {
			closed = append(closed, w.ID)
		}
	}
	return opened, closed
}

// Event is the stored event as the model has it.
func (e StoredEvent) Event() model.Event {
	return model.Event{Time: e.Time, Kind: e.Kind, Note: e.Note}
}
