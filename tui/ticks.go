package tui

import (
	"math"
	"strconv"
	"time"
)

// tick is a labelled position on a chart axis.
type tick struct {
	v     float64
	label string
}

// niceStep is the step of 1, 2 or 5 × 10^k that gives at most n intervals
// over span.
func niceStep(span float64, n int) float64 {
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

// niceTicks returns ticks at round multiples of a 1-2-5 step within lo…hi,
// at most about n of them.
func niceTicks(lo, hi float64, n int, format func(float64) string) []tick {
	step := niceStep(hi-lo, n)
	var out []tick
	for v := math.Ceil(lo/step-1e-9) * step; v <= hi+1e-9*step; v += step {
		v += 0 // no negative zero in a label
		out = append(out, tick{v, format(v)})
	}
	return out
}

// monthTicks returns a tick at the start of each month (or of every 2nd,
// 3rd, 6th or 12th month, so that at most n fit) between start and end; x
// maps a time to the chart's x value.
func monthTicks(start, end time.Time, n int, x func(time.Time) float64) []tick {
	start, end = start.UTC(), end.UTC()
	months := (end.Year()-start.Year())*12 + int(end.Month()-start.Month()) + 1
	every := 12
	for _, k := range []int{1, 2, 3, 6, 12} {
		if months/k <= max(n, 1) {
			every = k
			break
		}
	}
	var out []tick
	m := time.Date(start.Year(), start.Month(), 1, 0, 0, 0, 0, time.UTC)
	if m.Before(start) {
		m = m.AddDate(0, 1, 0)
	}
	for ; !m.After(end); m = m.AddDate(0, 1, 0) {
		if (int(m.Month())-1)%every != 0 {
			continue
		}
		label := m.Format("Jan")
		if m.Month() == time.January || every >= 12 {
			label = m.Format("2006")
		}
		out = append(out, tick{x(m), label})
	}
	return out
}

// fmtG formats v with one decimal, for tick labels.
func fmtG(v float64) string {
	if math.Abs(v) < 1e-9 {
		v = 0
	}
	return strconv.FormatFloat(v, 'f', 1, 64)
}

// dateTicks labels a time axis: month starts when at least two fall in
// start…end, else whole days (labelled "02 Jan"); x maps a time to the
// chart's x value in days.
func dateTicks(start, end time.Time, n int, x func(time.Time) float64) []tick {
	if t := monthTicks(start, end, n, x); len(t) >= 2 {
		return t
	}
	return niceTicks(x(start), x(end), n, func(v float64) string {
		return time.Unix(int64(math.Round(v*86400)), 0).UTC().Format("02 Jan")
	})
}
