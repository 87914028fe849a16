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
func TheilSen(x, y []float64, conf float64) Slope { return theilSen(x, y, conf, nil) }

// theilSen is TheilSen with its buffers from a.
func theilSen(x, y []float64, conf float64, a *arena) Slope {
	n := len(x)
	s := Slope{Slope: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Intercept: math.NaN(), N: n}
	if n < 3 || len(y) != n {
		return s
	}
	N := 0 // pairs with distinct x
	finite, increasing := true, true
	for i := range n {
		if math.IsInf(x[i], 0) || math.IsInf(y[i], 0) || x[i] != x[i] || y[i] != y[i] {
			finite = false
		}
		if i > 0 && !(x[i] > x[i-1]) {
			increasing = false
		}
	}
	if increasing { // no ties (the drift's daily medians)
		N = n * (n - 1) / 2
	} else {
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				if x[j] != x[i] {
					N++
				}
			}
		}
	}
	if N == 0 {
		return s
	}
	z := distuv.UnitNormal.Quantile(0.5 + conf/2)
	fn := float64(n)
	c := z * math.Sqrt(fn*(fn-1)*(2*fn+5)/18)
	lo := max(int(math.Floor((float64(N)-c)/2))-1, 0) // 0-based
	hi := min(int(math.Ceil((float64(N)+c)/2)), N-1)  // 0-based of the (…+1)-th
	if finite && N > 4096 {
		if w, ok := theilSenWindow(x, y, N, lo, hi, a); ok {
			return w.withIntercept(x, y, a)
		}
	}
	slopes := a.floats(N)[:0]
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			if dx := x[j] - x[i]; dx != 0 {
				slopes = append(slopes, (y[j]-y[i])/dx)
			}
		}
	}
	if hasNaN(slopes) {
		sort.Float64s(slopes)
		s.Slope, s.Lo, s.Hi = sortedMedian(slopes), slopes[lo], slopes[hi]
		return s.withIntercept(x, y, a)
	}
	s.Slope, s.Lo, s.Hi = orderStats(slopes, lo, N/2, hi, N%2 == 0)
	return s.withIntercept(x, y, a)
}

// orderStats returns the k-th smallest of v (with even, the mean of the
// (k−1)-th and the k-th: a median), and the lo-th and hi-th smallest
// (0-based, lo ≤ k ≤ hi, lo < k with even), the values a full sort puts
// there; v is reordered and must hold no NaN. The three are found by
// selection, each within the part the one before left (linear time).
func orderStats(v []float64, lo, k, hi int, even bool) (med, l, h float64) {
	selectK(v, k)
	med = v[k]
	if even {
		med = 0.5 * (maxOf(v[:k]) + v[k])
	}
	switch {
	case lo < k:
		l = orderStat(v[:k], lo)
	default:
		l = v[lo] // lo == k
	}
	switch {
	case hi > k:
		h = orderStat(v[k+1:], hi-k-1)
	default:
		h = v[hi]
	}
	return med, l, h
}

// theilSenWindow finds the median and the lo-th and hi-th of the N pair
// slopes of finite x, y without keeping them all: the slopes of a
// pseudo-random sample of pairs give a range [a, b] that should hold
// ranks lo to hi; one pass over all pairs counts the slopes below a and
// keeps those within [a, b], and the order statistics are selected among
// the kept ones (their ranks shifted by the count below). The values are
// exactly those of a full selection; false when the range missed a rank
// (then the caller selects among all slopes).
func theilSenWindow(x, y []float64, N, lo, hi int, ar *arena) (Slope, bool) {
	n := len(x)
	const m = 1024
	sample := ar.floats(m)[:0]
	state := uint64(0x9E3779B97F4A7C15)
	for tries := 0; len(sample) < m && tries < 4*m; tries++ {
		state = state*6364136223846793005 + 1442695040888963407 // Knuth's MMIX LCG
		i, j := int((state>>33)%uint64(n)), int((state>>13)%uint64(n))
		if dx := x[j] - x[i]; dx != 0 {
			sample = append(sample, (y[j]-y[i])/dx)
		}
	}
	if len(sample) < m/2 {
		return Slope{}, false
	}
	ms := float64(len(sample))
	// Bounds at the sample quantiles of lo/N and hi/N widened by about
	// four standard errors of a sample quantile (a miss costs a second
	// pass, never a wrong value).
	rank := func(q, side float64) int {
		r := q*ms + side*(4*math.Sqrt(ms*q*(1-q))+4)
		return int(max(-1, min(r, ms)))
	}
	ra, rb := rank(float64(lo)/float64(N), -1), rank(float64(hi+1)/float64(N), 1)
	a, b := math.Inf(-1), math.Inf(1)
	if rb < len(sample) {
		b = orderStat(sample, rb)
	}
	if ra >= 0 {
		a = orderStat(sample[:min(rb, len(sample))], ra)
	}
	want := int(1.25*float64(N)*float64(rb-ra)/ms) + 256 // the expected count is passed half the time
	below := 0
	kept := ar.floats(want)[:0] // grows by append beyond want, off the arena
	for i := 0; i < n; i++ {
		xi, yi := x[i], y[i]
		for j := i + 1; j < n; j++ {
			if dx := x[j] - xi; dx != 0 {
				switch s := (y[j] - yi) / dx; {
				case s < a:
					below++
				case s <= b:
					kept = append(kept, s)
				}
			}
		}
	}
	k := N / 2
	first := k
	if N%2 == 0 {
		first = k - 1
	}
	if below > min(lo, first) || below+len(kept) <= hi {
		return Slope{}, false
	}
	med, l, h := orderStats(kept, lo-below, k-below, hi-below, N%2 == 0)
	return Slope{Slope: med, Lo: l, Hi: h, N: n, Intercept: math.NaN()}, true
}

// withIntercept sets Sen's intercept, the median of y − slope·x.
func (s Slope) withIntercept(x, y []float64, a *arena) Slope {
	res := a.floats(len(x))
	for i := range x {
		res[i] = y[i] - s.Slope*x[i]
	}
	s.Intercept = median(res)
	return s
}
