package model

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/stat/distuv"
)

// flightsEvery makes a per-flight series: one flight every step from
// start, value v(i, t).
func flightsEvery(start time.Time, step time.Duration, n int, v func(i int, t time.Time) float64) []FlightPoint {
	out := make([]FlightPoint, n)
	for i := range out {
		t := start.Add(time.Duration(i) * step)
		out[i] = FlightPoint{UnixNano: t.UnixNano(), DevPct: v(i, t), N: 3}
	}
	return out
}

// The ranks of the distribution-free interval for the median against the
// binomial tables (Conover, Practical Nonparametric Statistics, 3rd ed.,
// 1999, Table A3; the sums are P(B ≤ k) for B ~ Binomial(n, ½)): n = 6:
// x(1), x(6) (P(B ≤ 0) = 0.0156); n = 10: x(2), x(9) (P(B ≤ 1) = 0.0107,
// P(B ≤ 2) = 0.0547); n = 20: x(6), x(15) (P(B ≤ 5) = 0.0207, P(B ≤ 6) =
// 0.0577); n = 5: none at 95 % (P(B ≤ 0) = 0.03125).
func TestMedianInterval(t *testing.T) {
	tests := []struct {
		name   string
		n      int
		conf   float64
		lo, hi int // ranks from 1; 0: NaN
	}{
		{"n 5 is too few at 95 %", 5, 0.95, 0, 0},
		{"n 6", 6, 0.95, 1, 6},
		{"n 10", 10, 0.95, 2, 9},
		{"n 20", 20, 0.95, 6, 15},
		// at 90 % (α/2 = 0.05) too: P(B ≤ 5) ≤ 0.05 < P(B ≤ 6)
		{"n 20 at 90 %", 20, 0.90, 6, 15},
		// n = 30: P(B ≤ 9) = 0.0214, P(B ≤ 10) = 0.0494 (Conover Table A3)
		{"n 30", 30, 0.95, 10, 21},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			v := make([]float64, tc.n)
			for i := range v {
				v[i] = float64(i + 1) // x(k) = k
			}
			lo, hi := MedianInterval(v, tc.conf)
			if tc.lo == 0 {
				if !math.IsNaN(lo) || !math.IsNaN(hi) {
					t.Errorf("got %g … %g, want none", lo, hi)
				}
				return
			}
			if lo != float64(tc.lo) || hi != float64(tc.hi) {
				t.Errorf("got x(%g) … x(%g), want x(%d) … x(%d)", lo, hi, tc.lo, tc.hi)
			}
		})
	}
}

// The interval's coverage of a known median, by simulation: at least the
// nominal 95 % for any continuous distribution (the rank interval is
// conservative: 95.9 % exactly at n = 20, Conover §3.2).
func TestMedianIntervalCoverage(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, n := range []int{20, 47, 60} {
		hits, trials := 0, 4000
		for range trials {
			v := make([]float64, n)
			for i := range v {
				v[i] = rng.ExpFloat64() // skewed; median ln 2
			}
			sortFloats(v)
			lo, hi := MedianInterval(v, 0.95)
			if lo <= math.Ln2 && math.Ln2 <= hi {
				hits++
			}
		}
		if rate := float64(hits) / float64(trials); rate < 0.94 || rate > 0.985 {
			t.Errorf("n %d: coverage %.3f, want about 0.95 to 0.97", n, rate)
		}
	}
}

func sortFloats(v []float64) { insertionSort(v) }

func TestMonitorFactor(t *testing.T) {
	start := time.Date(2026, 1, 1, 6, 0, 0, 0, time.UTC)
	// two flights a day at +1.5 %, 0.2 of noise
	rng := rand.New(rand.NewPCG(1, 2))
	fl := flightsEvery(start, 12*time.Hour, 200, func(int, time.Time) float64 { return 1.5 + 0.2*rng.NormFloat64() })
	c := DefaultFactorConfig()
	end := fl[len(fl)-1].At()
	tests := []struct {
		name     string
		restarts []time.Time
		at       time.Time
		flights  int
		reason   string // a part of it; "" for a level
	}{
		{"30 days", nil, end, 61, ""}, // [end − 30 d, end] holds both ends
		{"a restart 20 days back cuts the window", []time.Time{end.Add(-20 * 24 * time.Hour)}, end, 41, ""},
		{"a restart 5 days back leaves too few", []time.Time{end.Add(-5 * 24 * time.Hour)}, end, 11, "since the step or event of"},
		{"a restart after the time is not used", []time.Time{end.Add(24 * time.Hour)}, end, 61, ""},
		{"a restart before the window is not used", []time.Time{start}, end, 61, ""},
		{"too few flights at the start", nil, start.Add(5 * 24 * time.Hour), 11, "flights in the window"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lv := MonitorFactor(fl, tc.restarts, tc.at, c)
			if lv.Flights != tc.flights {
				t.Errorf("%d flights, want %d", lv.Flights, tc.flights)
			}
			if tc.reason != "" {
				if lv.OK() || !strings.Contains(lv.Reason, tc.reason) {
					t.Errorf("level %g, reason %q, want none with %q", lv.Pct, lv.Reason, tc.reason)
				}
				return
			}
			// the median of noise 0.2 over 40+ flights is within 0.1 of 1.5
			if !lv.OK() || math.Abs(lv.Pct-1.5) > 0.1 || !(lv.Lo <= lv.Pct && lv.Pct <= lv.Hi) || lv.Hi-lv.Lo > 0.3 {
				t.Errorf("level %.3f (%.3f … %.3f), reason %q; want 1.5 ± 0.1 inside a narrow interval", lv.Pct, lv.Lo, lv.Hi, lv.Reason)
			}
		})
	}
}

