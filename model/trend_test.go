package model

import (
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
	"time"
	"unsafe"
)

var day0 = time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)

// testFlights names the flights of the tests' points.
var testFlights = NewFlightNames()

// series makes one point per flight, two flights a day, with deviation
// f(day) plus normal noise sigma.
func series(nDays int, sigma float64, seed uint64, f func(d float64) float64) []TrendPoint {
	rng := rand.New(rand.NewPCG(seed, 1))
	var pts []TrendPoint
	for d := 0; d < nDays; d++ {
		for k := 0; k < 2; k++ {
			t := day0.Add(time.Duration(d*24+6+8*k) * time.Hour)
			x := float64(d) + float64(6+8*k)/24
			pts = append(pts, TrendPoint{UnixNano: t.UnixNano(), Flight: testFlights.ID("F" + string(rune('A'+k))), DevPct: f(x) + sigma*rng.NormFloat64(), FuelFlowExpected: 0.7})
		}
	}
	return pts
}

// Theil–Sen: the slope of an exact line is exact and its interval has no
// width; one wild point does not move it (its breakdown point is 29 %,
// Sen 1968); on noisy lines the 95 % interval covers the true slope about
// 95 % of the time.
func TestTheilSen(t *testing.T) {
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}
	y := make([]float64, len(x))
	for i := range x {
		y[i] = 3 - 0.5*x[i]
	}
	s := TheilSen(x, y, 0.95)
	if s.Slope != -0.5 || s.Lo != -0.5 || s.Hi != -0.5 || s.Intercept != 3 {
		t.Errorf("exact line: %+v, want slope -0.5 and Sen's intercept 3", s)
	}
	y[9] = 1000
	if s := TheilSen(x, y, 0.95); math.Abs(s.Slope+0.5) > 1e-12 {
		t.Errorf("with an outlier: slope %g, want -0.5", s.Slope)
	}
	if s := TheilSen(x[:2], y[:2], 0.95); !math.IsNaN(s.Slope) {
		t.Errorf("two points should give NaN, got %+v", s)
	}
	rng := rand.New(rand.NewPCG(42, 0))
	covered, trials := 0, 400
	for k := 0; k < trials; k++ {
		xs, ys := make([]float64, 40), make([]float64, 40)
		for i := range xs {
			xs[i] = float64(i)
			ys[i] = 0.2*xs[i] + rng.NormFloat64()
		}
		if s := TheilSen(xs, ys, 0.95); s.Lo <= 0.2 && 0.2 <= s.Hi {
			covered++
		}
	}
	if share := float64(covered) / float64(trials); share < 0.92 || share > 0.985 {
		t.Errorf("95 %% interval covered the true slope in %.1f %% of trials", 100*share)
	}
}

// The noise estimate from successive differences ignores steps and slow
// drifts (Rousseeuw & Croux 1993: MAD scaled by 1.4826 estimates σ for
// normal data).
func TestNoiseSigma(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 0))
	y := make([]float64, 4000)
	for i := range y {
		y[i] = 0.8*rng.NormFloat64() + 0.001*float64(i)
		if i > 2000 {
			y[i] += 5
		}
	}
	if s := NoiseSigma(y); math.Abs(s-0.8) > 0.05 {
		t.Errorf("σ = %.3f, want 0.8", s)
	}
}

func TestSegmentLines(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 0))
	n := 300
	x, step, line := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = float64(i)
		e := 0.5 * rng.NormFloat64()
		step[i] = e
		if i >= 120 {
			step[i] += 3
		}
		line[i] = 0.02*x[i] + e
	}
	pen := 8 * 0.25 * math.Log(float64(n))
	tests := []struct {
		name   string
		y      []float64
		forced []int
		want   []int
	}{
		{"one step at 120", step, nil, []int{120}},
		{"a straight line has no boundary", line, nil, nil},
		{"a forced boundary stays", line, []int{200}, []int{200}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := SegmentLines(x, tc.y, 20, pen, tc.forced)
			if len(got) != len(tc.want) {
				t.Fatalf("boundaries %v, want %v", got, tc.want)
			}
			for i := range got {
				if d := got[i] - tc.want[i]; d < -2 || d > 2 {
					t.Errorf("boundary %d, want %d ± 2", got[i], tc.want[i])
				}
			}
		})
	}
}

