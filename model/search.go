package model

import "gonum.org/v1/gonum/floats"

// argmax returns the x in [lo, hi] that maximises f, and f there. It scans n
// evenly spaced points (gonum floats.Span, floats.MaxIdx) and refines the
// best one by golden-section search between its neighbours to tol. f must be
// unimodal at the grid's resolution. gonum has no bounded scalar optimiser,
// hence the short golden-section loop here.
func argmax(f func(float64) float64, lo, hi float64, n int, tol float64) (x, fx float64) {
	xs := floats.Span(make([]float64, n), lo, hi)
	ys := make([]float64, n)
	for i, v := range xs {
		ys[i] = f(v)
	}
	i := floats.MaxIdx(ys)
	a, b := xs[max(i-1, 0)], xs[min(i+1, n-1)]
	const invPhi = 0.6180339887498949 // (√5 − 1)/2
	c, d := b-invPhi*(b-a), a+invPhi*(b-a)
	fc, fd := f(c), f(d)
	for b-a > tol {
		if fc >= fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = f(d)
		}
	}
	x = 0.5 * (a + b)
	fx = f(x)
	// The grid point itself may beat the refined one at a boundary maximum.
	if ys[i] > fx {
		return xs[i], ys[i]
	}
	return x, fx
}

// bisect returns the root of f in [lo, hi] to tol, given f(lo) and f(hi) of
// opposite sign (plain bisection; gonum has no scalar root finder).
func bisect(f func(float64) float64, lo, hi, tol float64) float64 {
	flo := f(lo)
	for hi-lo > tol {
		mid := 0.5 * (lo + hi)
		fm := f(mid)
		if (fm > 0) == (flo > 0) {
			lo, flo = mid, fm
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi)
}
