package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"reflect"
	"sort"
	"strings"
	"testing"

	"dragdeck/feed"
	"dragdeck/model"
)

func runArgs(args ...string) (code int, stdout, stderr string) {
	var out, errb bytes.Buffer
	code = run(context.Background(), args, strings.NewReader(""), &out, &errb)
	return code, out.String(), errb.String()
}

var pointArgs = []string{"point", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "0.78",
	"--fuel-flow-kgph", "2400", "--sat-c", "-50", "--bank-deg", "10", "--vs-fpm", "100", "--accel-kt-per-min", "0.5"}

func TestRunExitCodes(t *testing.T) {
	tests := []struct {
		name       string
		args       []string
		code       int
		stdout     string // substring
		stderrLine string // substring of the single stderr line
	}{
		{"no arguments: demo cruise table", nil, 0, "optimum ft", ""},
		{"help", []string{"help"}, 0, "commands:", ""},
		{"point table", pointArgs, 0, "excess drag", ""},
		{"speed table", []string{"speed", "--weight-kg", "65000", "--alt-ft", "35000"}, 0, "maximum altitude", ""},
		{"speed with excess", []string{"speed", "--weight-kg", "65000", "--alt-ft", "35000", "--excess-counts", "20"}, 0, "with +20 counts", ""},
		{"bank table", []string{"bank", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "0.78"}, 0, "1.1547", ""},
		{"unknown command", []string{"fly"}, 2, "", `unknown command "fly"`},
		{"missing flag", []string{"point", "--weight-kg", "65000"}, 2, "", "--alt-ft: missing"},
		{"weight zero", []string{"speed", "--weight-kg", "0", "--alt-ft", "35000"}, 2, "", "--weight-kg: must be > 0"},
		{"Mach above 1", []string{"bank", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "1.1"}, 2, "", "--mach: must be in [0.05, 1)"},
		{"bank 90", append(append([]string{}, pointArgs[:11]...), "--bank-deg", "90"), 2, "", "--bank-deg: |bank| must be < 90°"},
		{"not a number", []string{"point", "--mach", "fast"}, 2, "", `--mach: "fast" is not a number`},
		{"unknown flag", []string{"bank", "--wing", "3"}, 2, "", "not defined: --wing"},
		{"negative cost index", []string{"speed", "--weight-kg", "65000", "--alt-ft", "35000", "--cost-index", "-1"}, 2, "", "--cost-index"},
		{"missing type file", []string{"speed", "--type", "/no/such.toml", "--weight-kg", "65000", "--alt-ft", "35000"}, 2, "", "--type: type file: open /no/such.toml"},
		{"another type drives everything", []string{"speed", "--type", "../../testdata/types/widebody.toml", "--weight-kg", "230000", "--alt-ft", "37000"}, 0, "WB-9 test widebody", ""},
		{"invalid type names key and line", []string{"bank", "--type", "../../testdata/types/bad_oswald.toml", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "0.78"}, 2, "", "bad_oswald.toml:7: polar.oswald: must be 0.4 … 1.2"},
		{"altitude out of range", []string{"speed", "--weight-kg", "65000", "--alt-ft", "70000"}, 2, "", "--alt-ft: pressure altitude"},
		{"ISA deviation too hot", []string{"speed", "--weight-kg", "65000", "--alt-ft", "0", "--isa-dev-c", "50"}, 2, "", "--isa-dev-c"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errs := runArgs(tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d (stderr %q)", code, tc.code, errs)
			}
			if !strings.Contains(out, tc.stdout) {
				t.Errorf("stdout lacks %q:\n%s", tc.stdout, out)
			}
			if tc.stderrLine == "" && errs != "" {
				t.Errorf("unexpected stderr %q", errs)
			}
			if tc.stderrLine != "" {
				if !strings.Contains(errs, tc.stderrLine) || strings.Count(errs, "\n") != 1 {
					t.Errorf("stderr %q: want one line containing %q", errs, tc.stderrLine)
				}
				if out != "" {
					t.Errorf("nothing should go to stdout on error, got %q", out)
				}
			}
			if tc.code == 0 && tc.name != "help" && !strings.Contains(out, "not approved performance data") {
				t.Error("human-readable output lacks the caution")
			}
		})
	}
}

