// Package tui will hold dragdeck's bubbletea dashboard: one file per screen
// (fleet, tail, flight, cruise, turns, about) behind one small interface,
// key bindings declared once, colours in one theme (DESIGN.md §6). It is
// empty until the dashboard issue builds it; nothing imports it yet.
package tui
