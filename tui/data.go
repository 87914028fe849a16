package tui

import (
	"math"
	"sort"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// Data is what the dashboard shows: a fleet's assessment and the snapshots
// behind it.
type Data struct {
	Source  string // where the snapshots came from
	Type    *model.Type
	Config  model.TrendConfig
	Fleet   model.Fleet
	Stats   feed.Stats
	First   time.Time
	Last    time.Time
	Records map[string][]feed.Record // by tail, in time order
}

// NewData assesses a loaded fleet for the dashboard.
func NewData(source string, t *model.Type, fd *feed.FleetData, events map[string][]model.Event, c model.TrendConfig) *Data {
	for _, recs := range fd.Records {
		sort.SliceStable(recs, func(i, j int) bool { return recs[i].Time.Before(recs[j].Time) })
	}
	return &Data{
		Source: source, Type: t, Config: c,
		Fleet: model.AssessFleet(fd.Trends(events, c), c),
		Stats: fd.Stats, First: fd.First, Last: fd.Last, Records: fd.Records,
	}
}

// DemoData is the built-in demo fleet, made in memory.
func DemoData() (*Data, error) {
	d, err := feed.NewDemoFleet(feed.DemoConfig{})
	if err != nil {
		return nil, err
	}
	t := feed.DemoType()
	fd := feed.FleetFromRecords(d.Records, d.Stats, t, true)
	events := map[string][]model.Event{}
	for _, e := range d.Truth.Events {
		at, _ := time.Parse(time.RFC3339, e.Time)
		events[e.Tail] = append(events[e.Tail], model.Event{Time: at, Kind: e.Kind, Note: e.Note})
	}
	return NewData("built-in demo: "+feed.DemoAirline, t, fd, events, model.DefaultTrendConfig()), nil
}

// tail returns the assessment of one tail.
func (d *Data) tail(name string) (model.TailAssessment, bool) {
	for _, a := range d.Fleet.Tails {
		if a.Tail == name {
			return a, true
		}
	}
	return model.TailAssessment{}, false
}

// flightRecords returns the records of flight f of the tail, in time order.
func (d *Data) flightRecords(tail string, f model.FlightPoint, gapHours float64) []feed.Record {
	recs := d.Records[tail]
	i := sort.Search(len(recs), func(i int) bool { return !recs[i].Time.Before(f.Time) })
	var out []feed.Record
	for ; i < len(recs); i++ {
		r := recs[i]
		if r.Flight != f.Flight || (len(out) > 0 && r.Time.Sub(out[len(out)-1].Time).Hours() > gapHours) {
			break
		}
		out = append(out, r)
	}
	return out
}

// Condition is the cruise condition the Cruise and Turns screens work at:
// the current snapshot of the Flight screen, or a typical cruise of the
// selected tail.
type Condition struct {
	Tail      string
	Weight    float64 // kg
	Altitude  float64 // m, pressure altitude
	Mach      float64
	ISADev    float64 // K
	CostIndex float64 // kg/min
	ExcessPct float64 // the tail's recent drag deviation, %; NaN when unknown
}

// excess returns the condition's excess as an added drag coefficient: the
// deviation taken as lift-independent at this weight, level and Mach.
func (c Condition) excess(t *model.Type) float64 {
	if math.IsNaN(c.ExcessPct) {
		return 0
	}
	l := model.LevelFlight(t, c.Weight, model.AirISA(c.Altitude, c.ISADev), c.Mach, 0)
	return c.ExcessPct / 100 * l.CD
}

// typicalCondition is a tail's median cruise: weight, level, Mach and ISA
// deviation of its snapshots.
func typicalCondition(t *model.Type, tail string, recs []feed.Record, excessPct float64) Condition {
	c := Condition{Tail: tail, Weight: 65000, Altitude: 35000 * model.Foot, Mach: math.Min(0.78, t.MMO-0.02), ExcessPct: excessPct}
	if len(recs) == 0 {
		return c
	}
	w, h, m, dev := make([]float64, len(recs)), make([]float64, len(recs)), make([]float64, len(recs)), make([]float64, len(recs))
	for i, r := range recs {
		w[i], h[i], m[i] = r.Snap.Weight, r.Snap.Altitude, r.Snap.Mach
		dev[i] = model.AirAt(r.Snap.Altitude, r.Snap.SAT).ISADev()
	}
	c.Weight, c.Altitude, c.Mach, c.ISADev = model.Median(w), model.Median(h), model.Median(m), model.Median(dev)
	return c
}
