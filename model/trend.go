package model

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"
)

// TrendPoint is one analysed snapshot of a tail, as the trend uses it: 40
// bytes and no pointer (its time in nanoseconds, its flight by id), so
// that a million of them, a year of a large fleet, take 40 MB and are
// never scanned by the garbage collector. What only the tail's own polar
// and typical cruise need is its PointDetail, kept beside it (same index)
// where a screen shows them. Where its row is, for a replay, is the
// reader's to keep.
type TrendPoint struct {
	UnixNano         int64   // time, ns since 1970-01-01 UTC (At gives it as a time)
	DevPct           float64 // drag deviation, % of baseline drag
	FuelFlowExpected float64 // kg/s on the baseline polar
	// EngineDevPct is the engine deviation, % (thrust from fan speed),
	// when HasEngine. The engine series is made of the points that have
	// one (EngineSeries), so it needs no copy of them.
	EngineDevPct float64
	// FuelFlowDevPct is the fuel-flow deviation, 100 (FF − FF_expected) /
	// FF_expected (model.Point.FuelFlowDevPct): the airframe's drag and the
	// engine's consumption together, the series of the fuel factor
	// (fuelfactor.go).
	FuelFlowDevPct float64
	Flight         FlightID // the flight's name in the points' FlightNames

	OutsideTable bool // N1k or Mach outside the type's thrust table
	HasEngine    bool // thrust from fan speed: EngineDevPct holds the engine deviation
	// Manoeuvre says which limit of the configuration that made the point
	// (TrendConfig.NewPoint) its bank, vertical speed or acceleration
	// passes; ManoeuvreNone when none. The values themselves are not kept.
	Manoeuvre Manoeuvre
}

// PointDetail is what a point adds for its tail's own polar and typical
// cruise: 24 bytes (single precision is ample for both), kept beside the
// points by the outputs that show them.
type PointDetail struct {
	CL         float32 // lift coefficient
	CDLessWave float32 // CD_measured − ΔCD_wave
	Weight     float32 // kg
	Altitude   float32 // m, pressure altitude
	Mach       float32
	ISADev     float32 // K
}

// NewDetail makes the detail of an analysed snapshot s.
func NewDetail(s *Snapshot, p *Point) PointDetail {
	return PointDetail{CL: float32(p.CL), CDLessWave: float32(p.CDMeasured - p.CDWave),
		Weight: float32(s.Weight), Altitude: float32(s.Altitude), Mach: float32(s.Mach), ISADev: float32(p.ISADev)}
}

// At returns the point's time (UTC).
func (p *TrendPoint) At() time.Time { return time.Unix(0, p.UnixNano).UTC() }

// nanos is t in ns since 1970-01-01 UTC, the time of a TrendPoint; the zero
// time gives the smallest value, before every point.
func nanos(t time.Time) int64 {
	if t.IsZero() {
		return math.MinInt64
	}
	return t.UnixNano()
}

// Manoeuvre is the first of bank, vertical speed and acceleration that is
// beyond its limit.
type Manoeuvre uint8

// The manoeuvres that leave a point out of the trend.
const (
	ManoeuvreNone Manoeuvre = iota
	ManoeuvreBank
	ManoeuvreVS
	ManoeuvreAccel
)

// EngineSeries returns the engine series of pts: the points with an engine
// deviation, with it as their DevPct (a new slice; pts is not changed).
func EngineSeries(pts []TrendPoint) []TrendPoint { return AppendEngineSeries(nil, pts) }

// AppendEngineSeries is EngineSeries appending to dst (a buffer to reuse),
// which it returns as it is when no point has an engine deviation.
func AppendEngineSeries(dst, pts []TrendPoint) []TrendPoint {
	n := 0
	for i := range pts {
		if pts[i].HasEngine {
			n++
		}
	}
	if n == 0 {
		return dst
	}
	dst = slices.Grow(dst, n)
	for _, p := range pts {
		if p.HasEngine {
			p.DevPct = p.EngineDevPct
			dst = append(dst, p)
		}
	}
	return dst
}

