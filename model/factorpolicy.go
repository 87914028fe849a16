package model

import (
	"fmt"
	"math"
	"time"
)

// FactorPolicy turns a tail's monitored fuel factor into a proposal for
// the factor flight planning uses (FactorPolicy.Propose). The defaults
// (DefaultFactorPolicy) are common practice, no single source: a 0.1 %
// step, a 0.5 % dead band held for 2 monthly periods, −3 … +8 %, and a
// second look at a change of more than 2 % in one step.
type FactorPolicy struct {
	FactorConfig
	RoundPct     float64 // the factor is a multiple of this (0.1 %)
	DeadBandPct  float64 // propose only a change of at least this (0.5 %) ...
	Periods      int     // ... that held in each of the last Periods months (2)
	MinPct       float64 // a factor below this needs a note to approve (−3 %)
	MaxPct       float64 // a factor above this needs a note to approve (+8 %)
	MaxChangePct float64 // a larger change in one step is marked for a second look (2 %)
	// BasicPct is a per-type basic factor, added to the monitored one (a
	// type whose book is known to be off), by the roster's type name.
	BasicPct map[string]float64
}

// DefaultFactorPolicy returns the default policy.
func DefaultFactorPolicy() FactorPolicy {
	return FactorPolicy{FactorConfig: DefaultFactorConfig(), RoundPct: 0.1, DeadBandPct: 0.5, Periods: 2,
		MinPct: -3, MaxPct: 8, MaxChangePct: 2}
}

// Check returns an error naming the first setting that cannot be used.
func (p FactorPolicy) Check() error {
	switch {
	case !(p.WindowDays > 0 && p.WindowDays <= 366):
		return fmt.Errorf("window_days: must be 1 … 366, got %g", p.WindowDays)
	case p.MinFlights < 1:
		return fmt.Errorf("min_flights: must be at least 1, got %d", p.MinFlights)
	case !(p.RoundPct > 0 && p.RoundPct <= 5):
		return fmt.Errorf("round_pct: must be > 0 and ≤ 5, got %g", p.RoundPct)
	case !(p.DeadBandPct >= 0 && p.DeadBandPct <= 10):
		return fmt.Errorf("dead_band_pct: must be 0 … 10, got %g", p.DeadBandPct)
	case p.Periods < 1 || p.Periods > 24:
		return fmt.Errorf("periods: must be 1 … 24, got %d", p.Periods)
	case !(p.MinPct < p.MaxPct) || math.IsInf(p.MinPct, 0) || math.IsInf(p.MaxPct, 0):
		return fmt.Errorf("min_pct, max_pct: need min < max, got %g and %g", p.MinPct, p.MaxPct)
	case !(p.MaxChangePct > 0):
		return fmt.Errorf("max_change_pct: must be > 0, got %g", p.MaxChangePct)
	case !(p.Confidence > 0 && p.Confidence < 1):
		return fmt.Errorf("confidence: must be in (0, 1), got %g", p.Confidence)
	}
	for t, v := range p.BasicPct {
		if math.IsNaN(v) || math.Abs(v) > 20 {
			return fmt.Errorf("basic_pct.%s: must be −20 … +20, got %g", t, v)
		}
	}
	return nil
}

// Round rounds a factor to the policy's step (half away from zero).
func (p FactorPolicy) Round(pct float64) float64 {
	r := math.Round(pct/p.RoundPct) * p.RoundPct
	return math.Round(r*1e9) / 1e9 // 0.30000000000000004 → 0.3
}

// FactorCaution stands beside every proposal and every factor sent out.
const FactorCaution = "A fuel factor here is an engineering proposal for the operator's approved\n" +
	"process, not approved performance data."

// FactorProposal is what the policy makes of a tail's monitored factor.
type FactorProposal struct {
	Tail, Type string
	Period     string      // the month of the level it rests on, "2026-11"
	Level      FactorLevel // the latest monitored level
	InUsePct   float64     // the factor in use (0 when none was ever set)
	TargetPct  float64     // rounded monitored + basic; NaN without a level
	BasicPct   float64     // the type's basic factor added
	// Proposed: the target differs from the factor in use by at least the
	// dead band, on the same side, in each of the last Periods periods.
	Proposed  bool
	ChangePct float64 // TargetPct − InUsePct when Proposed
	// NeedsNote: the target is outside MinPct … MaxPct, so approving it
	// needs a note; SecondLook: |ChangePct| > MaxChangePct.
	NeedsNote, SecondLook bool
	Reason                string // why nothing is proposed ("" when Proposed)
}

// Propose applies the policy to a tail's monitored history (FactorHistory,
// oldest first) against the factor in use, with the type's basic factor:
// the target of each period is Round(level + basic); a change is proposed
// when each of the last Periods targets differs from inUse by at least
// DeadBandPct on the same side, and the proposal is the latest target. A
// period without a level (too few flights, a step or event that cut the
// window) proposes nothing.
func (p FactorPolicy) Propose(hist []FactorLevel, inUse, basic float64) FactorProposal {
	pr := FactorProposal{InUsePct: inUse, BasicPct: basic, TargetPct: math.NaN(), Level: FactorLevel{Pct: math.NaN(), Lo: math.NaN(), Hi: math.NaN()}}
	if len(hist) == 0 {
		pr.Reason = "no usable flights"
		return pr
	}
	pr.Level = hist[len(hist)-1]
	pr.Period = Period(pr.Level.At)
	if !pr.Level.OK() {
		pr.Reason = pr.Level.Reason
		return pr
	}
	pr.TargetPct = p.Round(pr.Level.Pct + basic)
	const eps = 1e-9
	side := 0.0
	for k := 0; k < p.Periods; k++ {
		i := len(hist) - 1 - k
		if i < 0 {
			pr.Reason = fmt.Sprintf("%d of the %d periods the policy looks back on", len(hist), p.Periods)
			return pr
		}
		l := hist[i]
		if !l.OK() {
			pr.Reason = fmt.Sprintf("no level in %s (%s)", Period(l.At), l.Reason)
			return pr
		}
		d := p.Round(l.Pct+basic) - inUse
		if math.Abs(d) < p.DeadBandPct-eps {
			if k == 0 {
				pr.Reason = fmt.Sprintf("within the dead band (%+.1f of ±%.1f %%)", d, p.DeadBandPct)
			} else {
				pr.Reason = fmt.Sprintf("outside the dead band for %d of %d periods", k, p.Periods)
			}
			return pr
		}
		if side != 0 && math.Signbit(d) != math.Signbit(side) {
			pr.Reason = fmt.Sprintf("outside the dead band on both sides within %d periods", p.Periods)
			return pr
		}
		side = d
	}
	pr.Proposed, pr.ChangePct = true, p.Round(pr.TargetPct-inUse)
	pr.NeedsNote = pr.TargetPct < p.MinPct-eps || pr.TargetPct > p.MaxPct+eps
	pr.SecondLook = math.Abs(pr.ChangePct) > p.MaxChangePct+eps
	return pr
}

// PeriodEnd is the first instant after the month period names ("2026-11"
// → 2026-12-01T00:00Z); an error for a name that is not a month.
func PeriodEnd(period string) (time.Time, error) {
	t, err := time.Parse("2006-01", period)
	if err != nil {
		return time.Time{}, fmt.Errorf("%q is not a month such as 2026-11", period)
	}
	return t.AddDate(0, 1, 0), nil
}