func TestEveryCommandHasHelp(t *testing.T) {
	for _, c := range commands() {
		code, out, errs := runArgs(c.name, "--help")
		if code != 0 || errs != "" {
			t.Errorf("%s --help: exit %d, stderr %q", c.name, code, errs)
		}
		want := []string{"usage: dragdeck " + c.name, "example:", "not approved performance data"}
		switch c.name {
		case "point", "speed", "bank":
			want = append(want, "flags:", "--type FILE", "(required)")
		}
		for _, w := range want {
			if !strings.Contains(out, w) {
				t.Errorf("%s --help lacks %q", c.name, w)
			}
		}
	}
}

func jsonKeys(t *testing.T, s string) []string {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal([]byte(s), &m); err != nil {
		t.Fatalf("not a JSON object: %v\n%s", err, s)
	}
	var keys []string
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}

func hasAll(t *testing.T, got []string, want ...string) {
	t.Helper()
	set := map[string]bool{}
	for _, k := range got {
		set[k] = true
	}
	for _, k := range want {
		if !set[k] {
			t.Errorf("JSON lacks field %q (has %v)", k, got)
		}
	}
}

// The JSON field names are a stable contract (DESIGN.md §5), and the numbers
// are those of the model for the same snapshot.
func TestPointJSON(t *testing.T) {
	code, out, errs := runArgs(append(pointArgs, "--json")...)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	hasAll(t, jsonKeys(t, out), "cl", "cd_measured", "cd_baseline", "cd_induced", "cd_wave",
		"cd_parasite_baseline", "cd_parasite_measured", "excess_drag_counts", "drag_deviation_pct",
		"fuel_flow_expected_kgph", "fuel_flow_deviation_pct", "thrust_n", "drag_n", "load_factor",
		"tas_kt", "isa_dev_c", "delta", "theta", "q_pa")
	var got pointJSON
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	p := model.Analyze(feed.DemoType(), model.Snapshot{
		Weight: 65000, Altitude: feed.MetresFromFeet(35000), Mach: 0.78, SAT: feed.KelvinFromCelsius(-50),
		FuelFlow: feed.KgPerSFromKgPerH(2400), Bank: feed.RadFromDeg(10), VS: feed.MPerSFromFtPerMin(100),
		Accel: feed.MPerS2FromKtPerMin(0.5),
	})
	if want := newPointJSON(p); !reflect.DeepEqual(got, want) {
		t.Errorf("JSON %+v\nwant  %+v", got, want)
	}
	if math.Abs(float64(got.LoadFactor)-1/math.Cos(10*math.Pi/180)) > 1e-12 || math.Abs(float64(got.TASKt)-p.TAS/model.Knot) > 1e-9 {
		t.Errorf("load factor %g, TAS %g kt", got.LoadFactor, got.TASKt)
	}
}

func TestSpeedJSON(t *testing.T) {
	code, out, _ := runArgs("speed", "--weight-kg", "65000", "--alt-ft", "35000", "--cost-index", "20", "--excess-counts", "25", "--json")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	hasAll(t, jsonKeys(t, out), "mach_min_drag", "mach_max_range", "mach_long_range", "mach_econ",
		"sr_max_nm_per_kg", "optimum_alt_ft", "max_alt_ft", "baseline")
	var j speedJSON
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatal(err)
	}
	o := model.CruiseOptimum(feed.DemoType(), 65000, 35000*model.Foot, 0, 20.0/60, 25*model.DragCount)
	if math.Abs(float64(j.MachEcon)-o.Econ.Mach) > 1e-12 || math.Abs(float64(j.OptimumAltFt)-o.OptimumAltitude/model.Foot) > 1e-6 {
		t.Errorf("JSON %+v does not match the model %+v", j, o)
	}
	if j.Baseline == nil || j.Baseline.SRMaxNmPerKg <= j.SRMaxNmPerKg {
		t.Errorf("baseline SR should beat the worn polar's: %+v", j.Baseline)
	}
}

