package model

import (
	"math"
	"testing"
)

// cruiseSnapshot is level cruise of the test twin at FL350, ISA, with the
// fuel flow its baseline polar predicts times (1 + extra).
func cruiseSnapshot(ty *Type, extra float64) Snapshot {
	h := 35000 * Foot
	air := AirISA(h, 0)
	l := LevelFlight(ty, 65000, air, 0.78, 0)
	return Snapshot{Weight: 65000, Altitude: h, Mach: 0.78, SAT: air.T, FuelFlow: l.FuelFlow * (1 + extra)}
}

// Property: analysing the fuel flow the model predicts gives zero excess, in
// level flight, in a turn, climbing and accelerating (the energy method of
// DESIGN.md §4.5 inverts the fuel-flow prediction exactly).
func TestAnalyzePredictedFuelFlowHasNoExcess(t *testing.T) {
	ty := twin()
	tests := []struct {
		name            string
		bank, vs, accel float64
	}{
		{"level", 0, 0, 0},
		{"25 degree turn", 25 * math.Pi / 180, 0, 0},
		{"climbing 500 ft/min", 0, 500 * Foot / Minute, 0},
		{"accelerating 2 kt/min", 0, 0, 2 * Knot / Minute},
		{"descending turn, decelerating", -15 * math.Pi / 180, -300 * Foot / Minute, -1 * Knot / Minute},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := cruiseSnapshot(ty, 0)
			s.Bank, s.VS, s.Accel = tc.bank, tc.vs, tc.accel
			air := AirAt(s.Altitude, s.SAT)
			n := LoadFactor(s.Bank)
			q := air.DynamicPressure(s.Mach)
			cl := LiftCoefficient(n, s.Weight, q, ty.WingArea)
			d := ty.CD(cl, s.Mach, 0)*q*ty.WingArea + s.Weight*G0*s.VS/air.TAS(s.Mach) + s.Weight*s.Accel
			s.FuelFlow = ty.TSFC(s.Mach, air.Theta()) * d
			p := Analyze(ty, s)
			if math.Abs(p.ExcessCounts) > 1e-6 || math.Abs(p.FuelFlowDevPct) > 1e-9 {
				t.Errorf("excess %.3g counts, fuel-flow deviation %.3g %%, want 0", p.ExcessCounts, p.FuelFlowDevPct)
			}
			if math.Abs(p.CDParasiteMeasured-ty.CD0) > 1e-12 {
				t.Errorf("parasite measured %.6f, want CD0 %.6f", p.CDParasiteMeasured, ty.CD0)
			}
		})
	}
}

// Property: in level flight fuel flow is proportional to drag, so 3 % more
// fuel flow is 3 % more drag, all of it parasite.
func TestAnalyzeExcess(t *testing.T) {
	ty := twin()
	p := Analyze(ty, cruiseSnapshot(ty, 0.03))
	if math.Abs(p.DragDevPct-3) > 1e-9 || math.Abs(p.FuelFlowDevPct-3) > 1e-9 {
		t.Errorf("drag deviation %.6f %%, fuel-flow deviation %.6f %%, want 3", p.DragDevPct, p.FuelFlowDevPct)
	}
	wantCounts := 0.03 * p.CDBaseline / DragCount
	if math.Abs(p.ExcessCounts-wantCounts) > 1e-9 {
		t.Errorf("excess %.4f counts, want %.4f", p.ExcessCounts, wantCounts)
	}
	if d := p.CDParasiteMeasured - p.CDParasiteBaseline - p.ExcessCounts*DragCount; math.Abs(d) > 1e-12 {
		t.Errorf("excess is not all parasite: residual %g", d)
	}
	if sum := p.CDInduced + p.CDWave + p.CDParasiteMeasured; math.Abs(sum-p.CDMeasured) > 1e-15 {
		t.Errorf("split %g does not add up to measured %g", sum, p.CDMeasured)
	}
	if math.Abs(p.Drag-p.Thrust) > 1e-9 {
		t.Errorf("level unaccelerated flight: drag %g != thrust %g", p.Drag, p.Thrust)
	}
}

// Thrust from fuel flow T = FF[kg/h] g0 / TSFC[1/h] (DESIGN.md §4.4): 2,400
// kg/h at a TSFC of 0.6 /h is 4,000 kgf = 39,226.6 N.
func TestThrustFromFuelFlow(t *testing.T) {
	ty := twin()
	ty.TSFCA, ty.TSFCB = TSFCPerHour(0.6), 0
	s := Snapshot{Weight: 60000, Altitude: 0, Mach: 0.5, SAT: T0, FuelFlow: 2400 / Hour}
	if p := Analyze(ty, s); math.Abs(p.Thrust-4000*G0) > 1e-6 {
		t.Errorf("thrust %.3f N, want %.3f", p.Thrust, 4000*G0)
	}
}

// Common practice (no source): at constant lift, doubling the speed quarters
// CL, divides the induced-drag coefficient by 16 and the induced drag by 4;
// halving it multiplies the induced drag by 4. More generally induced drag
// at constant lift falls as 1/V².
func TestInducedDragAtConstantLift(t *testing.T) {
	ty := bizJet()
	air := AirISA(20000*Foot, 0)
	induced := func(m float64) (cl, cdi, di float64) {
		l := LevelFlight(ty, bizJetWeight, air, m, 0)
		cdi = ty.K() * l.CL * l.CL
		return l.CL, cdi, cdi * air.DynamicPressure(m) * ty.WingArea
	}
	cl1, cdi1, di1 := induced(0.3)
	cl2, cdi2, di2 := induced(0.6)
	tests := []struct {
		name      string
		got, want float64
	}{
		{"CL quarters", cl2 / cl1, 0.25},
		{"CDi / 16", cdi2 / cdi1, 1.0 / 16},
		{"Di / 4", di2 / di1, 0.25},
		{"halving: Di × 4", di1 / di2, 4},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > 1e-12 {
			t.Errorf("%s: ratio %g, want %g", tc.name, tc.got, tc.want)
		}
	}
	for _, m := range []float64{0.25, 0.4, 0.55, 0.7} {
		_, _, di := induced(m)
		if r := di * m * m / (di1 * 0.3 * 0.3); math.Abs(r-1) > 1e-12 {
			t.Errorf("Mach %.2f: Di·V² not constant (ratio %g)", m, r)
		}
	}
}

func TestLoadFactor(t *testing.T) {
	// n = 1/cos φ in a level turn (standard flight mechanics; values to the
	// fourth decimal).
	tests := []struct{ deg, want float64 }{
		{0, 1}, {15, 1.0353}, {30, 1.1547}, {45, 1.4142}, {60, 2.0},
	}
	for _, tc := range tests {
		if got := LoadFactor(tc.deg * math.Pi / 180); math.Abs(got-tc.want) > 0.00005 {
			t.Errorf("%g°: n = %.5f, want %.4f", tc.deg, got, tc.want)
		}
	}
}

func BenchmarkAnalyze(b *testing.B) {
	ty := twin()
	snaps := make([]Snapshot, 1024)
	for i := range snaps {
		s := cruiseSnapshot(ty, 0.01*float64(i%7))
		s.Weight += float64(i)
		s.Bank = float64(i%5) * 0.05
		snaps[i] = s
	}
	b.ReportAllocs()
	b.ResetTimer()
	var sink float64
	for i := 0; i < b.N; i++ {
		sink += Analyze(ty, snaps[i&1023]).ExcessCounts
	}
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "snapshots/s")
	_ = sink
}
