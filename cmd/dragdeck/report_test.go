package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"dragdeck/feed/demo"
)

type reportOut struct {
	Read     int `json:"read"`
	Rejected int `json:"rejected"`
	Fleet    struct {
		Tails   int      `json:"tails"`
		Flagged int      `json:"flagged"`
		Median  *float64 `json:"deviation_pct_median"`
	} `json:"fleet"`
	Tails []struct {
		Tail    string     `json:"tail"`
		Type    string     `json:"type"`
		Points  int        `json:"points"`
		Flights int        `json:"flights"`
		First   string     `json:"first"`
		Last    string     `json:"last"`
		Dev     *float64   `json:"deviation_pct"`
		Drift   *float64   `json:"drift_pct_per_100d"`
		CI      []*float64 `json:"drift_ci95_pct_per_100d"`
		Steps   []struct {
			Date    string  `json:"date"`
			SizePct float64 `json:"size_pct"`
		} `json:"steps"`
		Flags  []string   `json:"flags"`
		Fuel   float64    `json:"excess_fuel_kg_per_year"`
		CO2    float64    `json:"co2_t_per_year"`
		Source string     `json:"thrust_source"`
		Engine *engineOut `json:"engine"`
	} `json:"tails"`
}

// On demo fleets it has not seen — other seeds, sizes, spans and an aircraft
// type of their own — report flags exactly the tails the truth file names,
// dates each step within 7 days and 0.4 pp, finds each drift within
// 0.3 pp/100 d (a drift is growth, never a step) and counts every rejected row.
func TestReportFindsTheTruth(t *testing.T) {
	tests := []struct {
		name string
		args []string
	}{
		// three types, a wingtip retrofit half-way, an engine change
		{"built-in mixed fleet, 24 tails, 2 years", []string{"--tails", "24", "--days", "730", "--seed", "1"}},
		{"built-in mixed fleet, 40 tails, 500 days", []string{"--tails", "40", "--days", "500", "--seed", "21"}},
		{"widebody type, 30 tails", []string{"--tails", "30", "--days", "650", "--seed", "5", "--type", "../../testdata/types/widebody.toml"}},
		// fan speed on most tails: engine wear, a meter bias and a shop
		// visit planted on steady airframes
		{"thrust-table twin, 24 tails, 2 years", []string{"--tails", "24", "--days", "730", "--seed", "3", "--type", "../../testdata/types/twin_thrust.toml"}},
		{"thrust-table twin, 36 tails, 600 days", []string{"--tails", "36", "--days", "600", "--seed", "17", "--type", "../../testdata/types/twin_thrust.toml"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			if code, _, errs := runArgs(append([]string{"demo", "--out", dir}, tc.args...)...); code != 0 {
				t.Fatalf("demo: %s", errs)
			}
			var truth demo.Truth
			js, _ := os.ReadFile(filepath.Join(dir, demo.TruthFile))
			if err := json.Unmarshal(js, &truth); err != nil {
				t.Fatal(err)
			}
			code, out, errs := runArgs("report", "--format", "json", "--fleet", filepath.Join(dir, demo.FleetFile),
				"--events", filepath.Join(dir, demo.EventsFile), filepath.Join(dir, "snapshots"))
			if code != 0 {
				t.Fatalf("report: exit %d %s", code, errs)
			}
			var rep reportOut
			if err := json.Unmarshal([]byte(out), &rep); err != nil {
				t.Fatal(err)
			}
			if rep.Read != truth.Rows || rep.Rejected != truth.Rejected || rep.Fleet.Tails != len(truth.Tails) {
				t.Errorf("read %d rejected %d tails %d; truth %d, %d, %d", rep.Read, rep.Rejected, rep.Fleet.Tails, truth.Rows, truth.Rejected, len(truth.Tails))
			}
			byTail := map[string]demo.TailTruth{}
			flagged := 0
			for _, tt := range truth.Tails {
				byTail[tt.Tail] = tt
				if len(tt.ExpectedFlags) > 0 {
					flagged++
				}
			}
			if rep.Fleet.Flagged != flagged {
				t.Errorf("%d tails flagged, truth says %d", rep.Fleet.Flagged, flagged)
			}
			for _, r := range rep.Tails {
				tt := byTail[r.Tail]
				want := tt.Type
				if tt.Retrofit != nil {
					want = tt.Retrofit.Type
				}
				if r.Type != want {
					t.Errorf("%s: type %q, fleet file says %q at the end", r.Tail, r.Type, want)
				}
				if strings.Join(r.Flags, ",") != strings.Join(tt.ExpectedFlags, ",") {
					t.Errorf("%s (%s): flags %v, truth %v", r.Tail, tt.Role, r.Flags, tt.ExpectedFlags)
				}
				if r.Drift == nil || math.Abs(*r.Drift-tt.DriftPctPer100d) > 0.3 {
					t.Errorf("%s (%s): drift %v pp/100 d, truth %.2f", r.Tail, tt.Role, r.Drift, tt.DriftPctPer100d)
				}
				if r.Dev == nil || math.Abs(*r.Dev-tt.RecentLevelPct) > 0.5 {
					t.Errorf("%s: recent level %s, truth %.2f", r.Tail, fmtPtr(r.Dev), tt.RecentLevelPct)
				}
				checkEngineTruth(t, r.Tail, tt, r.Source, r.Engine)
				if len(r.Steps) != len(tt.Steps) {
					t.Errorf("%s (%s): steps %+v, truth %+v", r.Tail, tt.Role, r.Steps, tt.Steps)
					continue
				}
				for i, s := range r.Steps {
					got, _ := time.Parse(time.DateOnly, s.Date)
					want, _ := time.Parse(time.DateOnly, tt.Steps[i].Date)
					if d := got.Sub(want).Hours() / 24; math.Abs(d) > 7 || math.Abs(s.SizePct-tt.Steps[i].SizePct) > 0.4 {
						t.Errorf("%s: step %s %+.2f, truth %s %+.2f", r.Tail, s.Date, s.SizePct, tt.Steps[i].Date, tt.Steps[i].SizePct)
					}
				}
			}
		})
	}
}

