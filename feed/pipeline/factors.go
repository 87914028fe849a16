package pipeline

import (
	"math"
	"sort"
	"time"

	"dragdeck/feed/store"
	"dragdeck/model"
)

// TailFactor is a tail's fuel factor: the monitored level month by month,
// the factor in use and what the policy proposes (model.FactorPolicy).
type TailFactor struct {
	// History is the monitored factor at each month's end and, last, at
	// the tail's last snapshot (model.FactorHistory).
	History  []model.FactorLevel
	Proposal model.FactorProposal
	// InUse is whether a factor in use was given for the tail (Input.InUse);
	// Proposal.InUsePct is 0 otherwise.
	InUse bool
	// PlanFuel is the fuel a year the proposal puts into the plan (kg, −
	// takes out): its change × the tail's median expected fuel flow × its
	// cruise hours (model.TailTrend.FuelPerYear); 0 without a proposal.
	PlanFuel float64
	// Restarts are the times that cut the monitored window: the steps of
	// both series and the tail's events (time order).
	Restarts []time.Time
}

// Factor returns the fuel factor of one tail.
func (r *Result) Factor(tail string) (TailFactor, bool) {
	f, ok := r.Factors[tail]
	return f, ok
}

// StoreProposal is the tail's proposal as the store files it (meaningful
// when Proposal.Proposed).
func (f TailFactor) StoreProposal(tail string) store.Proposal {
	pr := f.Proposal
	return store.Proposal{Tail: tail, Type: pr.Type, Period: pr.Period, Status: store.FactorProposed,
		ProposedPct: pr.TargetPct, InUsePct: pr.InUsePct, MonitoredPct: pr.Level.Pct, LoPct: pr.Level.Lo, HiPct: pr.Level.Hi,
		Flights: pr.Level.Flights, PlanFuel: f.PlanFuel, NeedsNote: pr.NeedsNote, SecondLook: pr.SecondLook}
}

// tailFactor computes a tail's fuel factor from its points (time order),
// its trends and events: the per-flight factor series of the usable
// points, restarted at every step of the airframe and engine series and
// at every event, its monthly history and the policy's proposal against
// the factor in use.
func tailFactor(pts []model.TrendPoint, air, eng *model.TailTrend, events []model.Event, in *Input, buf *[]model.FlightPoint) TailFactor {
	var tf TailFactor
	for _, s := range air.Steps {
		tf.Restarts = append(tf.Restarts, s.Time)
	}
	if eng != nil {
		for _, s := range eng.Steps {
			tf.Restarts = append(tf.Restarts, s.Time)
		}
	}
	for _, e := range events {
		tf.Restarts = append(tf.Restarts, e.Time)
	}
	sort.Slice(tf.Restarts, func(i, j int) bool { return tf.Restarts[i].Before(tf.Restarts[j]) })
	pol := in.policy()
	fl := model.FactorSeries(pts, &in.Config, buf)
	tf.History = model.FactorHistory(fl, tf.Restarts, pol.FactorConfig)
	inUse, ok := in.InUse[air.Tail]
	tf.InUse = ok
	tf.Proposal = pol.Propose(tf.History, inUse, pol.BasicPct[air.Type])
	tf.Proposal.Tail, tf.Proposal.Type = air.Tail, air.Type
	if tf.Proposal.Proposed && !math.IsNaN(air.FuelFlowExpected) {
		tf.PlanFuel = air.FuelPerYear(tf.Proposal.ChangePct, in.Config)
	}
	return tf
}

// policy is the input's fuel-factor policy, the default when none is set.
func (in *Input) policy() model.FactorPolicy {
	if in.Policy != nil {
		return *in.Policy
	}
	return model.DefaultFactorPolicy()
}

// FactorTotals sums what the proposals put into the plan and take out of
// it a year (kg of fuel), and counts the proposals; in the fleet's order,
// so that the sums have the same digits every run.
func (r *Result) FactorTotals() (in, out float64, proposals int) {
	for _, a := range r.Fleet.Tails {
		f := r.Factors[a.Tail]
		if !f.Proposal.Proposed {
			continue
		}
		proposals++
		if f.PlanFuel > 0 {
			in += f.PlanFuel
		} else {
			out += f.PlanFuel
		}
	}
	return in, out, proposals
}

// Backtest replays the fuel factor over the run's history under the run's
// policy (model.RunBacktest): it needs the points, so a run with
// DropPoints has none (ok false).
func (r *Result) Backtest() (model.Backtest, bool) {
	if len(r.Points) == 0 {
		return model.Backtest{}, false
	}
	tails := make([]string, 0, len(r.Points))
	for t := range r.Points {
		tails = append(tails, t)
	}
	sort.Strings(tails)
	var bt []model.BacktestTail
	for _, t := range tails {
		a, _ := r.Tail(t)
		f := r.Factors[t]
		bt = append(bt, model.BacktestTail{Tail: t, Type: a.Type, Flights: model.PlanFlights(r.Points[t], &r.Config), History: f.History})
	}
	return model.RunBacktest(bt, r.Policy), true
}