func TestBankJSON(t *testing.T) {
	code, out, _ := runArgs("bank", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "0.78", "--sat-c", "-50", "--json")
	if code != 0 {
		t.Fatalf("exit %d", code)
	}
	var rows []map[string]float64
	if err := json.Unmarshal([]byte(out), &rows); err != nil {
		t.Fatal(err)
	}
	if len(rows) != 10 {
		t.Fatalf("%d rows, want 10", len(rows))
	}
	for i, r := range rows {
		if len(r) != 5 {
			t.Errorf("row %d has fields %v, want the five the README names for bank", i, r)
		}
		if r["bank_deg"] != float64(5*i) {
			t.Errorf("row %d bank %g, want %d", i, r["bank_deg"], 5*i)
		}
	}
	// 30°: n = 1.1547, induced +33.3 % (n = 1/cos φ).
	if r := rows[6]; math.Abs(r["load_factor"]-1.1547) > 5e-5 || math.Abs(r["induced_drag_increase_pct"]-33.33) > 0.005 {
		t.Errorf("30° row %v", r)
	}
}

// User-facing text stands alone: no help cites a document that is not in
// the repository.
func TestHelpStandsAlone(t *testing.T) {
	_, top, _ := runArgs("help")
	texts := map[string]string{"help": top}
	for _, c := range commands() {
		_, out, _ := runArgs(c.name, "--help")
		texts[c.name] = out
	}
	for name, s := range texts {
		if strings.Contains(s, "DESIGN") || strings.Contains(s, "§") {
			t.Errorf("%s help cites the design document:\n%s", name, s)
		}
	}
	// The overview (no arguments, not a terminal) names every command.
	_, out, _ := runArgs()
	for _, c := range commands() {
		if !strings.Contains(out, c.name) {
			t.Errorf("overview lacks %s", c.name)
		}
	}
}

func TestVersion(t *testing.T) {
	for _, arg := range []string{"--version", "version"} {
		code, out, errs := runArgs(arg)
		if code != 0 || !strings.HasPrefix(out, "dragdeck ") || !strings.Contains(out, "go1.") || errs != "" {
			t.Errorf("%s: exit %d %q %q", arg, code, out, errs)
		}
	}
}

// point refuses a vertical speed at or above TAS (sin γ > 1) and warns about
// a CL beyond buffet and a negative parasite drag, on stderr and in JSON.
func TestPointWarnings(t *testing.T) {
	base := []string{"point", "--weight-kg", "65000", "--alt-ft", "35000", "--sat-c", "-54"}
	code, _, errs := runArgs(append(base, "--mach", "0.78", "--fuel-flow-kgph", "2400", "--vs-fpm", "50000")...)
	if code != exitUsage || !strings.Contains(errs, "--vs-fpm") {
		t.Errorf("VS above TAS: exit %d %s", code, errs)
	}
	code, out, errs := runArgs(append(base, "--mach", "0.45", "--fuel-flow-kgph", "2400", "--json")...)
	if code != 0 || !strings.Contains(errs, "buffet") {
		t.Errorf("slow and heavy: exit %d, stderr %q", code, errs)
	}
	var j struct{ Warnings []string }
	if json.Unmarshal([]byte(out), &j) != nil || len(j.Warnings) == 0 || !strings.Contains(j.Warnings[0], "buffet") {
		t.Errorf("JSON warnings %v:\n%s", j.Warnings, out)
	}
	_, _, errs = runArgs(append(base, "--mach", "0.78", "--fuel-flow-kgph", "600")...)
	if !strings.Contains(errs, "parasite drag") || !strings.Contains(errs, "negative") {
		t.Errorf("low fuel flow: stderr %q", errs)
	}
	_, out, errs = runArgs(append(base, "--mach", "0.78", "--fuel-flow-kgph", "2400", "--json")...)
	if errs != "" || !strings.Contains(out, `"warnings": []`) {
		t.Errorf("a clean point warns: %q\n%s", errs, out)
	}
}

