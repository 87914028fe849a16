package tui

import (
	"errors"
	"strings"
	"testing"
	"time"

	"dragdeck/feed/store"
)

// fakeWork is a work list in memory that follows the store's state machine
// (store.Next), to drive the Fleet screen's work key.
type fakeWork struct {
	items []store.WorkItem
}

func (f *fakeWork) InProgress() (map[string][]store.WorkItem, error) {
	return store.OpenWork(f.items), nil
}

func (f *fakeWork) Open(tail, reason, flag string) (int64, error) {
	if reason == "" {
		return 0, errors.New("a work item needs a reason")
	}
	id := int64(len(f.items) + 1)
	f.items = append(f.items, store.WorkItem{ID: id, Tail: tail, Status: store.StatusOpen, Reason: reason, Flag: flag})
	return id, nil
}

func (f *fakeWork) Set(id int64, status, note string) error {
	it := &f.items[id-1]
	ok := status == it.Status && note != ""
	for _, n := range store.Next(it.Status) {
		ok = ok || n == status
	}
	if !ok {
		return store.ErrTransition
	}
	it.Status = status
	it.Notes = append(it.Notes, store.Note{Status: status, Text: note})
	return nil
}

// With a store's work list, the work key opens an item for the selected
// tail with its flag, then moves it on with a note; the Fleet screen shows
// the status at once, and q typed in the form is text, not quit.
func TestFleetWorkKey(t *testing.T) {
	base := smallData(t, 8, 200)
	d := *base
	w := &fakeWork{}
	d.Work = w
	d.Review = &ReviewMarks{Since: time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC), Raised: map[string]map[string]bool{}, Steps: map[string]int{}}
	newStep := ""
	for _, a := range d.Fleet.Tails {
		if k := len(a.Steps); k > 0 {
			d.Review.Steps[a.Tail] = 1
			newStep = "+" + a.Steps[k-1].Time.Format("2006-01-02")
			break
		}
	}
	if newStep == "" {
		t.Fatal("no tail with a step in the test fleet")
	}
	first := d.Fleet.Tails[0]
	if len(first.Flags) > 0 {
		d.Review.Raised[first.Tail] = map[string]bool{first.Flags[0]: true}
	}
	m := sized(&d, 120, 30)
	press(m, "w")
	if !m.fleet.Capturing() || m.fleet.form == nil || m.fleet.form.item != nil {
		t.Fatal("w should open a new item's form")
	}
	if v := m.View(); !strings.Contains(v, "enter save") || strings.Contains(v, "next screen") {
		t.Errorf("while the form is open the help offers its keys only:\n%s", v)
	}
	press(m, "q", "enter")
	if len(w.items) != 1 || w.items[0].Tail != first.Tail || !strings.HasSuffix(w.items[0].Reason, "q") {
		t.Fatalf("items %+v", w.items)
	}
	if len(first.Flags) > 0 && w.items[0].Flag != first.Flags[0] {
		t.Errorf("flag %q, want %q", w.items[0].Flag, first.Flags[0])
	}
	view := m.View()
	if !strings.Contains(view, "work item #1 opened") || !strings.Contains(view, " open ") {
		t.Errorf("the screen does not show the new item:\n%s", view)
	}
	if !strings.Contains(view, newStep) {
		t.Errorf("the step new since the review is not marked %s:\n%s", newStep, view)
	}
	if len(first.Flags) > 0 && !strings.Contains(view, "+"+first.Flags[0]) {
		t.Errorf("the flag raised since the review is not marked:\n%s", view)
	}
	// move it on: the first choice is the first next status (inspect)
	press(m, "w")
	if f := m.fleet.form; f == nil || f.item == nil || f.choices[0] != store.StatusInspect {
		t.Fatalf("form %+v", m.fleet.form)
	}
	for _, r := range "slot 12 Dec" {
		press(m, string(r))
	}
	press(m, "enter")
	if w.items[0].Status != store.StatusInspect || w.items[0].Notes[0].Text != "slot 12 Dec" {
		t.Errorf("item %+v", w.items[0])
	}
	if !strings.Contains(m.View(), "inspect") {
		t.Error("the status is not shown")
	}
	// esc drops the form; nothing changes
	press(m, "w", "right", "esc")
	if w.items[0].Status != store.StatusInspect || m.fleet.form != nil {
		t.Errorf("esc: item %+v, form %v", w.items[0], m.fleet.form)
	}
	// without a store the key does nothing
	m2 := sized(base, 120, 30)
	press(m2, "w")
	if m2.fleet.form != nil {
		t.Error("w opened a form without a work list")
	}
}
