package model

import "math"

// Search settings for the cruise optimum. Mach is searched on
// [minSearchMach, MMO]; altitude on [0, ceiling].
const (
	minSearchMach = 0.2
	machGrid      = 161  // points in the Mach scan before refinement
	machTol       = 1e-6 // Mach
	altStep       = 500.0 * Foot
	altTol        = 0.5 // m
	// LongRangeFraction is the trade's long-range cruise convention: the
	// higher Mach at which specific range is 99 % of its maximum.
	LongRangeFraction = 0.99
	// BuffetMargin is the load factor to buffet onset kept at the maximum
	// altitude: 1.3 g, i.e. a 39.7° bank (common practice).
	BuffetMargin = 1.3
)

// MaxRangeMach returns the Mach of greatest specific range, Mach ≤ MMO.
func MaxRangeMach(t *Type, w float64, air Air, excess float64) Level {
	m, _ := argmax(func(m float64) float64 { return LevelFlight(t, w, air, m, excess).SR },
		minSearchMach, t.MMO, machGrid, machTol)
	return LevelFlight(t, w, air, m, excess)
}

// LongRangeMach returns the higher Mach at which specific range is
// LongRangeFraction of its maximum, capped at MMO; mr is the max-range level.
func LongRangeMach(t *Type, w float64, air Air, excess float64, mr Level) Level {
	target := LongRangeFraction * mr.SR
	g := func(m float64) float64 { return LevelFlight(t, w, air, m, excess).SR - target }
	if mr.Mach >= t.MMO || g(t.MMO) >= 0 {
		return LevelFlight(t, w, air, t.MMO, excess)
	}
	return LevelFlight(t, w, air, bisect(g, mr.Mach, t.MMO, machTol), excess)
}

// MinDragMach returns the Mach of least drag, Mach ≤ MMO.
func MinDragMach(t *Type, w float64, air Air, excess float64) Level {
	m, _ := argmax(func(m float64) float64 { return -LevelFlight(t, w, air, m, excess).Drag },
		minSearchMach, t.MMO, machGrid, machTol)
	return LevelFlight(t, w, air, m, excess)
}

// EconMach returns the Mach of least cost per distance, (FF + CI)/TAS, for a
// cost index ci in kg of fuel per second of time (the trade's kg/min ÷ 60);
// ci = 0 gives the maximum-range Mach.
func EconMach(t *Type, w float64, air Air, excess, ci float64) Level {
	m, _ := argmax(func(m float64) float64 {
		l := LevelFlight(t, w, air, m, excess)
		return -(l.FuelFlow + ci) / l.TAS
	}, minSearchMach, t.MMO, machGrid, machTol)
	return LevelFlight(t, w, air, m, excess)
}

// Limit names what bounds the maximum altitude.
type Limit string

// The limits of the maximum altitude.
const (
	LimitCeiling Limit = "ceiling" // the type's max_alt_ft
	LimitBuffet  Limit = "buffet"  // 1.3 g buffet margin at long-range Mach
	LimitThrust  Limit = "thrust"  // maximum cruise thrust at long-range Mach
	LimitNone    Limit = "none"    // no altitude from 0 up is feasible
)

// levelLimit reports which limit, if any, level flight at weight w at
// altitude h with ISA deviation dev violates at long-range Mach.
func levelLimit(t *Type, w, h, dev, excess float64) Limit {
	air := AirISA(h, dev)
	lrc := LongRangeMach(t, w, air, excess, MaxRangeMach(t, w, air, excess))
	switch {
	case BuffetMargin*lrc.CL > t.CLBuffet:
		return LimitBuffet
	case lrc.Drag > t.MaxThrust(air.Delta()):
		return LimitThrust
	}
	return ""
}

// MaxAltitude returns the highest pressure altitude (m) at or below the
// type's ceiling at which level flight at long-range Mach keeps the 1.3 g
// buffet margin (CL · 1.3 ≤ cl_buffet) and, if the type gives it, has the
// thrust; and the limit that binds there (DESIGN.md §4.7).
func MaxAltitude(t *Type, w, dev, excess float64) (float64, Limit) {
	top := t.MaxAltitude
	if levelLimit(t, w, top, dev, excess) == "" {
		return top, LimitCeiling
	}
	for hi := top; hi > 0; hi -= altStep {
		lo := math.Max(hi-altStep, 0)
		if levelLimit(t, w, lo, dev, excess) != "" {
			continue
		}
		for hi-lo > altTol {
			mid := 0.5 * (lo + hi)
			if levelLimit(t, w, mid, dev, excess) == "" {
				lo = mid
			} else {
				hi = mid
			}
		}
		return lo, levelLimit(t, w, hi, dev, excess)
	}
	return 0, LimitNone
}

// OptimumAltitude returns the pressure altitude (m) of greatest specific
// range at maximum-range Mach, searched from 0 up to ceiling (m), and that
// specific range.
func OptimumAltitude(t *Type, w, dev, excess, ceiling float64) (float64, float64) {
	if ceiling <= 0 {
		return 0, MaxRangeMach(t, w, AirISA(0, dev), excess).SR
	}
	n := int(math.Ceil(ceiling/altStep)) + 1
	return argmax(func(h float64) float64 {
		return MaxRangeMach(t, w, AirISA(h, dev), excess).SR
	}, 0, ceiling, max(n, 3), altTol)
}

// Optimum is the cruise optimum for a weight at one level (DESIGN.md §4.7).
type Optimum struct {
	Air       Air
	MinDrag   Level // minimum-drag Mach
	MaxRange  Level // maximum-range Mach (greatest SR)
	LongRange Level // 99 % of max SR on the fast side, capped at MMO
	Econ      Level // least (FF + CI)/TAS

	OptimumAltitude float64 // m, greatest SR at max-range Mach, ≤ MaxAltitude
	OptimumSR       float64 // m/kg, SR there
	MaxAltitude     float64 // m
	MaxAltLimit     Limit   // what bounds MaxAltitude
}

// CruiseOptimum computes the cruise optimum of the type for weight w (kg) at
// pressure altitude h (m) with ISA deviation dev (K), cost index ci (kg/s)
// and an added lift-independent drag coefficient excess (zero for the
// baseline; a tail's excess in counts × 0.0001 for its own polar).
func CruiseOptimum(t *Type, w, h, dev, ci, excess float64) Optimum {
	air := AirISA(h, dev)
	o := Optimum{Air: air}
	o.MaxRange = MaxRangeMach(t, w, air, excess)
	o.LongRange = LongRangeMach(t, w, air, excess, o.MaxRange)
	o.MinDrag = MinDragMach(t, w, air, excess)
	if ci == 0 {
		o.Econ = o.MaxRange
	} else {
		o.Econ = EconMach(t, w, air, excess, ci)
	}
	o.MaxAltitude, o.MaxAltLimit = MaxAltitude(t, w, dev, excess)
	o.OptimumAltitude, o.OptimumSR = OptimumAltitude(t, w, dev, excess, o.MaxAltitude)
	return o
}