// point --n1-pct with a type that has a thrust table: thrust from the fan
// speed, the engine deviation apart; a meter reading 2 % high moves the
// engine deviation by that factor and leaves the airframe deviation as it
// was (the DESIGN.md §7 check, end to end). Without N1 the engine
// deviation and N1k are null, never 0.
func TestPointN1(t *testing.T) {
	base := []string{"point", "--type", "../../testdata/types/twin_thrust.toml", "--weight-kg", "65000", "--alt-ft", "35000",
		"--sat-c", "-54", "--mach", "0.78", "--json"}
	type pj struct {
		Source   string   `json:"thrust_source"`
		N1k      *float64 `json:"n1_corrected_pct"`
		Engine   *float64 `json:"engine_deviation_pct"`
		Airframe float64  `json:"drag_deviation_pct"`
	}
	get := func(args ...string) pj {
		t.Helper()
		code, out, errs := runArgs(append(append([]string{}, base...), args...)...)
		var j pj
		if code != 0 || json.Unmarshal([]byte(out), &j) != nil {
			t.Fatalf("%v: exit %d %s\n%s", args, code, errs, out)
		}
		return j
	}
	a := get("--fuel-flow-kgph", "2400", "--n1-pct", "83.5")
	b := get("--fuel-flow-kgph", "2448", "--n1-pct", "83.5")
	if a.Source != "fan speed" || a.N1k == nil || a.Engine == nil || b.Engine == nil {
		t.Fatalf("with N1: %+v", a)
	}
	if got := (1 + *b.Engine/100) / (1 + *a.Engine/100); math.Abs(got-1.02) > 1e-9 {
		t.Errorf("a 2 %% meter bias moves (1 + engine dev) by %g, want 1.02", got)
	}
	if a.Airframe != b.Airframe {
		t.Errorf("airframe deviation moved with the meter: %g → %g", a.Airframe, b.Airframe)
	}
	c := get("--fuel-flow-kgph", "2400")
	if c.Source != "fuel flow" || c.N1k != nil || c.Engine != nil {
		t.Errorf("without N1: %+v", c)
	}
	code, _, errs := runArgs("point", "--type", "../../testdata/types/widebody.toml", "--weight-kg", "180000", "--alt-ft", "35000", "--sat-c", "-54", "--mach", "0.83", "--fuel-flow-kgph", "6400", "--n1-pct", "83.5")
	if code != 0 || !strings.Contains(errs, "no [thrust] table") {
		t.Errorf("N1 with a type without a table: exit %d, stderr %q", code, errs)
	}
	code, _, errs = runArgs(append(append([]string{}, base...), "--fuel-flow-kgph", "2400", "--n1-pct", "140")...)
	if code != exitUsage || !strings.Contains(errs, "--n1-pct") {
		t.Errorf("N1 of 140 %%: exit %d, stderr %q", code, errs)
	}
	code, _, errs = runArgs(append(append([]string{}, base...), "--fuel-flow-kgph", "2400", "--n1-pct", "50")...)
	if code != 0 || !strings.Contains(errs, "outside the type's thrust table") {
		t.Errorf("N1 below the table: exit %d, stderr %q", code, errs)
	}
}

// bank marks the rows beyond buffet, as the Turns screen does.
func TestBankMarksBuffet(t *testing.T) {
	_, out, _ := runArgs("bank", "--weight-kg", "65000", "--alt-ft", "35000", "--mach", "0.78")
	ty := feed.DemoType()
	rows := model.BankTable(ty, 65000, model.AirISA(35000*model.Foot, 0), 0.78, 0)
	for _, r := range rows {
		line := ""
		for _, l := range strings.Split(out, "\n") {
			if f := strings.Fields(l); len(f) > 1 && f[0] == fmt.Sprint(degrees(r.Bank)) && strings.Contains(l, "%") {
				line = l
			}
		}
		if r.Buffet != strings.Contains(line, "beyond buffet") {
			t.Errorf("%v° (buffet %v): %q", degrees(r.Bank), r.Buffet, line)
		}
	}
	if !strings.Contains(out, "1.3 g margin is not kept") {
		t.Errorf("no buffet footnote:\n%s", out)
	}
}

