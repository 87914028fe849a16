package tui

import (
	"math"
	"strings"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// recordingRecs is a 1 Hz recording: steady 300 s, a 20° turn of 120 s,
// steady 300 s.
func recordingRecs() []feed.Record {
	t0 := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	h := 35000 * model.Foot
	tISA, _ := model.ISA(h)
	var recs []feed.Record
	for k := 0; k < 720; k++ {
		bank := 0.0
		if k >= 300 && k < 420 {
			bank = 20 * math.Pi / 180
		}
		recs = append(recs, feed.Record{Time: t0.Add(time.Duration(k) * time.Second), Tail: "R1", Flight: "X1",
			Snap: model.Snapshot{Weight: 65000 - float64(k)*0.6, Altitude: h, Mach: 0.78, SAT: tISA + 2, FuelFlow: 0.64, Bank: bank}})
	}
	return recs
}

// A recording on the Flight screen: each sample says whether it lies in a
// stable window (and what the window's snapshot gives) or which criterion
// it breaks; a strip along the flight marks the windows.
func TestFlightStableWindows(t *testing.T) {
	s := newFlightScreen(NewStyles(DefaultTheme))
	s.SetSize(100, 30)
	s.Replay(model.SingleType(feed.DemoType()), model.DefaultTrendConfig(), "R1", "X1", recordingRecs(), 0, math.NaN())
	s.seek(100)
	v := s.View()
	if l, ok := lineWith(v, "stable window 1 of"); !ok || !strings.Contains(l, "its snapshot gives drag") {
		t.Errorf("steady sample:\n%s", v)
	}
	strip, ok := "", false
	for _, l := range strings.Split(v, "\n") {
		if strings.HasPrefix(l, "stable ") && strings.Contains(l, "█") {
			strip, ok = l, true
		}
	}
	if !ok || !strings.Contains(strip, "█") || !strings.Contains(strip, "·") || !strings.Contains(strip, "|") {
		t.Errorf("strip %q\n%s", strip, v)
	}
	s.seek(350)
	if _, ok := lineWith(s.View(), "not stable here: bank"); !ok {
		t.Errorf("turn sample:\n%s", s.View())
	}
	// snapshots (minutes apart) get no strip
	recs := recordingRecs()
	var sparse []feed.Record
	for i := 0; i < len(recs); i += 60 {
		sparse = append(sparse, recs[i])
	}
	s.Replay(model.SingleType(feed.DemoType()), model.DefaultTrendConfig(), "R1", "X1", sparse, 0, math.NaN())
	s.seek(5)
	if _, ok := lineWith(s.View(), "stable window"); ok {
		t.Errorf("snapshots taken for a recording:\n%s", s.View())
	}
}

// The built-in demo holds the demo's 1 Hz recordings: their flights replay
// on the Flight screen with their stable windows.
func TestDemoRecordingsReplay(t *testing.T) {
	d := demoFleet(t)
	found := 0
	for _, a := range d.Fleet.Tails {
		for _, f := range a.Flights {
			if !strings.HasPrefix(a.FlightName(f), "DDR") {
				continue
			}
			found++
			recs := d.FlightRecords(a.Tail, f)
			if len(recs) < 3000 {
				t.Fatalf("%s %s: %d records", a.Tail, a.FlightName(f), len(recs))
			}
			s := newFlightScreen(NewStyles(DefaultTheme))
			s.SetSize(100, 30)
			s.Replay(d.Roster, d.Config, a.Tail, a.FlightName(f), recs, 0, a.RecentPct)
			s.seek(len(recs) / 3)
			if _, ok := lineWith(s.View(), "stable window"); !ok {
				if _, ok := lineWith(s.View(), "not stable here"); !ok {
					t.Errorf("%s %s: no stability line\n%s", a.Tail, a.FlightName(f), s.View())
				}
			}
		}
	}
	if found != 2 {
		t.Errorf("%d recording flights in the built-in demo, want 2", found)
	}
}
