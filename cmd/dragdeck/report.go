package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"os"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// reportJSON is the stable JSON of a fleet report; its field names are
// used by scripts and do not change.
type reportJSON struct {
	Read     int `json:"read"`
	Rejected int `json:"rejected"`
	// Duplicates are accepted rows that repeat a tail and time, counted
	// once in the analysis.
	Duplicates int            `json:"duplicates"`
	Fleet      fleetJSON      `json:"fleet"`
	Tails      []tailJSON     `json:"tails"`
	Caution    string         `json:"caution"`
	Settings   map[string]any `json:"settings"`
}

type fleetJSON struct {
	fleetSeriesJSON        // the airframe series
	First           string `json:"first,omitempty"`
	Last            string `json:"last,omitempty"`
	// Engine is the engine series of the tails with fan speed; null without.
	Engine *fleetSeriesJSON `json:"engine"`
	// Types groups the tails by the type in force at their last snapshot:
	// the medians their level flags compare with.
	Types map[string]typeJSON `json:"types"`
	// FuelFactor sums the fuel-factor proposals.
	FuelFactor fleetFactorJSON `json:"fuel_factor"`
}

type typeJSON struct {
	Tails                    int      `json:"tails"`
	DeviationPctMedian       *float64 `json:"deviation_pct_median"`
	EngineDeviationPctMedian *float64 `json:"engine_deviation_pct_median"`
}

// newTypesJSON gives each type's tail count and its medians of the two
// series (from the pipeline's fleets).
func newTypesJSON(r *pipeline.Result) map[string]typeJSON {
	out := map[string]typeJSON{}
	for name, g := range r.Fleet.Types {
		t := typeJSON{Tails: g.Tails, DeviationPctMedian: num(g.MedianRecentPct)}
		if eg, ok := r.Engine.Types[name]; ok {
			t.EngineDeviationPctMedian = num(eg.MedianRecentPct)
		}
		out[name] = t
	}
	return out
}

// fleetSeriesJSON is one series over the fleet: its tails, flags, median
// recent level and excess fuel and CO2 a year, summed over the tails (net).
type fleetSeriesJSON struct {
	Tails               int      `json:"tails"`
	Flagged             int      `json:"flagged"`
	DeviationPctMedian  *float64 `json:"deviation_pct_median"`
	ExcessFuelKgPerYear *float64 `json:"excess_fuel_kg_per_year"`
	CO2TPerYear         *float64 `json:"co2_t_per_year"`
}

func newFleetSeriesJSON(f model.Fleet) fleetSeriesJSON {
	return fleetSeriesJSON{Tails: len(f.Tails), Flagged: f.Flagged, DeviationPctMedian: num(f.MedianRecentPct),
		ExcessFuelKgPerYear: num(f.ExcessFuel), CO2TPerYear: num(f.CO2 / 1000)}
}

type tailJSON struct {
	Tail string `json:"tail"`
	Type string `json:"type"` // the type in force at its last snapshot
	// ThrustSource is "fan speed" when the tail has an engine series, else
	// "fuel flow" (the drag then includes engine effects).
	ThrustSource string         `json:"thrust_source"`
	Points       int            `json:"points"`
	Flights      int            `json:"flights"`
	First        string         `json:"first"`
	Last         string         `json:"last"`
	seriesJSON                  // the airframe series
	NoLevel      string         `json:"no_level_reason,omitempty"` // why deviation_pct is null
	MoneyPerYear *float64       `json:"money_per_year,omitempty"`
	Excluded     map[string]int `json:"excluded"`
	// Engine is the tail's engine series; null without thrust from fan speed.
	Engine *seriesJSON `json:"engine"`
	// Work is the tail's work items in progress (from a store; [] else).
	Work []workRefJSON `json:"work"`
	// FuelFactor is the tail's fuel factor: in use, monitored, proposed.
	FuelFactor factorJSON `json:"fuel_factor"`
}

// workRefJSON is a work item in a report: its id, status and reason.
type workRefJSON struct {
	ID     int64  `json:"id"`
	Status string `json:"status"`
	Reason string `json:"reason"`
}

func workRefs(items []store.WorkItem) []workRefJSON {
	out := []workRefJSON{}
	for _, w := range items {
		out = append(out, workRefJSON{ID: w.ID, Status: w.Status, Reason: w.Reason})
	}
	return out
}

