package demo

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
	"strconv"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// The demo fleet is an invented airline flying invented types. Its
// snapshots are made through the model's own equations from a known truth:
// a per-tail drag deviation that may drift, step, drop after a repair or sit
// high, plus measurement noise, so that every later analysis can be checked
// against what was put in.

// Airline is the invented operator of the demo fleet.
const Airline = "Kestrel Bay Air (invented)"

// DefaultEnd is where the demo's data stops by default: a fixed day in the
// past, so that the same seed gives the same fleet on any day and no
// snapshot lies in the future.
var DefaultEnd = time.Date(2026, 7, 1, 0, 0, 0, 0, time.UTC)

// Config sets the size and seed of the demo fleet.
type Config struct {
	Tails int       // number of aircraft (default 24)
	Days  int       // days of data (default 730)
	Seed  uint64    // random seed (default 1)
	Start time.Time // first day, UTC midnight (default: Days before DefaultEnd)
	// Type is the one aircraft type flown by every tail. Weights scale
	// with its wing area and buffet limit, speeds with its maximum-range
	// Mach. Groups splits the fleet among several types instead. With
	// neither, the fleet is the built-in mixed fleet (MixedGroups).
	Type   *model.Type
	Groups []Group
	// Effects are the sensor effects on the recorded data (nil: the
	// defaults, DefaultEffects); Clean leaves them all out.
	Effects *Effects
	Clean   bool
	// Overwrite lets Write use a folder that holds files: those of an
	// earlier demo are replaced, the others kept.
	Overwrite bool
}

func (c Config) withDefaults() Config {
	if c.Tails <= 0 {
		c.Tails = 24
	}
	if c.Days <= 0 {
		c.Days = 730
	}
	if c.Seed == 0 {
		c.Seed = 1
	}
	if c.Start.IsZero() {
		c.Start = DefaultEnd.AddDate(0, 0, -c.Days)
	}
	if c.Effects == nil {
		e := DefaultEffects()
		c.Effects = &e
	}
	if c.Clean {
		c.Effects = &Effects{}
	}
	return c
}

// Flag thresholds of DESIGN.md §4.9 used to state the expected flags.
const (
	truthLevelPP  = 2.0 // recent level above fleet median
	truthGrowthPP = 1.0 // drift × 180 d
	truthStepPP   = 1.0
	truthMargin   = 0.5 // expected levels are kept this far from the threshold
)

// Roles of demo tails.
const (
	RoleSteady     = "steady"
	RoleDrift      = "drift"
	RoleStep       = "step"
	RoleRepair     = "repair"
	RoleHigh       = "high"
	RoleManoeuvres = "manoeuvres"
)

// Truth is what the generator put into the demo fleet (truth.json).
type Truth struct {
	Generator    string      `json:"generator"`
	Airline      string      `json:"airline"`
	Types        []TypeTruth `json:"types"`
	Seed         uint64      `json:"seed"`
	Days         int         `json:"days"`
	Start        string      `json:"start"`
	End          string      `json:"end"`
	SnapshotFile string      `json:"snapshot_file"`
	Rows         int         `json:"rows"`
	Accepted     int         `json:"accepted"`
	Rejected     int         `json:"rejected"`
	Thresholds   truthLimits `json:"thresholds"`
	// FleetMedianPct is the median recent level of all tails; each tail's
	// level flag compares it with its own type's (Types).
	FleetMedianPct float64 `json:"fleet_recent_level_median_pct"`
	// ReferenceCD is the baseline CD at the reference cruise of each type
	// (by the fleet file's name); a deviation d % of the truth is an excess
	// ΔCD = d/100 × ReferenceCD of the type in force at every condition
	// (lift-independent).
	ReferenceCD map[string]float64 `json:"reference_cd_baseline"`
	// Effects are the sensor effects put on the recorded snapshots.
	Effects    Effects      `json:"sensor_effects"`
	Tails      []TailTruth  `json:"tails"`
	BrokenRows []BrokenRow  `json:"broken_rows"`
	Traces     []TraceTruth `json:"traces"`
	// Recordings are the 1 Hz recordings of whole flights, for extract.
	Recordings []RecordingTruth `json:"recordings"`
	Events     []Event          `json:"events"`
	Note       string           `json:"note"`
}

