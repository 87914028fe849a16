package tui

import (
	"math"
	"strings"
	"testing"
)

func TestFleetFilter(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "/")
	if !m.fleet.Capturing() {
		t.Fatal("/ should start the filter")
	}
	press(m, "s", "t", "e", "p", "q") // q is typed, not quit
	if m.fleet.filter.Value() != "stepq" {
		t.Fatalf("filter %q", m.fleet.filter.Value())
	}
	press(m, "esc")
	press(m, "/", "s", "t", "e", "p", "enter")
	for _, a := range m.fleet.rows {
		if !strings.Contains(strings.Join(a.Flags, " "), "step") {
			t.Errorf("filter 'step' kept %s %v", a.Tail, a.Flags)
		}
	}
	if len(m.fleet.rows) == 0 {
		t.Fatal("no step tails in the demo")
	}
	press(m, "esc")
	if len(m.fleet.rows) != len(m.data.Fleet.Tails) {
		t.Errorf("esc should clear the filter: %d rows", len(m.fleet.rows))
	}
	press(m, "down", "down", "up")
	if m.fleet.cursor != 1 {
		t.Errorf("cursor %d after down down up", m.fleet.cursor)
	}
}

func TestTailZoom(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	full := m.tail.window
	press(m, "+", "+")
	if m.tail.window != full/4 {
		t.Errorf("zoom in twice: %g days of %g", m.tail.window, full)
	}
	press(m, "h")
	if m.tail.back <= 0 {
		t.Error("h should move the window earlier")
	}
	press(m, "-", "-", "-")
	if m.tail.window != full {
		t.Errorf("zoom out: %g, want %g", m.tail.window, full)
	}
	press(m, "down", "down")
	if m.tail.cursor != 2 {
		t.Errorf("flight cursor %d", m.tail.cursor)
	}
}

// A replay runs to its end on its ticks; the controls pause, step and seek.
func TestFlightReplayToEnd(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	// the longest recent flight
	best := 0
	for i := 0; i < 20; i++ {
		if f, ok := m.tail.flightAt(i); ok && f.N > 2 {
			best = i
			break
		}
	}
	for i := 0; i < best; i++ {
		press(m, "down")
	}
	press(m, "enter")
	f := m.flight
	n := len(f.recs)
	if n < 2 || !f.playing || f.pos != 1 {
		t.Fatalf("replay start: %d records, playing %v, pos %d", n, f.playing, f.pos)
	}
	for i := 0; i < n+5 && f.playing; i++ {
		m.Update(replayTickMsg{gen: f.gen})
	}
	if f.pos != n || f.playing {
		t.Fatalf("after the ticks: pos %d of %d, playing %v", f.pos, n, f.playing)
	}
	if v := m.View(); !strings.Contains(v, "at the end") || !strings.Contains(v, "excess") {
		t.Errorf("view at the end:\n%s", v)
	}
	press(m, "h")
	if f.pos != n-1 || f.playing {
		t.Errorf("back: pos %d", f.pos)
	}
	stale := f.gen - 1
	m.Update(replayTickMsg{gen: stale})
	if f.pos != n-1 {
		t.Error("a stale tick moved the replay")
	}
	press(m, "g")
	if f.pos != 1 {
		t.Errorf("g: pos %d", f.pos)
	}
	speed := f.speed
	press(m, "+")
	if f.speed != 2*speed {
		t.Errorf("+: speed %g", f.speed)
	}
	if !f.optOK || math.IsNaN(f.opt.MaxRange.Mach) {
		t.Error("no cruise optimum for the current snapshot")
	}
}

func TestCruiseAndTurns(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	m.activate(scrCruise)
	c := m.cruise.c
	press(m, "up", "]", "I")
	if m.cruise.c.Altitude <= c.Altitude || m.cruise.c.CostIndex != c.CostIndex+5 || m.cruise.c.ISADev != c.ISADev+5 {
		t.Errorf("cruise keys: %+v → %+v", c, m.cruise.c)
	}
	if m.cruise.tail.MaxRange.SR >= m.cruise.base.MaxRange.SR {
		t.Error("a flagged tail's own polar should have less range than the baseline")
	}
	if v := m.View(); !strings.Contains(v, "max range M") || !strings.Contains(v, "level") {
		t.Errorf("cruise view:\n%s", v)
	}
	m.activate(scrTurns)
	if len(m.turns.rows) != 10 {
		t.Fatalf("%d bank rows", len(m.turns.rows))
	}
	mach := m.turns.c.Mach
	press(m, "-")
	if math.Abs(m.turns.c.Mach-(mach-0.01)) > 0.006 {
		t.Errorf("- on Turns: Mach %g → %g", mach, m.turns.c.Mach)
	}
	if v := m.View(); !strings.Contains(v, "1.1547") || !strings.Contains(v, "+33.3%") {
		t.Errorf("turns view lacks the 30° row:\n%s", v)
	}
}
