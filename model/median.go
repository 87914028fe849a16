package model

import (
	"math"
	"sort"
)

// median returns the median of v (NaN for none), the average of the middle
// two for an even count; it reorders v. The middle values are found by
// selection (selectK), not by sorting, with the same result. (gonum's
// stat.Quantile gives the lower middle value for an even count, so it is
// not used here.)
func median(v []float64) float64 {
	n := len(v)
	if n == 0 {
		return math.NaN()
	}
	if hasNaN(v) {
		sort.Float64s(v)
		return sortedMedian(v)
	}
	if n <= 32 { // a flight's few snapshots
		insertionSort(v)
		return sortedMedian(v)
	}
	k := n / 2
	selectK(v, k)
	if n%2 == 1 {
		return v[k]
	}
	return 0.5 * (maxOf(v[:k]) + v[k])
}

// insertionSort sorts a short v holding no NaN.
func insertionSort(v []float64) {
	for i := 1; i < len(v); i++ {
		x, j := v[i], i
		for ; j > 0 && v[j-1] > x; j-- {
			v[j] = v[j-1]
		}
		v[j] = x
	}
}

// Median returns the median of v without changing v (NaN for none); the
// average of the middle two for an even count.
func Median(v []float64) float64 {
	return median(append([]float64(nil), v...))
}

// RollingMedian returns, for each i, the median of v over the window
// [i − half, i + half] clipped to the ends of v. The window is kept sorted
// as it slides (slidingWindow).
func RollingMedian(v []float64, half int) []float64 {
	out := make([]float64, len(v))
	if hasNaN(v) { // a NaN has no place in a sorted window: each window anew
		buf := make([]float64, 0, 2*half+1)
		for i := range v {
			buf = append(buf[:0], v[max(0, i-half):min(len(v), i+half+1)]...)
			out[i] = median(buf)
		}
		return out
	}
	w := slidingWindow{sorted: make([]float64, 0, 2*half+2)}
	lo, hi := 0, 0 // the window is v[lo:hi]
	for i := range v {
		for ; hi < min(len(v), i+half+1); hi++ {
			w.insert(v[hi])
		}
		for ; lo < max(0, i-half); lo++ {
			w.remove(v[lo])
		}
		out[i] = sortedMedian(w.sorted)
	}
	return out
}
