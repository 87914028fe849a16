package store

import (
	"errors"
	"testing"
	"time"
)

// The work list's state machine: every move from every status, allowed
// or refused, and the timestamps and notes of the moves.
func TestWorkStateMachine(t *testing.T) {
	allowed := map[[2]string]bool{
		{StatusOpen, StatusInspect}: true, {StatusOpen, StatusDismissed}: true,
		{StatusInspect, StatusFound}: true, {StatusInspect, StatusNotFound}: true, {StatusInspect, StatusDismissed}: true,
		{StatusFound, StatusClosed}: true, {StatusNotFound, StatusClosed}: true,
	}
	// the path to each status from open
	path := map[string][]string{
		StatusOpen: nil, StatusInspect: {StatusInspect}, StatusFound: {StatusInspect, StatusFound},
		StatusNotFound: {StatusInspect, StatusNotFound}, StatusClosed: {StatusInspect, StatusFound, StatusClosed},
		StatusDismissed: {StatusDismissed},
	}
	for _, from := range Statuses {
		for _, to := range Statuses {
			t.Run(from+" to "+to, func(t *testing.T) {
				s, _ := openTemp(t)
				id, err := s.AddWork("T1", "level +1.2 pp", "level")
				if err != nil {
					t.Fatal(err)
				}
				for _, st := range path[from] {
					if err := s.SetWork(id, st, ""); err != nil {
						t.Fatal(err)
					}
				}
				err = s.SetWork(id, to, "a note")
				switch {
				case from == to:
					if err != nil {
						t.Errorf("a note alone refused: %v", err)
					}
				case allowed[[2]string{from, to}]:
					if err != nil {
						t.Errorf("refused: %v", err)
					}
				default:
					if !errors.Is(err, ErrTransition) {
						t.Errorf("allowed (err %v)", err)
					}
				}
			})
		}
	}
}

func TestWorkItems(t *testing.T) {
	s, _ := openTemp(t)
	clock := time.Date(2026, 11, 30, 9, 0, 0, 0, time.UTC)
	s.Now = func() time.Time { clock = clock.Add(time.Hour); return clock }
	id, err := s.AddWork("T1", "drift +0.9 pp/100 d", "growth")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := s.AddWork("T1", "again", ""); !errors.Is(err, ErrOpenItem) {
		t.Errorf("a second item in progress: %v", err)
	}
	cases := []struct {
		name, status, note string
		want               error
	}{
		{"unknown status", "fixed", "", ErrStatus},
		{"no such item", StatusInspect, "", ErrNoItem},
		{"same status without a note", StatusOpen, "", nil},
		{"to inspect", StatusInspect, "door seals, slot 12 Dec", nil},
		{"to found", StatusFound, "seal torn, replaced", nil},
		{"to closed", StatusClosed, "", nil},
		{"after closed", StatusOpen, "", ErrTransition},
	}
	for _, c := range cases {
		item := id
		if c.want == ErrNoItem {
			item = 99
		}
		err := s.SetWork(item, c.status, c.note)
		if c.want == nil && c.name == "same status without a note" {
			if err == nil {
				t.Errorf("%s: accepted", c.name)
			}
			continue
		}
		if (c.want == nil) != (err == nil) || (c.want != nil && !errors.Is(err, c.want)) {
			t.Errorf("%s: %v, want %v", c.name, err, c.want)
		}
	}
	items, err := s.Work()
	if err != nil || len(items) != 1 {
		t.Fatalf("%v: %d items", err, len(items))
	}
	w := items[0]
	if w.Status != StatusClosed || w.Flag != "growth" || len(w.Notes) != 4 || w.Notes[2].Text != "seal torn, replaced" {
		t.Errorf("item %+v", w)
	}
	if !w.Updated.After(w.Opened) || w.Notes[3].Time != w.Updated {
		t.Errorf("timestamps: opened %v updated %v notes %v", w.Opened, w.Updated, w.Notes)
	}
	// closed: the tail may have a new item
	if _, err := s.AddWork("T1", "step +1.1 pp", "step"); err != nil {
		t.Errorf("a new item after the last was closed: %v", err)
	}
	if open := OpenWork(mustWork(t, s)); len(open["T1"]) != 1 || open["T1"][0].Reason != "step +1.1 pp" {
		t.Errorf("open work %v", open)
	}
}

func mustWork(t *testing.T, s *Store) []WorkItem {
	t.Helper()
	items, err := s.Work()
	if err != nil {
		t.Fatal(err)
	}
	return items
}
