package tui

import "github.com/charmbracelet/bubbles/key"

// Every key of the dashboard is declared here, once; the screens match
// keys against these bindings and draw their help from them.

// globalKeys work on every screen; the root handles them.
type globalKeys struct {
	Next, Prev, Back, Help, Quit, ForceQuit key.Binding
}

var global = globalKeys{
	Next:      key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "next screen")),
	Prev:      key.NewBinding(key.WithKeys("shift+tab"), key.WithHelp("shift+tab", "previous screen")),
	Back:      key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "back")),
	Help:      key.NewBinding(key.WithKeys("?"), key.WithHelp("?", "all keys")),
	Quit:      key.NewBinding(key.WithKeys("q", "ctrl+c"), key.WithHelp("q", "quit")),
	ForceQuit: key.NewBinding(key.WithKeys("ctrl+c"), key.WithHelp("ctrl+c", "quit")),
}

func (g globalKeys) bindings() []key.Binding { return []key.Binding{g.Next, g.Back, g.Help, g.Quit} }

// Keys shared by the screens that have a list.
var (
	keyUp    = key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "up"))
	keyDown  = key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "down"))
	keyEnter = key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "open"))
	keyPgUp  = key.NewBinding(key.WithKeys("pgup", "ctrl+u"), key.WithHelp("pgup", "page up"))
	keyPgDn  = key.NewBinding(key.WithKeys("pgdown", "ctrl+d"), key.WithHelp("pgdn", "page down"))
	keyHome  = key.NewBinding(key.WithKeys("home", "g"), key.WithHelp("home/g", "first"))
	keyEnd   = key.NewBinding(key.WithKeys("end", "G"), key.WithHelp("end/G", "last"))
)

// Keys of the Fleet screen's filter: while it is typed, enter keeps it and
// esc clears it.
var (
	keyFilter     = key.NewBinding(key.WithKeys("/"), key.WithHelp("/", "filter tails"))
	keyFilterKeep = key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "keep filter"))
	keyFilterDrop = key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "clear filter"))
	keySort       = key.NewBinding(key.WithKeys("s"), key.WithHelp("s", "sort by"))
)

// Keys of the work list (a store's data only): the work key opens the form
// for the selected tail; in it, left and right choose the status, enter
// saves and esc drops.
var (
	keyWork       = key.NewBinding(key.WithKeys("w"), key.WithHelp("w", "work item"))
	keyWorkSave   = key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "save"))
	keyWorkCancel = key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "drop"))
	keyWorkNext   = key.NewBinding(key.WithKeys("right", "tab"), key.WithHelp("→", "next status"))
	keyWorkPrev   = key.NewBinding(key.WithKeys("left", "shift+tab"), key.WithHelp("←", "previous status"))
)

// Keys of the fuel factor: on the Fleet screen (a store's data only) the
// factor key opens the form that approves or rejects the selected tail's
// proposal (its keys are the work form's); on the Tail screen it turns the
// top chart to the fuel factor and back.
var (
	keyFactor      = key.NewBinding(key.WithKeys("f"), key.WithHelp("f", "fuel factor"))
	keyFactorChart = key.NewBinding(key.WithKeys("f"), key.WithHelp("f", "fuel factor chart"))
)