func TestFlights(t *testing.T) {
	pts := []TrendPoint{
		{UnixNano: day0.UnixNano(), Flight: testFlights.ID("A"), DevPct: 1},
		{UnixNano: day0.Add(20 * time.Minute).UnixNano(), Flight: testFlights.ID("A"), DevPct: 3},
		{UnixNano: day0.Add(40 * time.Minute).UnixNano(), Flight: testFlights.ID("A"), DevPct: 2},
		{UnixNano: day0.Add(3 * time.Hour).UnixNano(), Flight: testFlights.ID("B"), DevPct: 5},
		{UnixNano: day0.Add(24 * time.Hour).UnixNano(), Flight: testFlights.ID("B"), DevPct: 7}, // same name, next day
	}
	f := Flights(pts, 6)
	if len(f) != 3 || f[0].DevPct != 2 || f[0].N != 3 || f[1].DevPct != 5 || f[2].DevPct != 7 {
		t.Errorf("flights %+v", f)
	}
	if len(f) == 3 && (testFlights.Name(f[1].Flight) != "B" || !f[2].At().Equal(day0.Add(24*time.Hour))) {
		t.Errorf("flight 2 is %q, flight 3 at %v", testFlights.Name(f[1].Flight), f[2].At())
	}
}

func TestNewFlight(t *testing.T) {
	tests := []struct {
		name   string
		prev   string
		after  time.Duration
		flight string
		want   bool
	}{
		{"same id, 20 min later", "A", 20 * time.Minute, "A", false},
		{"same id, exactly the gap", "A", 6 * time.Hour, "A", false},
		{"same id, past the gap", "A", 6*time.Hour + time.Minute, "A", true},
		{"new id at once", "A", time.Minute, "B", true},
		{"no ids, close", "", time.Hour, "", false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := NewFlight(tc.prev, day0, tc.flight, day0.Add(tc.after), 6); got != tc.want {
				t.Errorf("NewFlight = %v, want %v", got, tc.want)
			}
		})
	}
}

// Small hand-made tails with known answers (DESIGN.md §4.8).
func TestAnalyzeTrend(t *testing.T) {
	c := DefaultTrendConfig()
	stepDay := 150.0
	tests := []struct {
		name      string
		pts       []TrendPoint
		recent    float64 // want ± 0.2
		drift     float64 // pp/100 d ± 0.2; NaN for none
		steps     []float64
		stepDates []float64 // days after day0
	}{
		{"flat", series(300, 0.6, 1, func(float64) float64 { return 0.5 }), 0.5, 0, nil, nil},
		{"step of 3 pp at day 150", series(300, 0.6, 2, func(d float64) float64 {
			if d >= stepDay {
				return 3
			}
			return 0
		}), 3, 0, []float64{3}, []float64{stepDay}},
		{"drift 1.2 pp/100 d is growth, not a step", series(400, 0.6, 3, func(d float64) float64 { return 0.012 * d }), 0.012 * 385, 1.2, nil, nil},
		{"drift from day 150 on", series(400, 0.6, 4, func(d float64) float64 { return 0.01 * max(0, d-150) }), 0.01 * 235, 1.0, nil, nil},
		// A long flat run, then a drift: segmentation may place a boundary
		// well before the drift starts, but that is no step.
		{"flat 420 days, then a drift of 1.2 pp/100 d", series(660, 0.6, 6, func(d float64) float64 { return 0.012 * max(0, d-420) }), 0.012 * 225, 1.2, nil, nil},
		{"too short for a drift", series(40, 0.6, 5, func(float64) float64 { return 1 }), 1, math.NaN(), nil, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tr := AnalyzeTrend("T1", tc.pts, nil, testFlights, nil, c)
			if math.Abs(tr.RecentPct-tc.recent) > 0.25 {
				t.Errorf("recent level %.2f, want %.2f", tr.RecentPct, tc.recent)
			}
			if math.IsNaN(tc.drift) != math.IsNaN(tr.Drift.Slope) || math.Abs(tr.Drift.Slope-tc.drift) > 0.2 {
				t.Errorf("drift %.2f [%.2f, %.2f], want %.2f", tr.Drift.Slope, tr.Drift.Lo, tr.Drift.Hi, tc.drift)
			}
			if len(tr.Steps) != len(tc.steps) {
				t.Fatalf("steps %+v, want sizes %v", tr.Steps, tc.steps)
			}
			for i, s := range tr.Steps {
				if math.Abs(s.SizePct-tc.steps[i]) > 0.3 || math.Abs(days(s.Time, day0)-tc.stepDates[i]) > 2 {
					t.Errorf("step %+.2f on day %.1f, want %+.2f on day %.0f", s.SizePct, days(s.Time, day0), tc.steps[i], tc.stepDates[i])
				}
			}
			if tr.Flights == nil || tr.Points != len(tc.pts) {
				t.Errorf("points %d, flights %d", tr.Points, len(tr.Flights))
			}
		})
	}
}

