package model

import (
	"math"
	"testing"
)

// ExcessFromDeviation is ΔCD = dev/100 · CD_baseline, so analysing a
// snapshot flown with that excess gives the deviation back (definition).
func TestExcessFromDeviation(t *testing.T) {
	ty := twin()
	air := AirISA(35000*Foot, 0)
	for _, dev := range []float64{-3, 0, 2.5, 10} {
		ex := ExcessFromDeviation(ty, 65000, air, 0.78, dev)
		l := LevelFlight(ty, 65000, air, 0.78, ex)
		p := Analyze(ty, Snapshot{Weight: 65000, Altitude: 35000 * Foot, Mach: 0.78, SAT: air.T, FuelFlow: l.FuelFlow})
		if math.Abs(p.DragDevPct-dev) > 1e-9 {
			t.Errorf("dev %g: analysed back as %g", dev, p.DragDevPct)
		}
	}
	if got := ExcessFromDeviation(ty, 65000, air, 0.78, math.NaN()); got != 0 {
		t.Errorf("NaN deviation gives %g, want 0", got)
	}
}

func TestPointWarnings(t *testing.T) {
	ty := twin()
	air := AirISA(35000*Foot, 0)
	good := LevelFlight(ty, 65000, air, 0.78, 0)
	tests := []struct {
		name string
		s    Snapshot
		want int
	}{
		{"steady cruise", Snapshot{Weight: 65000, Altitude: 35000 * Foot, Mach: 0.78, SAT: air.T, FuelFlow: good.FuelFlow}, 0},
		// Half the fuel flow (one engine of two): thrust below induced + wave.
		{"one engine's fuel flow", Snapshot{Weight: 65000, Altitude: 35000 * Foot, Mach: 0.78, SAT: air.T, FuelFlow: good.FuelFlow / 3}, 1},
		{"beyond buffet", Snapshot{Weight: 65000, Altitude: 35000 * Foot, Mach: 0.45, SAT: air.T, FuelFlow: good.FuelFlow}, 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Analyze(ty, tc.s).Warnings(ty); len(got) != tc.want {
				t.Errorf("warnings %q, want %d", got, tc.want)
			}
		})
	}
}

// At MinBuffetMach the 1 g CL is exactly cl_buffet/1.3 (definition), and a
// turn there is beyond the margin.
func TestMinBuffetMach(t *testing.T) {
	ty := twin()
	air := AirISA(37000*Foot, 0)
	m := MinBuffetMach(ty, 70000, air)
	cl := LiftCoefficient(1, 70000, air.DynamicPressure(m), ty.WingArea)
	if math.Abs(BuffetMargin*cl/ty.CLBuffet-1) > 1e-12 {
		t.Errorf("at M%.4f CL·1.3/cl_buffet = %g, want 1", m, BuffetMargin*cl/ty.CLBuffet)
	}
	if r := BankPenalty(ty, 70000, air, m, 0, 0.1); !r.Buffet {
		t.Error("a 6° turn at the buffet-limited Mach should be marked beyond buffet")
	}
	if r := BankPenalty(ty, 70000, air, m+0.05, 0, 0); r.Buffet {
		t.Error("wings level above the buffet-limited Mach is within the margin")
	}
}