func TestFactorHistory(t *testing.T) {
	start := time.Date(2026, 1, 10, 6, 0, 0, 0, time.UTC)
	fl := flightsEvery(start, 12*time.Hour, 2*100, func(i int, t time.Time) float64 { return float64(t.Month()) })
	h := FactorHistory(fl, nil, DefaultFactorConfig())
	// Jan 10 … Apr 19: the ends of January, February, March, then the last flight
	if len(h) != 4 {
		t.Fatalf("%d levels, want 4", len(h))
	}
	wantAt := []time.Time{time.Date(2026, 2, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC),
		time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC), fl[len(fl)-1].At().Add(time.Nanosecond)}
	wantPct := []float64{1, 2, 3, 4} // each window holds its month's flights (March's 31 days: 30 of them)
	for i, lv := range h {
		if !lv.At.Add(time.Nanosecond).Equal(wantAt[i]) {
			t.Errorf("level %d at %s, want just before %s", i, lv.At, wantAt[i])
		}
		if i < 3 && lv.Pct != wantPct[i] {
			t.Errorf("level %d (%s) %g, want %g", i, Period(lv.At), lv.Pct, wantPct[i])
		}
	}
	if got := Period(h[1].At); got != "2026-02" {
		t.Errorf("period %q, want 2026-02", got)
	}
	if FactorHistory(nil, nil, DefaultFactorConfig()) != nil {
		t.Errorf("a history without flights")
	}
}

// A tail without fan speed: the factor series is the fuel-flow deviation
// of its snapshots, and with level flight and thrust from fuel flow that
// is the drag deviation (FF/FF_expected = D/D_baseline when the thrust is
// FF/TSFC and sinγ = dV/dt = 0; §4.5).
func TestFactorSeriesIsFuelFlowDeviation(t *testing.T) {
	typ := twin()
	c := DefaultTrendConfig()
	base := time.Date(2026, 5, 1, 8, 0, 0, 0, time.UTC)
	var pts []TrendPoint
	for i := range 30 {
		s := cruiseSnapshot(typ, 0.01+0.002*float64(i%7))
		p := Analyze(typ, s)
		at := base.Add(time.Duration(i) * 20 * time.Minute)
		pts = append(pts, c.NewPoint(at, FlightID(i/3), &s, &p))
		if math.Abs(p.FuelFlowDevPct-p.DragDevPct) > 1e-9 {
			t.Errorf("level flight from fuel flow: fuel-flow deviation %.9f, drag deviation %.9f", p.FuelFlowDevPct, p.DragDevPct)
		}
	}
	fl := FactorSeries(pts, &c, nil)
	if len(fl) != 10 {
		t.Fatalf("%d flights, want 10", len(fl))
	}
	for i, f := range fl {
		v := []float64{pts[3*i].FuelFlowDevPct, pts[3*i+1].FuelFlowDevPct, pts[3*i+2].FuelFlowDevPct}
		if want := Median(v); f.DevPct != want {
			t.Errorf("flight %d: factor %.9f, want the median fuel-flow deviation %.9f", i, f.DevPct, want)
		}
	}
}

// The rank search from the normal approximation finds the rank the full
// scan over every k finds, for every n from 1 to 400 at three levels.
func TestMedianRankMatchesScan(t *testing.T) {
	for _, conf := range []float64{0.9, 0.95, 0.99} {
		for n := 1; n <= 400; n++ {
			b := distuv.Binomial{N: float64(n), P: 0.5}
			want := 0
			for k := 1; k <= (n+1)/2; k++ {
				if b.CDF(float64(k-1)) <= (1-conf)/2 {
					want = k
				} else {
					break
				}
			}
			if got := medianRank(n, conf); got != want {
				t.Errorf("n %d conf %g: rank %d, want %d", n, conf, got, want)
			}
		}
	}
}