// engineOut is a tail's engine series in the report JSON.
type engineOut struct {
	Dev   *float64 `json:"deviation_pct"`
	Flags []string `json:"flags"`
	Steps []struct {
		Date    string  `json:"date"`
		SizePct float64 `json:"size_pct"`
	} `json:"steps"`
}

// checkEngineTruth compares a tail's engine series with what the demo
// planted: fan speed or the fuel-flow fallback, the engine flags exactly,
// the recent level within 0.5 pp, a shop visit as an engine step of the
// right date (7 days) and size (0.5 pp).
func checkEngineTruth(t *testing.T, tail string, tt demo.TailTruth, source string, eng *engineOut) {
	t.Helper()
	if !tt.FanSpeed {
		if source != "fuel flow" || eng != nil {
			t.Errorf("%s has no fan speed: thrust source %q, engine %v", tail, source, eng)
		}
		return
	}
	e := tt.Engine
	if source != "fan speed" || eng == nil {
		t.Errorf("%s has fan speed: thrust source %q, engine %v", tail, source, eng)
		return
	}
	if strings.Join(eng.Flags, ",") != strings.Join(e.ExpectedFlags, ",") {
		t.Errorf("%s (engine %s): engine flags %v, truth %v", tail, e.Role, eng.Flags, e.ExpectedFlags)
	}
	if eng.Dev == nil || math.Abs(*eng.Dev-e.RecentLevelPct) > 0.5 {
		t.Errorf("%s (engine %s): engine level %s, truth %.2f", tail, e.Role, fmtPtr(eng.Dev), e.RecentLevelPct)
	}
	if len(eng.Steps) != len(e.Steps) {
		t.Errorf("%s (engine %s): engine steps %+v, truth %+v", tail, e.Role, eng.Steps, e.Steps)
		return
	}
	for i, s := range eng.Steps {
		got, _ := time.Parse(time.DateOnly, s.Date)
		want, _ := time.Parse(time.DateOnly, e.Steps[i].Date)
		if d := got.Sub(want).Hours() / 24; math.Abs(d) > 7 || math.Abs(s.SizePct-e.Steps[i].SizePct) > 0.5 {
			t.Errorf("%s: engine step %s %+.2f, truth %s %+.2f", tail, s.Date, s.SizePct, e.Steps[i].Date, e.Steps[i].SizePct)
		}
	}
}