type truthLimits struct {
	LevelPP       float64 `json:"level_pp"`
	GrowthPPin180 float64 `json:"growth_pp_per_180d"`
	StepPP        float64 `json:"step_pp"`
}

// TailTruth is one tail's injected drag deviation.
type TailTruth struct {
	Tail string `json:"tail"`
	// Type is the fleet file's name of the type flown from the start;
	// Retrofit, when set, the type flown from its date on.
	Type            string         `json:"type"`
	Retrofit        *RetrofitTruth `json:"retrofit"`
	Role            string         `json:"role"`
	OffsetPct       float64        `json:"offset_pct"`
	DriftPctPer100d float64        `json:"drift_pct_per_100d"`
	DriftStart      string         `json:"drift_start,omitempty"`
	Steps           []StepTruth    `json:"steps"`
	Manoeuvres      bool           `json:"manoeuvres"`
	RecentLevelPct  float64        `json:"recent_level_pct"`
	ExpectedFlags   []string       `json:"expected_flags"`
	// FanSpeed says that the tail's recorder gives n1_pct (the type has a
	// thrust table); Engine is then what was planted in its engines and
	// fuel-flow meter, and the deviation above is the airframe's alone.
	FanSpeed bool         `json:"fan_speed"`
	Engine   *EngineTruth `json:"engine"`

	driftStart time.Time
	ctx        *typeCtx // the type flown from the start
}

// StepTruth is a sudden change of a tail's drag deviation.
type StepTruth struct {
	Date    string  `json:"date"`
	SizePct float64 `json:"size_pct"`
	Cause   string  `json:"cause"`

	at time.Time
}

// BrokenRow is a row written broken on purpose.
type BrokenRow struct {
	File   string `json:"file"`
	Line   int    `json:"line"`
	Column string `json:"column"`
	Defect string `json:"defect"`
}

// TraceTruth is a per-minute trace of one whole flight.
type TraceTruth struct {
	File   string `json:"file"`
	Tail   string `json:"tail"`
	Flight string `json:"flight"`
	Rows   int    `json:"rows"`
}

// Event is one line of the events file (DESIGN.md §3.3).
type Event struct {
	Time string `json:"time"`
	Tail string `json:"tail"`
	Kind string `json:"kind"`
	Note string `json:"note"`
}

// deviation is the true drag deviation (%) of tail tt at time t.
func (tt *TailTruth) deviation(t time.Time) float64 {
	return planted(tt.OffsetPct, tt.DriftPctPer100d, tt.driftStart, tt.Steps, t)
}

// demoGen holds the state of one generation.
type demoGen struct {
	cfg   Config
	types []*typeCtx // one per group, in the config's order
	rng   *rand.Rand
	tails []TailTruth
	end   time.Time
	// typeMedians are the medians of the planted recent levels by the
	// type each tail flies at the end, airframe and engine.
	typeMedians, engineMedians map[string]float64
}

func newDemoGen(cfg Config) *demoGen {
	cfg = cfg.withDefaults()
	g := &demoGen{cfg: cfg, rng: rand.New(rand.NewPCG(cfg.Seed, 0x6472616764656b)),
		end: cfg.Start.AddDate(0, 0, cfg.Days)}
	for _, gr := range cfg.groups() {
		g.types = append(g.types, newTypeCtx(gr))
	}
	g.assignRoles()
	g.assignEngines()
	return g
}

func (g *demoGen) uniform(lo, hi float64) float64 { return lo + (hi-lo)*g.rng.Float64() }

func (g *demoGen) day(frac float64) time.Time {
	d := int(math.Round(frac * float64(g.cfg.Days)))
	return g.cfg.Start.AddDate(0, 0, max(1, min(d, g.cfg.Days-1)))
}

