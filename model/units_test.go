package model

import (
	"math"
	"testing"
)

// The unit definitions are exact by international agreement: the foot and
// pound by the 1959 international yard and pound agreement, the nautical
// mile (1852 m) by the 1929 International Hydrographic Conference; the knot
// is one nautical mile per hour.
func TestUnitDefinitions(t *testing.T) {
	tests := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"foot is 0.3048 m", Foot, 0.3048, 0},
		{"pound is 0.45359237 kg", Pound, 0.45359237, 0},
		{"knot is 1852/3600 m/s", Knot, 0.514444444, 1e-9},
		{"100 ft per min is 0.508 m/s", 100 * Foot / Minute, 0.508, 1e-12},
		{"1 lb/h is 1.26e-4 kg/s", Pound / Hour, 1.259978806e-4, 1e-13},
		// ICAO: 3.16 kg of CO2 per kg of jet fuel burnt.
		{"CO2 per kg of fuel", CO2PerFuel, 3.16, 0},
		{"one drag count", DragCount, 0.0001, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if math.Abs(tc.got-tc.want) > tc.tol {
				t.Errorf("got %.12g, want %.12g ± %g", tc.got, tc.want, tc.tol)
			}
		})
	}
}

// TSFC in kg/(kgf·h) is numerically the same as lb/(lbf·h) and converts to SI
// kg/(N·s) by dividing by g0 and by 3600 (definition of the kilogram-force).
func TestTSFCPerHour(t *testing.T) {
	got := TSFCPerHour(0.6)
	want := 0.6 / (9.80665 * 3600)
	if math.Abs(got-want) > 1e-15 {
		t.Fatalf("TSFCPerHour(0.6) = %g, want %g", got, want)
	}
	// 0.6 lb/(lbf·h) is about 16.99 mg/(N·s) (common practice conversion).
	if mg := got * 1e6; math.Abs(mg-16.99) > 0.01 {
		t.Errorf("0.6 /h = %.3f mg/(N·s), want 16.99", mg)
	}
}
