package model

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"time"

	"gonum.org/v1/gonum/stat/distuv"
)

// The monitored fuel factor of a tail is what flight planning should add
// to the book fuel flow of that tail: the deviation of the measured fuel
// flow from the one the baseline polar and the engine model expect,
//
//	factor % = 100 (FF − FF_expected) / FF_expected,
//	FF_expected = TSFC(M, θ) · (CD_baseline q S + W g0 sinγ + W dV/dt) / g0,
//
// per snapshot (Point.FuelFlowDevPct, TrendPoint.FuelFlowDevPct): both
// series together, the airframe's drag and the engine's consumption at
// that drag. With thrust from fan speed, 1 + factor = (1 + engine
// deviation) · (Fn / thrust expected), Fn the thrust from the fan speed;
// without it the factor is the fuel-flow deviation itself. Per flight,
// the median of its usable snapshots (the trend's points); per tail, the
// median of the flights of a trailing window (FactorLevel), with a
// distribution-free interval for that median from the order statistics
// (MedianInterval). Using cruise monitoring to set the planning factor is
// the trade's common practice (no single source).

// FactorSeries returns the per-flight series of the fuel factor of a
// tail's points (in time order): the usable points under c, grouped into
// flights as the trend groups them (Flights: a new flight when the flight
// changes or the gap from the usable point before exceeds c.FlightGap),
// each flight's value the median fuel-flow deviation of its snapshots.
// buf, when not nil, is a buffer for the flights, kept for the next call
// (the result then lives in it).
func FactorSeries(pts []TrendPoint, c *TrendConfig, buf *[]FlightPoint) []FlightPoint {
	var out []FlightPoint
	if buf != nil {
		out = (*buf)[:0]
	}
	var vals [64]float64
	devs := vals[:0]
	start := -1 // the flight's first usable point
	prev := -1  // the usable point before
	flush := func() {
		if start >= 0 {
			out = append(out, FlightPoint{UnixNano: pts[start].UnixNano, Flight: pts[start].Flight, DevPct: median(devs), N: int32(len(devs))})
		}
	}
	for i := range pts {
		p := &pts[i]
		if math.IsNaN(p.FuelFlowDevPct) || c.Usable(*p) != "" {
			continue
		}
		if prev < 0 || NextFlight(&pts[prev], p, c.FlightGap) {
			flush()
			start, devs = i, devs[:0]
		}
		devs = append(devs, p.FuelFlowDevPct)
		prev = i
	}
	flush()
	if buf != nil {
		*buf = out
	}
	return out
}

// FactorLevel is the monitored fuel factor of a tail at one time: the
// median of the per-flight factors of the trailing window that ends then.
type FactorLevel struct {
	At      time.Time // end of the window (a month's end, or the tail's last snapshot)
	From    time.Time // start of the window: At − the window, or a later step or event
	Pct     float64   // median per-flight factor, %; NaN when none (Reason says why)
	Lo, Hi  float64   // its 95 % interval (MedianInterval), %; NaN likewise
	Flights int       // flights in the window
	Reason  string    // why there is no level ("" when Pct is a number)
}

// OK reports whether the level is a number a proposal may use.
func (l FactorLevel) OK() bool { return l.Reason == "" && !math.IsNaN(l.Pct) }

// FactorConfig is the window of the monitored factor.
type FactorConfig struct {
	WindowDays float64 // trailing window (30 days)
	MinFlights int     // fewest flights behind a level (20)
	Confidence float64 // of the interval (0.95)
}

// DefaultFactorConfig returns the defaults: 30 days, 20 flights, 95 %.
func DefaultFactorConfig() FactorConfig {
	return FactorConfig{WindowDays: 30, MinFlights: 20, Confidence: 0.95}
}

// MonitorFactor is the monitored factor at time at, of the per-flight
// series fl (time order): the flights of [at − WindowDays, at], or from
// the last restart (a step of either series, an event, a change of type)
// at or before at, when that is later. No level from fewer than
// MinFlights flights; the reason names a restart that cut the window.
func MonitorFactor(fl []FlightPoint, restarts []time.Time, at time.Time, c FactorConfig) FactorLevel {
	return monitorFactor(fl, restarts, at, c, nil)
}