// NewPoint makes the trend's point of an analysed snapshot s taken at time
// t in flight f, judging its manoeuvre against c's limits (Usable must be
// asked with the same limits).
func (c *TrendConfig) NewPoint(t time.Time, f FlightID, s *Snapshot, p *Point) TrendPoint {
	m := ManoeuvreNone
	switch {
	case math.Abs(s.Bank) > c.MaxBank:
		m = ManoeuvreBank
	case math.Abs(s.VS) > c.MaxVS:
		m = ManoeuvreVS
	case math.Abs(s.Accel) > c.MaxAccel:
		m = ManoeuvreAccel
	}
	return TrendPoint{UnixNano: t.UnixNano(), Flight: f, DevPct: p.DragDevPct, FuelFlowExpected: p.FuelFlowExpected,
		FuelFlowDevPct: p.FuelFlowDevPct, OutsideTable: p.OutsideThrustTable, HasEngine: p.ThrustFromN1, EngineDevPct: p.EngineDevPct, Manoeuvre: m}
}

// PolarPoints returns the polar-fit points of the usable points among pts
// (in time order, det their details) taken at or after from (zero: all);
// none without details.
func PolarPoints(pts []TrendPoint, det []PointDetail, c TrendConfig, from time.Time) []PolarPoint {
	if len(det) != len(pts) {
		return nil
	}
	at := nanos(from)
	i := sort.Search(len(pts), func(i int) bool { return pts[i].UnixNano >= at }) // pts in time order
	out := make([]PolarPoint, 0, len(pts)-i)
	for k := i; k < len(pts); k++ {
		if c.Usable(pts[k]) == "" && pts[k].UnixNano >= at {
			out = append(out, PolarPoint{CL: float64(det[k].CL), CDMeasured: float64(det[k].CDLessWave)})
		}
	}
	return out
}

// Cruise is a tail's typical cruise: the medians of its usable snapshots.
type Cruise struct {
	Weight   float64 // kg
	Altitude float64 // m, pressure altitude
	Mach     float64
	ISADev   float64 // K
}

// Event is a maintenance or other event of a tail (DESIGN.md §3.3).
type Event struct {
	Time time.Time
	Kind string
	Note string
}

// TrendConfig holds the windows, limits and thresholds of the trend and the
// flags (DESIGN.md §4.8–§4.10). DefaultTrendConfig gives the defaults.
type TrendConfig struct {
	RecentDays   float64 // window of the recent level (30)
	DriftDays    float64 // trailing window of the drift (180)
	MinDriftDays float64 // shortest window for a drift (60)
	FlightGap    float64 // hours between snapshots that start a new flight (6)

	MaxAbsDevPct float64 // implausible beyond (25 %)
	MaxBank      float64 // rad (30°)
	MaxVS        float64 // m/s (1,500 ft/min)
	MaxAccel     float64 // m/s² (5 kt/min)

	// The change-point search. The penalty σ² ln n per parameter is the
	// Schwarz information criterion (Schwarz, Ann. Statist. 6, 1978; Yao,
	// Statist. Probab. Lett. 6, 1988, for change points); the factor 8, the
	// minimum segment, StepZ, MinStepPct and the 60-day windows were tuned
	// on the demo fleet (no drift read as a step, every planted step of
	// 1 pp found), not taken from a source.
	MinSegment     int     // fewest flights between two steps (20; tuned on the demo fleet)
	PenaltyFactor  float64 // split penalty = factor · σ² · ln n (8; tuned on the demo fleet)
	StepZ          float64 // a step is significant when |size| / SE ≥ this (4; tuned on the demo fleet)
	MinStepPct     float64 // smallest step reported (0.5 pp; tuned on the demo fleet)
	EventMatchDays float64 // an event this close to a step is shown beside it (7; common practice: a week)
	StepWindowDays float64 // a step is tested on this many days each side (60; tuned on the demo fleet)
	RollingHalf    int     // the rolling median spans 2·RollingHalf+1 flights (10)

	LevelPP  float64 // flag level: recent ≥ fleet median + this (2.0 pp)
	GrowthPP float64 // flag growth: drift × DriftDays ≥ this (1.0 pp)
	StepPP   float64 // flag step: an increase ≥ this (1.0 pp)

	// The engine series' flag thresholds, set apart from the airframe's
	// (the same defaults).
	EngineLevelPP, EngineGrowthPP, EngineStepPP float64

	CruiseHours float64 // per year, for the cost (2,500 h)
	FuelPrice   float64 // per kg of fuel, for the cost (0: no money figure)
}

