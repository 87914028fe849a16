package model

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// testThrust is an invented table (N per δ, one engine), rising with N1 and
// falling with Mach, about the size of a 120 kN-class turbofan's.
func testThrust(t testing.TB) *ThrustTable {
	t.Helper()
	tt, err := NewThrustTable(
		[]float64{70, 80, 90, 100},
		[]float64{0.6, 0.7, 0.8, 0.9},
		[][]float64{
			{40000, 62000, 88000, 118000},
			{38000, 60000, 86000, 115000},
			{36500, 58000, 83500, 112000},
			{35000, 56000, 81000, 109000},
		})
	if err != nil {
		t.Fatal(err)
	}
	return tt
}

// Bilinear interpolation, by its definition: every grid value comes back
// exactly; along an edge it is linear (midpoint = mean of the ends); at a
// cell's centre it is the mean of the four corners.
func TestThrustTableBilinear(t *testing.T) {
	tt := testThrust(t)
	for i, m := range tt.Mach {
		for j, n := range tt.N1 {
			if got, ok := tt.At(n, m); !ok || got != tt.PerDelta[i][j] {
				t.Errorf("grid (%g %%, M%g): %g, %v; want %g exactly", n, m, got, ok, tt.PerDelta[i][j])
			}
		}
	}
	const tol = 1e-9
	tests := []struct {
		name    string
		n1, m   float64
		want    float64
		comment string
	}{
		{"N1 edge at M0.6", 75, 0.6, (40000 + 62000) / 2.0, "midpoint of a row"},
		{"N1 edge, a quarter", 92.5, 0.9, 81000 + 0.25*(109000-81000), "linear along a row"},
		{"Mach edge at 100 %", 100, 0.85, (112000 + 109000) / 2.0, "midpoint of a column"},
		{"cell centre", 85, 0.75, (60000 + 86000 + 58000 + 83500) / 4.0, "mean of four corners"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, ok := tt.At(tc.n1, tc.m)
			if !ok || math.Abs(got-tc.want) > tol*tc.want {
				t.Errorf("At(%g, %g) = %g, %v; want %g (%s)", tc.n1, tc.m, got, ok, tc.want, tc.comment)
			}
		})
	}
	for _, out := range [][2]float64{{69.9, 0.7}, {100.1, 0.7}, {80, 0.59}, {80, 0.91}, {math.NaN(), 0.7}} {
		if v, ok := tt.At(out[0], out[1]); ok || !math.IsNaN(v) {
			t.Errorf("At(%g, %g) outside the grid = %g, %v; want NaN, false", out[0], out[1], v, ok)
		}
	}
}

// N1k = N1/√θt2 with θt2 = Tt/288.15 K and Tt = T (1 + 0.2 M²) (recovery 1;
// corrected parameters as in SAE AIR1703). At the ISA tropopause, 216.65 K
// (ICAO Doc 7488), and M0.80, Tt = 216.65 × 1.128 = 244.38 K.
func TestCorrectedN1(t *testing.T) {
	theta := 216.65 / 288.15
	tt2 := 216.65 * (1 + 0.2*0.8*0.8)
	want := 90 / math.Sqrt(tt2/288.15)
	if got := CorrectedN1(90, 0.8, theta); math.Abs(got-want) > 1e-12 {
		t.Errorf("N1k = %.6f %%, want %.6f %%", got, want)
	}
	if got := CorrectedN1(90, 0, 1); got != 90 {
		t.Errorf("sea-level static ISA: N1k = %g, want N1 itself", got)
	}
}