// A step at an event is dated at the event and carries it; after a step the
// drift window restarts.
func TestAnalyzeTrendEvent(t *testing.T) {
	pts := series(300, 0.5, 9, func(d float64) float64 {
		if d >= 200 {
			return 0
		}
		return 4
	})
	ev := []Event{{Time: day0.Add(200 * 24 * time.Hour), Kind: "repair", Note: "seal replaced"}}
	// Details on an exact polar CD − wave = 0.02 + 0.04 CL², at one cruise.
	det := make([]PointDetail, len(pts))
	for i := range det {
		cl := 0.4 + 0.1*float32(i%3)
		det[i] = PointDetail{CL: cl, CDLessWave: 0.02 + 0.04*cl*cl, Weight: 60000, Altitude: 11000, Mach: 0.78, ISADev: 5}
	}
	tr := AnalyzeTrend("T1", pts, det, testFlights, ev, DefaultTrendConfig())
	if len(tr.Steps) != 1 || tr.Steps[0].Event == nil || tr.Steps[0].Event.Kind != "repair" || math.Abs(tr.Steps[0].SizePct+4) > 0.3 {
		t.Fatalf("steps %+v", tr.Steps)
	}
	if !tr.DriftFrom.Equal(tr.Steps[0].Time) {
		t.Errorf("drift window from %v, want the step at %v", tr.DriftFrom, tr.Steps[0].Time)
	}
	// The tail's own polar is fitted over the current segment: from the
	// repair on, not over the whole history.
	if tr.PolarFrom.Before(ev[0].Time) || tr.PolarFrom.After(tr.Steps[0].Time) {
		t.Errorf("polar fitted from %v, want from the repair at %v (or its step at %v)", tr.PolarFrom, ev[0].Time, tr.Steps[0].Time)
	}
	if tr.PolarErr != nil || math.Abs(tr.Polar.CD0-0.02) > 1e-6 || math.Abs(tr.Polar.K-0.04) > 1e-5 {
		t.Errorf("own polar CD0 %g, k %g (%v), want 0.02, 0.04", tr.Polar.CD0, tr.Polar.K, tr.PolarErr)
	}
	if tr.Typical != (Cruise{Weight: 60000, Altitude: 11000, Mach: float64(float32(0.78)), ISADev: 5}) {
		t.Errorf("typical cruise %+v", tr.Typical)
	}
	// Without details: the same trend, no polar and no typical cruise.
	bare := AnalyzeTrend("T1", pts, nil, testFlights, ev, DefaultTrendConfig())
	if bare.PolarErr == nil || !math.IsNaN(bare.Typical.Weight) || bare.RecentPct != tr.RecentPct || len(bare.Steps) != 1 {
		t.Errorf("without details: polar error %v, typical %+v, recent %g (with: %g)", bare.PolarErr, bare.Typical, bare.RecentPct, tr.RecentPct)
	}
}

// The drift line is Sen's line through the daily medians: on a noiseless
// drift of 1 pp per 100 days it reproduces the series itself.
func TestDriftLine(t *testing.T) {
	pts := series(200, 0, 1, func(d float64) float64 { return 0.5 + 0.01*d })
	tr := AnalyzeTrend("T1", pts, nil, testFlights, nil, DefaultTrendConfig())
	if math.Abs(tr.Drift.Slope-1) > 1e-9 {
		t.Fatalf("drift %+v, want 1 pp/100 d", tr.Drift)
	}
	for _, f := range []FlightPoint{tr.Flights[len(tr.Flights)/2], tr.Flights[len(tr.Flights)-1]} {
		if got := tr.DriftAt(f.At()); math.Abs(got-f.DevPct) > 1e-6 {
			t.Errorf("drift line at %v = %g, want the flight's %g", f.At(), got, f.DevPct)
		}
	}
	rolling := tr.Rolling()
	if len(rolling) != len(tr.Flights) {
		t.Fatalf("%d rolling medians of %d flights", len(rolling), len(tr.Flights))
	}
	if r := rolling[50]; math.Abs(r-tr.Flights[50].DevPct) > 0.01 {
		t.Errorf("rolling median of a straight line = %g, want about %g", r, tr.Flights[50].DevPct)
	}
}

