package main

import (
	"fmt"
	"io"
	"text/tabwriter"

	"dragdeck/feed/pipeline"
)

// factorJSON is a tail's fuel factor in a report (stable names): the
// factor in use (null when none was set, or without a store), the
// monitored level of the last window with its interval, and the policy's
// proposal (proposed_pct null when none, no_proposal_reason says why).
type factorJSON struct {
	InUsePct          *float64   `json:"in_use_pct"`
	MonitoredPct      *float64   `json:"monitored_pct"`
	MonitoredCI95Pct  []*float64 `json:"monitored_ci95_pct"`
	Flights           int        `json:"flights"`
	WindowFrom        string     `json:"window_from,omitempty"`
	Period            string     `json:"period,omitempty"`
	ProposedPct       *float64   `json:"proposed_pct"`
	ChangePct         *float64   `json:"change_pct"`
	PlanFuelKgPerYear *float64   `json:"plan_fuel_kg_per_year"`
	NeedsNote         bool       `json:"needs_note"`
	SecondLook        bool       `json:"second_look"`
	NoProposalReason  string     `json:"no_proposal_reason,omitempty"`
}

// fleetFactorJSON sums the proposals over the fleet: the fuel they put
// into the plan and take out of it a year.
type fleetFactorJSON struct {
	Proposals            int      `json:"proposals"`
	PlanFuelInKgPerYear  float64  `json:"plan_fuel_in_kg_per_year"`
	PlanFuelOutKgPerYear float64  `json:"plan_fuel_out_kg_per_year"`
	Caution              string   `json:"caution"`
	Policy               policyJS `json:"policy"`
}

type policyJS struct {
	WindowDays   float64            `json:"window_days"`
	MinFlights   int                `json:"min_flights"`
	RoundPct     float64            `json:"round_pct"`
	DeadBandPct  float64            `json:"dead_band_pct"`
	Periods      int                `json:"periods"`
	MinPct       float64            `json:"min_pct"`
	MaxPct       float64            `json:"max_pct"`
	MaxChangePct float64            `json:"max_change_pct"`
	BasicPct     map[string]float64 `json:"basic_pct"`
}

func newFleetFactorJSON(r *pipeline.Result) fleetFactorJSON {
	in, out, n := r.FactorTotals()
	p := r.Policy
	basic := p.BasicPct
	if basic == nil {
		basic = map[string]float64{}
	}
	return fleetFactorJSON{Proposals: n, PlanFuelInKgPerYear: in, PlanFuelOutKgPerYear: out, Caution: oneLine(factorCaution),
		Policy: policyJS{WindowDays: p.WindowDays, MinFlights: p.MinFlights, RoundPct: p.RoundPct, DeadBandPct: p.DeadBandPct,
			Periods: p.Periods, MinPct: p.MinPct, MaxPct: p.MaxPct, MaxChangePct: p.MaxChangePct, BasicPct: basic}}
}

func newFactorJSON(f pipeline.TailFactor) factorJSON {
	j := factorJSON{MonitoredCI95Pct: []*float64{nil, nil}}
	pr := f.Proposal
	if f.InUse {
		j.InUsePct = num(pr.InUsePct)
	}
	if n := len(f.History); n > 0 {
		lv := f.History[n-1]
		j.MonitoredPct, j.MonitoredCI95Pct, j.Flights = num(lv.Pct), []*float64{num(lv.Lo), num(lv.Hi)}, lv.Flights
		j.WindowFrom, j.Period = timeOrEmpty(lv.From), pr.Period
	}
	if pr.Proposed {
		j.ProposedPct, j.ChangePct, j.PlanFuelKgPerYear = num(pr.TargetPct), num(pr.ChangePct), num(f.PlanFuel)
		j.NeedsNote, j.SecondLook = pr.NeedsNote, pr.SecondLook
	} else {
		j.NoProposalReason = pr.Reason
	}
	return j
}

// factorCSV is a tail's fuel-factor columns of the report's CSV.
var factorCSVHead = []string{"factor_in_use_pct", "factor_monitored_pct", "factor_lo_pct", "factor_hi_pct", "factor_flights",
	"factor_proposed_pct", "factor_plan_fuel_kg_per_year"}

func factorCSV(f pipeline.TailFactor) []string {
	row := make([]string, len(factorCSVHead))
	pr := f.Proposal
	if f.InUse {
		row[0] = fmtF(pr.InUsePct, 2)
	}
	if n := len(f.History); n > 0 {
		lv := f.History[n-1]
		row[1], row[2], row[3], row[4] = fmtF(lv.Pct, 2), fmtF(lv.Lo, 2), fmtF(lv.Hi, 2), fmt.Sprint(lv.Flights)
	}
	if pr.Proposed {
		row[5], row[6] = fmtF(pr.TargetPct, 2), fmtF(f.PlanFuel, 0)
	}
	return row
}

// writeFactorTable is the report table's fuel-factor section: per tail,
// in the report's order, the factor in use, the monitored level and the
// proposal; then the fleet totals of the plan's fuel and the caution.
func writeFactorTable(w io.Writer, r *pipeline.Result, withStore bool) {
	in, out, n := r.FactorTotals()
	period := ""
	for _, f := range r.Factors {
		if p := f.Proposal.Period; p > period {
			period = p
		}
	}
	fmt.Fprintf(w, "\nFuel factors (%s): %d proposal(s); a year, the changes put %s t\nof fuel into the plan and %s t out of it.\n",
		period, n, signed(in/1000, 1), signed(out/1000, 1))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "tail\tin use\tmonitored (95 %)\tflights\tproposed\tplan")
	fmt.Fprintln(tw, "\t%\t%\t\t%\tt/yr")
	var why []string
	for _, a := range r.Fleet.Tails {
		f := r.Factors[a.Tail]
		pr := f.Proposal
		use := "none"
		if f.InUse {
			use = signed(pr.InUsePct, 1)
		}
		mon, flights := "-", "-"
		if k := len(f.History); k > 0 && f.History[k-1].OK() {
			lv := f.History[k-1]
			mon, flights = fmt.Sprintf("%s (%s…%s)", signed(lv.Pct, 2), signed(lv.Lo, 2), signed(lv.Hi, 2)), fmt.Sprint(lv.Flights)
		}
		prop, plan := "-", "-"
		if pr.Proposed {
			prop, plan = signed(pr.TargetPct, 1), signed(f.PlanFuel/1000, 1)
			if pr.NeedsNote {
				prop += " N"
			}
			if pr.SecondLook {
				prop += " !"
			}
		} else if pr.Reason != "" && !pr.Level.OK() {
			why = append(why, a.Tail+": "+pr.Reason)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\n", a.Tail, use, mon, flights, prop, plan)
	}
	tw.Flush()
	writeWhy(w, "No monitored factor (shown as -):", why)
	p := r.Policy
	fmt.Fprintf(w, "monitored: median per-flight fuel-flow deviation of the last %g days (from\n"+
		"the last step or event when later), at least %d flights. proposed: rounded to\n"+
		"%g %%, when %g %% or more from the factor in use in each of the last %d months;\n"+
		"N: outside %g … %g %%, needs a note; !: a change of more than %g %%.",
		p.WindowDays, p.MinFlights, p.RoundPct, p.DeadBandPct, p.Periods, p.MinPct, p.MaxPct, p.MaxChangePct)
	if !withStore {
		fmt.Fprint(w, "\nin use: kept in a store (--store); without one, taken as none (0).")
	}
	fmt.Fprintf(w, "\n%s\n", factorCaution)
}
