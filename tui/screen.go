package tui

import (
	"github.com/charmbracelet/bubbles/help"
	tea "github.com/charmbracelet/bubbletea"
)

// Screen is one screen of the dashboard.
type Screen interface {
	tea.Model
	help.KeyMap
	SetSize(width, height int) // the area below the header and above the help line
	Title() string
}

// Capturing is implemented by screens that sometimes take every key (a
// filter being typed), so that the root does not treat q or tab as its own.
type Capturing interface {
	Capturing() bool
}