// No panic and clear answers for a tail with one flight, a tail with all
// points excluded, and an empty fleet.
func TestTrendEdgeCases(t *testing.T) {
	c := DefaultTrendConfig()
	one := AnalyzeTrend("ONE", []TrendPoint{{UnixNano: day0.UnixNano(), Flight: testFlights.ID("A"), DevPct: 1.5, FuelFlowExpected: 0.6}}, nil, testFlights, nil, c)
	if one.Points != 1 || len(one.Flights) != 1 || one.RecentPct != 1.5 || !math.IsNaN(one.Drift.Slope) || len(one.Steps) != 0 {
		t.Errorf("one flight: %+v", one)
	}
	bad := AnalyzeTrend("BAD", []TrendPoint{{UnixNano: day0.UnixNano(), DevPct: 40}, {UnixNano: day0.UnixNano(), DevPct: 1, Manoeuvre: ManoeuvreBank}}, nil, testFlights, nil, c)
	if bad.Points != 0 || bad.Excluded[ExcludeImplausible] != 1 || bad.Excluded[ExcludeBank] != 1 || !math.IsNaN(bad.RecentPct) {
		t.Errorf("all excluded: %+v", bad)
	}
	f := AssessFleet([]TailTrend{one, bad}, c)
	if len(f.Tails) != 2 || f.Flagged != 0 || f.Tails[0].Tail != "ONE" {
		t.Errorf("fleet %+v", f)
	}
	if e := AssessFleet(nil, c); len(e.Tails) != 0 || !math.IsNaN(e.MedianRecentPct) {
		t.Errorf("empty fleet %+v", e)
	}
}

func TestAssessFleet(t *testing.T) {
	c := DefaultTrendConfig()
	c.FuelPrice = 0.8
	nan := math.NaN()
	mk := func(tail string, recent, drift, lo float64, steps ...float64) TailTrend {
		tr := TailTrend{Tail: tail, RecentPct: recent, FuelFlowExpected: 0.7, Drift: Slope{Slope: drift, Lo: lo, Hi: drift + 1}}
		for i, s := range steps {
			tr.Steps = append(tr.Steps, Step{Time: day0.Add(time.Duration(i) * 24 * time.Hour), SizePct: s})
		}
		return tr
	}
	f := AssessFleet([]TailTrend{
		mk("A", 0.0, 0.1, -0.1), mk("B", 0.2, 0, -0.2), mk("C", -0.1, nan, nan),
		mk("HIGH", 2.5, 0, -0.1),
		mk("GROW", 1.0, 0.7, 0.2),            // 0.7 × 1.8 = 1.26 pp over 180 d
		mk("SLOW", 0.5, 0.5, 0.1),            // 0.9 pp: not enough
		mk("WIDE", 0.5, 0.9, -0.1),           // interval holds zero
		mk("STEP", 1.5, 0, -0.1, 1.6),        // a step still there
		mk("FIXED", 0.1, 0, -0.1, 2.0, -1.9), // stepped, then repaired
		mk("BETTER", -1.5, 0, -0.1, -1.4),    // an improvement
	}, c)
	want := map[string]string{"HIGH": "[level]", "GROW": "[growth]", "STEP": "[step]"}
	for _, a := range f.Tails {
		if got := fmtFlags(a.Flags); got != orEmpty(want[a.Tail]) {
			t.Errorf("%s: flags %s, want %s", a.Tail, got, orEmpty(want[a.Tail]))
		}
	}
	if f.Flagged != 3 || f.Tails[0].Tail != "HIGH" {
		t.Errorf("flagged %d, first %s", f.Flagged, f.Tails[0].Tail)
	}
	for _, a := range f.Tails {
		switch a.Tail {
		case "HIGH":
			// 2.5 % of 0.7 kg/s (2,520 kg/h) over 2,500 h = 157,500 kg;
			// CO2 × 3.16 (ICAO); money at 0.8 per kg.
			if math.Abs(a.ExcessFuel-157500) > 1e-6 || math.Abs(a.CO2-3.16*157500) > 1e-3 || math.Abs(a.Money-0.8*157500) > 1e-6 {
				t.Errorf("cost %+v", a)
			}
		case "BETTER", "FIXED":
			if len(a.Improvements) != 1 {
				t.Errorf("%s: improvements %+v", a.Tail, a.Improvements)
			}
		}
	}
	// The fleet's total: the recent levels sum to 4.7 pp (0 + 0.2 − 0.1 +
	// 2.5 + 1.0 + 0.5 + 0.5 + 1.5 + 0.1 − 1.5), each pp 63,000 kg a year
	// (1 % of 2,520 kg/h over 2,500 h): 296,100 kg, net.
	if math.Abs(f.ExcessFuel-296100) > 1e-6 || math.Abs(f.CO2-3.16*296100) > 1e-3 || math.Abs(f.Money-0.8*296100) > 1e-6 {
		t.Errorf("fleet total %g kg, %g kg CO2, %g money", f.ExcessFuel, f.CO2, f.Money)
	}
	if e := AssessFleet(nil, c); !math.IsNaN(e.ExcessFuel) || !math.IsNaN(e.CO2) {
		t.Errorf("empty fleet total %g kg, want NaN", e.ExcessFuel)
	}
}

