package store

import (
	"context"
	"os"
	"path/filepath"
	"testing"
	"time"
)

func day(s string) time.Time {
	t, _ := time.Parse(time.DateOnly, s)
	return t
}

// Compare: before the first mark every flag and step is new; against a
// mark, only what differs; a step found again a few days off is the same.
func TestCompare(t *testing.T) {
	before := State{Tails: []TailState{
		{Tail: "T1", Series: SeriesAirframe, Flags: []string{"level"}, Steps: []StepState{{day("2026-05-01"), 1.2}}},
		{Tail: "T2", Series: SeriesEngine, Flags: []string{"growth"}},
		{Tail: "T3", Series: SeriesAirframe, Flags: []string{"step"}},
	}}
	after := State{Tails: []TailState{
		{Tail: "T1", Series: SeriesAirframe, Flags: []string{"level", "step"}, Steps: []StepState{{day("2026-05-04"), 1.3}, {day("2026-09-01"), -2}}},
		{Tail: "T2", Series: SeriesEngine, Flags: []string{}},
	}}
	cases := []struct {
		name                   string
		prev                   *State
		cur                    State
		raised, cleared, steps int
	}{
		{"first review", nil, after, 2, 0, 2},
		{"against the mark", &before, after, 1, 2, 1},
		{"no change", &after, after, 0, 0, 0},
	}
	for _, c := range cases {
		ch := Compare(c.prev, c.cur)
		if len(ch.FlagsRaised) != c.raised || len(ch.FlagsCleared) != c.cleared || len(ch.StepsNew) != c.steps {
			t.Errorf("%s: %+v", c.name, ch)
		}
	}
	ch := Compare(&before, after)
	if ch.StepsNew[0].Date != day("2026-09-01") || ch.FlagsRaised[0] != (FlagChange{"T1", SeriesAirframe, "step"}) {
		t.Errorf("against the mark: %+v", ch)
	}
}

// A mark keeps the state and its time; events and work since the mark are
// those imported or changed after it.
func TestMarkAndSince(t *testing.T) {
	s, _ := openTemp(t)
	clock := time.Date(2026, 11, 30, 9, 0, 0, 0, time.UTC)
	s.Now = func() time.Time { clock = clock.Add(time.Minute); return clock }
	if m, err := s.LastMark(); err != nil || m != nil {
		t.Fatalf("a mark before any: %v %v", m, err)
	}
	dir := t.TempDir()
	ev := filepath.Join(dir, "e.csv")
	os.WriteFile(ev, []byte("time,tail,kind,note\n2026-03-02T00:00:00Z,T1,wash,\n"), 0o644)
	if _, err := s.Import(context.Background(), ImportInput{Files: []string{ev}}); err != nil {
		t.Fatal(err)
	}
	id, _ := s.AddWork("T1", "level", "level")
	st := State{Tails: []TailState{{Tail: "T1", Series: SeriesAirframe, Flags: []string{"level"}, Steps: []StepState{}}}}
	m, err := s.MarkReview(st)
	if err != nil {
		t.Fatal(err)
	}
	last, err := s.LastMark()
	if err != nil || last.ID != m.ID || !last.Time.Equal(m.Time) || len(last.State.Tails) != 1 || last.State.Tails[0].Flags[0] != "level" {
		t.Fatalf("last mark %+v %v", last, err)
	}
	if evs, _ := s.EventsSince(time.Time{}); len(evs) != 1 {
		t.Errorf("events before any mark: %d", len(evs))
	}
	if evs, _ := s.EventsSince(m.Time); len(evs) != 0 {
		t.Errorf("events since the mark: %d", len(evs))
	}
	opened, closed := WorkSince(mustWork(t, s), m.Time)
	if len(opened) != 0 || len(closed) != 0 {
		t.Errorf("work since the mark: %v %v", opened, closed)
	}
	s.SetWork(id, StatusDismissed, "a wash cleared it")
	opened, closed = WorkSince(mustWork(t, s), m.Time)
	if len(opened) != 0 || len(closed) != 1 || closed[0] != id {
		t.Errorf("work since the mark after a dismissal: %v %v", opened, closed)
	}
}
