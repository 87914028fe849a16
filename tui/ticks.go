package tui

import (
	"math"
	"strconv"
	"time"

	"dragdeck/tui/axis"
)

// tick is a labelled position on a chart axis.
type tick struct {
	v     float64
	label string
}

// niceStep is axis.Step: a 1-2-5 step giving at most n intervals over span.
func niceStep(span float64, n int) float64 { return axis.Step(span, n) }

// niceTicks returns ticks at round multiples of a 1-2-5 step within lo…hi,
// at most about n of them.
func niceTicks(lo, hi float64, n int, format func(float64) string) []tick {
	var out []tick
	for _, v := range axis.Values(lo, hi, n) {
		out = append(out, tick{v, format(v)})
	}
	return out
}

// monthTicks returns a tick at the start of each month (or of every 2nd,
// 3rd, 6th or 12th month, so that at most n fit) between start and end; x
// maps a time to the chart's x value.
func monthTicks(start, end time.Time, n int, x func(time.Time) float64) []tick {
	starts, every := axis.Months(start, end, n)
	var out []tick
	for _, m := range starts {
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