// anyThrust reports whether some type of the fleet has a thrust table (the
// snapshot file then has an n1_pct column).
func (g *demoGen) anyThrust() bool {
	for _, c := range g.types {
		if c.ty.Thrust != nil {
			return true
		}
	}
	return false
}

// typeNames is the fleet's types as the truth and the header name them.
func (g *demoGen) typeNames() string {
	var names []string
	for _, c := range g.types {
		names = append(names, c.ty.Name)
	}
	return strings.Join(names, ", ")
}

func (g *demoGen) assignRoles() {
	n := g.cfg.Tails
	count := func(frac float64) int { return max(1, int(math.Round(frac*float64(n)))) }
	var roles []string
	for _, r := range []struct {
		role string
		frac float64
	}{{RoleDrift, 0.08}, {RoleStep, 0.08}, {RoleRepair, 0.04}, {RoleHigh, 0.04}, {RoleManoeuvres, 0.04}} {
		for i := 0; i < count(r.frac) && len(roles) < n; i++ {
			roles = append(roles, r.role)
		}
	}
	for len(roles) < n {
		roles = append(roles, RoleSteady)
	}
	g.rng.Shuffle(n, func(i, j int) { roles[i], roles[j] = roles[j], roles[i] })

	causes := []string{"damaged door seal", "misrigged spoiler panel", "flap track fairing damage", "missing access panel seal"}
	recentAt := g.end.AddDate(0, 0, -15) // middle of the last 30 days
	g.tails = make([]TailTruth, n)
	i := 0
	for k, c := range split(n, g.cfg.groups()) {
		for range c {
			tt := &g.tails[i]
			tt.ctx = g.types[k]
			tt.Type = tt.ctx.group.Name
			tt.Tail = fmt.Sprintf("%s%03d", tt.ctx.group.Prefix, 101+i)
			i++
		}
	}
	for i := range g.tails {
		tt := &g.tails[i]
		tt.Role = roles[i]
		tt.Steps = []StepTruth{}
		switch tt.Role {
		case RoleSteady:
			tt.OffsetPct = g.uniform(-0.8, 0.8)
		case RoleManoeuvres:
			tt.OffsetPct = g.uniform(-0.5, 0.5)
			tt.Manoeuvres = true
		case RoleHigh:
			tt.OffsetPct = g.uniform(3.2, 4.5)
		case RoleDrift:
			tt.OffsetPct = g.uniform(-0.5, 0.5)
			tt.DriftPctPer100d = g.uniform(0.8, 1.4)
			tt.driftStart = g.end.AddDate(0, 0, -int(g.uniform(200, 260)))
			if tt.driftStart.Before(g.cfg.Start) {
				tt.driftStart = g.cfg.Start
			}
			tt.DriftStart = tt.driftStart.Format(time.DateOnly)
		case RoleStep:
			tt.OffsetPct = g.uniform(-0.5, 0.5)
			at := g.day(g.uniform(0.3, 0.8))
			tt.Steps = append(tt.Steps, StepTruth{at: at, SizePct: g.uniform(2.0, 4.0), Cause: causes[g.rng.IntN(len(causes))]})
		case RoleRepair:
			tt.OffsetPct = g.uniform(3.5, 4.5)
			at := g.day(g.uniform(0.35, 0.7))
			tt.Steps = append(tt.Steps, StepTruth{at: at, SizePct: -tt.OffsetPct + g.uniform(-0.3, 0.3), Cause: "repair"})
		}
		for k := range tt.Steps {
			tt.Steps[k].Date = tt.Steps[k].at.Format(time.DateOnly)
		}
		tt.RecentLevelPct = tt.deviation(recentAt)
	}
	g.assignRetrofits()
	// Expected flags by the rules of DESIGN.md §4.9, with levels kept away
	// from the threshold so that the truth is unambiguous.
	items := make([]levelItem, len(g.tails))
	for i := range g.tails {
		tt := &g.tails[i]
		items[i] = levelItem{group: tt.finalType(), offset: &tt.OffsetPct, recent: &tt.RecentLevelPct, high: tt.Role == RoleHigh}
	}
	g.typeMedians = keepFromLimit(items)
	for i := range g.tails {
		tt := &g.tails[i]
		tt.ExpectedFlags = expectFlags(tt.RecentLevelPct, g.typeMedians[tt.finalType()], tt.DriftPctPer100d, tt.Steps)
	}
}