// point --n1-pct against an independent implementation of thrust from fan
// speed, written out here from the published relations rather than through
// package model: the ICAO troposphere p = p0 (1 − L h/T0)^(g0/(R L))
// (ICAO Doc 7488), θt2 = θ (1 + 0.2 M²) and N1k = N1/√θt2 (SAE AIR1703
// corrected parameters), bilinear interpolation by hand in the table of
// testdata/types/twin_thrust.toml, the parabolic polar with Korn's drag
// divergence and Lock's wave drag (Gur, Mason & Schetz 2010), and TSFC =
// (a + b M) √θ. The budget is 0.05 pp of deviation and 0.2 % of thrust.
func TestPointN1Independent(t *testing.T) {
	const (
		wKg, altFt, mach, satC, ffKgph, n1 = 65000.0, 35000.0, 0.78, -54.0, 2400.0, 83.5
		g0, rAir, lapse, t0, p0            = 9.80665, 287.05287, 0.0065, 288.15, 101325.0
		area, span, cd0, osw               = 112.0, 33.2, 0.0210, 0.74
		kappa, tc, sweepDeg                = 0.945, 0.12, 25.0
		tsfcA, tsfcB, engines              = 0.38, 0.36, 2.0
	)
	h := altFt * 0.3048
	delta := math.Pow(1-lapse*h/t0, g0/(rAir*lapse))
	theta := (satC + 273.15) / t0
	n1k := n1 / math.Sqrt(theta*(1+0.2*mach*mach))
	// The table: rows at Mach 0.7 and 0.8 bracket 0.78, columns 90 and 100 % bracket N1k.
	if n1k < 90 || n1k > 100 {
		t.Fatalf("N1k %.2f: the hand interpolation below assumes 90…100 %%", n1k)
	}
	fx := (n1k - 90) / 10
	f07 := 86000 + fx*(115000-86000)
	f08 := 83500 + fx*(112000-83500)
	fPerDelta := f07 + (mach-0.7)/0.1*(f08-f07)
	fn := engines * delta * fPerDelta

	q := 0.7 * p0 * delta * mach * mach
	cl := wKg * g0 / (q * area)
	ar := span * span / area
	cosL := math.Cos(sweepDeg * math.Pi / 180)
	mdd := kappa/cosL - tc/(cosL*cosL) - cl/(10*cosL*cosL*cosL)
	mcr := mdd - math.Cbrt(0.1/80)
	wave := 0.0
	if mach > mcr {
		wave = 20 * math.Pow(mach-mcr, 4)
	}
	cdBase := cd0 + cl*cl/(math.Pi*osw*ar) + wave
	devWant := 100 * (fn/(q*area)/cdBase - 1)
	tsfc := (tsfcA + tsfcB*mach) * math.Sqrt(theta) / (g0 * 3600) // kg/(N s)
	engWant := 100 * (ffKgph/3600/(tsfc*fn) - 1)

	code, out, errs := runArgs("point", "--type", "../../testdata/types/twin_thrust.toml", "--weight-kg", "65000", "--alt-ft", "35000",
		"--mach", "0.78", "--sat-c", "-54", "--fuel-flow-kgph", "2400", "--n1-pct", "83.5", "--json")
	var j struct {
		Thrust float64 `json:"thrust_n"`
		Dev    float64 `json:"drag_deviation_pct"`
		Engine float64 `json:"engine_deviation_pct"`
		N1k    float64 `json:"n1_corrected_pct"`
	}
	if code != 0 || json.Unmarshal([]byte(out), &j) != nil {
		t.Fatalf("exit %d %s\n%s", code, errs, out)
	}
	if math.Abs(j.Thrust-fn) > 0.002*fn {
		t.Errorf("thrust %.0f N, independent %.0f N (%.3f %%)", j.Thrust, fn, 100*(j.Thrust/fn-1))
	}
	if math.Abs(j.Dev-devWant) > 0.05 || math.Abs(j.Engine-engWant) > 0.05 {
		t.Errorf("airframe %+.3f %% (independent %+.3f), engine %+.3f %% (independent %+.3f)", j.Dev, devWant, j.Engine, engWant)
	}
	if math.Abs(j.N1k-n1k) > 1e-6 {
		t.Errorf("N1k %.4f %%, independent %.4f %%", j.N1k, n1k)
	}
	t.Logf("thrust %.1f N vs %.1f N; airframe %+.4f vs %+.4f %%; engine %+.4f vs %+.4f %%", j.Thrust, fn, j.Dev, devWant, j.Engine, engWant)
}
