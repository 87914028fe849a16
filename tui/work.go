package tui

import (
	"fmt"
	"slices"
	"time"

	"dragdeck/feed/store"
)

// WorkList is the store's work list as the dashboard uses it: the items
// in progress, and the two changes a key makes, written to the store at
// once. The dashboard has one only when its data come from a store.
type WorkList interface {
	InProgress() (map[string][]store.WorkItem, error)
	Open(tail, reason, flag string) (int64, error)
	Set(id int64, status, note string) error
}

// ReviewMarks is what changed since the last review mark (from the
// review command's comparison), for the Fleet screen to mark.
type ReviewMarks struct {
	Since  time.Time                  // the last mark; zero before the first
	Raised map[string]map[string]bool // by tail: the flags raised since ("e-" for the engine series')
	Steps  map[string]int             // by tail: the steps new since
}

// workStatusShort is a status in the Fleet screen's work column.
func workStatusShort(s string) string {
	if s == store.StatusNotFound {
		return "no find"
	}
	return s
}

// workForm opens an item for a tail, or moves its item on, with a note:
// the Fleet screen's form behind the work key. Its choices are the
// statuses the item may move to, and its own (a note alone); a new item
// has none.
type workForm struct {
	tail string
	item *store.WorkItem // nil: a new item
	flag string          // the flag that raises a new item
	noteForm
}

func newWorkForm(tail string, item *store.WorkItem, flag, reason string) *workForm {
	if item == nil {
		return &workForm{tail: tail, flag: flag, noteForm: newNoteForm("reason: ", reason, nil)}
	}
	return &workForm{tail: tail, item: item, noteForm: newNoteForm("note: ", "", append(slices.Clone(store.Next(item.Status)), item.Status))}
}

// save writes the form to the work list and says what it did.
func (f *workForm) save(w WorkList) (string, error) {
	text := f.note()
	if f.item == nil {
		id, err := w.Open(f.tail, text, f.flag)
		if err != nil {
			return "", err
		}
		return fmt.Sprintf("work item #%d opened for %s", id, f.tail), nil
	}
	status := f.chosen()
	if err := w.Set(f.item.ID, status, text); err != nil {
		return "", err
	}
	if status == f.item.Status {
		return fmt.Sprintf("note added to item #%d", f.item.ID), nil
	}
	return fmt.Sprintf("item #%d of %s is %s", f.item.ID, f.tail, status), nil
}

// view is the form's line(s).
func (f *workForm) view(st Styles, w int) string {
	if f.item == nil {
		head := fmt.Sprintf("new work item for %s", clean(f.tail))
		if f.flag != "" {
			head += " (flag " + f.flag + ")"
		}
		return truncate(st.Accent.Render(head)+st.Muted.Render(" · enter saves, esc drops"), w) + "\n" + truncate(f.text.View(), w)
	}
	opts := f.options(st, func(c string) string {
		if c == f.item.Status {
			return "note only"
		}
		return c
	})
	head := fmt.Sprintf("item #%d %s %s → ", f.item.ID, clean(f.tail), f.item.Status)
	return truncate(st.Accent.Render(head)+opts+st.Muted.Render(" ←/→ choose · enter saves · esc drops"), w) +
		"\n" + truncate(f.text.View(), w)
}
