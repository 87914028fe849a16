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
	sort.Float64s(slopes)
	if N%2 == 1 {
		s.Slope = slopes[N/2]
	} else {
		s.Slope = 0.5 * (slopes[N/2-1] + slopes[N/2])
	}
	z := distuv.UnitNormal.Quantile(0.5 + conf/2)
	fn := float64(n)
	c := z * math.Sqrt(fn*(fn-1)*(2*fn+5)/18)
	lo := int(math.Floor((float64(N)-c)/2)) - 1 // 0-based
	hi := int(math.Ceil((float64(N) + c) / 2))  // 0-based of the (…+1)-th
	s.Lo = slopes[max(lo, 0)]
	s.Hi = slopes[min(hi, N-1)]
	res := make([]float64, n)
	for i := range x {
		res[i] = y[i] - s.Slope*x[i]
	}
	s.Intercept = median(res)
	return s
}