func fmtFlags(f []string) string {
	s := "["
	for i, x := range f {
		if i > 0 {
			s += " "
		}
		s += x
	}
	return s + "]"
}

func orEmpty(s string) string {
	if s == "" {
		return "[]"
	}
	return s
}

func TestRollingMedian(t *testing.T) {
	got := RollingMedian([]float64{1, 9, 2, 8, 3, 100, 4}, 1)
	want := []float64{5, 2, 8, 3, 8, 4, 52}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("RollingMedian = %v, want %v", got, want)
		}
	}
	if m := Median([]float64{3, 1, 2, 4}); m != 2.5 {
		t.Errorf("Median of 1…4 = %g, want 2.5", m)
	}
}

// A tail whose every snapshot is implausible (one engine's fuel flow gives
// about −55 %) has no level, and says why.
func TestTrendWhy(t *testing.T) {
	pts := series(40, 0.3, 2, func(float64) float64 { return -55 })
	tr := AnalyzeTrend("T1", pts, nil, testFlights, nil, DefaultTrendConfig())
	why := tr.Why()
	if !math.IsNaN(tr.RecentPct) || !strings.Contains(why, "all 80 snapshots left out") || !strings.Contains(why, "-55 %") ||
		!strings.Contains(why, "all engines") {
		t.Errorf("recent %g, why %q", tr.RecentPct, why)
	}
	f := AssessFleet([]TailTrend{tr}, DefaultTrendConfig())
	if !math.IsNaN(f.Tails[0].ExcessFuel) {
		t.Errorf("excess fuel %g without a level, want NaN (null in JSON)", f.Tails[0].ExcessFuel)
	}
	if ok := AnalyzeTrend("T2", series(40, 0.3, 2, func(float64) float64 { return 1 }), nil, testFlights, nil, DefaultTrendConfig()); ok.Why() != "" {
		t.Errorf("a tail with a level says %q", ok.Why())
	}
}

// A trend point stays compact, and holds no pointer for the garbage
// collector to follow: a year of a large fleet is millions of them.
func TestTrendPointSize(t *testing.T) {
	if typ := reflect.TypeFor[TrendPoint](); hasPointer(typ) {
		t.Errorf("TrendPoint holds a pointer")
	}
	if n := unsafe.Sizeof(TrendPoint{}); n > 48 {
		t.Errorf("TrendPoint is %d bytes, want at most 48", n)
	}
	if typ := reflect.TypeFor[PointDetail](); hasPointer(typ) || typ.Size() > 24 {
		t.Errorf("PointDetail is %d bytes or holds a pointer", typ.Size())
	}
}

// BenchmarkAnalyzeTrend: one tail of about 3,300 snapshots (550 days, two
// flights a day, three snapshots a flight) with a drift and a step, the
// shape of an airline export; points/s over the whole trend (flights,
// rolling median, steps, drift, own polar).
func BenchmarkAnalyzeTrend(b *testing.B) {
	base := series(550, 0.6, 3, func(d float64) float64 {
		if d > 300 {
			return 2 + 0.01*(d-300)
		}
		return 0.2
	})
	var pts []TrendPoint
	var det []PointDetail
	for _, p := range base { // three snapshots a flight
		for k := 0; k < 3; k++ {
			q := p
			q.UnixNano = p.UnixNano + int64(time.Duration(20*k)*time.Minute)
			pts = append(pts, q)
			det = append(det, PointDetail{CL: 0.5 + 0.01*float32(k), CDLessWave: 0.028 + 0.0005*float32(k)})
		}
	}
	c := DefaultTrendConfig()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		AnalyzeTrend("T", pts, det, testFlights, nil, c)
	}
	b.ReportMetric(float64(len(pts)*b.N)/b.Elapsed().Seconds(), "points/s")
}

