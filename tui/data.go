package tui

import (
	"math"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

// Data is what the dashboard shows: the fleet pipeline's result and where
// its snapshots came from. The dashboard computes nothing of its own from
// it; it presents it.
type Data struct {
	Source string // where the snapshots came from
	// Recorded is how many of the accepted rows are samples of continuous
	// recordings (the built-in demo's two 1 Hz flights), told apart from
	// snapshots in the header.
	Recorded int
	// Work is the store's work list (nil unless the data come from a
	// store); Review what changed since the last review mark (nil
	// likewise).
	Work   WorkList
	Review *ReviewMarks
	// Factors is the store's fuel factors (nil unless the data come from a
	// store).
	Factors FactorBook
	*pipeline.Result
}

// NewData wraps a pipeline result for the dashboard.
func NewData(source string, r *pipeline.Result) *Data { return &Data{Source: source, Result: r} }

// DemoData is the built-in demo fleet, made in memory.
func DemoData() (*Data, error) {
	d, err := demo.NewFleet(demo.Config{})
	if err != nil {
		return nil, err
	}
	// The snapshots and the 1 Hz recordings of two flights, which the Flight
	// screen plays with their stable windows.
	recs := append(append([]feed.Record(nil), d.Records...), d.Recordings...)
	st := d.Stats
	st.Add(d.RecordingStats)
	r := pipeline.FromRecords(recs, st, pipeline.Input{Roster: d.Roster, Events: d.Events(),
		Config: model.DefaultTrendConfig(), KeepRecords: true})
	data := NewData("built-in demo, invented data", r)
	data.Recorded = d.RecordingStats.Accepted
	return data, nil
}

// Condition is the cruise condition the Cruise and Turns screens work at:
// the current snapshot of the Flight screen, or a typical cruise of the
// selected tail.
type Condition struct {
	Tail      string
	Type      *model.Type // the tail's type at this condition (nil: the run's)
	Weight    float64     // kg
	Altitude  float64     // m, pressure altitude
	Mach      float64
	ISADev    float64 // K
	CostIndex float64 // kg/min
	ExcessPct float64 // the own polar's drag deviation, %; NaN when unknown
	// ExcessFrom says where ExcessPct comes from ("its recent level", "this
	// flight so far").
	ExcessFrom string
}

// excess returns the condition's excess as an added drag coefficient.
func (c Condition) excess(t *model.Type) float64 {
	return model.ExcessFromDeviation(t, c.Weight, model.AirISA(c.Altitude, c.ISADev), c.Mach, c.ExcessPct)
}

// levelFrom and flightFrom name where an own polar's deviation comes from.
const (
	levelFrom  = "its recent level"
	flightFrom = "this flight so far"
)

// defaultCondition is the cruise shown before any tail is chosen.
func defaultCondition(t *model.Type) Condition {
	m := 0.78
	if t != nil {
		m = math.Min(m, t.MMO-0.02)
	}
	return Condition{Type: t, Weight: 65000, Altitude: 35000 * model.Foot, Mach: m, ExcessPct: math.NaN()}
}

// tailCondition is a tail's typical cruise (the medians of its usable
// snapshots, from the pipeline) with its recent level as its excess.
func tailCondition(t *model.Type, a model.TailAssessment) Condition {
	c := defaultCondition(t)
	c.Tail, c.ExcessPct, c.ExcessFrom = a.Tail, a.RecentPct, levelFrom
	if ty := a.Typical; !math.IsNaN(ty.Weight) {
		c.Weight, c.Altitude, c.Mach, c.ISADev = ty.Weight, ty.Altitude, ty.Mach, ty.ISADev
	}
	return c
}
