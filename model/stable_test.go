package model

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"
)

// stretch is a planted part of a recording: kind and length in seconds.
type stretch struct {
	kind string // steady, turn, climb, speed, turbulence, gap
	secs int
}

// recording makes a 1 Hz cruise recording of the planted stretches, with a
// little sensor noise, and returns each stretch's time span.
func recording(parts []stretch, seed uint64) ([]Sample, [][2]time.Time) {
	rng := rand.New(rand.NewPCG(seed, 9))
	t := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	alt, mach := 35000*Foot, 0.78
	var out []Sample
	var spans [][2]time.Time
	for _, p := range parts {
		start := t
		for k := 0; k < p.secs; k++ {
			if p.kind == "gap" {
				t = t.Add(time.Second)
				continue
			}
			tISA, _ := ISA(alt)
			s := Sample{Time: t, Weight: 65000 - float64(len(out))*0.6, Altitude: alt + rng.NormFloat64()*2*Foot,
				Mach: mach + rng.NormFloat64()*0.0004, SAT: tISA + 2 + rng.NormFloat64()*0.05,
				FuelFlow: 0.64 * (1 + rng.NormFloat64()*0.002), Bank: rng.NormFloat64() * 0.002, N1: 86 + rng.NormFloat64()*0.05}
			switch p.kind {
			case "turn":
				s.Bank = 20 * math.Pi / 180
			case "climb":
				alt += 1000 * Foot / 60 // 1,000 ft/min
			case "speed":
				mach += 0.04 / float64(p.secs)
			case "turbulence":
				s.Mach += rng.NormFloat64() * 0.006
				s.Altitude += rng.NormFloat64() * 60 * Foot
			}
			out = append(out, s)
			t = t.Add(time.Second)
		}
		spans = append(spans, [2]time.Time{start, t})
	}
	return out, spans
}

// Windows lie only inside the steady stretches (a few seconds of slack at
// their edges, where a window may reach into the sample that breaks it),
// and every steady stretch of 4 minutes or more holds at least one; a gap
// splits a steady stretch and no window bridges it.
func TestStableWindowsPlanted(t *testing.T) {
	parts := []stretch{{"steady", 900}, {"turn", 120}, {"steady", 360}, {"climb", 120}, {"steady", 600},
		{"speed", 40}, {"steady", 300}, {"turbulence", 180}, {"steady", 240}, {"steady", 200}, {"gap", 30}, {"steady", 200}}
	for _, seed := range []uint64{1, 2, 3} {
		s, spans := recording(parts, seed)
		c := DefaultStableCriteria()
		ws, left := StableWindows(s, c)
		if len(ws) == 0 {
			t.Fatal("no window")
		}
		// Steady stretches next to each other are one.
		for k := len(parts) - 1; k > 0; k-- {
			if parts[k].kind == "steady" && parts[k-1].kind == "steady" {
				spans[k-1][1] = spans[k][1]
				parts[k-1].secs += parts[k].secs
				parts, spans = append(parts[:k:k], parts[k+1:]...), append(spans[:k:k], spans[k+1:]...)
			}
		}
		covered := make([]bool, len(parts))
		const edge = 5 * time.Second // a window may reach a few seconds into the stretch that ends it
		for _, w := range ws {
			a, b := s[w.From].Time, s[w.To].Time
			inside := -1
			for k, sp := range spans {
				if parts[k].kind == "steady" && !a.Before(sp[0].Add(-edge)) && !b.After(sp[1].Add(edge)) {
					inside = k
				}
			}
			if inside < 0 {
				t.Errorf("seed %d: window %v … %v lies outside every steady stretch", seed, a.Format("15:04:05"), b.Format("15:04:05"))
				continue
			}
			covered[inside] = true
			if d := b.Sub(a).Seconds(); d < c.MinSeconds || d > c.MaxSeconds {
				t.Errorf("window of %.0f s", d)
			}
		}
		for k, p := range parts {
			if p.kind == "steady" && p.secs >= 240 && !covered[k] {
				t.Errorf("seed %d: steady stretch %d (%d s) has no window", seed, k, p.secs)
			}
		}
		if left[UnstableBank] < 100 || left[UnstableAltitude] <= 0 || left[UnstableMach] <= 0 {
			t.Errorf("time left out by criterion %v", left)
		}
	}
}