func TestReportFormatsAndExits(t *testing.T) {
	dir := t.TempDir()
	runArgs("demo", "--out", dir, "--tails", "8", "--days", "200", "--seed", "4")
	snaps := filepath.Join(dir, "snapshots")
	rejects := filepath.Join(dir, "rejects.txt")
	code, out, errs := runArgs("report", "--rejects", rejects, "--fuel-price-per-kg", "0.9", snaps)
	if code != 0 || !strings.Contains(out, "money: thousands per year") || !strings.Contains(out, "not approved performance data") {
		t.Errorf("table: exit %d %s\n%s", code, errs, out)
	}
	for _, line := range strings.Split(out, "\n") {
		if len([]rune(line)) > 80 {
			t.Errorf("table line wider than 80 columns: %q", line)
		}
	}
	rj, _ := os.ReadFile(rejects)
	if strings.Count(string(rj), "\n") != 8 || !strings.Contains(string(rj), "fleet.csv:") {
		t.Errorf("rejects file:\n%s", rj)
	}
	code, out, _ = runArgs("report", "--format", "csv", snaps)
	if code != 0 || !strings.HasPrefix(out, "tail,type,thrust_source,points,flights,first,last,deviation_pct,drift_pct_per_100d") || strings.Count(out, "\n") != 9 {
		t.Errorf("csv: exit %d\n%s", code, out)
	}
	if code, _, _ := runArgs("report", "--fail-on-flag", snaps); code != 1 {
		t.Errorf("--fail-on-flag with flagged tails: exit %d, want 1", code)
	}
	if code, _, _ := runArgs("report", "--fail-on-flag", "--level-pp", "50", "--growth-pp", "50", "--step-pp", "50", snaps); code != 0 {
		t.Errorf("--fail-on-flag with nothing flagged: exit %d, want 0", code)
	}
	for _, args := range [][]string{{"report"}, {"report", "--format", "xml", snaps}, {"report", "--drift-days", "0", snaps}, {"report", "--events", "nope.csv", snaps}} {
		if code, _, _ := runArgs(args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
}

// An empty fleet, a tail with one flight and a tail with every row rejected
// give clear output, never a panic.
func TestReportEdgeFleets(t *testing.T) {
	dir := t.TempDir()
	head := "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"
	os.WriteFile(filepath.Join(dir, "empty.csv"), []byte(head), 0o644)
	os.WriteFile(filepath.Join(dir, "mixed.csv"), []byte(head+
		"2026-03-01T10:00:00Z,ONE,F1,65000,35000,0.78,-54,2400\n"+
		"2026-03-01T10:00:00Z,BAD,F1,65000,35000,1.78,-54,2400\n"), 0o644)
	code, out, errs := runArgs("report", filepath.Join(dir, "empty.csv"))
	if code != 0 || !strings.Contains(out, "No usable snapshots") {
		t.Errorf("empty fleet: exit %d %s\n%s", code, errs, out)
	}
	code, out, errs = runArgs("report", "--format", "json", filepath.Join(dir, "mixed.csv"))
	var rep reportOut
	if code != 0 || json.Unmarshal([]byte(out), &rep) != nil || rep.Fleet.Tails != 1 || rep.Rejected != 1 || rep.Tails[0].Flights != 1 {
		t.Errorf("one-flight tail: exit %d %s\n%s", code, errs, out)
	}
	code, out, _ = runArgs("report", filepath.Join(dir, "mixed.csv"))
	if code != 0 || !strings.Contains(out, "ONE") {
		t.Errorf("table: %s", out)
	}
}

func TestReportPlots(t *testing.T) {
	dir := t.TempDir()
	runArgs("demo", "--out", dir, "--tails", "5", "--days", "120", "--seed", "2")
	plots := filepath.Join(dir, "plots")
	code, _, errs := runArgs("report", "--fleet", filepath.Join(dir, demo.FleetFile), "--events", filepath.Join(dir, demo.EventsFile), "--plots", plots, filepath.Join(dir, "snapshots"))
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	files, _ := filepath.Glob(filepath.Join(plots, "*.png"))
	if len(files) != 6 {
		t.Fatalf("%d PNG files, want 5 tails + fleet.png: %v", len(files), files)
	}
	for _, f := range files {
		b, _ := os.ReadFile(f)
		if len(b) < 2000 || string(b[1:4]) != "PNG" {
			t.Errorf("%s is not a PNG picture (%d bytes)", f, len(b))
		}
	}
}

// One broken file in a folder of good ones: it is named, the others are
// reported, and the exit code (2) says that something failed.
func TestReportGoesOnPastABrokenFile(t *testing.T) {
	dir := t.TempDir()
	good, _ := os.ReadFile("../../testdata/snapshots/good_kg_sat.csv")
	os.WriteFile(filepath.Join(dir, "a.csv"), good, 0o644)
	os.WriteFile(filepath.Join(dir, "b.csv"), []byte(""), 0o644)
	os.WriteFile(filepath.Join(dir, "c.csv"), []byte("time,tail\n2026-01-01T00:00:00Z,X\n"), 0o644)
	code, out, errs := runArgs("report", "--format", "json", dir)
	if code != exitUsage {
		t.Errorf("exit %d, want 2", code)
	}
	var rep reportOut
	if err := json.Unmarshal([]byte(out), &rep); err != nil || rep.Fleet.Tails == 0 {
		t.Fatalf("no report of the good file (%v):\n%s", err, out)
	}
	for _, name := range []string{"b.csv", "c.csv", "2 of 3 file(s) could not be read"} {
		if !strings.Contains(errs, name) {
			t.Errorf("stderr does not name %q:\n%s", name, errs)
		}
	}
}

// A file whose fuel flow is one engine's makes every snapshot implausible:
// the tail has no level, its excess fuel is null (not 0), and the report
// says why.
func TestReportSaysWhyNoLevel(t *testing.T) {
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n")
	for d := 0; d < 40; d++ {
		fmt.Fprintf(&b, "2026-03-%02dT%02d:00:00Z,ONE,F%d,65000,35000,0.78,-54,1200\n", 1+d%28, 10+d/28, d)
	}
	p := filepath.Join(dir, "one-engine.csv")
	os.WriteFile(p, []byte(b.String()), 0o644)
	code, out, errs := runArgs("report", "--format", "json", p)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var raw struct {
		Tails []map[string]any `json:"tails"`
	}
	if err := json.Unmarshal([]byte(out), &raw); err != nil || len(raw.Tails) != 1 {
		t.Fatalf("%v\n%s", err, out)
	}
	tail := raw.Tails[0]
	if v, ok := tail["excess_fuel_kg_per_year"]; !ok || v != nil {
		t.Errorf("excess_fuel_kg_per_year = %v, want null", v)
	}
	why, _ := tail["no_level_reason"].(string)
	if !strings.Contains(why, "all 40 snapshots left out") || !strings.Contains(why, "fuel flow that of all engines") {
		t.Errorf("no_level_reason %q", why)
	}
	_, out, _ = runArgs("report", p)
	if !strings.Contains(out, "No recent level") || !strings.Contains(out, "fuel flow that of all engines") {
		t.Errorf("table does not say why:\n%s", out)
	}
}

// --plots with no tails writes nothing and does not panic.
func TestReportPlotsNoTails(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "empty.csv")
	os.WriteFile(p, []byte("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"), 0o644)
	code, _, errs := runArgs("report", "--plots", filepath.Join(dir, "plots"), p)
	if code != 0 || !strings.Contains(errs, "0 plot(s)") {
		t.Errorf("exit %d: %s", code, errs)
	}
}

// --rejects naming an input file is refused, and the file is left whole.
func TestReportRejectsNotAnInput(t *testing.T) {
	dir := t.TempDir()
	good, _ := os.ReadFile("../../testdata/snapshots/good_kg_sat.csv")
	p := filepath.Join(dir, "f.csv")
	os.WriteFile(p, good, 0o644)
	code, _, errs := runArgs("report", "--rejects", p, p)
	if code != exitUsage || !strings.Contains(errs, "is one of the input files") {
		t.Errorf("exit %d: %s", code, errs)
	}
	if after, _ := os.ReadFile(p); string(after) != string(good) {
		t.Error("the input file was changed")
	}
}

// A tail with fan speed (and a type with a thrust table) has thrust from
// fan speed and an engine series in the JSON; a tail without has thrust
// from fuel flow and "engine": null.
func TestReportEngineSeries(t *testing.T) {
	dir := t.TempDir()
	var b strings.Builder
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,n1_pct\n")
	for d := 0; d < 28; d++ {
		fmt.Fprintf(&b, "2026-03-%02dT10:00:00Z,FAN,F%d,65000,35000,0.78,-54,2400,83.5\n", 1+d, d)
		fmt.Fprintf(&b, "2026-03-%02dT11:00:00Z,FUEL,G%d,65000,35000,0.78,-54,2400,\n", 1+d, d)
	}
	p := filepath.Join(dir, "n1.csv")
	os.WriteFile(p, []byte(b.String()), 0o644)
	code, out, errs := runArgs("report", "--type", "../../testdata/types/twin_thrust.toml", "--format", "json", p)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	var raw struct {
		Tails []map[string]any `json:"tails"`
	}
	if err := json.Unmarshal([]byte(out), &raw); err != nil || len(raw.Tails) != 2 {
		t.Fatalf("%v\n%s", err, out)
	}
	_, table, _ := runArgs("report", "--type", "../../testdata/types/twin_thrust.toml", p)
	for _, line := range strings.Split(table, "\n") {
		if len([]rune(line)) > 80 {
			t.Errorf("table line wider than 80 columns: %q", line)
		}
	}
	if !strings.Contains(table, "(airframe).") || !strings.Contains(table, "Engine series, 1 tail(s) with fan speed") {
		t.Errorf("table without the fleet totals of both series:\n%s", table)
	}
	fan, _ := lineOf(table, "FAN ")
	fuel, _ := lineOf(table, "FUEL ")
	if !strings.Contains(table, "engine") || !strings.Contains(fuel, "n/a") || strings.Contains(fan, "n/a") {
		t.Errorf("table without both series:\n%s", table)
	}
	_, csvOut, _ := runArgs("report", "--type", "../../testdata/types/twin_thrust.toml", "--format", "csv", p)
	if !strings.Contains(csvOut, "engine_deviation_pct") || !strings.Contains(csvOut, "FAN,DD-200 demo twin with a thrust table (invented),fan speed,") || !strings.Contains(csvOut, "FUEL,DD-200 demo twin with a thrust table (invented),fuel flow,") {
		t.Errorf("csv without both series:\n%s", csvOut)
	}
	// Every FAN snapshot is the same, so its engine level is the engine
	// deviation that point gives for that snapshot.
	_, pout, _ := runArgs("point", "--type", "../../testdata/types/twin_thrust.toml", "--weight-kg", "65000", "--alt-ft", "35000",
		"--mach", "0.78", "--sat-c", "-54", "--fuel-flow-kgph", "2400", "--n1-pct", "83.5", "--json")
	var pj struct {
		Engine float64 `json:"engine_deviation_pct"`
	}
	if err := json.Unmarshal([]byte(pout), &pj); err != nil {
		t.Fatal(err)
	}
	var fleet struct {
		Fleet struct {
			Fuel   *float64 `json:"excess_fuel_kg_per_year"`
			Engine *struct {
				Tails int      `json:"tails"`
				Fuel  *float64 `json:"excess_fuel_kg_per_year"`
			} `json:"engine"`
		} `json:"fleet"`
	}
	if err := json.Unmarshal([]byte(out), &fleet); err != nil || fleet.Fleet.Fuel == nil || fleet.Fleet.Engine == nil ||
		fleet.Fleet.Engine.Tails != 1 || fleet.Fleet.Engine.Fuel == nil {
		t.Errorf("fleet totals: %v %+v", err, fleet.Fleet)
	}
	for _, tail := range raw.Tails {
		engine, has := tail["engine"]
		if !has {
			t.Fatalf("%v: no engine field", tail["tail"])
		}
		switch tail["tail"] {
		case "FAN":
			e, _ := engine.(map[string]any)
			dev, _ := e["deviation_pct"].(float64)
			if tail["thrust_source"] != "fan speed" || e == nil || math.Abs(dev-pj.Engine) > 1e-9 {
				t.Errorf("FAN: thrust_source %v, engine %v, want deviation %g as point gives", tail["thrust_source"], engine, pj.Engine)
			}
		case "FUEL":
			if tail["thrust_source"] != "fuel flow" || engine != nil {
				t.Errorf("FUEL: thrust_source %v, engine %v", tail["thrust_source"], engine)
			}
		}
	}
}

// lineOf returns the first line of s that contains sub.
// fmtPtr prints a JSON number that may be null.
func fmtPtr(v *float64) string {
	if v == nil {
		return "null"
	}
	return fmt.Sprintf("%.2f", *v)
}

func lineOf(s, sub string) (string, bool) {
	for _, l := range strings.Split(s, "\n") {
		if strings.Contains(l, sub) {
			return l, true
		}
	}
	return "", false
}

// With fan speed on most tails, engine flags and a money column, the table
// still fits 80 columns (it did not: 87 to 103 columns).
func TestReportTableWidthWithEngines(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "24", "--days", "400", "--seed", "3", "--type", "../../testdata/types/twin_thrust.toml"); code != 0 {
		t.Fatal(errs)
	}
	for _, extra := range [][]string{nil, {"--fuel-price-per-kg", "0.9"}} {
		args := append(append([]string{"report", "--events", filepath.Join(dir, demo.EventsFile), "--fleet", filepath.Join(dir, demo.FleetFile)}, extra...), filepath.Join(dir, "snapshots"))
		code, out, errs := runArgs(args...)
		if code != 0 || !strings.Contains(out, "e-") {
			t.Fatalf("%v: exit %d %s (want engine flags)\n%s", extra, code, errs, out)
		}
		for _, line := range strings.Split(out, "\n") {
			if len([]rune(line)) > 80 {
				t.Errorf("%v: table line wider than 80 columns: %q", extra, line)
			}
		}
	}
}

