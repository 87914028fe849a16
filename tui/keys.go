package tui

import "github.com/charmbracelet/bubbles/key"

// globalKeys work on every screen; the root handles them.
type globalKeys struct {
	Next, Prev, Back, Help, Quit key.Binding
}

var global = globalKeys{
	Next: key.NewBinding(key.WithKeys("tab"), key.WithHelp("tab", "next screen")),
	Prev: key.NewBinding(key.WithKeys("shift+tab"), key.WithHelp("shift+tab", "previous screen")),
	Back: key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "back")),
	Help: key.NewBinding(key.WithKeys("?"), key.WithHelp("?", "all keys")),
	Quit: key.NewBinding(key.WithKeys("q", "ctrl+c"), key.WithHelp("q", "quit")),
}

func (g globalKeys) bindings() []key.Binding { return []key.Binding{g.Next, g.Back, g.Help, g.Quit} }

// Movement keys shared by the screens that have a list.
var (
	keyUp    = key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "up"))
	keyDown  = key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "down"))
	keyEnter = key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "open"))
	keyPgUp  = key.NewBinding(key.WithKeys("pgup", "ctrl+u"), key.WithHelp("pgup", "page up"))
	keyPgDn  = key.NewBinding(key.WithKeys("pgdown", "ctrl+d"), key.WithHelp("pgdn", "page down"))
)
