package model

import (
	"math"
	"sort"
)

// Flag names (DESIGN.md §4.9).
const (
	FlagLevel  = "level"  // recent level well above the fleet's
	FlagGrowth = "growth" // drift over the trailing window
	FlagStep   = "step"   // a sudden increase that is still there
)

// TailAssessment is a tail's trend with its flags and cost.
type TailAssessment struct {
	TailTrend
	Flags        []string
	Improvements []Step  // significant decreases of at least StepPP
	ExcessFuel   float64 // kg per year: recent level × expected fuel flow × cruise hours; NaN without a recent level
	CO2          float64 // kg per year, 3.16 × ExcessFuel (ICAO); NaN likewise
	Money        float64 // ExcessFuel × fuel price; 0 without a price, NaN likewise
}

// Fleet is the assessment of all tails, most severe first.
type Fleet struct {
	Tails           []TailAssessment
	MedianRecentPct float64 // median of the tails' recent levels; NaN if none
	Flagged         int
	// ExcessFuel, CO2 and Money are the sums over the tails that have a
	// figure (kg, kg and currency a year): net, so a tail below its
	// baseline counts against the others. NaN when no tail has one.
	ExcessFuel, CO2, Money float64
	// Types groups the tails by TailTrend.Type: the count and the median
	// recent level of each, the reference of its tails' level flags.
	Types map[string]TypeGroup
}

// TypeGroup is the tails of one type in a fleet.
type TypeGroup struct {
	Tails           int
	MedianRecentPct float64 // NaN when no tail of the type has a recent level
}

// AssessFleet flags each tail (DESIGN.md §4.9) and prices its excess
// (§4.10):
//
//	level  — recent level ≥ the median recent level of the tails of its
//	         own type (TailTrend.Type; one group when unset) + LevelPP;
//	growth — drift × DriftDays ≥ GrowthPP and the drift's 95 % interval excludes zero;
//	step   — an increase ≥ StepPP that a later decrease of at least half its size has not undone.
//
// Decreases are reported as improvements, never flagged. Excess fuel per
// year = recent level/100 × median expected fuel flow × CruiseHours
// (the tail's own, when set); CO2 = 3.16 kg per kg of fuel (ICAO).
func AssessFleet(trends []TailTrend, c TrendConfig) Fleet {
	var levels []float64
	byType := map[string][]float64{}
	f := Fleet{ExcessFuel: math.NaN(), CO2: math.NaN(), Money: math.NaN(), Types: map[string]TypeGroup{}}
	for _, t := range trends {
		g := f.Types[t.Type]
		g.Tails++
		f.Types[t.Type] = g
		if !math.IsNaN(t.RecentPct) {
			levels = append(levels, t.RecentPct)
			byType[t.Type] = append(byType[t.Type], t.RecentPct)
		}
	}
	f.MedianRecentPct = median(levels)
	for name, g := range f.Types {
		g.MedianRecentPct = median(byType[name])
		f.Types[name] = g
	}
	for _, t := range trends {
		a := TailAssessment{TailTrend: t, Flags: []string{}, ExcessFuel: math.NaN(), CO2: math.NaN(), Money: math.NaN()}
		if ref := f.Types[t.Type].MedianRecentPct; !math.IsNaN(t.RecentPct) && !math.IsNaN(ref) && t.RecentPct >= ref+c.LevelPP {
			a.Flags = append(a.Flags, FlagLevel)
		}
		if d := t.Drift; !math.IsNaN(d.Slope) && d.Slope*c.DriftDays/100 >= c.GrowthPP && d.Lo > 0 {
			a.Flags = append(a.Flags, FlagGrowth)
		}
		for i, s := range t.Steps {
			if s.SizePct <= -c.StepPP {
				a.Improvements = append(a.Improvements, s)
			}
			if s.SizePct < c.StepPP || undone(s, t.Steps[i+1:]) {
				continue
			}
			if len(a.Flags) == 0 || a.Flags[len(a.Flags)-1] != FlagStep {
				a.Flags = append(a.Flags, FlagStep)
			}
		}
		if !math.IsNaN(t.RecentPct) && !math.IsNaN(t.FuelFlowExpected) {
			a.ExcessFuel = t.FuelPerYear(t.RecentPct, c)
			a.CO2 = CO2PerFuel * a.ExcessFuel
			a.Money = a.ExcessFuel * c.FuelPrice
			if math.IsNaN(f.ExcessFuel) {
				f.ExcessFuel, f.CO2, f.Money = 0, 0, 0
			}
			f.ExcessFuel += a.ExcessFuel
			f.CO2 += a.CO2
			f.Money += a.Money
		}
		if len(a.Flags) > 0 {
			f.Flagged++
		}
		f.Tails = append(f.Tails, a)
	}
	sort.SliceStable(f.Tails, func(i, j int) bool { return severer(&f.Tails[i], &f.Tails[j]) })
	return f
}