// DefaultTrendConfig returns the defaults of DESIGN.md §4.8–§4.10.
func DefaultTrendConfig() TrendConfig {
	return TrendConfig{
		RecentDays: 30, DriftDays: 180, MinDriftDays: 60, FlightGap: 6,
		MaxAbsDevPct: 25, MaxBank: 30 * math.Pi / 180, MaxVS: 1500 * Foot / Minute, MaxAccel: 5 * Knot / Minute,
		MinSegment: 20, PenaltyFactor: 8, StepZ: 4, MinStepPct: 0.5, EventMatchDays: 7, StepWindowDays: 60, RollingHalf: 10,
		LevelPP: 2, GrowthPP: 1, StepPP: 1,
		EngineLevelPP: 2, EngineGrowthPP: 1, EngineStepPP: 1,
		CruiseHours: 2500,
	}
}

// EngineSeries returns c with the engine series' flag thresholds in place
// of the airframe's: the configuration under which an engine series is
// trended and flagged.
func (c TrendConfig) EngineSeries() TrendConfig {
	c.LevelPP, c.GrowthPP, c.StepPP = c.EngineLevelPP, c.EngineGrowthPP, c.EngineStepPP
	return c
}

// Reasons a point is not usable for the trend.
const (
	ExcludeThrustTable = "outside the thrust table"
	ExcludeImplausible = "deviation beyond the plausible limit"
	ExcludeBank        = "bank beyond the limit"
	ExcludeVS          = "vertical speed beyond the limit"
	ExcludeAccel       = "acceleration beyond the limit"
)

// Usable reports why p cannot be used for the trend, or "" when it can: a
// fan speed outside the type's thrust table, |deviation| above MaxAbsDevPct, or bank, vertical speed or acceleration
// beyond their limits as NewPoint judged them (within them the energy method
// corrects for them).
func (c *TrendConfig) Usable(p TrendPoint) string {
	switch {
	case p.OutsideTable:
		return ExcludeThrustTable
	case math.IsNaN(p.DevPct) || math.Abs(p.DevPct) > c.MaxAbsDevPct:
		return ExcludeImplausible
	case p.Manoeuvre == ManoeuvreBank:
		return ExcludeBank
	case p.Manoeuvre == ManoeuvreVS:
		return ExcludeVS
	case p.Manoeuvre == ManoeuvreAccel:
		return ExcludeAccel
	}
	return ""
}

// FlightPoint is the median deviation of one flight: 24 bytes and no
// pointer, as a fleet has millions of flights. Their rolling median is
// TailTrend.Rolling, made when a chart draws it.
type FlightPoint struct {
	UnixNano int64 // first snapshot of the flight, ns since 1970-01-01 UTC (At)
	DevPct   float64
	Flight   FlightID // its name: TailTrend.FlightName
	N        int32    // snapshots
}

// At is the time of the flight's first snapshot (UTC).
func (f FlightPoint) At() time.Time { return time.Unix(0, f.UnixNano).UTC() }

// Step is a sudden change of a tail's deviation.
type Step struct {
	Time    time.Time // the first flight after the change
	SizePct float64   // pp, positive = more drag
	SE      float64   // standard error of the size, pp
	Event   *Event    // an event at or near the step, if any
}