// expectFlags gives the flags that the rules of DESIGN.md §4.9 raise on a
// planted series: its recent level against its type's median, its drift
// over 180 days, a step up (the planted steps are never undone).
func expectFlags(recent, median, drift float64, steps []StepTruth) []string {
	flags := []string{}
	if recent >= median+truthLevelPP {
		flags = append(flags, model.FlagLevel)
	}
	if drift*1.8 >= truthGrowthPP {
		flags = append(flags, model.FlagGrowth)
	}
	for _, s := range steps {
		if s.SizePct >= truthStepPP {
			return append(flags, model.FlagStep)
		}
	}
	return flags
}

// assignRetrofits moves one steady tail of each group named by another's
// RetrofitFrom to that other group's type half-way through the period.
func (g *demoGen) assignRetrofits() {
	at := g.cfg.Start.AddDate(0, 0, g.cfg.Days/2)
	for _, to := range g.types {
		if to.group.RetrofitFrom == "" || g.cfg.Days < 4 {
			continue
		}
		for i := range g.tails {
			tt := &g.tails[i]
			if tt.Type == to.group.RetrofitFrom && tt.Role == RoleSteady && tt.Retrofit == nil {
				tt.Retrofit = &RetrofitTruth{Date: at.Format(time.DateOnly), Type: to.group.Name, at: at, ctx: to}
				break
			}
		}
	}
}

// levelItem is one planted recent level in its group (the type flown at
// the end), with the offset that moves the whole series.
type levelItem struct {
	group          string
	offset, recent *float64
	high           bool // a tail planted high: kept above its limit
}

// keepFromLimit keeps every planted recent level at least truthMargin away
// from its group's level limit (the group's median + truthLevelPP), moving
// a tail's offset (above the limit for a tail planted high, below for the
// others), until the medians settle; it returns the medians by group.
func keepFromLimit(items []levelItem) map[string]float64 {
	medians := map[string]float64{}
	for range 5 {
		byGroup := map[string][]float64{}
		for _, it := range items {
			byGroup[it.group] = append(byGroup[it.group], *it.recent)
		}
		for name, l := range byGroup {
			medians[name] = model.Median(l)
		}
		moved := false
		for _, it := range items {
			d := *it.recent - (medians[it.group] + truthLevelPP)
			if math.Abs(d) >= truthMargin {
				continue
			}
			shift := -truthMargin - d // move below the limit by the margin
			if it.high {
				shift = truthMargin - d
			}
			*it.offset += shift
			*it.recent += shift
			moved = true
		}
		if !moved {
			break
		}
	}
	return medians
}

// fleetMedian returns the median recent level of all the tails (the
// median of each type is the reference of its level flags).
func (g *demoGen) fleetMedian() float64 {
	levels := make([]float64, len(g.tails))
	for i := range g.tails {
		levels[i] = g.tails[i].RecentLevelPct
	}
	return model.Median(levels)
}

// demoRow is one snapshot before it is written.
type demoRow struct {
	t                             time.Time
	tail, flight                  string
	w, altFt, mach, satC, ffKgph  float64
	bankDeg, vsFpm, accelKtPerMin float64
	n1                            float64 // %, 0: not recorded
}

