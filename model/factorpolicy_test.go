package model

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"
)

// monthlyHistory is the policy's history of a tail flying two flights a
// day from start for months months, its per-flight factor v(t) plus noise
// of sd; restarts cut the windows.
func monthlyHistory(months int, sd float64, v func(t time.Time) float64, restarts []time.Time) []FactorLevel {
	start := time.Date(2026, 1, 1, 6, 0, 0, 0, time.UTC)
	rng := rand.New(rand.NewPCG(7, uint64(months)))
	n := int(start.AddDate(0, months, 0).Sub(start).Hours() / 12)
	fl := flightsEvery(start, 12*time.Hour, n, func(_ int, t time.Time) float64 { return v(t) + sd*rng.NormFloat64() })
	return FactorHistory(fl, restarts, DefaultFactorConfig())
}

func TestProposeDeadBandAndPeriods(t *testing.T) {
	p := DefaultFactorPolicy()
	stepAt := time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)
	step := func(t time.Time) float64 {
		if t.Before(stepAt) {
			return 0.3
		}
		return 1.3 // a step of 1 %: beyond the 0.5 % dead band from a factor of 0.3
	}
	tests := []struct {
		name     string
		months   int
		v        func(time.Time) float64
		restarts []time.Time
		inUse    float64
		proposed bool
		target   float64 // when proposed
		reason   string  // a part of it, when not
	}{
		{"noise inside the band proposes nothing", 8, func(time.Time) float64 { return 0.6 }, nil, 0.3, false, 0, "within the dead band"},
		{"a step of 1 %: not in its first period", 4, step, nil, 0.3, false, 0, "for 1 of 2 periods"},
		{"a step of 1 %: proposed after two periods", 5, step, nil, 0.3, true, 1.3, ""},
		{"a step of 1 % with the step known: the same", 5, step, []time.Time{stepAt}, 0.3, true, 1.3, ""},
		{"a step right before the window's end is not used", 5, step,
			[]time.Time{stepAt, time.Date(2026, 5, 27, 0, 0, 0, 0, time.UTC)}, 0.3, false, 0, "since the step or event of 2026-05-27"},
		{"down by more than the band", 6, func(time.Time) float64 { return -0.8 }, nil, 0.5, true, -0.8, ""},
		{"the factor in use already right", 6, func(time.Time) float64 { return 2.04 }, nil, 2.0, false, 0, "within the dead band"},
		{"one period is not enough history", 1, func(time.Time) float64 { return 3 }, nil, 0, false, 0, "periods the policy looks back on"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			h := monthlyHistory(tc.months, 0.25, tc.v, tc.restarts)
			pr := p.Propose(h, tc.inUse, 0)
			if pr.Proposed != tc.proposed {
				t.Fatalf("proposed %v (target %.1f, reason %q), want %v", pr.Proposed, pr.TargetPct, pr.Reason, tc.proposed)
			}
			if tc.proposed {
				if math.Abs(pr.TargetPct-tc.target) > 0.15 || pr.Reason != "" {
					t.Errorf("target %.2f, want %.1f ± 0.15 (one step of the rounding either side of the noise); reason %q", pr.TargetPct, tc.target, pr.Reason)
				}
				if pr.ChangePct != p.Round(pr.TargetPct-tc.inUse) {
					t.Errorf("change %g, want %g", pr.ChangePct, pr.TargetPct-tc.inUse)
				}
				return
			}
			if !strings.Contains(pr.Reason, tc.reason) {
				t.Errorf("reason %q, want it to hold %q", pr.Reason, tc.reason)
			}
		})
	}
}

func TestProposeLimitsAndBasic(t *testing.T) {
	p := DefaultFactorPolicy()
	flat := func(v float64) []FactorLevel {
		return monthlyHistory(4, 0, func(time.Time) float64 { return v }, nil)
	}
	tests := []struct {
		name              string
		hist              []FactorLevel
		inUse, basic      float64
		target            float64
		needsNote, second bool
	}{
		{"a plain change", flat(1.24), 0, 0, 1.2, false, false},
		{"the basic factor is added", flat(1.24), 0, 0.5, 1.7, false, false},
		{"a change of more than 2 % in one step: a second look", flat(3.0), 0.5, 0, 3.0, false, true},
		{"above the range needs a note", flat(8.46), 7.5, 0, 8.5, true, false},
		{"below the range needs a note", flat(-3.5), -2.5, 0, -3.5, true, false},
		{"rounding half away from zero", flat(0.65), 0, 0, 0.7, false, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pr := p.Propose(tc.hist, tc.inUse, tc.basic)
			if !pr.Proposed || pr.TargetPct != tc.target || pr.NeedsNote != tc.needsNote || pr.SecondLook != tc.second {
				t.Errorf("proposed %v %.10g (note %v, second look %v, %q), want %.1f (note %v, second look %v)",
					pr.Proposed, pr.TargetPct, pr.NeedsNote, pr.SecondLook, pr.Reason, tc.target, tc.needsNote, tc.second)
			}
		})
	}
}

func TestFactorPolicyCheck(t *testing.T) {
	tests := []struct {
		name string
		mod  func(*FactorPolicy)
		key  string // "" : valid
	}{
		{"defaults", func(*FactorPolicy) {}, ""},
		{"zero rounding", func(p *FactorPolicy) { p.RoundPct = 0 }, "round_pct"},
		{"negative band", func(p *FactorPolicy) { p.DeadBandPct = -1 }, "dead_band_pct"},
		{"no periods", func(p *FactorPolicy) { p.Periods = 0 }, "periods"},
		{"range upside down", func(p *FactorPolicy) { p.MinPct, p.MaxPct = 5, 1 }, "min_pct"},
		{"basic far off", func(p *FactorPolicy) { p.BasicPct = map[string]float64{"DD-200": 40} }, "basic_pct.DD-200"},
		{"no window", func(p *FactorPolicy) { p.WindowDays = 0 }, "window_days"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := DefaultFactorPolicy()
			tc.mod(&p)
			err := p.Check()
			if (err == nil) != (tc.key == "") || (err != nil && !strings.HasPrefix(err.Error(), tc.key)) {
				t.Errorf("error %v, want one naming %q", err, tc.key)
			}
		})
	}
}

func TestPeriodEnd(t *testing.T) {
	end, err := PeriodEnd("2026-12")
	if err != nil || !end.Equal(time.Date(2027, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("PeriodEnd(2026-12) = %s, %v", end, err)
	}
	if _, err := PeriodEnd("2026-13"); err == nil {
		t.Errorf("month 13 accepted")
	}
}