// TailTrend is the trend of one tail (DESIGN.md §4.8).
type TailTrend struct {
	Tail string
	// Type is the type in force at the tail's last snapshot, the group whose
	// median its level flag compares with ("" : one group for all);
	// CruiseHours its hours a year for the cost (0: the configuration's).
	// The pipeline sets both from the roster.
	Type        string
	CruiseHours float64
	Points      int            // usable snapshots
	Excluded    map[string]int // snapshots left out, by reason
	First, Last time.Time

	Flights []FlightPoint
	Names   *FlightNames // the names of the flights
	// RollingHalf is the configuration's: Rolling spans 2·RollingHalf+1
	// flights.
	RollingHalf int

	RecentPct float64 // median of the per-flight deviations of the last RecentDays; NaN if none

	Drift              Slope // pp per 100 days over the drift window; NaN if too short
	DriftFrom, DriftTo time.Time
	Steps              []Step  // significant changes, increases and decreases, in time order
	Segments           []Line  // the fitted line of each run between boundaries (x in days since First)
	FuelFlowExpected   float64 // median expected fuel flow, kg/s
	Events             []Event

	Typical   Cruise    // medians of the usable snapshots
	Polar     PolarFit  // CD − wave = CD0 + k CL² over the current segment
	PolarErr  error     // why there is no polar fit (nil: Polar holds it)
	PolarFrom time.Time // start of the current segment: the last step or event, or First

	// ImplausibleMedianPct is the median deviation of the snapshots left out
	// as implausible (NaN if none): when every snapshot is, it says by how
	// much and so hints at the cause (a fuel flow of one engine, a unit).
	ImplausibleMedianPct float64
}

// Rolling returns the rolling median of the flights' deviations, one per
// flight, over 2·RollingHalf+1 flights (RollingMedian): the line a chart
// draws through them, made when it is drawn rather than kept for every
// tail of a fleet.
func (tr *TailTrend) Rolling() []float64 {
	devs := make([]float64, len(tr.Flights))
	for i, f := range tr.Flights {
		devs[i] = f.DevPct
	}
	return RollingMedian(devs, tr.RollingHalf)
}

// FlightName is the name of one of the tail's flights.
func (tr *TailTrend) FlightName(f FlightPoint) string { return tr.Names.Name(f.Flight) }

// DriftAt is the drift line at time t, in %: Sen's line through the daily
// medians of the drift window. NaN without a drift.
func (tr *TailTrend) DriftAt(t time.Time) float64 {
	return tr.Drift.Intercept + tr.Drift.Slope/100*days(t, tr.First)
}

// days is t in days since base.
func days(t, base time.Time) float64 { return t.Sub(base).Hours() / 24 }

// daysNs is days for a time in ns since 1970 (a point's or a flight's).
func daysNs(ns int64, base time.Time) float64 { return time.Duration(ns-base.UnixNano()).Hours() / 24 }

// NewFlight reports whether a snapshot of flight id flight at t starts a new
// flight after one of prevFlight at prevTime, of the same tail: the id
// changes or more than gapHours pass between them.
func NewFlight(prevFlight string, prevTime time.Time, flight string, t time.Time, gapHours float64) bool {
	return flight != prevFlight || t.Sub(prevTime).Hours() > gapHours
}

// NextFlight is NewFlight for two points of a tail: whether b, after a,
// starts a new flight.
func NextFlight(a, b *TrendPoint, gapHours float64) bool {
	return a.Flight != b.Flight || time.Duration(b.UnixNano-a.UnixNano).Hours() > gapHours
}

// Flights groups time-ordered usable points into flights: a new flight
// starts when the flight changes or the gap exceeds gapHours; each
// flight's deviation is the median of its snapshots.
func Flights(pts []TrendPoint, gapHours float64) []FlightPoint {
	n := min(len(pts), 1)
	for i := 1; i < len(pts); i++ {
		if NextFlight(&pts[i-1], &pts[i], gapHours) {
			n++
		}
	}
	out := make([]FlightPoint, 0, n) // counted first: a fleet has hundreds of thousands, none to spare
	var devs []float64
	start := 0
	flush := func(end int) {
		if end <= start {
			return
		}
		devs = devs[:0]
		for _, p := range pts[start:end] {
			devs = append(devs, p.DevPct)
		}
		out = append(out, FlightPoint{UnixNano: pts[start].UnixNano, Flight: pts[start].Flight, DevPct: median(devs), N: int32(end - start)})
	}
	for i := 1; i <= len(pts); i++ {
		if i == len(pts) || NextFlight(&pts[i-1], &pts[i], gapHours) {
			flush(i)
			start = i
		}
	}
	return out
}

