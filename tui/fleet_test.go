package tui

import (
	"fmt"
	"math"
	"strings"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
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

// Runes that arrive in one read ("jjj", as fast typing or tmux send-keys
// gives them) are taken as one key each; a paste into the filter stays
// whole.
func TestRunesArriveTogether(t *testing.T) {
	m := sized(demoFleet(t), 80, 24)
	m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("jjj")})
	if m.fleet.cursor != 3 {
		t.Errorf("cursor %d after \"jjj\" in one message, want 3", m.fleet.cursor)
	}
	m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("/DD1")})
	if !m.fleet.Capturing() || m.fleet.filter.Value() != "DD1" {
		t.Errorf("\"/DD1\" in one message: capturing %v, filter %q", m.fleet.Capturing(), m.fleet.filter.Value())
	}
	m.Update(tea.KeyMsg{Type: tea.KeyRunes, Runes: []rune("0q"), Paste: true})
	if m.fleet.filter.Value() != "DD10q" {
		t.Errorf("pasted \"0q\": filter %q", m.fleet.filter.Value())
	}
}

// lineWith returns the first line of v that contains s.
func lineWith(v, s string) (string, bool) {
	for _, l := range strings.Split(v, "\n") {
		if strings.Contains(l, s) {
			return l, true
		}
	}
	return "", false
}

// Without colour (the tests' ASCII profile is what NO_COLOR gives), the
// selected row still shows: it starts with the selection marker, and only
// it does.
func TestFleetSelectionWithoutColour(t *testing.T) {
	m := sized(demoFleet(t), 80, 24)
	press(m, "down", "down")
	want, _ := m.fleet.selected()
	v := m.View()
	if n := strings.Count(v, selMark); n != 1 {
		t.Fatalf("%d selection markers:\n%s", n, v)
	}
	l, _ := lineWith(v, selMark)
	if !strings.HasPrefix(l, selMark+want) {
		t.Errorf("marked row %q, selected %s", l, want)
	}
	press(m, "enter")
	if m.tail.a.Tail != want {
		t.Errorf("enter opened %s, the marked row is %s", m.tail.a.Tail, want)
	}
}

// The column header fits 80 and 100 columns whole, with the units and
// periods of its columns.
func TestFleetHeaderUnits(t *testing.T) {
	for _, w := range []int{80, 100} {
		m := sized(demoFleet(t), w, 24)
		v := checkFrame(t, m, w, 24)
		h1, ok1 := lineWith(v, "last step")
		h2, ok2 := lineWith(v, "pp/100d")
		if !ok1 || !ok2 {
			t.Fatalf("%d columns: no two-line header:\n%s", w, v)
		}
		for _, s := range []string{"tail", "level", "drift", "fuel", "flags"} {
			if !strings.Contains(h1, s) {
				t.Errorf("%d columns: header %q lacks %q", w, h1, s)
			}
		}
		for _, s := range []string{"% 30d", "pp/100d", "t/yr"} {
			if !strings.Contains(h2, s) {
				t.Errorf("%d columns: units %q lack %q", w, h2, s)
			}
		}
		if strings.Contains(h1, "…") || strings.Contains(h2, "…") {
			t.Errorf("%d columns: header cut: %q / %q", w, h1, h2)
		}
	}
}

// s cycles the order; Home and End go to the first and last rows.
func TestFleetSortHomeEnd(t *testing.T) {
	m := sized(demoFleet(t), 100, 30)
	rows := func() []string {
		var out []string
		for _, a := range m.fleet.rows {
			out = append(out, a.Tail)
		}
		return out
	}
	press(m, "s") // by tail
	if got := rows(); !sortedStrings(got) {
		t.Errorf("by tail: %v", got)
	}
	press(m, "s") // by deviation, largest first, NaN last
	prev := math.Inf(1)
	for _, a := range m.fleet.rows {
		if !math.IsNaN(a.RecentPct) && a.RecentPct > prev {
			t.Fatalf("by deviation: %s %+.2f after %+.2f", a.Tail, a.RecentPct, prev)
		}
		if !math.IsNaN(a.RecentPct) {
			prev = a.RecentPct
		}
	}
	if !strings.Contains(m.View(), "by deviation") {
		t.Error("the order is not named on screen")
	}
	press(m, "end")
	if m.fleet.cursor != len(m.fleet.rows)-1 {
		t.Errorf("end: cursor %d of %d", m.fleet.cursor, len(m.fleet.rows))
	}
	press(m, "home")
	if m.fleet.cursor != 0 {
		t.Errorf("home: cursor %d", m.fleet.cursor)
	}
	for range fleetOrders { // on round to severity (the type order only with several types)
		if fleetOrders[m.fleet.order].name == "severity" {
			break
		}
		press(m, "s")
	}
	if got, want := rows()[0], m.data.Fleet.Tails[0].Tail; got != want {
		t.Errorf("severity order starts with %s, want %s", got, want)
	}
}

func sortedStrings(s []string) bool {
	for i := 1; i < len(s); i++ {
		if s[i] < s[i-1] {
			return false
		}
	}
	return true
}

