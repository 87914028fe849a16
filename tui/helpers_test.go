package tui

import (
	"context"
	"os"
	"strings"
	"sync"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"dragdeck/feed"
	"dragdeck/model"
)

func TestMain(m *testing.M) {
	lipgloss.SetColorProfile(termenv.Ascii) // stable goldens, no colour codes
	os.Exit(m.Run())
}

var (
	demoOnce sync.Once
	demo     *Data
)

// demoFleet is the built-in demo, made once.
func demoFleet(t testing.TB) *Data {
	t.Helper()
	demoOnce.Do(func() {
		d, err := DemoData()
		if err != nil {
			t.Fatal(err)
		}
		demo = d
	})
	return demo
}

// smallData is a demo fleet of the given size.
func smallData(t testing.TB, tails, days int) *Data {
	t.Helper()
	d, err := feed.NewDemoFleet(feed.DemoConfig{Tails: tails, Days: days, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	ty := feed.DemoType()
	return NewData("test", ty, feed.FleetFromRecords(d.Records, d.Stats, ty, true), nil, model.DefaultTrendConfig())
}

// sized returns a dashboard on d at w × h.
func sized(d *Data, w, h int, opts ...Option) *Model {
	m := New(context.Background(), d, nil, opts...)
	m.Update(tea.WindowSizeMsg{Width: w, Height: h})
	return m
}

// press sends keys and runs the commands they return until none is left
// (ticks excepted), as the bubbletea runtime would.
func press(m *Model, keys ...string) {
	for _, k := range keys {
		msg := keyMsg(k)
		_, cmd := m.Update(msg)
		drain(m, cmd)
	}
}

// drain runs cmd and feeds its messages back, skipping timers.
func drain(m *Model, cmd tea.Cmd) {
	for cmd != nil {
		msg := runCmd(cmd)
		switch msg := msg.(type) {
		case nil, replayTickMsg, progressTickMsg:
			return
		case tea.BatchMsg:
			for _, c := range msg {
				drain(m, c)
			}
			return
		default:
			_, cmd = m.Update(msg)
		}
	}
}

// runCmd runs a command, giving up on timers after a moment (the
// dashboard's own commands return at once).
func runCmd(cmd tea.Cmd) tea.Msg {
	ch := make(chan tea.Msg, 1)
	go func() { ch <- cmd() }()
	select {
	case msg := <-ch:
		return msg
	case <-time.After(200 * time.Millisecond):
		return nil
	}
}

// checkFrame asserts that the view fits w × h.
func checkFrame(t *testing.T, m *Model, w, h int) string {
	t.Helper()
	v := m.View()
	lines := strings.Split(v, "\n")
	if len(lines) > h {
		t.Errorf("%d lines in a %d-line window", len(lines), h)
	}
	for i, l := range lines {
		if lipgloss.Width(l) > w {
			t.Errorf("line %d is %d wide in a %d-wide window: %q", i, lipgloss.Width(l), w, l)
		}
	}
	return v
}

// keyMsg is the key message of a key name.
func keyMsg(k string) tea.KeyMsg {
	types := map[string]tea.KeyType{"enter": tea.KeyEnter, "esc": tea.KeyEsc, "tab": tea.KeyTab,
		"shift+tab": tea.KeyShiftTab, "up": tea.KeyUp, "down": tea.KeyDown}
	if t, ok := types[k]; ok {
		return tea.KeyMsg{Type: t}
	}
	if k == "space" {
		return tea.KeyMsg{Type: tea.KeySpace, Runes: []rune{' '}}
	}
	return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(k)}
}