// seriesJSON is one series of a tail, airframe or engine: its recent
// level, %, drift, steps, flags and excess fuel.
type seriesJSON struct {
	DeviationPct        *float64   `json:"deviation_pct"`
	DriftPctPer100d     *float64   `json:"drift_pct_per_100d"`
	DriftCI95PctPer100d []*float64 `json:"drift_ci95_pct_per_100d"`
	Steps               []stepJSON `json:"steps"`
	Flags               []string   `json:"flags"`
	ExcessFuelKgPerYear *float64   `json:"excess_fuel_kg_per_year"`
	CO2TPerYear         *float64   `json:"co2_t_per_year"`
}

func newSeriesJSON(a model.TailAssessment) seriesJSON {
	j := seriesJSON{DeviationPct: num(a.RecentPct), DriftPctPer100d: num(a.Drift.Slope), Steps: stepsJSON(a.Steps), Flags: a.Flags,
		ExcessFuelKgPerYear: num(a.ExcessFuel), CO2TPerYear: num(a.CO2 / 1000)}
	if j.DriftPctPer100d != nil {
		j.DriftCI95PctPer100d = []*float64{num(a.Drift.Lo), num(a.Drift.Hi)}
	}
	return j
}

func stepsJSON(steps []model.Step) []stepJSON {
	out := []stepJSON{}
	for _, s := range steps {
		out = append(out, stepJSON{Date: s.Time.UTC().Format(time.DateOnly), SizePct: finite(s.SizePct), SEPct: finite(s.SE), Event: eventText(s.Event)})
	}
	return out
}

type stepJSON struct {
	Date    string `json:"date"`
	SizePct finite `json:"size_pct"`
	SEPct   finite `json:"se_pct"`
	Event   string `json:"event,omitempty"`
}

// num turns NaN into a JSON null.
func num(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func timeOrEmpty(t time.Time) string {
	if t.IsZero() {
		return ""
	}
	return t.UTC().Format(time.RFC3339)
}

func eventText(e *model.Event) string {
	if e == nil {
		return ""
	}
	if e.Note == "" {
		return e.Kind
	}
	return e.Kind + ": " + e.Note
}

func newTailJSON(a model.TailAssessment, engine *model.TailAssessment, price float64) tailJSON {
	j := tailJSON{
		Tail: a.Tail, Type: a.Type, ThrustSource: sourceFuelFlow, Points: a.Points, Flights: len(a.Flights),
		First: timeOrEmpty(a.First), Last: timeOrEmpty(a.Last),
		seriesJSON: newSeriesJSON(a), Excluded: a.Excluded, NoLevel: a.Why(),
	}
	if engine != nil {
		e := newSeriesJSON(*engine)
		j.ThrustSource, j.Engine = sourceFanSpeed, &e
	}
	if price > 0 {
		j.MoneyPerYear = num(a.Money)
	}
	return j
}

// trendFlags declares the trend settings of report and dash; the function
// it returns reads and checks them after parsing.
func trendFlags(fs *flagSet) func() (model.TrendConfig, error) {
	c := model.DefaultTrendConfig()
	recent := fs.float("recent-days", "D", c.RecentDays, false, "window of the recent level, days")
	drift := fs.float("drift-days", "D", c.DriftDays, false, "trailing window of the drift, days")
	levelPP := fs.float("level-pp", "P", c.LevelPP, false, "level flag: percentage points above the fleet median")
	growthPP := fs.float("growth-pp", "P", c.GrowthPP, false, "growth flag: percentage points over the drift window")
	stepPP := fs.float("step-pp", "P", c.StepPP, false, "step flag: smallest increase, percentage points")
	eLevel := fs.float("engine-level-pp", "P", c.EngineLevelPP, false, "engine series' level flag: percentage points above the fleet's engine median")
	eGrowth := fs.float("engine-growth-pp", "P", c.EngineGrowthPP, false, "engine series' growth flag: percentage points over the drift window")
	eStep := fs.float("engine-step-pp", "P", c.EngineStepPP, false, "engine series' step flag: smallest increase, percentage points")
	hours := fs.float("cruise-hours", "H", c.CruiseHours, false, "cruise hours per tail per year")
	price := fs.float("fuel-price-per-kg", "P", 0, false, "fuel price per kg, for a money figure (any currency)")
	maxDev := fs.float("max-dev-pct", "P", c.MaxAbsDevPct, false, "points with a larger |deviation| are implausible, %")
	maxBank := fs.float("max-bank-deg", "B", 30, false, "points with a larger |bank| are left out, degrees")
	maxVS := fs.float("max-vs-fpm", "V", 1500, false, "points with a larger |vertical speed| are left out, ft/min")
	maxAcc := fs.float("max-accel-kt-per-min", "A", 5, false, "points with a larger |acceleration| are left out, kt/min")
	return func() (model.TrendConfig, error) {
		for name, v := range map[string]float64{"recent-days": *recent, "drift-days": *drift, "level-pp": *levelPP, "growth-pp": *growthPP,
			"step-pp": *stepPP, "engine-level-pp": *eLevel, "engine-growth-pp": *eGrowth, "engine-step-pp": *eStep, "cruise-hours": *hours, "max-dev-pct": *maxDev, "max-bank-deg": *maxBank, "max-vs-fpm": *maxVS, "max-accel-kt-per-min": *maxAcc} {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				return c, usageErrorf("--%s: must be > 0, got %g", name, v)
			}
		}
		if math.IsNaN(*price) || math.IsInf(*price, 0) || *price < 0 {
			return c, usageErrorf("--fuel-price-per-kg: must be ≥ 0, got %g", *price)
		}
		c.RecentDays, c.DriftDays, c.LevelPP, c.GrowthPP, c.StepPP, c.CruiseHours, c.FuelPrice = *recent, *drift, *levelPP, *growthPP, *stepPP, *hours, *price
		c.EngineLevelPP, c.EngineGrowthPP, c.EngineStepPP = *eLevel, *eGrowth, *eStep
		c.MaxAbsDevPct, c.MaxBank, c.MaxVS, c.MaxAccel = *maxDev, feed.RadFromDeg(*maxBank), feed.MPerSFromFtPerMin(*maxVS), feed.MPerS2FromKtPerMin(*maxAcc)
		c.MinDriftDays = math.Min(c.MinDriftDays, c.DriftDays)
		return c, nil
	}
}