// A tail name from the data cannot drive the terminal.
func TestFleetCleansNames(t *testing.T) {
	d := smallData(t, 2, 20)
	d.Fleet.Tails[0].Tail = "EV\x1b[2J\x07IL"
	m := sized(d, 100, 30)
	v := m.View()
	if strings.ContainsAny(v, "\x1b\x07") {
		t.Errorf("control characters reached the screen: %q", v)
	}
	if !strings.Contains(v, "EV[2JIL") {
		t.Errorf("cleaned name missing:\n%s", v)
	}
	if w := lipgloss.Width(v); w > 100 {
		t.Errorf("width %d", w)
	}
}

// With fan speed on some tails, the Fleet screen shows each tail's engine
// level beside its airframe level, n/a for a tail on fuel flow, and still
// fits 80 columns.
func TestFleetEngineColumn(t *testing.T) {
	r, fan := engineResult(t)
	e, _ := r.EngineTail(fan)
	m := sized(NewData("test", r), 80, 24)
	v := checkFrame(t, m, 80, 24)
	if h, _ := lineWith(v, "last step"); !strings.Contains(h, "engine") {
		t.Errorf("header without the engine column: %q", h)
	}
	for _, a := range r.Fleet.Tails {
		l, _ := lineWith(v, a.Tail)
		want := "n/a"
		if a.Tail == fan {
			want = fmtSigned(e.RecentPct, 2)
		}
		if !strings.Contains(l, want) {
			t.Errorf("%s: row %q lacks %q", a.Tail, l, want)
		}
	}
}

// engineResult is a small demo fleet on the thrust-table twin whose first
// tail has fan speed on every snapshot (so an engine series) and the
// others none.
func engineResult(t *testing.T) (*pipeline.Result, string) {
	t.Helper()
	ty, err := feed.LoadType("../testdata/types/twin_thrust.toml")
	if err != nil {
		t.Fatal(err)
	}
	d, err := demo.NewFleet(demo.Config{Tails: 3, Days: 60, Seed: 5, Type: ty})
	if err != nil {
		t.Fatal(err)
	}
	recs := append([]feed.Record(nil), d.Records...)
	fan := recs[0].Tail
	for i := range recs {
		recs[i].Snap.N1 = 0 // the others on fuel flow
		if recs[i].Tail == fan {
			recs[i].Snap.N1 = 83.5
		}
	}
	r := pipeline.FromRecords(recs, d.Stats, pipeline.Input{Type: ty, Config: model.DefaultTrendConfig(), KeepRecords: true})
	if _, ok := r.EngineTail(fan); !ok {
		t.Fatal("no engine series")
	}
	return r, fan
}

// TestFleetTypeColumn: with a fleet file of several types the Fleet screen
// shows each tail's type, filters on it and groups by it.
func TestFleetTypeColumn(t *testing.T) {
	roster, err := feed.LoadFleet("../testdata/fleets/mixed/fleet.toml")
	if err != nil {
		t.Fatal(err)
	}
	d, err := demo.NewFleet(demo.Config{Tails: 3, Days: 60, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	// The demo's tails renamed onto the fleet file's tails.
	names := map[string]string{}
	want := []string{"DT101", "DT102", "WB201"}
	recs := append([]feed.Record(nil), d.Records...)
	for i := range recs {
		if _, ok := names[recs[i].Tail]; !ok {
			names[recs[i].Tail] = want[len(names)]
		}
		recs[i].Tail = names[recs[i].Tail]
	}
	r := pipeline.FromRecords(recs, d.Stats, pipeline.Input{Roster: roster, Config: model.DefaultTrendConfig(), KeepRecords: true})
	m := sized(NewData("test", r), 100, 30)
	v := checkFrame(t, m, 100, 30)
	if h, _ := lineWith(v, "last step"); !strings.Contains(h, "type") {
		t.Errorf("header without the type column: %q", h)
	}
	for tail, typ := range map[string]string{"DT101": "DT", "WB201": "WB"} {
		if l, _ := lineWith(v, tail); !strings.Contains(l, tail+"   "+typ+" ") {
			t.Errorf("%s: row %q without its type %s", tail, l, typ)
		}
	}
	press(m, "/", "w", "b", "enter")
	v = checkFrame(t, m, 100, 30)
	if _, ok := lineWith(v, "WB201"); !ok {
		t.Errorf("filter by type lost WB201:\n%s", v)
	}
	if _, ok := lineWith(v, "DT101"); ok {
		t.Errorf("filter by type kept DT101:\n%s", v)
	}
}

// The Fleet header counts the engine series' flagged tails beside the
// airframe's.
func TestFleetHeaderEngineFlags(t *testing.T) {
	d := demoFleet(t)
	if d.Engine.Flagged == 0 {
		t.Fatal("the built-in demo has no flagged engine series")
	}
	m := sized(d, 100, 30)
	want := fmt.Sprintf("%d flagged · engines %d flagged", d.Fleet.Flagged, d.Engine.Flagged)
	if _, ok := lineWith(checkFrame(t, m, 100, 30), want); !ok {
		t.Errorf("header without %q", want)
	}
}