// An engine whose fuel flow is the model's for the table's thrust has
// engine deviation 0 and the same airframe deviation as thrust from fuel
// flow; a fuel-flow meter reading x % high gives engine deviation x % and
// leaves the airframe deviation exactly as it was (DESIGN.md §7).
func TestThrustFromFanSpeed(t *testing.T) {
	ty := twin()
	ty.Thrust = testThrust(t)
	s := Snapshot{Weight: 64000, Altitude: 35000 * Foot, Mach: 0.78}
	s.SAT, _ = ISA(35000 * Foot)
	air := AirAt(s.Altitude, s.SAT)
	s.N1 = 88 * math.Sqrt(air.Theta()*(1+0.2*s.Mach*s.Mach)) // N1k = 88 %
	f, _ := ty.Thrust.At(88, s.Mach)
	fn := float64(ty.EngineCount) * air.Delta() * f
	s.FuelFlow = ty.TSFC(s.Mach, air.Theta()) * fn

	p := Analyze(ty, s)
	if !p.ThrustFromN1 || math.Abs(p.N1Corrected-88) > 1e-9 || math.Abs(p.Thrust-fn) > 1e-9*fn {
		t.Fatalf("thrust from N1: %v, N1k %g, Fn %g N (want %g N)", p.ThrustFromN1, p.N1Corrected, p.Thrust, fn)
	}
	if math.Abs(p.EngineDevPct) > 1e-9 {
		t.Errorf("engine at the model's fuel flow: engine deviation %g %%, want 0", p.EngineDevPct)
	}
	noN1 := s
	noN1.N1 = 0
	ff := Analyze(ty, noN1)
	if math.Abs(p.DragDevPct-ff.DragDevPct) > 1e-9 {
		t.Errorf("airframe deviation %g %%, thrust from fuel flow gives %g %% for the same thrust", p.DragDevPct, ff.DragDevPct)
	}
	if ff.ThrustFromN1 || !math.IsNaN(ff.EngineDevPct) || !math.IsNaN(ff.N1Corrected) {
		t.Errorf("without N1: from N1 %v, engine deviation %g (want NaN), N1k %g", ff.ThrustFromN1, ff.EngineDevPct, ff.N1Corrected)
	}

	for _, bias := range []float64{-2, 1, 3} {
		b := s
		b.FuelFlow *= 1 + bias/100
		pb := Analyze(ty, b)
		if math.Abs(pb.EngineDevPct-bias) > 1e-9 {
			t.Errorf("meter %+g %%: engine deviation %g %%", bias, pb.EngineDevPct)
		}
		if pb.DragDevPct != p.DragDevPct {
			t.Errorf("meter %+g %%: airframe deviation moved from %g to %g %%", bias, p.DragDevPct, pb.DragDevPct)
		}
		// (1 + fuel-flow dev) = (1 + engine dev)(1 + drag share): with no
		// climb or acceleration the drag share is the drag deviation.
		if got, want := 1+pb.FuelFlowDevPct/100, (1+pb.EngineDevPct/100)*(1+pb.DragDevPct/100); math.Abs(got-want) > 1e-9 {
			t.Errorf("meter %+g %%: 1 + fuel-flow dev %g, product %g", bias, got, want)
		}
	}

	out := s
	out.N1 = 60 // N1k well below the grid
	po := Analyze(ty, out)
	if po.ThrustFromN1 || !po.OutsideThrustTable || !math.IsNaN(po.EngineDevPct) {
		t.Errorf("outside the table: from N1 %v, outside %v, engine deviation %g", po.ThrustFromN1, po.OutsideThrustTable, po.EngineDevPct)
	}
	c := DefaultTrendConfig()
	if why := c.Usable(c.NewPoint(day0, 0, &out, &po)); why != ExcludeThrustTable {
		t.Errorf("outside the table: usable reason %q, want %q", why, ExcludeThrustTable)
	}
	if why := c.Usable(c.NewPoint(day0, 0, &s, &p)); why != "" {
		t.Errorf("inside the table: left out for %q", why)
	}
}

func TestNewThrustTableErrors(t *testing.T) {
	n1, mach := []float64{70, 80}, []float64{0.6, 0.8}
	rows := [][]float64{{1, 2}, {1, 2}}
	tests := []struct {
		name      string
		n1, mach  []float64
		rows      [][]float64
		key, text string
	}{
		{"one N1 point", []float64{70}, mach, [][]float64{{1}, {1}}, "thrust.n1_corrected_pct", "at least 2"},
		{"N1 not ascending", []float64{80, 70}, mach, rows, "thrust.n1_corrected_pct", "ascending"},
		{"Mach repeated", n1, []float64{0.6, 0.6}, rows, "thrust.mach", "ascending"},
		{"Mach not finite", n1, []float64{0.6, math.Inf(1)}, rows, "thrust.mach", "finite"},
		{"a row short", n1, mach, [][]float64{{1, 2}, {1}}, "thrust.fn_per_delta_n", "row 2"},
		{"rows missing", n1, mach, [][]float64{{1, 2}}, "thrust.fn_per_delta_n", "one row per Mach"},
		{"a value zero", n1, mach, [][]float64{{0, 2}, {1, 2}}, "thrust.fn_per_delta_n", "> 0"},
		{"falls with N1", n1, mach, [][]float64{{1, 2}, {2, 1}}, "thrust.fn_per_delta_n", "rise with N1"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := NewThrustTable(tc.n1, tc.mach, tc.rows)
			var fe *FieldError
			if !errors.As(err, &fe) || fe.Key != tc.key || !strings.Contains(fe.Reason, tc.text) {
				t.Errorf("error %v, want key %s with %q", err, tc.key, tc.text)
			}
		})
	}
}

// A weight that reads 1 % high moves the drag deviation by about −0.8 pp at
// cruise: twice the induced share of the baseline drag, since CL and so
// k CL² rise with it while the measured drag does not (a trade rule of
// thumb, common practice). Checked over a spread of cruise conditions of
// the invented twin; the tolerance of 0.15 pp covers the wave drag's share
// of the CL sensitivity.
func TestWeightErrorSensitivity(t *testing.T) {
	ty := twin()
	for _, w := range []float64{58000, 64000, 70000} {
		for _, ft := range []float64{33000, 35000, 37000} {
			for _, m := range []float64{0.76, 0.78} {
				h := ft * Foot
				air := AirISA(h, 0)
				s := Snapshot{Weight: w, Altitude: h, Mach: m, SAT: air.T}
				p0 := Analyze(ty, Snapshot{Weight: w, Altitude: h, Mach: m, SAT: air.T, FuelFlow: 1})
				s.FuelFlow = p0.TSFC * p0.CDBaseline * p0.Q * ty.WingArea // on the baseline: deviation 0
				base := Analyze(ty, s)
				s.Weight = w * 1.01
				off := Analyze(ty, s)
				d := off.DragDevPct - base.DragDevPct
				share := base.CDInduced / base.CDBaseline
				if math.Abs(d-(-2*share)) > 0.15 || d > -0.4 || d < -1.3 {
					t.Errorf("W %.0f kg, FL%.0f, M%.2f: +1 %% weight moves the deviation %+.3f pp; twice the induced share is %.3f pp",
						w, ft/100, m, d, -2*share)
				}
			}
		}
	}
}