// snapshot makes the row of tail tt at time t, with cruise weight w (kg), at
// pressure altitude altFt, Mach m and ISA deviation dev, and the manoeuvre
// given; fuel flow follows the model with the tail's true deviation and
// noise (sigma, as a fraction).
func (g *demoGen) snapshot(tt *TailTruth, t time.Time, flight string, w, altFt, m, dev, bankDeg, vsFpm, acc, noise float64) demoRow {
	h := altFt * model.Foot
	tISA, _ := model.ISA(h)
	air := model.AirISA(h, dev)
	q := air.DynamicPressure(m)
	n := model.LoadFactor(bankDeg * math.Pi / 180)
	c := tt.ctxAt(t)
	cl := model.LiftCoefficient(n, w, q, c.ty.WingArea)
	cd := c.ty.CD(cl, m, tt.deviation(t)/100*c.refCD) // excess lift-independent, as the analysis takes it
	tas := air.TAS(m)
	thrust := cd*q*c.ty.WingArea + w*model.G0*feed.MPerSFromFtPerMin(vsFpm)/tas + w*feed.MPerS2FromKtPerMin(acc)
	// The engines burn the model's fuel for this thrust times their
	// planted deviation (wear, a meter reading high), with noise.
	ff := c.ty.TSFC(m, air.Theta()) * thrust * (1 + tt.Engine.deviation(t)/100) * (1 + noise)
	n1 := 0.0
	if tt.FanSpeed {
		n1 = fanSpeed(c.ty, thrust, m, air.Delta(), air.Theta())
	}
	return demoRow{t: t, tail: tt.Tail, flight: flight, w: w, altFt: altFt, mach: m,
		satC: tISA + dev - model.CelsiusZero, ffKgph: ff * model.Hour, bankDeg: bankDeg, vsFpm: vsFpm, accelKtPerMin: acc, n1: n1}
}

// isaDev is the seasonal ISA deviation (K) on day t, with weather noise.
func (g *demoGen) isaDev(t time.Time) float64 {
	season := 6 * math.Sin(2*math.Pi*(float64(t.YearDay())-110)/365)
	weather := g.rng.NormFloat64() * 4
	if !g.cfg.Effects.Seasonal {
		return 0
	}
	return max(-25, min(25, season+weather))
}

// days calls fn with each day's rows in time order.
func (g *demoGen) days(fn func([]demoRow)) {
	var rows []demoRow
	for d := 0; d < g.cfg.Days; d++ {
		day := g.cfg.Start.AddDate(0, 0, d)
		rows = rows[:0]
		dev := g.isaDev(day)
		for i := range g.tails {
			tt := &g.tails[i]
			if g.rng.Float64() < 0.04 { // in maintenance
				continue
			}
			flights := 1 + g.rng.IntN(3)
			dep := day.Add(time.Duration(5*60+g.rng.IntN(180)) * time.Minute)
			for k := 0; k < flights; k++ {
				flight := fmt.Sprintf("DDF%04d", 100+(i*37+k*11)%900)
				c := tt.ctxAt(dep)
				w := c.wMid * g.uniform(0.924, 1.17)
				alt := c.cruiseLevel(w)
				m := math.Round(g.uniform(c.machLo, c.machHi)*1000) / 1000
				fx := g.cfg.Effects
				bias := g.rng.NormFloat64() * fx.FuelFlowScatterPct / 100 // per-flight fuel-flow error
				fdev := dev + g.rng.NormFloat64()*1.5
				if !fx.Seasonal {
					fdev = 0
				}
				wErr := 1 + g.rng.NormFloat64()*fx.WeightErrorPct/100 // per-flight weight error
				t := dep.Add(25 * time.Minute)
				snaps := 1 + g.rng.IntN(3)
				for s := 0; s < snaps; s++ {
					var bank, vs, acc float64
					if tt.Manoeuvres && g.rng.Float64() < 0.4 {
						switch g.rng.IntN(3) {
						case 0:
							bank = g.uniform(8, 28) * float64(1-2*g.rng.IntN(2))
						case 1:
							vs = g.uniform(300, 1200) * float64(1-2*g.rng.IntN(2))
						default:
							acc = g.uniform(1, 3) * float64(1-2*g.rng.IntN(2))
						}
					}
					r := g.snapshot(tt, t, flight, w, alt, m, fdev, bank, vs, acc, bias+g.rng.NormFloat64()*fuelFlowNoise)
					w -= r.ffKgph * 0.4 // the true weight: about 25 min of burn
					// What the recorders give: the true values with their errors.
					r.w *= wErr
					r.mach += g.rng.NormFloat64() * fx.MachNoise
					r.satC += g.rng.NormFloat64() * fx.SATNoiseK
					rows = append(rows, r)
					t = t.Add(time.Duration(15+g.rng.IntN(15)) * time.Minute)
				}
				dep = dep.Add(time.Duration(200+g.rng.IntN(90)) * time.Minute)
			}
		}
		sort.SliceStable(rows, func(a, b int) bool { return rows[a].t.Before(rows[b].t) })
		fn(rows)
	}
}

