package model

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/stat/distuv"
)

// Slope is a robust straight-line slope with its confidence interval.
type Slope struct {
	Slope, Lo, Hi float64 // units of y per unit of x; NaN when not computable
	Intercept     float64 // y at x = 0 (Sen's intercept), units of y
	N             int     // points used
}

// TheilSen returns the Theil–Sen slope of y against x — the median of the
// slopes of all pairs with distinct x — and its distribution-free confidence
// interval at level conf (e.g. 0.95): with N pair slopes sorted and
// C = z √(n(n−1)(2n+5)/18), the interval runs from the ((N − C)/2)-th to the
// ((N + C)/2 + 1)-th slope (Sen, J. Am. Stat. Assoc. 63, 1968; Hollander &
// Wolfe, Nonparametric Statistical Methods, ch. 9). The intercept is the
// median of y − slope·x, which puts the line through the middle of the
// points (Sen 1968; Conover, Practical Nonparametric Statistics, §5.5).
// Ties in x are skipped. Fewer than 3 points give NaN.
func TheilSen(x, y []float64, conf float64) Slope {
	n := len(x)
	s := Slope{Slope: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Intercept: math.NaN(), N: n}
	if n < 3 || len(y) != n {
		return s
	}
	slopes := make([]float64, 0, n*(n-1)/2)
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if dx := x[j] - x[i]; dx != 0 {
				slopes = append(slopes, (y[j]-y[i])/dx)
			}
		}
	}
	N := len(slopes)
	if N == 0 {
		return s
	}
	z := distuv.UnitNormal.Quantile(0.5 + conf/2)
	fn := float64(n)
	c := z * math.Sqrt(fn*(fn-1)*(2*fn+5)/18)
	lo := max(int(math.Floor((float64(N)-c)/2))-1, 0) // 0-based
	hi := min(int(math.Ceil((float64(N)+c)/2)), N-1)  // 0-based of the (…+1)-th
	// The three order statistics by selection, each within the part the
	// one before left (the same values a full sort gives, in linear time).
	if hasNaN(slopes) {
		sort.Float64s(slopes)
		s.Slope, s.Lo, s.Hi = sortedMedian(slopes), slopes[lo], slopes[hi]
		return s.withIntercept(x, y)
	}
	k := N / 2
	selectK(slopes, k)
	s.Slope = slopes[k]
	if N%2 == 0 {
		s.Slope = 0.5 * (maxOf(slopes[:k]) + slopes[k])
	}
	switch {
	case lo < k:
		s.Lo = orderStat(slopes[:k], lo)
	default:
		s.Lo = slopes[lo] // lo == k
	}
	switch {
	case hi > k:
		s.Hi = orderStat(slopes[k+1:], hi-k-1)
	default:
		s.Hi = slopes[hi]
	}
	return s.withIntercept(x, y)
}

// withIntercept sets Sen's intercept, the median of y − slope·x.
func (s Slope) withIntercept(x, y []float64) Slope {
	res := make([]float64, len(x))
	for i := range x {
		res[i] = y[i] - s.Slope*x[i]
	}
	s.Intercept = median(res)
	return s
}