// hasPointer reports whether a value of typ holds a pointer (a string, a
// slice, a map, a time.Time's location…).
func hasPointer(typ reflect.Type) bool {
	switch typ.Kind() {
	case reflect.Struct:
		for i := range typ.NumField() {
			if hasPointer(typ.Field(i).Type) {
				return true
			}
		}
		return false
	case reflect.Array:
		return hasPointer(typ.Elem())
	case reflect.Bool, reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Float32, reflect.Float64:
		return false
	}
	return true
}

// The trend's buffers are reused from one tail to the next (the arena of a
// pooled scratch): a tail analysed after a larger and a smaller one has
// the trend it has on its own, with the public functions' (fresh buffers)
// slope and noise.
func TestAnalyzeTrendReusesBuffers(t *testing.T) {
	c := DefaultTrendConfig()
	tails := []struct {
		name string
		pts  []TrendPoint
	}{
		{"step", series(300, 0.6, 2, func(d float64) float64 { return 3 * math.Floor(d/150) })},
		{"long drift", series(900, 0.6, 3, func(d float64) float64 { return 0.012 * d })},
		{"short", series(70, 0.4, 5, func(float64) float64 { return 1 })},
	}
	alone := make([]TailTrend, len(tails))
	for i, tc := range tails {
		alone[i] = AnalyzeTrend(tc.name, append([]TrendPoint(nil), tc.pts...), nil, testFlights, nil, c)
	}
	for round := 0; round < 3; round++ {
		for i, tc := range tails {
			got := AnalyzeTrend(tc.name, append([]TrendPoint(nil), tc.pts...), nil, testFlights, nil, c)
			if g, w := fmt.Sprintf("%+v", got), fmt.Sprintf("%+v", alone[i]); g != w { // NaN-safe, unlike reflect.DeepEqual
				t.Errorf("round %d, %s: trend differs from the tail's alone:\n%s\n%s", round, tc.name, g, w)
			}
		}
	}
	// The drift is TheilSen's on the daily medians of its window.
	tr := alone[1]
	var x, y, day, dayX []float64
	cur := math.Inf(-1)
	for _, f := range tr.Flights {
		if f.UnixNano < tr.DriftFrom.UnixNano() {
			continue
		}
		fx := daysNs(f.UnixNano, tr.First)
		if d := math.Floor(fx); d != cur {
			if len(day) > 0 {
				x, y = append(x, Median(dayX)), append(y, Median(day))
			}
			day, dayX, cur = day[:0], dayX[:0], d
		}
		day, dayX = append(day, f.DevPct), append(dayX, fx)
	}
	x, y = append(x, Median(dayX)), append(y, Median(day))
	if s := TheilSen(x, y, 0.95); 100*s.Slope != tr.Drift.Slope || 100*s.Lo != tr.Drift.Lo || 100*s.Hi != tr.Drift.Hi {
		t.Errorf("drift %+v, TheilSen of its daily medians %+v", tr.Drift, s)
	}
}

// EngineSeries keeps the points with an engine deviation, as their DevPct;
// AppendEngineSeries appends them to a buffer, left as it is when none has.
func TestEngineSeries(t *testing.T) {
	withEngine := func(dev, eng float64, has bool) TrendPoint {
		return TrendPoint{DevPct: dev, EngineDevPct: eng, HasEngine: has}
	}
	tests := []struct {
		name string
		pts  []TrendPoint
		want []float64 // DevPct of the engine series
	}{
		{"none has", []TrendPoint{withEngine(1, 0, false), withEngine(2, 0, false)}, nil},
		{"some have", []TrendPoint{withEngine(1, 5, true), withEngine(2, 0, false), withEngine(3, 7, true)}, []float64{5, 7}},
		{"empty", nil, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := EngineSeries(tt.pts)
			if len(tt.want) == 0 && got != nil {
				t.Errorf("EngineSeries = %v, want nil", got)
			}
			dst := []TrendPoint{withEngine(-1, -1, true)}
			app := AppendEngineSeries(dst, tt.pts)
			if app[0].DevPct != -1 || len(app) != 1+len(tt.want) {
				t.Fatalf("AppendEngineSeries = %+v: the buffer's point lost or wrong length", app)
			}
			for i, w := range tt.want {
				if got[i].DevPct != w || app[1+i].DevPct != w {
					t.Errorf("point %d: %g and %g, want %g", i, got[i].DevPct, app[1+i].DevPct, w)
				}
			}
		})
	}
}
