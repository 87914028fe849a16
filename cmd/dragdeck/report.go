package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// reportJSON is the stable JSON of a fleet report (DESIGN.md §5).
type reportJSON struct {
	Read     int            `json:"read"`
	Rejected int            `json:"rejected"`
	Fleet    fleetJSON      `json:"fleet"`
	Tails    []tailJSON     `json:"tails"`
	Caution  string         `json:"caution"`
	Settings map[string]any `json:"settings"`
}

type fleetJSON struct {
	Tails              int      `json:"tails"`
	Flagged            int      `json:"flagged"`
	DeviationPctMedian *float64 `json:"deviation_pct_median"`
	First              string   `json:"first,omitempty"`
	Last               string   `json:"last,omitempty"`
}

type tailJSON struct {
	Tail                string         `json:"tail"`
	Points              int            `json:"points"`
	Flights             int            `json:"flights"`
	First               string         `json:"first"`
	Last                string         `json:"last"`
	DeviationPct        *float64       `json:"deviation_pct"`
	DriftPctPer100d     *float64       `json:"drift_pct_per_100d"`
	DriftCI95PctPer100d []*float64     `json:"drift_ci95_pct_per_100d"`
	Steps               []stepJSON     `json:"steps"`
	Flags               []string       `json:"flags"`
	ExcessFuelKgPerYear float64        `json:"excess_fuel_kg_per_year"`
	CO2TPerYear         float64        `json:"co2_t_per_year"`
	MoneyPerYear        *float64       `json:"money_per_year,omitempty"`
	Excluded            map[string]int `json:"excluded"`
}

