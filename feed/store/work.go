package store

import (
	"database/sql"
	"errors"
	"fmt"
	"slices"
	"strings"
	"time"

	"dragdeck/feed"
)

// The statuses of a work item (DESIGN.md §4.15): open → inspect → found or
// not found → closed; dismissed from open or inspect. Closed and dismissed
// are final.
const (
	StatusOpen      = "open"
	StatusInspect   = "inspect"
	StatusFound     = "found"
	StatusNotFound  = "not found"
	StatusClosed    = "closed"
	StatusDismissed = "dismissed"
)

// Statuses lists every status in the order of the work.
var Statuses = []string{StatusOpen, StatusInspect, StatusFound, StatusNotFound, StatusClosed, StatusDismissed}

// next is the state machine: the statuses each one may move to.
var next = map[string][]string{
	StatusOpen:      {StatusInspect, StatusDismissed},
	StatusInspect:   {StatusFound, StatusNotFound, StatusDismissed},
	StatusFound:     {StatusClosed},
	StatusNotFound:  {StatusClosed},
	StatusClosed:    nil,
	StatusDismissed: nil,
}

// Next returns the statuses an item in status may move to (none for the
// final ones).
func Next(status string) []string { return next[status] }

// Final reports whether an item in status is done with.
func Final(status string) bool {
	n, known := next[status]
	return known && len(n) == 0
}

// ErrStatus is an unknown status; ErrTransition a move the work list does
// not allow; ErrNoItem an id that names no item; ErrOpenItem a second
// item for a tail whose item is not done with.
var (
	ErrStatus     = errors.New("unknown status")
	ErrTransition = errors.New("not allowed")
	ErrNoItem     = errors.New("no such work item")
	ErrOpenItem   = errors.New("already has an item in progress")
)

// WorkItem is one item of the work list.
type WorkItem struct {
	ID              int64
	Tail            string
	Status          string
	Reason          string
	Flag            string // the flag that raised it ("" when opened by hand)
	Opened, Updated time.Time
	Notes           []Note
}

// Note is one timestamped change of an item: its status after it, and the
// text given (may be empty).
type Note struct {
	Time   time.Time
	Status string
	Text   string
}

// AddWork opens an item for the tail, with the flag that raised it (may be
// ""), and returns its id. A tail whose last item is not final gets no
// second one (ErrOpenItem).
func (s *Store) AddWork(tail, reason, flag string) (int64, error) {
	tail, reason = strings.TrimSpace(tail), strings.TrimSpace(feed.PlainText(reason))
	if tail == "" {
		return 0, errors.New("a work item needs a tail")
	}
	if reason == "" {
		return 0, errors.New("a work item needs a reason")
	}
	tx, err := s.db.Begin()
	if err != nil {
		return 0, err
	}
	defer tx.Rollback()
	var id int64
	var status string
	err = tx.QueryRow("SELECT id, status FROM work WHERE tail = ? ORDER BY id DESC LIMIT 1", tail).Scan(&id, &status)
	if err == nil && !Final(status) {
		return 0, fmt.Errorf("%s %w: item %d (%s)", tail, ErrOpenItem, id, status)
	}
	if err != nil && !errors.Is(err, sql.ErrNoRows) {
		return 0, err
	}
	now := s.now().UnixNano()
	r, err := tx.Exec("INSERT INTO work (tail, status, reason, flag, opened, updated) VALUES (?,?,?,?,?,?)", tail, StatusOpen, reason, flag, now, now)
	if err != nil {
		return 0, err
	}
	if id, err = r.LastInsertId(); err != nil {
		return 0, err
	}
	if _, err := tx.Exec("INSERT INTO work_notes (item, time, status, text) VALUES (?,?,?,?)", id, now, StatusOpen, reason); err != nil {
		return 0, err
	}
	return id, tx.Commit()
}

// SetWork moves item id to status with an optional note, or, with the
// status it has, adds the note alone. The change is timestamped.
func (s *Store) SetWork(id int64, status, note string) error {
	if _, known := next[status]; !known {
		return fmt.Errorf("%q: %w (one of %s)", status, ErrStatus, strings.Join(Statuses, ", "))
	}
	tx, err := s.db.Begin()
	if err != nil {
		return err
	}
	defer tx.Rollback()
	var cur string
	if err := tx.QueryRow("SELECT status FROM work WHERE id = ?", id).Scan(&cur); errors.Is(err, sql.ErrNoRows) {
		return fmt.Errorf("%d: %w", id, ErrNoItem)
	} else if err != nil {
		return err
	}
	note = strings.TrimSpace(feed.PlainText(note))
	switch {
	case status == cur && note == "":
		return fmt.Errorf("item %d is %s already: give --note to add a note", id, cur)
	case status != cur && !slices.Contains(next[cur], status):
		allowed := "none: it is done with"
		if n := next[cur]; len(n) > 0 {
			allowed = strings.Join(n, " or ")
		}
		return fmt.Errorf("item %d: %s → %s is %w (from %s: %s)", id, cur, status, ErrTransition, cur, allowed)
	}
	now := s.now().UnixNano()
	if _, err := tx.Exec("UPDATE work SET status = ?, updated = ? WHERE id = ?", status, now, id); err != nil {
		return err
	}
	if _, err := tx.Exec("INSERT INTO work_notes (item, time, status, text) VALUES (?,?,?,?)", id, now, status, note); err != nil {
		return err
	}
	return tx.Commit()
}

// Work returns the work list, oldest first, each item with its notes.
func (s *Store) Work() ([]WorkItem, error) {
	rows, err := s.db.Query("SELECT id, tail, status, reason, flag, opened, updated FROM work ORDER BY id")
	if err != nil {
		return nil, err
	}
	var out []WorkItem
	at := map[int64]int{}
	for rows.Next() {
		var w WorkItem
		var opened, updated int64
		if err := rows.Scan(&w.ID, &w.Tail, &w.Status, &w.Reason, &w.Flag, &opened, &updated); err != nil {
			rows.Close()
			return nil, err
		}
		w.Opened, w.Updated = unixTime(opened), unixTime(updated)
		at[w.ID] = len(out)
		out = append(out, w)
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return nil, err
	}
	notes, err := s.db.Query("SELECT item, time, status, text FROM work_notes ORDER BY rowid")
	if err != nil {
		return nil, err
	}
	defer notes.Close()
	for notes.Next() {
		var id, t int64
		var n Note
		if err := notes.Scan(&id, &t, &n.Status, &n.Text); err != nil {
			return nil, err
		}
		n.Time = unixTime(t)
		if i, ok := at[id]; ok {
			out[i].Notes = append(out[i].Notes, n)
		}
	}
	return out, notes.Err()
}

// OpenWork returns the items not yet final, by tail.
func OpenWork(items []WorkItem) map[string][]WorkItem {
	out := map[string][]WorkItem{}
	for _, w := range items {
		if !Final(w.Status) {
			out[w.Tail] = append(out[w.Tail], w)
		}
	}
	return out
}
