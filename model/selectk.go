package model

import (
	"math"
	"slices"
)

// selectK reorders v so that v[k] is the value sort.Float64s would put
// there, with v[:k] ≤ v[k] ≤ v[k+1:] (quickselect, Hoare 1961: linear on
// average, where sorting is n log n). v must hold no NaN. After about
// 2 log2(n) rounds without the range shrinking enough, the rest is sorted,
// so that no input makes it quadratic.
func selectK(v []float64, k int) {
	lo, hi := 0, len(v)-1
	for rounds := 2 * (bitsLen(len(v)) + 1); hi > lo; rounds-- {
		if rounds == 0 || hi-lo < 16 {
			slices.Sort(v[lo : hi+1])
			return
		}
		// median of three as the pivot
		mid := lo + (hi-lo)/2
		if v[mid] < v[lo] {
			v[mid], v[lo] = v[lo], v[mid]
		}
		if v[hi] < v[lo] {
			v[hi], v[lo] = v[lo], v[hi]
		}
		if v[hi] < v[mid] {
			v[hi], v[mid] = v[mid], v[hi]
		}
		p := v[mid]
		i, j := lo, hi
		for i <= j { // Hoare partition: v[lo:i] ≤ p ≤ v[j+1:hi+1]
			for v[i] < p {
				i++
			}
			for v[j] > p {
				j--
			}
			if i <= j {
				v[i], v[j] = v[j], v[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default: // j < k < i: v[k] == p, in place
			return
		}
	}
}

func bitsLen(n int) int {
	b := 0
	for ; n > 0; n >>= 1 {
		b++
	}
	return b
}

// hasNaN reports whether v holds a NaN.
func hasNaN(v []float64) bool {
	for _, x := range v {
		if x != x {
			return true
		}
	}
	return false
}

// orderStat is the k-th smallest of v (0-based) as a sorted v would hold
// it; v is reordered. v must hold no NaN.
func orderStat(v []float64, k int) float64 {
	selectK(v, k)
	return v[k]
}

// maxOf is the largest of v (len ≥ 1, no NaN).
func maxOf(v []float64) float64 {
	m := v[0]
	for _, x := range v[1:] {
		if x > m {
			m = x
		}
	}
	return m
}

// sortedMedian is the median of a sorted v (NaN for none).
func sortedMedian(v []float64) float64 {
	n := len(v)
	switch {
	case n == 0:
		return math.NaN()
	case n%2 == 1:
		return v[n/2]
	}
	return 0.5 * (v[n/2-1] + v[n/2])
}

// slidingWindow is a sorted copy of a window of values that slides along
// a series: each step inserts and removes one value, where sorting each
// window anew costs w log w. The windows are short (21 flights), so a
// value's place is found by the shift that makes it.
type slidingWindow struct{ sorted []float64 }

func (s *slidingWindow) insert(x float64) {
	v := append(s.sorted, x)
	i := len(v) - 1
	for ; i > 0 && v[i-1] > x; i-- { // a short window: shifting is the search
		v[i] = v[i-1]
	}
	v[i] = x
	s.sorted = v
}

func (s *slidingWindow) remove(x float64) {
	v := s.sorted
	i := 0
	for i < len(v)-1 && v[i] < x { // the first equal value: any will do
		i++
	}
	s.sorted = append(v[:i], v[i+1:]...)
}