// AnalyzeTrend computes the trend of one tail from its analysed points (any
// order) and its events: usable points only; per-flight medians; the recent
// level; steps from a piecewise-linear segmentation of the per-flight series
// (runs also start at events), kept when the jump between the two fitted
// lines is significant; and the drift as the Theil–Sen slope of the daily
// medians over the trailing DriftDays after the last step. names gives the
// names of the points' flights. det, when not nil, holds the points'
// details (same index), for the typical cruise and the tail's own polar;
// without them Typical stays NaN and PolarErr says why (an engine series,
// whose snapshots are the airframe's; a report, which shows neither).
func AnalyzeTrend(tail string, pts []TrendPoint, det []PointDetail, names *FlightNames, events []Event, c TrendConfig) TailTrend {
	tr := TailTrend{Tail: tail, Names: names, Excluded: map[string]int{}, RecentPct: math.NaN(),
		Drift:            Slope{Slope: math.NaN(), Lo: math.NaN(), Hi: math.NaN(), Intercept: math.NaN()},
		FuelFlowExpected: math.NaN(), ImplausibleMedianPct: math.NaN(),
		Typical: Cruise{math.NaN(), math.NaN(), math.NaN(), math.NaN()}, PolarErr: errNoPoints}
	sc := scratches.Get().(*scratch)
	defer scratches.Put(sc)
	if len(det) != len(pts) {
		det = nil
	}
	usable, udet := sc.usable[:0], sc.det[:0]
	defer func() { sc.usable, sc.det = usable[:0], udet[:0] }()
	var implausible []float64
	for i, p := range pts {
		if why := c.Usable(p); why != "" {
			tr.Excluded[why]++
			if why == ExcludeImplausible && !math.IsNaN(p.DevPct) {
				implausible = append(implausible, p.DevPct)
			}
			continue
		}
		usable = append(usable, p)
		if det != nil {
			udet = append(udet, det[i])
		}
	}
	tr.ImplausibleMedianPct = median(implausible)
	if order := TimeOrder(usable); order != nil { // the pipeline's are in order
		Reorder(usable, order)
		if det != nil {
			Reorder(udet, order)
		}
	}
	tr.Points = len(usable)
	tr.Events = append([]Event(nil), events...)
	sort.SliceStable(tr.Events, func(i, j int) bool { return tr.Events[i].Time.Before(tr.Events[j].Time) })
	if len(usable) == 0 {
		return tr
	}
	tr.First, tr.Last = usable[0].At(), usable[len(usable)-1].At()
	ff := slices.Grow(sc.col[:0], len(usable))[:len(usable)]
	sc.col = ff
	for i := range usable {
		ff[i] = usable[i].FuelFlowExpected
	}
	tr.FuelFlowExpected = median(ff)
	if det != nil {
		tr.Typical = typicalCruise(udet, ff)
	}
	tr.Flights = Flights(usable, c.FlightGap)
	tr.RollingHalf = c.RollingHalf
	ar := &sc.ar
	ar.reset()

	recentFrom := tr.Last.Add(-time.Duration(c.RecentDays * 24 * float64(time.Hour)))
	recent := ar.floats(len(tr.Flights))[:0]
	for _, f := range tr.Flights {
		if f.UnixNano >= recentFrom.UnixNano() {
			recent = append(recent, f.DevPct)
		}
	}
	tr.RecentPct = median(recent)

	tr.findSteps(c, ar)
	tr.findDrift(c, ar)
	if det != nil {
		tr.fitPolar(usable, udet, c)
	}
	return tr
}

