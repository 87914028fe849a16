package tui

import (
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

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

// However far the cursor goes down the flights list, the selected flight is
// on screen (marked), and enter replays that one.
func TestTailFlightsCursorVisible(t *testing.T) {
	for _, size := range [][2]int{{80, 24}, {100, 30}, {120, 50}} {
		m := sized(demoFleet(t), size[0], size[1])
		press(m, "enter")
		for i := 0; i < 12; i++ {
			press(m, "down")
			v := checkFrame(t, m, size[0], size[1])
			f, _ := m.tail.flightAt(m.tail.cursor)
			l, ok := lineWith(v, selMark)
			if !ok || !strings.Contains(l, f.At().Format("2006-01-02 15:04")) {
				t.Fatalf("%v, %d downs: selected flight %s not marked on screen:\n%s", size, i+1, f.At(), v)
			}
		}
		f, _ := m.tail.flightAt(m.tail.cursor)
		press(m, "enter")
		if m.flight.flight != m.tail.a.FlightName(f) || !m.flight.recs[0].Time.Equal(f.At()) {
			t.Errorf("%v: enter replayed %s at %s, the marked flight is %s at %s", size, m.flight.flight, m.flight.recs[0].Time, m.tail.a.FlightName(f), f.At())
		}
	}
}

// The polar points and the tail's own line cover the current segment only
// (since the last step or event), and the screen names that period.
func TestTailPolarCurrentSegment(t *testing.T) {
	d := demoFleet(t)
	var name string
	for _, a := range d.Fleet.Tails {
		if len(a.Steps) > 0 {
			name = a.Tail
			break
		}
	}
	if name == "" {
		t.Fatal("no tail with a step in the demo")
	}
	m := sized(d, 120, 40)
	m.Update(openTailMsg{name})
	a := m.tail.a
	if !a.PolarFrom.After(a.First) {
		t.Fatalf("%s: polar from %s, first %s: the segment should start at the step", name, a.PolarFrom, a.First)
	}
	all := d.PolarPoints(name, false)
	if n := len(m.tail.polar); n == 0 || n >= len(all) {
		t.Errorf("%s: %d polar points of %d: want only the current segment's", name, n, len(all))
	}
	if v := m.View(); !strings.Contains(v, "since "+a.PolarFrom.Format("2006-01-02")) {
		t.Errorf("the polar's period is not named:\n%s", v)
	}
}

// The deviation chart's x labels are month names at the month starts (with
// the year at January), not evenly spaced dates.
func TestTailMonthAxis(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter")
	v := m.View()
	axis, ok := lineWith(v, "Sep")
	if !ok || !strings.Contains(axis, "2026") || strings.Contains(axis, "2025-0") {
		t.Errorf("month axis %q:\n%s", axis, v)
	}
}

// The Tail screen shows the engine series beside the airframe's: its facts
// line and its rolling median in the engine colour; a tail on fuel flow
// says its engine is unknown.
func TestTailEngineSeries(t *testing.T) {
	r, fan := engineResult(t)
	e, _ := r.EngineTail(fan)
	m := sized(NewData("test", r), 120, 40)
	for _, a := range r.Fleet.Tails {
		m.tail.SetTail(a.Tail)
		m.activate(scrTail)
		v := m.View()
		if a.Tail == fan {
			if l, ok := lineWith(v, "engine "+fmtSigned(e.RecentPct, 2)); !ok || !strings.Contains(v, "rolling median · engine") {
				t.Errorf("%s: engine facts %q\n%s", a.Tail, l, v)
			}
		} else if _, ok := lineWith(v, "engine unknown (thrust from fuel flow)"); !ok {
			t.Errorf("%s on fuel flow:\n%s", a.Tail, v)
		}
	}
}

// The Tail screen's title lists the engine series' flags (e-…) beside the
// airframe's: a tail flagged for engine wear alone is not "no flags".
func TestTailTitleEngineFlags(t *testing.T) {
	ty, err := feed.LoadType("../testdata/types/twin_thrust.toml")
	if err != nil {
		t.Fatal(err)
	}
	d, err := demo.NewFleet(demo.Config{Tails: 24, Days: 400, Seed: 3, Type: ty})
	if err != nil {
		t.Fatal(err)
	}
	r := pipeline.FromRecords(d.Records, d.Stats, pipeline.Input{Type: ty, Events: d.Events(), Config: model.DefaultTrendConfig()})
	m := sized(NewData("test", r), 120, 40)
	found := false
	for _, e := range r.Engine.Tails {
		if len(e.Flags) == 0 {
			continue
		}
		found = true
		m.tail.SetTail(e.Tail)
		m.activate(scrTail)
		title, _ := lineWith(m.View(), e.Tail+"  ")
		if !strings.Contains(title, "e-"+e.Flags[0]) || strings.Contains(title, "no flags") {
			t.Errorf("%s: title %q lacks its engine flags %v", e.Tail, title, e.Flags)
		}
	}
	if !found {
		t.Fatal("no tail with engine flags in the thrust-table demo")
	}
}

// The deviation chart's range holds the engine series too: a fuel-flow
// meter reading 4 % high must not be drawn clipped at the top of an
// airframe series near zero.
func TestTailChartHoldsEngine(t *testing.T) {
	d := demoFleet(t)
	tail, level := "", 0.0
	for _, a := range d.Fleet.Tails {
		if e, ok := d.EngineTail(a.Tail); ok && e.RecentPct-a.RecentPct > 2 {
			tail, level = a.Tail, e.RecentPct
			break
		}
	}
	if tail == "" {
		t.Fatal("no tail in the built-in demo whose engine sits 2 pp above its airframe")
	}
	m := sized(d, 100, 30)
	m.tail.SetTail(tail)
	m.activate(scrTail)
	top := math.Inf(-1)
	for _, l := range strings.Split(m.View(), "\n") {
		if g := yLabel.FindStringSubmatch(l); g != nil {
			v, _ := strconv.ParseFloat(g[1], 64)
			top = math.Max(top, v)
		}
	}
	if top < level-0.3 {
		t.Errorf("%s: the chart's top label %+.1f %% is below its engine level %+.2f %%:\n%s", tail, top, level, m.View())
	}
}

var yLabel = regexp.MustCompile(`^\s*([+-]\d+\.\d)%│`)
