package model

import (
	"math"
	"slices"
	"sort"
	"time"

	"gonum.org/v1/gonum/stat"
)

// The back-test of the fuel factor replays a fleet's history month by
// month and plans each flight with a factor chosen from the data before
// it, against the fuel the flight burnt. Per flight, per cruise hour:
//
//	planned − burnt = 3600 · mean over its usable snapshots of
//	                  (FF_expected · (1 + f/100) − FF), kg/h,
//
// f the factor in force at the flight (0 before any is set). Three ways
// of choosing f are compared: none (f = 0), one factor for the whole
// fleet (the policy applied to the median of the tails' monitored levels
// of each month), and each tail's own factor under the policy. A factor
// decided on a month's level is in force from the month's end. The
// monitored levels see only the flights before their time; the steps
// that cut their windows are those the whole history shows.

// PlanFlight is one flight of a back-test: the mean book (expected) and
// burnt fuel flow of its usable snapshots, kg/s.
type PlanFlight struct {
	UnixNano    int64 // the flight's first snapshot
	Book, Burnt float64
}

// PlanFlights groups a tail's points (time order) into flights as the
// trend does (usable points only, Flights) and gives each its mean book
// and burnt fuel flow.
func PlanFlights(pts []TrendPoint, c *TrendConfig) []PlanFlight {
	var out []PlanFlight
	var prev *TrendPoint
	n := 0
	for i := range pts {
		p := &pts[i]
		if c.Usable(*p) != "" || math.IsNaN(p.FuelFlowDevPct) {
			continue
		}
		if prev == nil || NextFlight(prev, p, c.FlightGap) {
			if n > 0 {
				out[len(out)-1].Book /= float64(n)
				out[len(out)-1].Burnt /= float64(n)
			}
			out, n = append(out, PlanFlight{UnixNano: p.UnixNano}), 0
		}
		f := &out[len(out)-1]
		f.Book += p.FuelFlowExpected
		f.Burnt += p.FuelFlowExpected * (1 + p.FuelFlowDevPct/100)
		n++
		prev = p
	}
	if n > 0 {
		out[len(out)-1].Book /= float64(n)
		out[len(out)-1].Burnt /= float64(n)
	}
	return out
}

// BacktestTail is what the back-test needs of one tail.
type BacktestTail struct {
	Tail, Type string
	Flights    []PlanFlight  // time order
	History    []FactorLevel // FactorHistory of its factor series
}

// PlanError summarises |planned − burnt| per flight, kg per cruise hour.
type PlanError struct {
	Flights     int
	MedianAbs   float64 // median of |planned − burnt|
	P95Abs      float64 // 95th percentile of |planned − burnt|
	MeanSigned  float64 // mean planned − burnt (+: fuel carried that was not needed)
	TotalAbsKgh float64 // sum of |planned − burnt| over the flights, kg per cruise hour of each
}

// Backtest is the back-test of a fleet: the three ways of planning.
type Backtest struct {
	None, Fleet, PerTail PlanError
	Changes              int // per-tail factor changes made over the history
	FleetChanges         int // fleet factor changes
	Months               int // monthly periods of the history
}

// RunBacktest plans every flight of the tails with no factor, one fleet
// factor and per-tail factors under policy p (see the comment above), and
// summarises the errors.
func RunBacktest(tails []BacktestTail, p FactorPolicy) Backtest {
	// The fleet's monthly level: the median of the tails' levels at each
	// month's end (their last, partial month left out).
	byPeriod := map[string][]float64{}
	periodEnd := map[string]time.Time{}
	for _, t := range tails {
		for i, l := range t.History {
			if i == len(t.History)-1 || !l.OK() {
				continue
			}
			k := Period(l.At)
			byPeriod[k] = append(byPeriod[k], l.Pct)
			periodEnd[k] = l.At
		}
	}
	periods := make([]string, 0, len(byPeriod))
	for k := range byPeriod {
		periods = append(periods, k)
	}
	sort.Strings(periods)
	var fleetHist []FactorLevel
	type change struct {
		at  int64
		pct float64
	}
	var fleetSched []change
	inUse := 0.0
	bt := Backtest{Months: len(periods)}
	for _, k := range periods {
		v := byPeriod[k]
		lv := FactorLevel{At: periodEnd[k], Pct: Median(slices.Clone(v)), Lo: math.NaN(), Hi: math.NaN(), Flights: len(v)}
		fleetHist = append(fleetHist, lv)
		if pr := p.Propose(fleetHist, inUse, 0); pr.Proposed {
			inUse = pr.TargetPct
			fleetSched = append(fleetSched, change{lv.At.UnixNano(), inUse})
			bt.FleetChanges++
		}
	}
	factorAt := func(s []change, ns int64) float64 {
		f := 0.0
		for _, c := range s {
			if c.at < ns {
				f = c.pct
			}
		}
		return f
	}
	var none, fleet, own []float64
	for _, t := range tails {
		var sched []change
		use := 0.0
		for i := range t.History {
			if i == len(t.History)-1 {
				break // the partial month's level plans no flight of the history
			}
			pr := p.Propose(t.History[:i+1], use, p.BasicPct[t.Type])
			if pr.Proposed {
				use = pr.TargetPct
				sched = append(sched, change{t.History[i].At.UnixNano(), use})
				bt.Changes++
			}
		}
		for _, f := range t.Flights {
			err := func(pct float64) float64 { return Hour * (f.Book*(1+pct/100) - f.Burnt) }
			none = append(none, err(0))
			fleet = append(fleet, err(factorAt(fleetSched, f.UnixNano)))
			own = append(own, err(factorAt(sched, f.UnixNano)))
		}
	}
	bt.None, bt.Fleet, bt.PerTail = planError(none), planError(fleet), planError(own)
	return bt
}

// planError summarises the signed errors e (gonum's stat.Mean and
// stat.Quantile, empirical, of the sorted absolute values).
func planError(e []float64) PlanError {
	pe := PlanError{Flights: len(e), MedianAbs: math.NaN(), P95Abs: math.NaN(), MeanSigned: math.NaN()}
	if len(e) == 0 {
		return pe
	}
	pe.MeanSigned = stat.Mean(e, nil)
	abs := make([]float64, len(e))
	for i, v := range e {
		abs[i] = math.Abs(v)
		pe.TotalAbsKgh += abs[i]
	}
	sort.Float64s(abs)
	pe.MedianAbs = Median(slices.Clone(abs))
	pe.P95Abs = stat.Quantile(0.95, stat.Empirical, abs, nil)
	return pe
}