// monitorFactor is MonitorFactor with a buffer for the window's values,
// kept for the next call (nil: a fresh one).
func monitorFactor(fl []FlightPoint, restarts []time.Time, at time.Time, c FactorConfig, buf *[]float64) FactorLevel {
	from := at.Add(-time.Duration(c.WindowDays * 24 * float64(time.Hour)))
	var cut time.Time
	for _, r := range restarts {
		if r.After(from) && !r.After(at) {
			from, cut = r, r
		}
	}
	lv := FactorLevel{At: at, From: from, Pct: math.NaN(), Lo: math.NaN(), Hi: math.NaN()}
	lo := sort.Search(len(fl), func(i int) bool { return fl[i].UnixNano >= from.UnixNano() })
	hi := sort.Search(len(fl), func(i int) bool { return fl[i].UnixNano > at.UnixNano() })
	var v []float64
	if buf != nil {
		v = (*buf)[:0]
		defer func() { *buf = v }()
	}
	for _, f := range fl[lo:max(hi, lo)] {
		v = append(v, f.DevPct)
	}
	lv.Flights = len(v)
	if len(v) < max(c.MinFlights, 1) {
		lv.Reason = fmt.Sprintf("%d flights in the window, %d needed", len(v), max(c.MinFlights, 1))
		if !cut.IsZero() {
			lv.Reason = fmt.Sprintf("%d flights since the step or event of %s, %d needed", len(v), cut.Format(time.DateOnly), max(c.MinFlights, 1))
		}
		return lv
	}
	slices.Sort(v)
	lv.Pct = sortedMedian(v)
	lv.Lo, lv.Hi = MedianInterval(v, c.Confidence)
	return lv
}

// MedianInterval returns the distribution-free confidence interval for the
// median of the sorted sample v: the order statistics x(l) and x(n+1−l),
// l the largest rank with P(B ≤ l − 1) ≤ (1 − conf)/2 for B ~ Binomial(n,
// ½), whose coverage is at least conf for any continuous distribution
// (Conover, Practical Nonparametric Statistics, 3rd ed., 1999, §3.2; the
// binomial from gonum's distuv). NaN when n is too small for conf (n < 6 at
// 95 %).
func MedianInterval(v []float64, conf float64) (lo, hi float64) {
	n := len(v)
	if n == 0 {
		return math.NaN(), math.NaN()
	}
	l := medianRank(n, conf)
	if l == 0 {
		return math.NaN(), math.NaN()
	}
	return v[l-1], v[n-l]
}

// medianRank is the rank l of MedianInterval (0 when none qualifies):
// the largest k ≤ (n+1)/2 with P(B ≤ k − 1) ≤ (1 − conf)/2. The search
// starts at the normal approximation n/2 − z √n / 2 and steps from there
// (the CDF is monotone in k), a few CDF calls instead of n/2.
func medianRank(n int, conf float64) int {
	b := distuv.Binomial{N: float64(n), P: 0.5}
	alpha := (1 - conf) / 2
	ok := func(k int) bool { return b.CDF(float64(k-1)) <= alpha }
	top := (n + 1) / 2
	if top < 1 || !ok(1) {
		return 0
	}
	z := distuv.UnitNormal.Quantile(1 - alpha)
	k := max(1, min(top, int(float64(n)/2-z*math.Sqrt(float64(n))/2)))
	for k > 1 && !ok(k) {
		k--
	}
	for k < top && ok(k+1) {
		k++
	}
	return k
}

// FactorHistory is the monitored factor at the end of each calendar month
// (UTC) from the month of the first flight to the month before the last
// one, then at the last flight's time: the periods a fuel-factor policy
// looks back on (FactorPolicy.Propose), oldest first. Nil without flights.
func FactorHistory(fl []FlightPoint, restarts []time.Time, c FactorConfig) []FactorLevel {
	if len(fl) == 0 {
		return nil
	}
	first, last := fl[0].At(), fl[len(fl)-1].At()
	months := (last.Year()-first.Year())*12 + int(last.Month()) - int(first.Month()) + 1
	out := make([]FactorLevel, 0, max(months, 1))
	var buf []float64
	for end := MonthStart(first).AddDate(0, 1, 0); end.Before(last); end = end.AddDate(0, 1, 0) {
		// the level of the month that ends at end, taken just before it
		out = append(out, monitorFactor(fl, restarts, end.Add(-time.Nanosecond), c, &buf))
	}
	return append(out, monitorFactor(fl, restarts, last, c, &buf))
}

// MonthStart is the first instant of t's calendar month (UTC).
func MonthStart(t time.Time) time.Time {
	t = t.UTC()
	return time.Date(t.Year(), t.Month(), 1, 0, 0, 0, 0, time.UTC)
}

// Period names the month of a level, as "2026-11".
func Period(t time.Time) string { return t.UTC().Format("2006-01") }
