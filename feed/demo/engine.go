package demo

import (
	"math"
	"math/rand/v2"
	"time"

	"dragdeck/model"
)

// Engine roles of the demo tails that record fan speed.
const (
	EngineSteady    = "steady"
	EngineWear      = "wear"          // fuel burnt for the thrust grows between shop visits
	EngineMeterBias = "meter bias"    // the fuel-flow meter reads high
	EngineShopVisit = "shop visit"    // a worn engine restored at a shop visit
	EngineChange    = "engine change" // an engine swapped for a more worn spare
)

// fanSpeedShare is the share of tails with fan speed on their recorders
// when the type has a thrust table (rounded; at least one tail is left
// without): the others are older recorders.
const fanSpeedShare = 0.75

// EngineTruth is what was planted in a tail's engines and fuel-flow meter:
// the engine deviation, % (fuel burnt against the model's fuel for the
// thrust, §4.12), over time. Only tails with fan speed carry one.
type EngineTruth struct {
	Role            string      `json:"role"`
	OffsetPct       float64     `json:"offset_pct"`
	DriftPctPer100d float64     `json:"drift_pct_per_100d"`
	DriftStart      string      `json:"drift_start,omitempty"`
	Steps           []StepTruth `json:"steps"`
	RecentLevelPct  float64     `json:"recent_level_pct"`
	ExpectedFlags   []string    `json:"expected_flags"`
	driftStart      time.Time
}

// planted is a planted series at time t: an offset, a drift from a start
// and steps, %.
func planted(offset, drift float64, start time.Time, steps []StepTruth, t time.Time) float64 {
	d := offset
	if drift != 0 && t.After(start) {
		d += drift * t.Sub(start).Hours() / 24 / 100
	}
	for _, s := range steps {
		if !t.Before(s.at) {
			d += s.SizePct
		}
	}
	return d
}

// deviation is the engine deviation (%) at time t; 0 without a truth.
func (e *EngineTruth) deviation(t time.Time) float64 {
	if e == nil {
		return 0
	}
	return planted(e.OffsetPct, e.DriftPctPer100d, e.driftStart, e.Steps, t)
}

// assignEngines gives fan speed to most tails whose types have a thrust
// table, and plants engine wear, a meter bias, a shop visit and an engine
// change on tails whose airframe is steady, so that engine and airframe can
// be told apart. It draws from its own generator, so the airframe's
// planting is the same with or without thrust tables.
func (g *demoGen) assignEngines() {
	var able []int
	for i := range g.tails {
		if g.tails[i].hasThrust() {
			able = append(able, i)
		}
	}
	if len(able) == 0 {
		return
	}
	rng := rand.New(rand.NewPCG(g.cfg.Seed, 0x656e67696e65))
	uniform := func(lo, hi float64) float64 { return lo + (hi-lo)*rng.Float64() }
	n := len(g.tails)
	share := func(f float64) int { return max(1, int(math.Round(f*float64(n)))) }
	want := map[string]int{EngineWear: share(0.06), EngineMeterBias: share(0.06), EngineShopVisit: share(0.04), EngineChange: share(0.04)}
	order := []string{EngineWear, EngineMeterBias, EngineShopVisit, EngineChange}
	recentAt := g.end.AddDate(0, 0, -15)
	withN1 := int(math.Round(fanSpeedShare * float64(len(able))))
	if len(able) > 1 {
		withN1 = min(withN1, len(able)-1) // at least one older recorder
	}
	var items []levelItem
	for k, j := range rng.Perm(len(able)) {
		tt := &g.tails[able[j]]
		if k >= withN1 {
			continue // an older recorder: no fan speed
		}
		tt.FanSpeed = true
		e := &EngineTruth{Role: EngineSteady, OffsetPct: uniform(-0.8, 0.8), Steps: []StepTruth{}}
		if tt.Role == RoleSteady {
			for _, r := range order {
				if want[r] > 0 {
					e.Role = r
					want[r]--
					break
				}
			}
		}
		switch e.Role {
		case EngineWear:
			e.OffsetPct = uniform(-0.5, 0.5)
			e.DriftPctPer100d = uniform(1.0, 1.5)
			e.driftStart = g.end.AddDate(0, 0, -int(uniform(200, 260)))
			if e.driftStart.Before(g.cfg.Start) {
				e.driftStart = g.cfg.Start
			}
			e.DriftStart = e.driftStart.Format(time.DateOnly)
		case EngineMeterBias:
			e.OffsetPct = uniform(3.5, 4.5)
		case EngineShopVisit:
			e.OffsetPct = uniform(3.5, 4.5)
			at := g.day(uniform(0.35, 0.7))
			e.Steps = append(e.Steps, StepTruth{at: at, Date: at.Format(time.DateOnly), SizePct: -e.OffsetPct + uniform(-0.3, 0.3), Cause: EngineShopVisit})
		case EngineChange:
			// One engine swapped for a more worn spare: the pair burns more.
			e.OffsetPct = uniform(-0.6, 0)
			at := g.day(uniform(0.35, 0.7))
			e.Steps = append(e.Steps, StepTruth{at: at, Date: at.Format(time.DateOnly), SizePct: uniform(1.5, 2.0), Cause: EngineChange})
		}
		e.RecentLevelPct = e.deviation(recentAt)
		tt.Engine = e
		items = append(items, levelItem{group: tt.finalType(), offset: &e.OffsetPct, recent: &e.RecentLevelPct, high: e.Role == EngineMeterBias})
	}
	g.engineMedians = keepFromLimit(items)
	for i := range g.tails {
		tt := &g.tails[i]
		e := tt.Engine
		if e == nil {
			continue
		}
		e.ExpectedFlags = expectFlags(e.RecentLevelPct, g.engineMedians[tt.finalType()], e.DriftPctPer100d, e.Steps)
	}
}

// fanSpeed is the N1 (%) that gives the thrust fn (N, all engines) of type
// ty at Mach m, δ and θ, by bisection on the type's table (which rises with N1, so the
// root is unique); 0 when the thrust lies outside the table.
func fanSpeed(ty *model.Type, fn, m, delta, theta float64) float64 {
	tab := ty.Thrust
	want := fn / (float64(ty.EngineCount) * delta)
	lo, hi := tab.N1[0], tab.N1[len(tab.N1)-1]
	fLo, okLo := tab.At(lo, m)
	fHi, okHi := tab.At(hi, m)
	if !okLo || !okHi || want < fLo || want > fHi {
		return 0
	}
	for range 60 {
		mid := (lo + hi) / 2
		if f, _ := tab.At(mid, m); f < want {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2 * math.Sqrt(theta*(1+0.2*m*m))
}