// undone reports whether a later decrease took back at least half of s.
func undone(s Step, later []Step) bool {
	for _, l := range later {
		if l.SizePct <= -0.5*s.SizePct {
			return true
		}
	}
	return false
}

// FuelPerYear is the fuel a deviation of pct % costs the tail a year, kg:
// pct/100 × its median expected cruise fuel flow (kg/s) × 3600 × its cruise
// hours a year (its own, or the configuration's). Negative for a saving:
// the fuel a step down of a repair saves is FuelPerYear of its size. NaN
// without an expected fuel flow.
func (t *TailTrend) FuelPerYear(pct float64, c TrendConfig) float64 {
	hours := c.CruiseHours
	if t.CruiseHours > 0 {
		hours = t.CruiseHours
	}
	return pct / 100 * t.FuelFlowExpected * Hour * hours
}

// severer orders tails: more flags first, then more excess fuel, then a
// higher recent level, then by name.
func severer(a, b *TailAssessment) bool {
	if len(a.Flags) != len(b.Flags) {
		return len(a.Flags) > len(b.Flags)
	}
	if ae, be := nanLow(a.ExcessFuel), nanLow(b.ExcessFuel); ae != be {
		return ae > be
	}
	ar, br := nanLow(a.RecentPct), nanLow(b.RecentPct)
	if ar != br {
		return ar > br
	}
	return a.Tail < b.Tail
}

func nanLow(v float64) float64 {
	if math.IsNaN(v) {
		return math.Inf(-1)
	}
	return v
}

// DeviationRange is the 2nd and 98th percentiles (linear interpolation,
// as gonum's stat.Quantile with LinInterp) of every per-flight deviation of the fleet, %: a
// common scale for comparing tails that a few outliers do not flatten. It
// is −1…1 around the only value when all are equal, and 0…1 without
// flights.
func (f Fleet) DeviationRange() (lo, hi float64) {
	var v []float64
	for _, a := range f.Tails {
		for _, fl := range a.Flights {
			if !math.IsNaN(fl.DevPct) {
				v = append(v, fl.DevPct)
			}
		}
	}
	if len(v) == 0 {
		return 0, 1
	}
	lo, hi = linInterpQuantile(v, 0.02), linInterpQuantile(v, 0.98)
	if !(hi > lo) {
		return lo - 1, lo + 1
	}
	return lo, hi
}

// linInterpQuantile is gonum's stat.Quantile(p, stat.LinInterp, x, nil) of
// the sorted v, without sorting v (a fleet has hundreds of thousands of
// flights): the i-th of n values sits at cumulative probability (i+1)/n,
// and p·n falling between i and i+1 interpolates between the (i−1)-th and
// the i-th smallest, i = ⌈p·n⌉ − 1, which selection finds (v is reordered;
// no NaN).
func linInterpQuantile(v []float64, p float64) float64 {
	fidx := p * float64(len(v))
	i := max(0, int(math.Ceil(fidx))-1)
	i = min(i, len(v)-1)
	selectK(v, i)
	if i == 0 {
		return v[0]
	}
	t := float64(i+1) - fidx
	return t*maxOf(v[:i]) + (1-t)*v[i]
}
