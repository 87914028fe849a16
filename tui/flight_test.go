package tui

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
	"time"

	tea "github.com/charmbracelet/bubbletea"

	"dragdeck/feed"
	"dragdeck/model"
)

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

// The replay's pacing is feed.Player's: each tick waits the time gap to
// the next snapshot divided by the speed, capped at maxReplayWait.
func TestFlightPacingIsThePlayers(t *testing.T) {
	var waits []float64
	old := after
	defer func() { after = old }()
	after = func(d time.Duration, fn func(time.Time) tea.Msg) tea.Cmd {
		waits = append(waits, d.Seconds())
		return instant(d, fn)
	}
	d := demoFleet(t)
	recs := d.Records[d.Fleet.Tails[0].Tail][:4]
	recs[1].Time = recs[0].Time.Add(60 * time.Second)
	recs[2].Time = recs[1].Time.Add(120 * time.Second)
	recs[3].Time = recs[2].Time.Add(10 * time.Hour)
	s := newFlightScreen(NewStyles(DefaultTheme))
	s.SetSize(100, 30)
	cmd := s.Replay(d.Roster, d.Config, "T", "F", recs, 60, math.NaN())
	for cmd != nil {
		_, cmd = s.Update(cmd())
	}
	want := []float64{1, 2, maxReplayWait.Seconds()}
	if len(waits) != len(want) {
		t.Fatalf("waits %v, want %v", waits, want)
	}
	for i := range want {
		if math.Abs(waits[i]-want[i]) > 1e-9 {
			t.Errorf("wait %d: %g s, want %g s", i, waits[i], want[i])
		}
	}
}

// Snapshots that the trend leaves out (a speed change here) are marked, on the
// chart and for the current one.
func TestFlightMarksLeftOut(t *testing.T) {
	d := demoFleet(t)
	recs := append([]feed.Record(nil), d.Records[d.Fleet.Tails[0].Tail][:3]...)
	recs[1].Snap.Accel = 1.2 * d.Config.MaxAccel // a speed change
	s := newFlightScreen(NewStyles(DefaultTheme))
	s.SetSize(100, 30)
	s.Replay(d.Roster, d.Config, "T", "F", recs, 0, math.NaN())
	s.seek(2)
	if !strings.Contains(s.View(), "left out of the trend: "+model.ExcludeAccel) {
		t.Errorf("the turning snapshot is not marked:\n%s", s.View())
	}
	if s.left[0] != "" || s.left[1] == "" {
		t.Errorf("left out: %q", s.left)
	}
	s.seek(3)
	if !strings.Contains(s.View(), "dots: left out") {
		t.Errorf("no legend for the left-out snapshots:\n%s", s.View())
	}
}

// A replay of many flights, interleaved with another tail's, charts and
// names the current snapshot's flight only.
func TestFlightChartsTheCurrentFlight(t *testing.T) {
	d := demoFleet(t)
	base := d.Records[d.Fleet.Tails[0].Tail][0]
	t0 := base.Time
	mk := func(tail, flight string, min float64) feed.Record {
		r := base
		r.Tail, r.Flight, r.Time = tail, flight, t0.Add(time.Duration(min*float64(time.Minute)))
		return r
	}
	recs := []feed.Record{
		mk("A", "A1", 0), mk("B", "B1", 5), mk("A", "A1", 20), mk("A", "A1", 40),
		mk("A", "A2", 600), mk("B", "B1", 610), mk("A", "A2", 630), mk("A", "A2", 700),
	}
	s := newFlightScreen(NewStyles(DefaultTheme))
	s.SetSize(100, 30)
	s.Replay(d.Roster, d.Config, "A", "A1", recs, 0, math.NaN())
	s.seek(7) // up to A2's second snapshot
	played, last := s.flightSpan()
	if want := []int{4, 6}; !slices.Equal(played, want) {
		t.Errorf("played %v, want A2's %v", played, want)
	}
	if want := t0.Add(700 * time.Minute); !last.Equal(want) {
		t.Errorf("flight ends %v, want %v", last, want)
	}
	v := s.View()
	if !strings.Contains(v, "Flight A2 · A") {
		t.Errorf("header does not name the current flight:\n%s", v)
	}
	if strings.Contains(v, "600 min") || !strings.Contains(v, "min") {
		t.Errorf("chart should span A2 (100 min), not the whole replay:\n%s", v)
	}
	s.seek(6)
	if played, _ := s.flightSpan(); len(played) != 1 || !strings.Contains(s.View(), "first snapshot of this flight") {
		t.Errorf("B's snapshot inside A2: played %v\n%s", played, s.View())
	}
}

// The Flight screen says where the thrust came from: fan speed, with the
// engine deviation apart, or fuel flow, when the drag includes engine
// effects.
func TestFlightThrustSource(t *testing.T) {
	d := demoFleet(t)
	tail := d.Fleet.Tails[0].Tail
	ty := d.TypeOf(tail)
	recs := append([]feed.Record(nil), d.Records[tail][:2]...)
	recs[0].Snap.N1, recs[1].Snap.N1 = 83.5, 0 // the second on fuel flow
	s := newFlightScreen(NewStyles(DefaultTheme))
	s.SetSize(100, 30)
	s.Replay(model.SingleType(ty), d.Config, "T", "F", recs, 0, math.NaN())
	want := model.Analyze(ty, recs[0].Snap)
	if l, ok := lineWith(s.View(), "thrust from fan speed"); !ok || !strings.Contains(l, fmt.Sprintf("engine %+.2f %%", want.EngineDevPct)) {
		t.Errorf("fan speed snapshot: %q\n%s", l, s.View())
	}
	s.seek(2)
	if _, ok := lineWith(s.View(), "thrust from fuel flow: drag includes engine effects"); !ok {
		t.Errorf("snapshot without N1:\n%s", s.View())
	}
}

// The drag split bars use a glyph per part, so the parts show without
// colour.
func TestFlightBarsGlyphs(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	press(m, "enter", "enter")
	v := m.View()
	for _, g := range []string{glyphInduced, glyphWave, glyphParasite} {
		l, ok := lineWith(v, "baseline ")
		if !ok || !strings.Contains(l, g) {
			t.Errorf("baseline bar lacks %q:\n%s", g, v)
		}
	}
	if l, _ := lineWith(v, "induced "); !strings.Contains(l, glyphInduced+" induced") || !strings.Contains(l, glyphExcess+" excess") {
		t.Errorf("legend without glyphs: %q", l)
	}
}

// Opened from replay, Fleet and Tail say why they are empty.
func TestReplayOnlyScreensSayWhy(t *testing.T) {
	d := demoFleet(t)
	m := New(t.Context(), nil, nil, WithReplay(d.Roster, d.Config, d.Records[d.Fleet.Tails[0].Tail][:3], 0))
	m.Update(tea.WindowSizeMsg{Width: 80, Height: 24})
	for _, scr := range []int{scrFleet, scrTail} {
		m.activate(scr)
		if v := m.View(); !strings.Contains(v, "no fleet is loaded") {
			t.Errorf("screen %d under replay:\n%s", scr, v)
		}
	}
}