var errNoPoints = errors.New("no usable snapshots")

// ByTime orders points by time (for slices.SortStableFunc).
func ByTime(a, b TrendPoint) int { return cmp.Compare(a.UnixNano, b.UnixNano) }

// scratch is AnalyzeTrend's buffers, kept from one tail to the next
// (scratches): the usable points and their details, a column of values
// and the arena of the trend's other columns.
type scratch struct {
	usable []TrendPoint
	det    []PointDetail
	col    []float64
	ar     arena
}

var scratches = sync.Pool{New: func() any { return new(scratch) }}

// typicalCruise is the median weight, level, Mach and ISA deviation of the
// points of details pts. The buffer v (len(pts)) serves the four columns
// (each median reorders it).
func typicalCruise(pts []PointDetail, v []float64) Cruise {
	col := func(k int) float64 {
		for i := range pts {
			p := &pts[i]
			switch k {
			case 0:
				v[i] = float64(p.Weight)
			case 1:
				v[i] = float64(p.Altitude)
			case 2:
				v[i] = float64(p.Mach)
			default:
				v[i] = float64(p.ISADev)
			}
		}
		return median(v)
	}
	return Cruise{Weight: col(0), Altitude: col(1), Mach: col(2), ISADev: col(3)}
}

// fitPolar fits the tail's own polar over its current segment: from the
// last step or event on, since a repair or a step changes CD0.
func (tr *TailTrend) fitPolar(usable []TrendPoint, det []PointDetail, c TrendConfig) {
	tr.PolarFrom = tr.First
	if k := len(tr.Steps); k > 0 && tr.Steps[k-1].Time.After(tr.PolarFrom) {
		tr.PolarFrom = tr.Steps[k-1].Time
	}
	for _, e := range tr.Events {
		if e.Time.After(tr.PolarFrom) && !e.Time.After(tr.Last) {
			tr.PolarFrom = e.Time
		}
	}
	tr.Polar, tr.PolarErr = FitPolar(PolarPoints(usable, det, c, tr.PolarFrom))
}

// findSteps segments the per-flight series and keeps significant jumps.
// Its columns are buffers of ar.
func (tr *TailTrend) findSteps(c TrendConfig, ar *arena) {
	n := len(tr.Flights)
	x, y := ar.floats(n), ar.floats(n)
	for i, f := range tr.Flights {
		x[i], y[i] = daysNs(f.UnixNano, tr.First), f.DevPct
	}
	sigma := noiseSigma(y, ar)
	sums := newLineSums(x, y, ar)
	if n < 2*max(c.MinSegment, 3) || math.IsNaN(sigma) || sigma == 0 {
		if n >= 2 {
			tr.Segments = []Line{sums.fit(0, n)}
		}
		return
	}
	var forced []int
	for _, e := range tr.Events {
		i := sort.Search(n, func(i int) bool { return tr.Flights[i].UnixNano >= e.Time.UnixNano() })
		if i > 0 && i < n {
			forced = append(forced, i)
		}
	}
	s2 := sigma * sigma
	bounds := segmentLines(sums, n, c.MinSegment, c.PenaltyFactor*s2*math.Log(float64(n)), forced)
	edges := append(append([]int{0}, bounds...), n)
	for i := 0; i+1 < len(edges); i++ {
		tr.Segments = append(tr.Segments, sums.fit(edges[i], edges[i+1]))
	}
	for i, b := range bounds {
		// Whether the jump is real is tested on lines fitted to the flights
		// within StepWindowDays of the boundary: a boundary placed near the
		// start of a drift shows no jump there. Its size is then measured
		// on the whole neighbouring runs, which is more precise.
		at := 0.5 * (x[b-1] + x[b])
		lo := sort.SearchFloat64s(x[edges[i]:b], at-c.StepWindowDays) + edges[i]
		hi := sort.SearchFloat64s(x[b:edges[i+2]], at+c.StepWindowDays) + b
		if b-lo < 3 || hi-b < 3 {
			continue
		}
		nearL, nearR := sums.fit(lo, b), sums.fit(b, hi)
		local := nearR.At(at) - nearL.At(at)
		if math.Abs(local) < c.MinStepPct || math.Abs(local) < c.StepZ*math.Sqrt(nearL.VarAt(at, s2)+nearR.VarAt(at, s2)) {
			continue
		}
		left, right := tr.Segments[i], tr.Segments[i+1]
		size := right.At(at) - left.At(at)
		se := math.Sqrt(left.VarAt(at, s2) + right.VarAt(at, s2))
		if math.Abs(size) < c.MinStepPct {
			continue
		}
		st := Step{Time: tr.Flights[b].At(), SizePct: size, SE: se}
		// An event at the boundary, or the nearest within EventMatchDays.
		best := c.EventMatchDays
		for k := range tr.Events {
			if d := math.Abs(days(tr.Events[k].Time, st.Time)); d <= best {
				best, st.Event = d, &tr.Events[k]
			}
		}
		tr.Steps = append(tr.Steps, st)
	}
}