func TestWrapWords(t *testing.T) {
	cases := []struct {
		name  string
		in    string
		width int
		want  []string
	}{
		{"fits", "a short line", 20, []string{"a short line"}},
		{"breaks at a space, indents the rest", "one two three four", 9, []string{"one two", "  three", "  four"}},
		{"a long word stands alone", "x averyveryverylongword y", 8, []string{"x", "  averyveryverylongword", "  y"}},
		{"empty", "", 10, []string{""}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := wrapWords(c.in, c.width, 2)
			if strings.Join(got, "|") != strings.Join(c.want, "|") {
				t.Fatalf("got %q, want %q", got, c.want)
			}
		})
	}
}

// The same file given twice is counted once, with a note: it doubled every
// tail's points without a word.
func TestReportSameFileTwice(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "4", "--days", "60", "--seed", "3"); code != 0 {
		t.Fatal(errs)
	}
	f := filepath.Join(dir, demo.SnapshotFile)
	fleet := filepath.Join(dir, demo.FleetFile)
	_, once, _ := runArgs("report", "--fleet", fleet, "--format", "json", f)
	code, twice, errs := runArgs("report", "--fleet", fleet, "--format", "json", f, f)
	var a, b struct {
		Read, Duplicates int
		Tails            []struct {
			Points int     `json:"points"`
			Dev    float64 `json:"deviation_pct"`
		}
	}
	if json.Unmarshal([]byte(once), &a) != nil || json.Unmarshal([]byte(twice), &b) != nil || code != 0 {
		t.Fatalf("exit %d %s", code, errs)
	}
	if b.Duplicates != a.Read-8 || b.Read != 2*a.Read || !strings.Contains(errs, "repeat a tail and time") {
		t.Errorf("twice: read %d, duplicates %d (once: read %d, 8 broken rows); stderr %q", b.Read, b.Duplicates, a.Read, errs)
	}
	for i := range a.Tails {
		if a.Tails[i].Points != b.Tails[i].Points || a.Tails[i].Dev != b.Tails[i].Dev {
			t.Errorf("tail %d: once %+v, twice %+v", i, a.Tails[i], b.Tails[i])
		}
	}
}