// snapshotHeader is the column layout the demo writes.
const snapshotHeader = "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg,vs_fpm,accel_kt_per_min\n"

// header is the column layout for the type: with n1_pct when it has a
// thrust table (left empty on the tails without fan speed).
func (g *demoGen) header() string {
	if g.anyThrust() {
		return strings.TrimSuffix(snapshotHeader, "\n") + ",n1_pct\n"
	}
	return snapshotHeader
}

func (g *demoGen) appendRow(b []byte, r demoRow) []byte {
	b = appendRow(b, r)
	if !g.anyThrust() {
		return b
	}
	b = append(b[:len(b)-1], ',')
	if r.n1 > 0 {
		b = strconv.AppendFloat(b, r.n1, 'f', 2, 64)
	}
	return append(b, '\n')
}

func appendRow(b []byte, r demoRow) []byte {
	b = appendFields(r, b, num{r.w, 0}, num{r.altFt, 0}, num{r.mach, 3}, num{r.satC, 1}, num{r.ffKgph, 0},
		num{r.bankDeg, 1}, num{r.vsFpm, 0}, num{r.accelKtPerMin, 2})
	return append(b, '\n')
}

// num is a number of a written row with its decimals.
type num struct {
	v    float64
	prec int
}

// appendFields appends r's time, tail and flight and then the numbers, comma-separated.
func appendFields(r demoRow, b []byte, nums ...num) []byte {
	b = r.t.AppendFormat(b, time.RFC3339)
	b = append(b, ',')
	b = append(b, r.tail...)
	b = append(b, ',')
	b = append(b, r.flight...)
	for _, f := range nums {
		b = append(b, ',')
		b = strconv.AppendFloat(b, f.v, 'f', f.prec, 64)
	}
	return b
}

// brokenKinds are the defects written into the demo file, one per broken
// row in turn, with the column the reader must name.
var brokenKinds = []struct {
	column, defect string
	spoil          func(line []byte) []byte
}{
	{"row", "a field missing", func(l []byte) []byte { return append(l[:bytes.LastIndexByte(l, ',')], '\n') }},
	{"mach", "Mach written as text", func(l []byte) []byte { return replaceField(l, 5, "M.78") }},
	{"weight_kg", "negative weight", func(l []byte) []byte { return replaceField(l, 3, "-64000") }},
	{"mach", "Mach above 1", func(l []byte) []byte { return replaceField(l, 5, "1.78") }},
	{"fuel_flow_kgph", "fuel flow empty", func(l []byte) []byte { return replaceField(l, 7, "") }},
	{"bank_deg", "bank of 95 degrees", func(l []byte) []byte { return replaceField(l, 8, "95") }},
	{"alt_ft", "altitude 70,000 ft", func(l []byte) []byte { return replaceField(l, 4, "70000") }},
	{"time", "time without zone", func(l []byte) []byte { return replaceField(l, 0, "2025-13-01 10:00") }},
}

// replaceField returns line (ending in '\n') with field i replaced by v.
func replaceField(line []byte, i int, v string) []byte {
	fields := bytes.Split(bytes.TrimSuffix(line, []byte{'\n'}), []byte{','})
	fields[i] = []byte(v)
	return append(bytes.Join(fields, []byte{','}), '\n')
}