// findDrift fits the Theil–Sen slope of the daily medians over the trailing
// DriftDays, starting after the last step. Its columns are buffers of ar.
func (tr *TailTrend) findDrift(c TrendConfig, ar *arena) {
	from := tr.Last.Add(-time.Duration(c.DriftDays * 24 * float64(time.Hour)))
	if from.Before(tr.First) {
		from = tr.First
	}
	if k := len(tr.Steps); k > 0 && tr.Steps[k-1].Time.After(from) {
		from = tr.Steps[k-1].Time
	}
	if days(tr.Last, from) < c.MinDriftDays {
		return
	}
	// Each day is one point at the median time of its flights, so that
	// the line's intercept is at the right time of day.
	n := len(tr.Flights)
	x, y := ar.floats(n)[:0], ar.floats(n)[:0]
	day, dayX := ar.floats(min(n, 64))[:0], ar.floats(min(n, 64))[:0] // one day's flights
	cur := math.Inf(-1)
	flushDay := func() {
		if len(day) > 0 {
			x = append(x, median(dayX))
			y = append(y, median(day))
			day, dayX = day[:0], dayX[:0]
		}
	}
	for _, f := range tr.Flights {
		if f.UnixNano < from.UnixNano() {
			continue
		}
		fx := daysNs(f.UnixNano, tr.First)
		if d := math.Floor(fx); d != cur {
			flushDay()
			cur = d
		}
		day, dayX = append(day, f.DevPct), append(dayX, fx)
	}
	flushDay()
	if len(x) < 10 {
		return
	}
	s := theilSen(x, y, 0.95, ar)
	tr.Drift = Slope{Slope: 100 * s.Slope, Lo: 100 * s.Lo, Hi: 100 * s.Hi, Intercept: s.Intercept, N: s.N}
	tr.DriftFrom, tr.DriftTo = from, tr.Last
}

// Why says, for a tail without a recent level, why it has none: every
// snapshot left out, by reason, and for implausible deviations their median,
// which points at the usual causes. "" when the tail has a recent level.
func (tr *TailTrend) Why() string {
	if !math.IsNaN(tr.RecentPct) {
		return ""
	}
	total := 0
	for _, n := range tr.Excluded {
		total += n
	}
	if total == 0 {
		return "no snapshots"
	}
	reasons := make([]string, 0, len(tr.Excluded))
	for why, n := range tr.Excluded {
		reasons = append(reasons, fmt.Sprintf("%d %s", n, why))
	}
	sort.Strings(reasons)
	msg := fmt.Sprintf("all %d snapshots left out (%s)", total, strings.Join(reasons, ", "))
	if m := tr.ImplausibleMedianPct; !math.IsNaN(m) {
		msg += fmt.Sprintf("; their median deviation is %+.0f %%", m)
		if m < -30 {
			msg += ": is the fuel flow that of all engines, and in the unit of its column?"
		} else if m > 30 {
			msg += ": check the weight, the fuel-flow unit and the type file"
		}
	}
	return msg
}
