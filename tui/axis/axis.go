// Package axis places the ticks of a chart axis at round values: multiples
// of a 1-2-5 step for numbers, month starts for dates. The dashboard's
// charts and the report's PNG plots both use it, so that an axis reads the
// same on screen and on paper.
package axis

import (
	"math"
	"time"
)

// Step is the step of 1, 2 or 5 × 10^k that gives at most n intervals over
// span (1 when span is not positive or n < 1).
func Step(span float64, n int) float64 {
	if !(span > 0) || n < 1 {
		return 1
	}
	raw := span / float64(n)
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= raw {
			return m * p
		}
	}
	return 10 * p
}

// Values returns the multiples of Step(hi−lo, n) within lo…hi, in order,
// without a negative zero.
func Values(lo, hi float64, n int) []float64 {
	step := Step(hi-lo, n)
	var out []float64
	// Each value is k·step, rounded to the step's decimals, so that no
	// error accumulates (0.1 + 0.2 is not 0.3).
	dec := max(0, -int(math.Floor(math.Log10(step))))
	scale := math.Pow(10, float64(dec))
	for k := math.Ceil(lo/step - 1e-9); k*step <= hi+1e-9*step; k++ {
		v := math.Round(k*step*scale) / scale
		if v == 0 {
			v = 0 // no negative zero
		}
		out = append(out, v)
	}
	return out
}

// Months returns the starts (UTC) of the months within start…end, every
// 1st, 2nd, 3rd, 6th or 12th month counted from January, the smallest
// spacing that gives at most n of them; every is that spacing.
func Months(start, end time.Time, n int) (starts []time.Time, every int) {
	start, end = start.UTC(), end.UTC()
	months := (end.Year()-start.Year())*12 + int(end.Month()-start.Month()) + 1
	every = 12
	for _, k := range []int{1, 2, 3, 6, 12} {
		if months/k <= max(n, 1) {
			every = k
			break
		}
	}
	m := time.Date(start.Year(), start.Month(), 1, 0, 0, 0, 0, time.UTC)
	if m.Before(start) {
		m = m.AddDate(0, 1, 0)
	}
	for ; !m.After(end); m = m.AddDate(0, 1, 0) {
		if (int(m.Month())-1)%every == 0 {
			starts = append(starts, m)
		}
	}
	return starts, every
}
