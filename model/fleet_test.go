package model

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat"
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

// linInterpQuantile, by selection, gives what gonum's stat.Quantile with
// LinInterp gives on the sorted values, bit for bit, at any p and size,
// with ties.
func TestLinInterpQuantileIsGonums(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for _, n := range []int{1, 2, 3, 10, 49, 50, 51, 1000, 4099} {
		for _, ties := range []bool{false, true} {
			v := make([]float64, n)
			for i := range v {
				v[i] = rng.NormFloat64()
				if ties {
					v[i] = math.Round(v[i] * 2)
				}
			}
			sorted := append([]float64(nil), v...)
			sort.Float64s(sorted)
			for _, p := range []float64{0, 0.001, 0.02, 0.25, 0.5, 0.98, 0.999, 1} {
				want := stat.Quantile(p, stat.LinInterp, sorted, nil)
				if got := linInterpQuantile(append([]float64(nil), v...), p); got != want {
					t.Errorf("n %d ties %v p %g: %v, gonum %v", n, ties, p, got, want)
				}
			}
		}
	}
}
