// Package tui is dragdeck's terminal dashboard, built with bubbletea. The
// root model (root.go) alone handles the window size and routes messages to
// one screen at a time: Fleet, Tail, Flight, Cruise, Turns and About, one
// file each, all behind the Screen interface (tea.Model + help.KeyMap +
// SetSize). Key bindings are declared once with bubbles/key and the help is
// drawn from them; colours live in one theme (theme.go) and every style is
// derived from it. Screens draw their charts when their data or size
// changes and return a cached string from View.
//
// The dashboard is an engineering monitoring aid, not approved performance
// data; the About screen says so.
package tui