func runReport(e *env, args []string) error {
	fs := newFlagSet("report", "dragdeck report [--type FILE | --fleet FILE] [--format table|csv|json|html] [--events FILE] [flags] PATH... | --store FILE",
		`Per-tail drag trend and flags for a fleet (the method is in the README). Every
accepted snapshot is analysed against the baseline polar; points beyond the
limits below are left out and counted. Per tail: the recent level (median
per-flight deviation over the last --recent-days), the drift (Theil–Sen slope
of the daily medians over the trailing --drift-days after the last step, with
its 95 % interval), the steps (significant jumps found by piecewise-linear
segmentation; events start a new segment), the flags and the cost:
  level   recent level ≥ fleet median + --level-pp (with --fleet: the median
          of the tail's own type)
  growth  drift × --drift-days ≥ --growth-pp and its interval excludes zero
  step    an increase ≥ --step-pp that has not been undone
Decreases are reported as improvements, not flagged. Excess fuel per year =
recent level × the tail's median expected cruise fuel flow × --cruise-hours;
CO2 = 3.16 kg per kg of fuel (ICAO). Tails are sorted by severity. With
--store, the snapshots, events and fleet file come from the store, and each
tail's work items in progress are shown.`,
		"dragdeck report --events fleet/events.csv --fuel-price-per-kg 0.85 fleet/snapshots/")
	types := fs.typeFlags()
	format := fs.str("format", "F", "table", "table, csv, json or html (one self-contained page for the weekly review: fleet totals, the tails, charts of the flagged ones, from a store the changes since the last review and the work in progress)")
	events := fs.str("events", "FILE", "", "events file (time,tail,kind,note): steps are matched to events, trends restart at them")
	rejects := fs.str("rejects", "FILE", "", "write every rejected row to FILE")
	plots := fs.str("plots", "DIR", "", "write a PNG per tail and fleet.png into DIR")
	storePath := fs.storeFlag()
	failOnFlag := fs.Bool("fail-on-flag", false, "exit 1 when any tail is flagged (for scheduled jobs)")
	trend := trendFlags(fs)
	policyOf := factorFlags(fs)
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	c, err := trend()
	if err != nil {
		return err
	}
	switch *format {
	case "table", "csv", "json", "html":
	default:
		return usageErrorf("--format: %q is not table, csv, json or html", *format)
	}
	in, err := openInput(e.stderr, fs, types, *storePath, *events)
	if err != nil {
		return err
	}
	defer in.close()
	if in.policy, err = policyOf(in.roster); err != nil {
		return err
	}
	files := in.files
	var rejOut *atomicFile
	if *rejects != "" {
		if in.store == nil {
			if files, err = leaveOutOutput(e.stderr, *rejects, fs.Args(), files); err != nil {
				return err
			}
		} else if sameFile(*rejects, *storePath) {
			return usageErrorf("--rejects: %s is the store; writing it would destroy it", *rejects)
		}
		if rejOut, err = createAtomic(*rejects); err != nil {
			return usageErrorf("--rejects: %v", err)
		}
		defer rejOut.Abort() // a run that fails leaves the old file as it was
	}
	in.files = files
	pin := in.pipelineInput(c)
	pin.Reject = func(r *feed.RowError) {
		if rejOut != nil {
			fmt.Fprintln(rejOut, r)
		}
	}
	// A report shows trends and flights, never points; the memory limit is
	// put back for the next command of a test.
	pin.DropPoints = true
	defer setMemoryLimit(in, reportBytesPerByte)()
	r := pipeline.Run(pin)
	if err := sourceFailed(r); err != nil {
		return err
	}
	failed := reportFiles(e.stderr, "report", r)
	if rejOut != nil {
		if err := rejOut.Commit(); err != nil {
			return usageErrorf("--rejects: %v", err)
		}
	}
	if *plots != "" {
		n, err := writePlots(*plots, r.Fleet, c, files)
		if err != nil {
			return usageErrorf("--plots: %v", err)
		}
		fmt.Fprintf(e.stderr, "dragdeck report: %d plot(s) written to %s\n", n, *plots)
	}
	switch *format {
	case "json":
		err = writeReportJSON(e.stdout, r, in.work)
	case "html":
		err = writeReportHTML(e.stdout, r, in, time.Now())
	case "csv":
		err = writeReportCSV(e.stdout, r, c.FuelPrice)
	default:
		writeReportTable(e.stdout, r, in)
	}
	if err != nil {
		return err
	}
	if failed > 0 {
		return &exitErr{code: exitUsage, err: fmt.Errorf("%d of %d file(s) could not be read; the report covers the others", failed, len(files))}
	}
	if *failOnFlag && r.Fleet.Flagged > 0 {
		return &exitErr{code: exitFindings}
	}
	return nil
}