// The window's vertical speed is the slope of the geometric height and its
// acceleration the slope of TAS: known ramps come back.
func TestSnapshotOfRamps(t *testing.T) {
	t0 := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	const vsFpm, dMach = 40.0, 0.004 // over 200 s
	var s []Sample
	for k := 0; k <= 200; k++ {
		h := 35000*Foot + vsFpm*Foot/60*float64(k)
		tISA, _ := ISA(h)
		s = append(s, Sample{Time: t0.Add(time.Duration(k) * time.Second), Weight: 65000, Altitude: h,
			Mach: 0.78 + dMach*float64(k)/200, SAT: tISA, FuelFlow: 0.64, N1: 86})
	}
	w := SnapshotOf(s, Window{0, len(s) - 1})
	if got := w.Snap.VS / Foot * 60; math.Abs(got-vsFpm) > 0.01 {
		t.Errorf("vs %.3f ft/min, want %g (ISA: geometric = pressure)", got, vsFpm)
	}
	// TAS rises nearly linearly: its slope is the end-to-end rise over 200 s.
	tas := func(p Sample) float64 { return AirAt(p.Altitude, p.SAT).TAS(p.Mach) }
	if got, want := w.Snap.Accel, (tas(s[200])-tas(s[0]))/200; math.Abs(got-want) > 0.001*want {
		t.Errorf("accel %.5f m/s², want about %.5f", got, want)
	}
	if !w.Time.Equal(t0.Add(100*time.Second)) || w.Samples != 201 || w.Seconds != 200 || math.Abs(w.Snap.N1-86) > 1e-9 {
		t.Errorf("window %+v", w)
	}
	// 2 K warmer than ISA: the geometric rate is T/T_ISA times the pressure rate.
	for i := range s {
		s[i].SAT += 2
	}
	w = SnapshotOf(s, Window{0, len(s) - 1})
	tISA, _ := ISA(s[100].Altitude)
	if got, want := w.Snap.VS/Foot*60, vsFpm*(tISA+2)/tISA; math.Abs(got-want) > 0.01 {
		t.Errorf("warm: vs %.3f ft/min, want about %.3f", got, want)
	}
}

// BenchmarkStableWindows: samples a second through the window search (a
// 10-hour 1 Hz recording of steady stretches, turns and turbulence).
func BenchmarkStableWindows(b *testing.B) {
	var parts []stretch
	for k := 0; k < 40; k++ {
		parts = append(parts, stretch{"steady", 600}, stretch{"turn", 90}, stretch{"turbulence", 120})
	}
	s, _ := recording(parts, 5)
	c := DefaultStableCriteria()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		ws, _ := StableWindows(s, c)
		for _, w := range ws {
			SnapshotOf(s, w)
		}
	}
	b.ReportMetric(float64(len(s)*b.N)/b.Elapsed().Seconds(), "samples/s")
}

// StableReasons names, for each sample outside the windows, the criterion
// that ended the window started at it: the turn's samples say bank.
func TestStableReasons(t *testing.T) {
	s, spans := recording([]stretch{{"steady", 300}, {"turn", 120}, {"steady", 300}}, 4)
	ws, why := StableReasons(s, DefaultStableCriteria())
	if len(ws) < 2 || len(why) != len(s) {
		t.Fatalf("%d windows, %d reasons", len(ws), len(why))
	}
	for i, x := range s {
		inTurn := !x.Time.Before(spans[1][0]) && x.Time.Before(spans[1][1])
		if inTurn && why[i] != UnstableBank {
			t.Fatalf("turn sample %d: %s", i, UnstableNames[why[i]])
		}
	}
	for _, w := range ws {
		if why[w.From] != StableOK || why[w.To] != StableOK {
			t.Errorf("window %v: reasons %v %v", w, why[w.From], why[w.To])
		}
	}
}

// Samples minutes apart (snapshots, not a recording): no window, and the
// time between them is left out as gaps.
func TestStableWindowsGaps(t *testing.T) {
	t0 := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	var s []Sample
	for k := 0; k < 3; k++ {
		s = append(s, Sample{Time: t0.Add(time.Duration(20*k) * time.Minute), Mach: 0.78, Altitude: 10000, SAT: 220, FuelFlow: 0.6})
	}
	ws, left := StableWindows(s, DefaultStableCriteria())
	if len(ws) != 0 || left[UnstableGap] != 2400 || left[StableOK] != 0 {
		t.Errorf("windows %v, left %v", ws, left)
	}
}