type stepJSON struct {
	Date    string  `json:"date"`
	SizePct float64 `json:"size_pct"`
	SEPct   float64 `json:"se_pct"`
	Event   string  `json:"event,omitempty"`
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

func newTailJSON(a model.TailAssessment, price float64) tailJSON {
	j := tailJSON{
		Tail: a.Tail, Points: a.Points, Flights: len(a.Flights),
		First: timeOrEmpty(a.First), Last: timeOrEmpty(a.Last),
		DeviationPct: num(a.RecentPct), DriftPctPer100d: num(a.Drift.Slope),
		Steps: []stepJSON{}, Flags: a.Flags,
		ExcessFuelKgPerYear: a.ExcessFuel, CO2TPerYear: a.CO2 / 1000, Excluded: a.Excluded,
	}
	if j.DriftPctPer100d != nil {
		j.DriftCI95PctPer100d = []*float64{num(a.Drift.Lo), num(a.Drift.Hi)}
	}
	for _, s := range a.Steps {
		j.Steps = append(j.Steps, stepJSON{Date: s.Time.UTC().Format(time.DateOnly), SizePct: s.SizePct, SEPct: s.SE, Event: eventText(s.Event)})
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
	hours := fs.float("cruise-hours", "H", c.CruiseHours, false, "cruise hours per tail per year")
	price := fs.float("fuel-price-per-kg", "P", 0, false, "fuel price per kg, for a money figure (any currency)")
	maxDev := fs.float("max-dev-pct", "P", c.MaxAbsDevPct, false, "points with a larger |deviation| are implausible, %")
	maxBank := fs.float("max-bank-deg", "B", 30, false, "points with a larger |bank| are left out, degrees")
	maxVS := fs.float("max-vs-fpm", "V", 1500, false, "points with a larger |vertical speed| are left out, ft/min")
	maxAcc := fs.float("max-accel-kt-per-min", "A", 5, false, "points with a larger |acceleration| are left out, kt/min")
	return func() (model.TrendConfig, error) {
		for name, v := range map[string]float64{"recent-days": *recent, "drift-days": *drift, "level-pp": *levelPP, "growth-pp": *growthPP,
			"step-pp": *stepPP, "cruise-hours": *hours, "max-dev-pct": *maxDev, "max-bank-deg": *maxBank, "max-vs-fpm": *maxVS, "max-accel-kt-per-min": *maxAcc} {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				return c, usageErrorf("--%s: must be > 0, got %g", name, v)
			}
		}
		if math.IsNaN(*price) || math.IsInf(*price, 0) || *price < 0 {
			return c, usageErrorf("--fuel-price-per-kg: must be ≥ 0, got %g", *price)
		}
		c.RecentDays, c.DriftDays, c.LevelPP, c.GrowthPP, c.StepPP, c.CruiseHours, c.FuelPrice = *recent, *drift, *levelPP, *growthPP, *stepPP, *hours, *price
		c.MaxAbsDevPct, c.MaxBank, c.MaxVS, c.MaxAccel = *maxDev, feed.RadFromDeg(*maxBank), feed.MPerSFromFtPerMin(*maxVS), feed.MPerS2FromKtPerMin(*maxAcc)
		c.MinDriftDays = math.Min(c.MinDriftDays, c.DriftDays)
		return c, nil
	}
}

func runReport(e *env, args []string) error {
	fs := newFlagSet("report", "dragdeck report [--type FILE] [--format table|csv|json] [--events FILE] [flags] PATH...",
		`Per-tail drag trend and flags for a fleet (DESIGN.md §4.8–§4.10). Every
accepted snapshot is analysed against the baseline polar; points beyond the
limits below are left out and counted. Per tail: the recent level (median
per-flight deviation over the last --recent-days), the drift (Theil–Sen slope
of the daily medians over the trailing --drift-days after the last step, with
its 95 % interval), the steps (significant jumps found by piecewise-linear
segmentation; events start a new segment), the flags and the cost:
  level   recent level ≥ fleet median + --level-pp
  growth  drift × --drift-days ≥ --growth-pp and its interval excludes zero
  step    an increase ≥ --step-pp that has not been undone
Decreases are reported as improvements, not flagged. Excess fuel per year =
recent level × the tail's median expected cruise fuel flow × --cruise-hours;
CO2 = 3.16 kg per kg of fuel (ICAO). Tails are sorted by severity.`,
		"dragdeck report --events fleet/events.csv --fuel-price-per-kg 0.85 fleet/snapshots/")
	typ := fs.typeFlag()
	format := fs.str("format", "F", "table", "table, csv or json")
	events := fs.str("events", "FILE", "", "events file (time,tail,kind,note): steps are matched to events, trends restart at them")
	rejects := fs.str("rejects", "FILE", "", "write every rejected row to FILE")
	plots := fs.str("plots", "DIR", "", "write a PNG per tail and fleet.png into DIR")
	failOnFlag := fs.Bool("fail-on-flag", false, "exit 1 when any tail is flagged (for scheduled jobs)")
	trend := trendFlags(fs)
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	c, err := trend()
	if err != nil {
		return err
	}
	switch *format {
	case "table", "csv", "json":
	default:
		return usageErrorf("--format: %q is not table, csv or json", *format)
	}
	t, files, err := typeAndFiles(fs, *typ)
	if err != nil {
		return err
	}
	evs, err := readEvents(*events)
	if err != nil {
		return err
	}
	var rejOut io.Writer
	if *rejects != "" {
		f, err := os.Create(*rejects)
		if err != nil {
			return usageErrorf("--rejects: %v", err)
		}
		defer f.Close()
		rejOut = f
	}
	fd := feed.LoadFleet(files, t, func(r *feed.RowError) {
		if rejOut != nil {
			fmt.Fprintln(rejOut, r)
		}
	})
	for _, res := range fd.Files {
		warnUnknown(e.stderr, res)
		if res.Events {
			fmt.Fprintf(e.stderr, "dragdeck report: %s: an events file, skipped (give it with --events)\n", res.Path)
		}
		if res.Err != nil {
			return usageErrorf("%v", res.Err)
		}
	}
	fleet := model.AssessFleet(fd.Trends(evs, c), c)
	if *plots != "" {
		if err := writePlots(*plots, fleet); err != nil {
			return usageErrorf("--plots: %v", err)
		}
		fmt.Fprintf(e.stderr, "dragdeck report: plots written to %s\n", *plots)
	}
	switch *format {
	case "json":
		err = writeReportJSON(e.stdout, fd, fleet, c, t)
	case "csv":
		err = writeReportCSV(e.stdout, fleet, c.FuelPrice)
	default:
		writeReportTable(e.stdout, fd, fleet, t, c, len(files))
	}
	if err != nil {
		return err
	}
	if *failOnFlag && fleet.Flagged > 0 {
		return &exitErr{code: exitFindings}
	}
	return nil
}

func writeReportJSON(w io.Writer, fd *feed.FleetData, f model.Fleet, c model.TrendConfig, t *model.Type) error {
	j := reportJSON{Read: fd.Stats.Read, Rejected: fd.Stats.Rejected, Tails: []tailJSON{}, Caution: strings.ReplaceAll(caution, "\n", " "),
		Fleet: fleetJSON{Tails: len(f.Tails), Flagged: f.Flagged, DeviationPctMedian: num(f.MedianRecentPct),
			First: timeOrEmpty(fd.First), Last: timeOrEmpty(fd.Last)},
		Settings: map[string]any{"type": t.Name, "recent_days": c.RecentDays, "drift_days": c.DriftDays,
			"level_pp": c.LevelPP, "growth_pp": c.GrowthPP, "step_pp": c.StepPP, "cruise_hours": c.CruiseHours}}
	for _, a := range f.Tails {
		j.Tails = append(j.Tails, newTailJSON(a, c.FuelPrice))
	}
	return writeJSON(w, j)
}

func fmtF(v float64, prec int) string {
	if math.IsNaN(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'f', prec, 64)
}

func writeReportCSV(w io.Writer, f model.Fleet, price float64) error {
	cw := csv.NewWriter(w)
	head := []string{"tail", "points", "flights", "first", "last", "deviation_pct", "drift_pct_per_100d", "drift_ci95_lo", "drift_ci95_hi",
		"last_step_date", "last_step_size_pct", "flags", "excess_fuel_kg_per_year", "co2_t_per_year"}
	if price > 0 {
		head = append(head, "money_per_year")
	}
	cw.Write(head)
	for _, a := range f.Tails {
		stepDate, stepSize := "", ""
		if k := len(a.Steps); k > 0 {
			stepDate, stepSize = a.Steps[k-1].Time.UTC().Format(time.DateOnly), fmtF(a.Steps[k-1].SizePct, 2)
		}
		row := []string{a.Tail, strconv.Itoa(a.Points), strconv.Itoa(len(a.Flights)), timeOrEmpty(a.First), timeOrEmpty(a.Last),
			fmtF(a.RecentPct, 2), fmtF(a.Drift.Slope, 2), fmtF(a.Drift.Lo, 2), fmtF(a.Drift.Hi, 2), stepDate, stepSize,
			strings.Join(a.Flags, " "), fmtF(a.ExcessFuel, 0), fmtF(a.CO2/1000, 1)}
		if price > 0 {
			row = append(row, fmtF(a.Money, 0))
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

func writeReportTable(w io.Writer, fd *feed.FleetData, f model.Fleet, t *model.Type, c model.TrendConfig, files int) {
	price := c.FuelPrice
	span := "no data"
	if !fd.First.IsZero() {
		span = fd.First.UTC().Format(time.DateOnly) + " … " + fd.Last.UTC().Format(time.DateOnly)
	}
	fmt.Fprintf(w, "Fleet drag report: %s\n", t.Name)
	fmt.Fprintf(w, "%d tails, %d snapshots read from %d file(s), %d rejected; %s\n", len(f.Tails), fd.Stats.Read, files, fd.Stats.Rejected, span)
	if len(f.Tails) == 0 {
		fmt.Fprintf(w, "\nNo usable snapshots: nothing to report.\n\n%s\n", caution)
		return
	}
	fmt.Fprintf(w, "Fleet median recent deviation %s %%; %d tail(s) flagged.\n\n", signed(f.MedianRecentPct, 2), f.Flagged)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprint(tw, "tail\tdev %\tdrift\tlast step\tfuel t\tCO2 t\t")
	if price > 0 {
		fmt.Fprint(tw, "money\t")
	}
	fmt.Fprintln(tw, "flags")
	for _, a := range f.Tails {
		step := "-"
		if k := len(a.Steps); k > 0 {
			step = a.Steps[k-1].Time.UTC().Format(time.DateOnly) + " " + signed(a.Steps[k-1].SizePct, 1)
		}
		flags := strings.Join(a.Flags, " ")
		if flags == "" {
			flags = "-"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t", a.Tail, signed(a.RecentPct, 2), signed(a.Drift.Slope, 2), step,
			signed(a.ExcessFuel/1000, 0), signed(a.CO2/1000, 0))
		if price > 0 {
			fmt.Fprintf(tw, "%sk\t", signed(a.Money/1000, 0))
		}
		fmt.Fprintln(tw, flags)
	}
	tw.Flush()
	fmt.Fprintf(w, "\ndev %%: median per-flight drag deviation of the last %g days. drift: pp per\n"+
		"100 days over the trailing %g days (Theil–Sen). last step: date and size in pp.\n"+
		"fuel, CO2: excess per year at %g cruise hours", c.RecentDays, c.DriftDays, c.CruiseHours)
	if price > 0 {
		fmt.Fprintf(w, ";\nmoney: thousands per year at %g per kg of fuel", price)
	}
	fmt.Fprintf(w, ".\n%s\n", caution)
}

// signed formats v with a sign, or "-" for NaN.
func signed(v float64, prec int) string {
	if math.IsNaN(v) {
		return "-"
	}
	return fmt.Sprintf("%+.*f", prec, v)
}
