package model

import (
	"math"
	"sort"
)

// median returns the median of v (NaN for none), the average of the middle
// two for an even count; it sorts v in place. (gonum's stat.Quantile gives
// the lower middle value for an even count, so it is not used here.)
func median(v []float64) float64 {
	if len(v) == 0 {
		return math.NaN()
	}
	sort.Float64s(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return 0.5 * (v[n/2-1] + v[n/2])
}

// Median returns the median of v without changing v (NaN for none); the
// average of the middle two for an even count.
func Median(v []float64) float64 {
	return median(append([]float64(nil), v...))
}

// RollingMedian returns, for each i, the median of v over the window
// [i − half, i + half] clipped to the ends of v.
func RollingMedian(v []float64, half int) []float64 {
	out := make([]float64, len(v))
	buf := make([]float64, 0, 2*half+1)
	for i := range v {
		buf = append(buf[:0], v[max(0, i-half):min(len(v), i+half+1)]...)
		out[i] = median(buf)
	}
	return out
}