// reportFiles tells stderr about each file the pipeline read that needs a
// word: unknown columns, an events file among the snapshots, a file that
// could not be read. It returns how many could not be read.
func reportFiles(w io.Writer, cmd string, r *pipeline.Result) int {
	failed := 0
	for _, res := range r.Files {
		warnUnknown(w, res)
		switch {
		case res.Events:
			fmt.Fprintf(w, "dragdeck %s: %s: an events file, skipped (give it with --events)\n", cmd, res.Path)
		case res.Err != nil:
			failed++
			fmt.Fprintf(w, "dragdeck %s: %v (skipped; the other files are read)\n", cmd, res.Err)
		}
	}
	if r.Duplicates > 0 {
		fmt.Fprintf(w, "dragdeck %s: note: %d snapshot(s) repeat a tail and time already read (a file given twice, or overlapping exports?); each tail and time counts once\n", cmd, r.Duplicates)
	}
	return failed
}

// leaveOutOutput keeps the --rejects output out of the inputs. Named as an
// input itself it is refused, since writing it would destroy it; found in
// an input folder (the rejects file of an earlier run written beside the
// snapshots) it is left out of the inputs with a note.
func leaveOutOutput(stderr io.Writer, out string, args, inputs []string) ([]string, error) {
	oi, err := os.Stat(out)
	if err != nil {
		return inputs, nil // does not exist yet: cannot be an input
	}
	for _, a := range args {
		if ai, err := os.Stat(a); err == nil && os.SameFile(oi, ai) {
			return nil, usageErrorf("--rejects: %s is one of the input files; writing it would destroy it", out)
		}
	}
	kept := inputs[:0:0]
	for _, in := range inputs {
		if ii, err := os.Stat(in); err == nil && os.SameFile(oi, ii) {
			fmt.Fprintf(stderr, "dragdeck report: note: leaving out %s: it is the --rejects output\n", in)
			continue
		}
		kept = append(kept, in)
	}
	if len(kept) == 0 {
		return nil, usageErrorf("--rejects: %s is the only input file", out)
	}
	return kept, nil
}

