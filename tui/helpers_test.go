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

	"dragdeck/feed/demo"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

func TestMain(m *testing.M) {
	lipgloss.SetColorProfile(termenv.Ascii) // stable goldens, no colour codes
	after = instant
	os.Exit(m.Run())
}

// instant is tea.Tick without the wait: a timer's message comes at once, so
// no test depends on the clock.
func instant(_ time.Duration, fn func(time.Time) tea.Msg) tea.Cmd {
	return func() tea.Msg { return fn(time.Time{}) }
}

var (
	demoOnce sync.Once
	demoData *Data
)

// demoFleet is the built-in demo, made once.
func demoFleet(t testing.TB) *Data {
	t.Helper()
	demoOnce.Do(func() {
		d, err := DemoData()
		if err != nil {
			t.Fatal(err)
		}
		demoData = d
	})
	return demoData
}

// smallData is a demo fleet of the given size.
func smallData(t testing.TB, tails, days int) *Data {
	t.Helper()
	d, err := demo.NewFleet(demo.Config{Tails: tails, Days: days, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	return NewData("test", pipeline.FromRecords(d.Records, d.Stats, pipeline.Input{Roster: d.Roster, Events: d.Events(),
		Config: model.DefaultTrendConfig(), KeepRecords: true}))
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

// runCmd runs a command. Timers return at once (instant), so no command
// of the dashboard blocks.
func runCmd(cmd tea.Cmd) tea.Msg { return cmd() }

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
		"shift+tab": tea.KeyShiftTab, "up": tea.KeyUp, "down": tea.KeyDown, "left": tea.KeyLeft,
		"right": tea.KeyRight, "home": tea.KeyHome, "end": tea.KeyEnd, "pgup": tea.KeyPgUp,
		"pgdown": tea.KeyPgDown, "ctrl+c": tea.KeyCtrlC}
	if t, ok := types[k]; ok {
		return tea.KeyMsg{Type: t}
	}
	if k == "space" {
		return tea.KeyMsg{Type: tea.KeySpace, Runes: []rune{' '}}
	}
	return tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune(k)}
}
