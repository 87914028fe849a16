package pipeline

import (
	"math"
	"time"

	"dragdeck/feed/store"
	"dragdeck/model"
)

// ReviewState is what a review of this result sees: every tail's flags
// and steps, for the airframe series and, where there is N1, the engine
// series (store.State, kept by a review mark).
func (r *Result) ReviewState() store.State {
	st := store.State{Tails: []store.TailState{}}
	add := func(series string, tails []model.TailAssessment) {
		for _, a := range tails {
			ts := store.TailState{Tail: a.Tail, Series: series, Flags: append([]string{}, a.Flags...), Steps: []store.StepState{}}
			for _, s := range a.Steps {
				ts.Steps = append(ts.Steps, store.StepState{Date: s.Time.UTC().Truncate(24 * time.Hour), SizePct: s.SizePct})
			}
			st.Tails = append(st.Tails, ts)
		}
	}
	add(store.SeriesAirframe, r.Fleet.Tails)
	add(store.SeriesEngine, r.Engine.Tails)
	return st
}

// EventEffect is what an event did: the step matched to it (in the
// series it restarts) and the fuel that step costs a year (kg; negative: a
// saving, as a repair should give). Found is false when no step was
// matched to the event.
type EventEffect struct {
	Series  string
	Step    model.Step
	FuelKg  float64 // a year; NaN without an expected fuel flow
	Found   bool
	Flights int // the tail's flights after the event (0: no data yet to judge)
}

// EffectOf returns the effect of the tail's event e.
func (r *Result) EffectOf(tail string, e model.Event) EventEffect {
	series, fleet := store.SeriesAirframe, r.Fleet
	if model.EngineEvent(e.Kind) {
		series, fleet = store.SeriesEngine, r.Engine
	}
	out := EventEffect{Series: series, FuelKg: math.NaN()}
	a, ok := find(fleet.Tails, r.indexOf(series), tail)
	if !ok {
		return out
	}
	for _, f := range a.Flights {
		if f.UnixNano >= e.Time.UnixNano() {
			out.Flights++
		}
	}
	for _, s := range a.Steps {
		if s.Event != nil && s.Event.Time.Equal(e.Time) && s.Event.Kind == e.Kind {
			out.Step, out.Found = s, true
			out.FuelKg = a.FuelPerYear(s.SizePct, r.Config)
			break
		}
	}
	return out
}

// indexOf is the index of the tails of a series.
func (r *Result) indexOf(series string) map[string]int {
	if series == store.SeriesEngine {
		return r.engineIdx
	}
	return r.tailIdx
}