func writeReportJSON(w io.Writer, r *pipeline.Result, work map[string][]store.WorkItem) error {
	f, c := r.Fleet, r.Config
	j := reportJSON{Read: r.Stats.Read, Rejected: r.Stats.Rejected, Duplicates: r.Duplicates, Tails: []tailJSON{}, Caution: strings.ReplaceAll(caution, "\n", " "),
		Fleet: fleetJSON{fleetSeriesJSON: newFleetSeriesJSON(f), First: timeOrEmpty(r.First), Last: timeOrEmpty(r.Last), Types: newTypesJSON(r),
			FuelFactor: newFleetFactorJSON(r)},
		Settings: map[string]any{"type": r.Roster.Label(), "recent_days": c.RecentDays, "drift_days": c.DriftDays,
			"level_pp": c.LevelPP, "growth_pp": c.GrowthPP, "step_pp": c.StepPP, "cruise_hours": c.CruiseHours}}
	if len(r.Engine.Tails) > 0 {
		e := newFleetSeriesJSON(r.Engine)
		j.Fleet.Engine = &e
	}
	for _, a := range f.Tails {
		var engine *model.TailAssessment
		if e, ok := r.EngineTail(a.Tail); ok {
			engine = &e
		}
		t := newTailJSON(a, engine, c.FuelPrice)
		t.Work = workRefs(work[a.Tail])
		t.FuelFactor = newFactorJSON(r.Factors[a.Tail])
		j.Tails = append(j.Tails, t)
	}
	return writeJSON(w, j)
}

func fmtF(v float64, prec int) string {
	if math.IsNaN(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'f', prec, 64)
}

