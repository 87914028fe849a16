package model

import (
	"math"
	"testing"
)

// Table values of the ICAO standard atmosphere (ICAO Doc 7488; US Standard
// Atmosphere 1976, NOAA/NASA/USAF), checked to the rounding of the table.
func TestISATable(t *testing.T) {
	tests := []struct {
		name      string
		h         float64 // m
		T, p, rho float64 // K, Pa, kg/m³; 0 means not tabulated here
		tolT      float64
		tolP      float64
		tolRho    float64
	}{
		{"sea level", 0, 288.15, 101325, 1.225, 1e-9, 1e-6, 5e-5},
		{"tropopause 11 000 m", 11000, 216.65, 22632.1, 0.363918, 1e-9, 0.1, 2e-6},
		{"top of isothermal layer 20 000 m", 20000, 216.65, 5474.89, 0.088035, 1e-9, 0.05, 1e-6},
		// US Standard Atmosphere 1976 table at 32 km (from memory of the table).
		{"32 000 m", 32000, 228.65, 868.02, 0.013225, 1e-9, 0.05, 1e-6},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			T, p := ISA(tc.h)
			rho := AirISA(tc.h, 0).Density()
			if math.Abs(T-tc.T) > tc.tolT {
				t.Errorf("T = %.6f K, want %.6f", T, tc.T)
			}
			if math.Abs(p-tc.p) > tc.tolP {
				t.Errorf("p = %.4f Pa, want %.4f ± %g", p, tc.p, tc.tolP)
			}
			if math.Abs(rho-tc.rho) > tc.tolRho {
				t.Errorf("rho = %.7f kg/m³, want %.7f ± %g", rho, tc.rho, tc.tolRho)
			}
		})
	}
}

// Ratios at cruise levels as tabulated in the ICAO standard atmosphere
// (ICAO Doc 7488), to four decimals; and the sea-level speed of sound.
func TestISARatios(t *testing.T) {
	const half = 0.00005 // half a unit in the fourth decimal
	tests := []struct {
		name  string
		ft    float64
		ratio func(Air) float64
		want  float64
	}{
		{"35 000 ft delta", 35000, Air.Delta, 0.2353},
		{"35 000 ft theta", 35000, Air.Theta, 0.7594},
		{"35 000 ft sigma", 35000, Air.Sigma, 0.3099},
		{"36 089 ft delta", 36089, Air.Delta, 0.2234},
		{"40 000 ft delta", 40000, Air.Delta, 0.1851},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := tc.ratio(AirISA(tc.ft*Foot, 0)); math.Abs(got-tc.want) > half {
				t.Errorf("got %.5f, want %.4f", got, tc.want)
			}
		})
	}
	a0 := AirISA(0, 0).SpeedOfSound()
	if math.Abs(a0-340.294) > 0.0005 {
		t.Errorf("a0 = %.4f m/s, want 340.294", a0)
	}
	if kt := a0 / Knot; math.Abs(kt-661.48) > 0.005 {
		t.Errorf("a0 = %.3f kt, want 661.48", kt)
	}
}

// The pressure law is continuous across the layer boundaries (a property of
// the layered definition).
func TestISAContinuity(t *testing.T) {
	for _, h := range []float64{tropopause, stratosphere} {
		T1, p1 := ISA(h - 1e-6)
		T2, p2 := ISA(h + 1e-6)
		if math.Abs(T1-T2) > 1e-6 || math.Abs(p1-p2)/p1 > 1e-9 {
			t.Errorf("discontinuity at %g m: T %g/%g p %g/%g", h, T1, T2, p1, p2)
		}
	}
}

// The snapshot's own temperature sets θ, a and the ISA deviation; pressure
// stays that of the pressure altitude.
func TestAirAtObservedTemperature(t *testing.T) {
	h := 35000 * Foot
	tISA, pISA := ISA(h)
	air := AirAt(h, tISA+10)
	if math.Abs(air.ISADev()-10) > 1e-12 {
		t.Errorf("ISA deviation = %g, want 10", air.ISADev())
	}
	if air.P != pISA {
		t.Errorf("pressure changed with temperature: %g vs %g", air.P, pISA)
	}
	// a ∝ √T: ISA+10 at 218.8 K raises a by √(228.8/218.8).
	ratio := air.SpeedOfSound() / AirISA(h, 0).SpeedOfSound()
	if want := math.Sqrt((tISA + 10) / tISA); math.Abs(ratio-want) > 1e-12 {
		t.Errorf("a ratio %g, want %g", ratio, want)
	}
	// q = ½ γ p M² equals ½ ρ V² (definition of Mach and ideal gas law).
	m := 0.78
	q1 := air.DynamicPressure(m)
	q2 := 0.5 * air.Density() * math.Pow(air.TAS(m), 2)
	if math.Abs(q1-q2)/q1 > 1e-12 {
		t.Errorf("q = %g by ½γpM², %g by ½ρV²", q1, q2)
	}
}

// The shortcuts give exactly what ISA and Air give.
func TestStandardTemperatureAndTAS(t *testing.T) {
	for _, h := range []float64{-500, 0, 5000, 10999, 11000, 15000, 20000, 25000, 31000} {
		tISA, _ := ISA(h)
		if got := StandardTemperature(h); got != tISA {
			t.Errorf("h %g: %v, ISA %v", h, got, tISA)
		}
		for _, m := range []float64{0.3, 0.78} {
			if got, want := TrueAirspeed(m, tISA+5), AirAt(h, tISA+5).TAS(m); got != want {
				t.Errorf("h %g M %g: TAS %v, Air %v", h, m, got, want)
			}
		}
	}
}
