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
