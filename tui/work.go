package tui

import (
	"fmt"
	"slices"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"

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
// the Fleet screen's form behind the work key.
type workForm struct {
	tail    string
	item    *store.WorkItem // nil: a new item
	flag    string          // the flag that raises a new item
	choices []string        // the statuses the item may move to, and its own (a note alone)
	choice  int
	text    textinput.Model
}

func newWorkForm(tail string, item *store.WorkItem, flag, reason string) *workForm {
	ti := textinput.New()
	ti.CharLimit = 200
	ti.Cursor.SetMode(cursor.CursorStatic)
	f := &workForm{tail: tail, item: item, flag: flag, text: ti}
	if item == nil {
		ti.Prompt = "reason: "
		ti.SetValue(reason)
	} else {
		ti.Prompt = "note: "
		f.choices = append(slices.Clone(store.Next(item.Status)), item.Status)
	}
	f.text = ti
	f.text.Focus()
	return f
}

// update handles a key: done is set when the form is to be saved or
// dropped (save says which).
func (f *workForm) update(km tea.KeyMsg) (done, save bool, cmd tea.Cmd) {
	switch {
	case key.Matches(km, keyWorkSave):
		return true, true, nil
	case key.Matches(km, keyWorkCancel):
		return true, false, nil
	case f.item != nil && key.Matches(km, keyWorkNext):
		f.choice = (f.choice + 1) % len(f.choices)
		return false, false, nil
	case f.item != nil && key.Matches(km, keyWorkPrev):
		f.choice = (f.choice + len(f.choices) - 1) % len(f.choices)
		return false, false, nil
	}
	f.text, cmd = f.text.Update(km)
	return false, false, cmd
}

// save writes the form to the work list and says what it did.
func (f *workForm) save(w WorkList) (string, error) {
	text := strings.TrimSpace(f.text.Value())
	if f.item == nil {
		id, err := w.Open(f.tail, text, f.flag)
		if err != nil {
			return "", err
		}
		return fmt.Sprintf("work item #%d opened for %s", id, f.tail), nil
	}
	status := f.choices[f.choice]
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
	var opts []string
	for i, c := range f.choices {
		label := c
		if c == f.item.Status {
			label = "note only"
		}
		if i == f.choice {
			opts = append(opts, st.Selected.Render("["+label+"]"))
		} else {
			opts = append(opts, " "+label+" ")
		}
	}
	head := fmt.Sprintf("item #%d %s %s → ", f.item.ID, clean(f.tail), f.item.Status)
	return truncate(st.Accent.Render(head)+strings.Join(opts, "")+st.Muted.Render(" ←/→ choose · enter saves · esc drops"), w) +
		"\n" + truncate(f.text.View(), w)
}
