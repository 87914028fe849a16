package model

import (
	"slices"
	"testing"
)

// TimeOrder sorts by time as slices.SortStableFunc(ByTime) does, ties in
// the order given, and Reorder carries what is kept beside the points.
func TestTimeOrder(t *testing.T) {
	at := func(ns ...int64) []TrendPoint {
		pts := make([]TrendPoint, len(ns))
		for i, n := range ns {
			pts[i] = TrendPoint{UnixNano: n, DevPct: float64(i)} // DevPct: the index given
		}
		return pts
	}
	tests := []struct {
		name   string
		pts    []TrendPoint
		sorted bool
	}{
		{"empty", nil, true},
		{"in order", at(1, 2, 2, 5), true},
		{"reversed", at(9, 7, 3, 1), false},
		{"ties kept in the order given", at(5, 2, 5, 2, 5, 1), false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			order := TimeOrder(tt.pts)
			if (order == nil) != tt.sorted {
				t.Fatalf("order %v for points in order: %v", order, tt.sorted)
			}
			want := slices.Clone(tt.pts)
			slices.SortStableFunc(want, ByTime)
			got := slices.Clone(tt.pts)
			beside := make([]int, len(got)) // kept beside: the index given
			for i := range beside {
				beside[i] = i
			}
			if order != nil {
				Reorder(got, order)
				Reorder(beside, order)
			}
			if !slices.Equal(got, want) {
				t.Errorf("reordered %v, want %v", got, want)
			}
			for k := range got {
				if float64(beside[k]) != got[k].DevPct {
					t.Errorf("point %d came from %g, what is beside it from %d", k, got[k].DevPct, beside[k])
				}
			}
		})
	}
}