func writeReportCSV(w io.Writer, r *pipeline.Result, price float64) error {
	f := r.Fleet
	cw := csv.NewWriter(w)
	head := []string{"tail", "type", "thrust_source", "points", "flights", "first", "last", "deviation_pct", "drift_pct_per_100d", "drift_ci95_lo", "drift_ci95_hi",
		"last_step_date", "last_step_size_pct", "flags", "excess_fuel_kg_per_year", "co2_t_per_year",
		"engine_deviation_pct", "engine_drift_pct_per_100d", "engine_last_step_date", "engine_last_step_size_pct", "engine_flags",
		"engine_excess_fuel_kg_per_year"}
	head = append(head, factorCSVHead...)
	if price > 0 {
		head = append(head, "money_per_year")
	}
	cw.Write(head)
	for _, a := range f.Tails {
		stepDate, stepSize := "", ""
		if k := len(a.Steps); k > 0 {
			stepDate, stepSize = a.Steps[k-1].Time.UTC().Format(time.DateOnly), fmtF(a.Steps[k-1].SizePct, 2)
		}
		source, eng := sourceFuelFlow, []string{"", "", "", "", "", ""}
		if e, ok := r.EngineTail(a.Tail); ok {
			source = sourceFanSpeed
			eng = []string{fmtF(e.RecentPct, 2), fmtF(e.Drift.Slope, 2), "", "", strings.Join(e.Flags, " "), fmtF(e.ExcessFuel, 0)}
			if k := len(e.Steps); k > 0 {
				eng[2], eng[3] = e.Steps[k-1].Time.UTC().Format(time.DateOnly), fmtF(e.Steps[k-1].SizePct, 2)
			}
		}
		row := []string{a.Tail, a.Type, source, strconv.Itoa(a.Points), strconv.Itoa(len(a.Flights)), timeOrEmpty(a.First), timeOrEmpty(a.Last),
			fmtF(a.RecentPct, 2), fmtF(a.Drift.Slope, 2), fmtF(a.Drift.Lo, 2), fmtF(a.Drift.Hi, 2), stepDate, stepSize,
			strings.Join(a.Flags, " "), fmtF(a.ExcessFuel, 0), fmtF(a.CO2/1000, 1)}
		row = append(row, eng...)
		row = append(row, factorCSV(r.Factors[a.Tail])...)
		if price > 0 {
			row = append(row, fmtF(a.Money, 0))
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

func writeReportTable(w io.Writer, r *pipeline.Result, in *input) {
	f, c := r.Fleet, r.Config
	price := c.FuelPrice
	mixed := r.Roster.Mixed()
	span := "no data"
	if !r.First.IsZero() {
		span = r.First.Format(time.DateOnly) + " … " + r.Last.Format(time.DateOnly) + " UTC"
	}
	fmt.Fprintf(w, "Fleet drag report: %s\n", r.Roster.Label())
	from := fmt.Sprintf("%d file(s)", len(in.files))
	if in.store != nil {
		from = "store " + in.store.Path()
	}
	fmt.Fprintf(w, "%d tails, %d snapshots read from %s, %d rejected\nperiod %s\n", len(f.Tails), r.Stats.Read, from, r.Stats.Rejected, span)
	if len(f.Tails) == 0 {
		fmt.Fprintf(w, "\nNo usable snapshots: nothing to report.\n\n%s\n", caution)
		return
	}
	fmt.Fprintf(w, "Fleet median recent deviation %s %%; %d tail(s) flagged.\n", signed(f.MedianRecentPct, 2), f.Flagged)
	fmt.Fprintf(w, "Excess a year, net over the tails: %s t fuel, %s t CO2", signed(f.ExcessFuel/1000, 0), signed(f.CO2/1000, 0))
	if e := r.Engine; len(e.Tails) > 0 {
		fmt.Fprintf(w, " (airframe).\nEngine series, %d tail(s) with fan speed: median %s %%, %d flagged;\n%s t fuel, %s t CO2",
			len(e.Tails), signed(e.MedianRecentPct, 2), e.Flagged, signed(e.ExcessFuel/1000, 0), signed(e.CO2/1000, 0))
	}
	fmt.Fprint(w, ".\n")
	if mixed {
		for _, name := range r.Roster.TypeNames() {
			g, ok := f.Types[name]
			if !ok {
				continue
			}
			fmt.Fprintf(w, "  %s: %d tail(s), median %s %%", name, g.Tails, signed(g.MedianRecentPct, 2))
			if eg, ok := r.Engine.Types[name]; ok {
				fmt.Fprintf(w, ", engine median %s %%", signed(eg.MedianRecentPct, 2))
			}
			fmt.Fprintln(w)
		}
	}
	fmt.Fprintln(w)
	hasEngine := len(r.Engine.Tails) > 0
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	// Two header lines: the column, then its unit.
	fmt.Fprint(tw, "tail\t")
	if mixed {
		fmt.Fprint(tw, "type\t")
	}
	// CO2 is 3.16 × fuel: with a money column it gives way, so that the
	// table fits 80 columns (the footer says so).
	withCO2 := price <= 0
	fmt.Fprint(tw, "level\tdrift\tlast step\tfuel\t")
	if withCO2 {
		fmt.Fprint(tw, "CO2\t")
	}
	if hasEngine {
		fmt.Fprint(tw, "engine\t")
	}
	if price > 0 {
		fmt.Fprint(tw, "money\t")
	}
	fmt.Fprintln(tw, "flags")
	fmt.Fprint(tw, "\t")
	if mixed {
		fmt.Fprint(tw, "\t")
	}
	fmt.Fprint(tw, "%\tpp/100d\tdate pp\tt/yr\t")
	if withCO2 {
		fmt.Fprint(tw, "t/yr\t")
	}
	if hasEngine {
		fmt.Fprint(tw, "%\t")
	}
	if price > 0 {
		fmt.Fprint(tw, "k/yr\t")
	}
	fmt.Fprintln(tw)
	var why []string
	for _, a := range f.Tails {
		step := "-"
		if k := len(a.Steps); k > 0 {
			step = a.Steps[k-1].Time.UTC().Format(time.DateOnly) + " " + signed(a.Steps[k-1].SizePct, 1)
		}
		flags := a.Flags
		fmt.Fprintf(tw, "%s\t", a.Tail)
		if mixed {
			fmt.Fprintf(tw, "%s\t", a.Type)
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t", signed(a.RecentPct, 2), signed(a.Drift.Slope, 2), step, signed(a.ExcessFuel/1000, 0))
		if withCO2 {
			fmt.Fprintf(tw, "%s\t", signed(a.CO2/1000, 0))
		}
		if hasEngine {
			if e, ok := r.EngineTail(a.Tail); ok {
				fmt.Fprintf(tw, "%s\t", signed(e.RecentPct, 2))
				for _, fl := range e.Flags {
					flags = append(flags[:len(flags):len(flags)], "e-"+fl)
				}
			} else {
				fmt.Fprint(tw, "n/a\t")
			}
		}
		if price > 0 {
			fmt.Fprintf(tw, "%s\t", signed(a.Money/1000, 0))
		}
		if len(flags) == 0 {
			flags = []string{"-"}
		}
		fmt.Fprintln(tw, strings.Join(flags, " "))
		if reason := a.Why(); reason != "" {
			why = append(why, a.Tail+": "+reason)
		}
	}
	tw.Flush()
	if len(why) > 0 {
		fmt.Fprintln(w)
	}
	writeWhy(w, "No recent level (shown as -):", why)
	if in.store != nil {
		writeWorkInProgress(w, f.Tails, in.work)
	}
	if mixed {
		fmt.Fprintf(w, "\ntype: in force at the tail's last snapshot; the level flag compares a tail with\nthe median of its own type.")
	}
	fmt.Fprintf(w, "\nlevel: median per-flight drag deviation of the last %g days. drift: pp per\n"+
		"100 days over the trailing %g days (Theil–Sen). last step: date and size in pp.\n"+
		"fuel, CO2: excess per year at %g cruise hours", c.RecentDays, c.DriftDays, c.CruiseHours)
	if r.Roster.Single() == nil {
		fmt.Fprint(w, " (or the fleet file's, per tail)")
	}
	if hasEngine {
		fmt.Fprintf(w, ".\nWith fan speed (N1) the level, drift and steps are the airframe's; engine: the\n"+
			"engine series' level (fuel burnt against the model's for the thrust measured;\n"+
			"its excess fuel is in the totals above and the JSON), e- its flags; n/a:\n"+
			"thrust from fuel flow, the drag includes engine effects")
	}
	if price > 0 {
		fmt.Fprintf(w, ";\nmoney: thousands per year at %g per kg of fuel (CO2 is 3.16 × the fuel)", price)
	}
	fmt.Fprintf(w, ".\n%s\n", caution)
	writeFactorTable(w, r, in.store != nil)
}

// signed formats v with a sign, or "-" for NaN.
func signed(v float64, prec int) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf("%+.*f", prec, v)
}

// wrapWords breaks s at spaces into lines of at most width runes (a longer
// word stands alone), the lines after the first indented by indent spaces
// (within the width).
func wrapWords(s string, width, indent int) []string {
	var lines []string
	line := ""
	for _, word := range strings.Fields(s) {
		limit := width
		if len(lines) > 0 {
			limit -= indent
		}
		switch {
		case line == "":
			line = word
		case len([]rune(line))+1+len([]rune(word)) <= limit:
			line += " " + word
		default:
			lines = append(lines, line)
			line = word
		}
	}
	lines = append(lines, line)
	for i := 1; i < len(lines); i++ {
		lines[i] = strings.Repeat(" ", indent) + lines[i]
	}
	return lines
}

// writeWorkInProgress lists the work items in progress, by tail in the
// report's order (the most severe first).
func writeWorkInProgress(w io.Writer, tails []model.TailAssessment, work map[string][]store.WorkItem) {
	n := 0
	for _, items := range work {
		n += len(items)
	}
	if n == 0 {
		fmt.Fprintf(w, "\nWork in progress: none.\n")
		return
	}
	fmt.Fprintf(w, "\nWork in progress (%d):\n", n)
	seen := map[string]bool{}
	show := func(tail string) {
		for _, it := range work[tail] {
			line := fmt.Sprintf("%s #%d %s: %s (opened %s)", tail, it.ID, it.Status, it.Reason, it.Opened.Format(time.DateOnly))
			for _, l := range wrapWords(line, 80-2, 4) {
				fmt.Fprintf(w, "  %s\n", l)
			}
		}
		seen[tail] = true
	}
	for _, a := range tails {
		show(a.Tail)
	}
	var rest []string
	for tail := range work {
		if !seen[tail] {
			rest = append(rest, tail)
		}
	}
	sort.Strings(rest)
	for _, tail := range rest { // items of tails without data in this report
		show(tail)
	}
}

// writeWhy lists why some rows show "-": a title, then one wrapped
// reason a tail; nothing when there are none.
func writeWhy(w io.Writer, title string, why []string) {
	if len(why) == 0 {
		return
	}
	fmt.Fprintln(w, title)
	for _, s := range why {
		for _, line := range wrapWords(s, 80-2, 2) {
			fmt.Fprintf(w, "  %s\n", line)
		}
	}
}
