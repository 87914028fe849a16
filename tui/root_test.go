package tui

import (
	"context"
	"errors"
	"math"
	"strings"
	"sync/atomic"
	"testing"

	tea "github.com/charmbracelet/bubbletea"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

func TestRootKeysAndScreens(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	v := checkFrame(t, m, 100, 30)
	worst := m.data.Fleet.Tails[0]
	if !strings.Contains(v, worst.Tail) || !strings.Contains(v, "level step") {
		t.Fatalf("fleet view lacks the worst tail %s:\n%s", worst.Tail, v)
	}
	press(m, "?")
	if v := m.View(); !strings.Contains(v, "quit") || !strings.Contains(v, "previous screen") {
		t.Errorf("full help lacks keys:\n%s", v)
	}
	press(m, "?")
	// enter opens the worst tail in one key
	press(m, "enter")
	if m.active != scrTail || m.tail.a.Tail != worst.Tail {
		t.Fatalf("enter: screen %d, tail %q", m.active, m.tail.a.Tail)
	}
	checkFrame(t, m, 100, 30)
	// enter on its newest flight replays it
	press(m, "enter")
	if m.active != scrFlight || len(m.flight.recs) == 0 || m.flight.tail != worst.Tail {
		t.Fatalf("flight: screen %d, %d records", m.active, len(m.flight.recs))
	}
	press(m, "esc")
	if m.active != scrTail {
		t.Errorf("esc from Flight: screen %d, want Tail", m.active)
	}
	press(m, "esc")
	if m.active != scrFleet {
		t.Errorf("esc from Tail: screen %d, want Fleet", m.active)
	}
	for i := 1; i <= numScreens; i++ {
		press(m, "tab")
		if m.active != i%numScreens {
			t.Fatalf("tab %d: screen %d", i, m.active)
		}
		checkFrame(t, m, 100, 30)
	}
	press(m, "shift+tab")
	if m.active != scrAbout {
		t.Errorf("shift+tab from Fleet: %d", m.active)
	}
	if !strings.Contains(m.View(), "not approved performance data") {
		t.Error("About lacks the caution")
	}
	_, cmd := m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("q")})
	if _, ok := runCmd(cmd).(tea.QuitMsg); !ok {
		t.Error("q does not quit")
	}
}

// Every screen redraws within any window size, down to a tiny one, and
// never panics.
func TestResizeEveryScreen(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter", "enter")
	for s := 0; s < numScreens; s++ {
		m.activate(s)
		for _, size := range [][2]int{{80, 24}, {200, 60}, {40, 12}, {12, 5}, {1, 1}} {
			m.Update(tea.WindowSizeMsg{Width: size[0], Height: size[1]})
			if size[0] >= 40 {
				checkFrame(t, m, size[0], size[1])
			} else {
				m.View()
			}
		}
	}
}

func TestEmptyAndTinyFleets(t *testing.T) {
	in := pipeline.Input{Type: feed.DemoType(), Config: model.DefaultTrendConfig(), KeepRecords: true}
	empty := NewData("empty", pipeline.FromRecords(nil, feed.Stats{}, in))
	one := smallData(t, 1, 1)
	single := pipeline.FromRecords(one.Records[one.Fleet.Tails[0].Tail][:1], feed.Stats{Read: 1, Accepted: 1}, in)
	for name, d := range map[string]*Data{"empty": empty, "one tail, one day": one,
		"one snapshot": NewData("one", single)} {
		t.Run(name, func(t *testing.T) {
			m := sized(d, 80, 24)
			for i := 0; i < numScreens; i++ {
				press(m, "enter", "enter", "space", "+", "-", "up", "down", "tab")
				checkFrame(t, m, 80, 24)
			}
		})
	}
	m := sized(empty, 80, 24)
	if !strings.Contains(m.View(), "no tails") {
		t.Errorf("empty fleet view:\n%s", m.View())
	}
}

// While loading, the screen answers keys and shows progress; the data
// arrives as a message.
func TestLoading(t *testing.T) {
	l := &Loader{Total: 100, Load: func() (*Data, error) { return smallData(t, 3, 30), nil }}
	m := New(context.Background(), nil, l)
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	if v := m.View(); !strings.Contains(v, "reading and analysing") {
		t.Errorf("loading view:\n%s", v)
	}
	var read atomic.Int64
	read.Store(100)
	l.Progress = &read
	if v := m.View(); !strings.Contains(v, "trends, flags and cost") {
		t.Errorf("all bytes read, the view should name the trend stage:\n%s", v)
	}
	press(m, "tab", "tab", "tab", "tab", "tab")
	if m.active != scrAbout {
		t.Errorf("keys while loading: screen %d", m.active)
	}
	drain(m, m.Init())
	if m.loading || m.data == nil || len(m.data.Fleet.Tails) != 3 {
		t.Fatalf("not loaded: %+v", m.loading)
	}
}

func TestConditionFollowsFlight(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter", "enter", "G")
	r, _, ok := m.flight.current()
	if !ok {
		t.Fatal("no current snapshot")
	}
	m.activate(scrTurns)
	if m.turns.c.Weight != r.Snap.Weight || m.turns.c.Altitude != r.Snap.Altitude || math.IsNaN(m.turns.c.ExcessPct) {
		t.Errorf("turns condition %+v, snapshot %+v", m.turns.c, r.Snap)
	}
	m.activate(scrCruise)
	before := m.cruise.c.Weight
	press(m, "+")
	if m.cruise.c.Weight != before+1000 || m.cond.Weight != before+1000 {
		t.Errorf("+ on Cruise: weight %g → %g (root %g)", before, m.cruise.c.Weight, m.cond.Weight)
	}
}

func TestLoadError(t *testing.T) {
	l := &Loader{Load: func() (*Data, error) { return nil, errLoad }}
	m := New(context.Background(), nil, l)
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	drain(m, m.Init())
	if m.Err() != errLoad || !strings.Contains(m.View(), "could not load: x.csv:1: missing required column") {
		t.Errorf("err %v, view:\n%s", m.Err(), m.View())
	}
}

var errLoad = errors.New("x.csv:1: missing required column alt_ft (or alt_m)")
