package tui

import (
	"strings"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"
)

// noteForm is what the Fleet screen's forms (the work item's and the fuel
// factor's) share: a choice among moves, ←/→ to change it (when there is
// one), a line of text, enter to save and esc to drop.
type noteForm struct {
	choices []string // the moves to choose from (none: the text alone)
	choice  int
	text    textinput.Model
}

func newNoteForm(prompt, value string, choices []string) noteForm {
	ti := textinput.New()
	ti.CharLimit = 200
	ti.Cursor.SetMode(cursor.CursorStatic)
	ti.Prompt = prompt
	ti.SetValue(value)
	ti.Focus()
	return noteForm{choices: choices, text: ti}
}

// update handles a key: done is set when the form is to be saved or
// dropped (save says which).
func (f *noteForm) update(km tea.KeyMsg) (done, save bool, cmd tea.Cmd) {
	n := len(f.choices)
	switch {
	case key.Matches(km, keyWorkSave):
		return true, true, nil
	case key.Matches(km, keyWorkCancel):
		return true, false, nil
	case n > 0 && key.Matches(km, keyWorkNext):
		f.choice = (f.choice + 1) % n
		return false, false, nil
	case n > 0 && key.Matches(km, keyWorkPrev):
		f.choice = (f.choice + n - 1) % n
		return false, false, nil
	}
	f.text, cmd = f.text.Update(km)
	return false, false, cmd
}

// chosen is the move chosen; note the text, trimmed.
func (f *noteForm) chosen() string { return f.choices[f.choice] }
func (f *noteForm) note() string   { return strings.TrimSpace(f.text.Value()) }

// options draws the choices, the chosen one in brackets (visible without
// colour), each under its label.
func (f *noteForm) options(st Styles, label func(string) string) string {
	var opts []string
	for i, c := range f.choices {
		if i == f.choice {
			opts = append(opts, st.Selected.Render("["+label(c)+"]"))
		} else {
			opts = append(opts, " "+label(c)+" ")
		}
	}
	return strings.Join(opts, "")
}
