package feed

import (
	"math"
	"testing"
)

func TestUnitConversions(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		// 1959 international yard and pound agreement: exact definitions.
		{"1 lb", KgFromLb(1), 0.45359237, 0},
		{"150,000 lb", KgFromLb(150000), 68038.8555, 1e-9},
		{"35,000 ft", MetresFromFeet(35000), 10668, 1e-9},
		{"2,400 kg/h", KgPerSFromKgPerH(2400), 2.0 / 3, 1e-15},
		{"5,291 lb/h", KgPerSFromLbPerH(5291), 5291 * 0.45359237 / 3600, 1e-15},
		{"-56.5 °C", KelvinFromCelsius(-56.5), 216.65, 1e-12},
		{"1000 ft/min", MPerSFromFtPerMin(1000), 5.08, 1e-12},
		{"60 kt/min", MPerS2FromKtPerMin(60), 1852.0 / 3600, 1e-15},
		{"180°", RadFromDeg(180), math.Pi, 0},
	}
	for _, tc := range tests {
		if math.Abs(tc.got-tc.want) > tc.tol {
			t.Errorf("%s: got %.12g, want %.12g", tc.name, tc.got, tc.want)
		}
	}
}

// Adiabatic stagnation temperature with recovery factor 1:
// TAT/SAT = 1 + (γ − 1)/2 M² = 1 + 0.2 M² (Anderson, Introduction to Flight,
// ch. 4). At Mach 0.8, TAT/SAT = 1.128; at the ISA tropopause (216.65 K),
// Mach 0.78 gives TAT = 243.01 K.
func TestSATFromTAT(t *testing.T) {
	if got := SATFromTAT(1.128*220, 0.8); math.Abs(got-220) > 1e-9 {
		t.Errorf("SAT = %.6f K, want 220", got)
	}
	if got := SATFromTAT(243.0126, 0.78); math.Abs(got-216.65) > 1e-3 {
		t.Errorf("SAT = %.4f K, want 216.65", got)
	}
	if got := SATFromTAT(250, 0); got != 250 {
		t.Errorf("at rest SAT = TAT, got %g", got)
	}
}
