package model

import (
	"math"
	"testing"
)

// The fleet's deviation scale is the 2nd–98th percentile of its flights.
// gonum's LinInterp puts the i-th of n sorted values at cumulative
// probability i/n and interpolates linearly, so for 0, 1, …, 100 (n = 101)
// p = 0.02 falls at 2.02 of 101, between the values 1 and 2: 1.02; and
// p = 0.98 at 98.98, between 97 and 98: 97.98.
func TestDeviationRange(t *testing.T) {
	var fl []FlightPoint
	for i := 0; i <= 100; i++ {
		fl = append(fl, FlightPoint{DevPct: float64(i)})
	}
	tests := []struct {
		name   string
		f      Fleet
		lo, hi float64
	}{
		{"0…100", Fleet{Tails: []TailAssessment{{TailTrend: TailTrend{Flights: fl}}}}, 1.02, 97.98},
		{"no flights", Fleet{}, 0, 1},
		{"all equal", Fleet{Tails: []TailAssessment{{TailTrend: TailTrend{Flights: []FlightPoint{{DevPct: 3}, {DevPct: 3}}}}}}, 2, 4},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lo, hi := tc.f.DeviationRange()
			if math.Abs(lo-tc.lo) > 1e-9 || math.Abs(hi-tc.hi) > 1e-9 {
				t.Errorf("range %g…%g, want %g…%g", lo, hi, tc.lo, tc.hi)
			}
		})
	}
}
