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

// mixedFleet writes snapshots of the test fleet testdata/fleets/mixed (DT101
// on DT, DT102 retrofitted to DT-W on 2026-03-01, WB201 without fan speed)
// and of a tail the fleet file does not name; it returns the snapshot file.
func mixedFleet(t *testing.T) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,fuel_flow_kgph,sat_c,n1_pct\n")
	start := time.Date(2026, 1, 1, 10, 0, 0, 0, time.UTC)
	for d := 0; d < 120; d++ {
		at := start.Add(time.Duration(d) * 24 * time.Hour).Format(time.RFC3339)
		w := 65000.0 // constant: the deviation is the same every day
		fmt.Fprintf(&b, "%s,DT101,F%d,%g,37000,0.78,2300,-56,85\n", at, d, w)
		fmt.Fprintf(&b, "%s,DT102,G%d,%g,37000,0.78,2300,-56,85\n", at, d, w)
		fmt.Fprintf(&b, "%s,WB201,H%d,%g,37000,0.83,6300,-56,\n", at, d, 160000.0)
	}
	b.WriteString("2026-03-02T10:00:00Z,ZZ999,X1,65000,37000,0.78,2300,-56,85\n")
	p := filepath.Join(t.TempDir(), "snaps.csv")
	if err := os.WriteFile(p, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const mixedFleetFile = "../../testdata/fleets/mixed/fleet.toml"

type fleetReport struct {
	Read, Rejected int
	Fleet          struct {
		Types map[string]struct {
			Tails                    int      `json:"tails"`
			DeviationPctMedian       *float64 `json:"deviation_pct_median"`
			EngineDeviationPctMedian *float64 `json:"engine_deviation_pct_median"`
		} `json:"types"`
	} `json:"fleet"`
	Tails []struct {
		Tail         string   `json:"tail"`
		Type         string   `json:"type"`
		ThrustSource string   `json:"thrust_source"`
		DeviationPct *float64 `json:"deviation_pct"`
		Steps        []any    `json:"steps"`
		Engine       *struct {
			DeviationPct *float64 `json:"deviation_pct"`
		} `json:"engine"`
	} `json:"tails"`
}

func runFleetReport(t *testing.T, args ...string) fleetReport {
	t.Helper()
	code, out, errOut := runArgs(append([]string{"report", "--format", "json"}, args...)...)
	if code != 0 {
		t.Fatalf("report %v: exit %d: %s", args, code, errOut)
	}
	var r fleetReport
	if err := json.Unmarshal([]byte(out), &r); err != nil {
		t.Fatal(err)
	}
	return r
}

func TestReportFleetFile(t *testing.T) {
	snaps := mixedFleet(t)
	r := runFleetReport(t, "--fleet", mixedFleetFile, snaps)
	if r.Rejected != 1 || r.Read != 3*120+1 {
		t.Errorf("read %d rejected %d, want the unnamed tail's row rejected", r.Read, r.Rejected)
	}
	want := map[string]struct{ typ, source string }{
		"DT101": {"DT", "fan speed"}, "DT102": {"DT-W", "fan speed"}, "WB201": {"WB", "fuel flow"},
	}
	for _, tl := range r.Tails {
		w, ok := want[tl.Tail]
		if !ok || tl.Type != w.typ || tl.ThrustSource != w.source || (tl.Engine == nil) != (w.source == "fuel flow") {
			t.Errorf("tail %+v, want %+v", tl, w)
		}
		if tl.Tail == "DT102" && len(tl.Steps) != 0 {
			t.Errorf("DT102: a retrofit to an equal type gave steps %v", tl.Steps)
		}
	}
	if len(r.Tails) != 3 {
		t.Errorf("%d tails, want 3 (ZZ999 rejected)", len(r.Tails))
	}
	if g := r.Fleet.Types["WB"]; g.Tails != 1 || g.DeviationPctMedian == nil || g.EngineDeviationPctMedian != nil {
		t.Errorf("type WB %+v: want one tail, a median and no engine median", g)
	}
	if g := r.Fleet.Types["DT"]; g.Tails != 1 || g.EngineDeviationPctMedian == nil {
		t.Errorf("type DT %+v", g)
	}

	// The fleet file's fuel_flow_correction_pct = -0.8 on WB201 (thrust
	// from fuel flow) lowers its drag deviation by 0.8 % of (1 + dev).
	plain, err := os.ReadFile(mixedFleetFile)
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Dir(mixedFleetFile)
	abs, _ := filepath.Abs(dir)
	noCorr := strings.ReplaceAll(strings.ReplaceAll(string(plain), "fuel_flow_correction_pct = -0.8", ""), `"../../types/`, `"`+filepath.Join(abs, "../../types")+"/")
	f2 := filepath.Join(t.TempDir(), "fleet.toml")
	os.WriteFile(f2, []byte(noCorr), 0o644)
	r2 := runFleetReport(t, "--fleet", f2, snaps)
	dev := func(r fleetReport) float64 {
		for _, tl := range r.Tails {
			if tl.Tail == "WB201" && tl.DeviationPct != nil {
				return *tl.DeviationPct
			}
		}
		return math.NaN()
	}
	with, without := dev(r), dev(r2)
	if wantDev := (1+without/100)*(1-0.008)*100 - 100; math.Abs(with-wantDev) > 0.01 {
		t.Errorf("WB201 deviation with the correction %.3f %%, without %.3f %%: want %.3f %%", with, without, wantDev)
	}
}

func TestFleetFlagErrors(t *testing.T) {
	snaps := mixedFleet(t)
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"type and fleet", []string{"report", "--type", "../../testdata/types/widebody.toml", "--fleet", mixedFleetFile, snaps}, 2, "give one"},
		{"missing fleet file", []string{"report", "--fleet", "no/such.toml", snaps}, 2, "--fleet:"},
		{"fit of two types", []string{"fit", "--fleet", mixedFleetFile, snaps}, 2, "fly 3 types"},
		{"point without a type name", append([]string{"point", "--fleet", mixedFleetFile}, pointArgs[1:]...), 2, "name one of its types: DT, DT-W, WB"},
		{"point with a type name", append([]string{"point", "--fleet", mixedFleetFile, "--type", "DT"}, pointArgs[1:]...), 0, ""},
		{"check with the fleet", []string{"check", "--fleet", mixedFleetFile, snaps}, 1, "tail ZZ999 is not in the fleet file"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, out, errOut := runArgs(c.args...)
			if code != c.code || !strings.Contains(out+errOut, c.want) {
				t.Fatalf("exit %d, want %d with %q:\n%s%s", code, c.code, c.want, out, errOut)
			}
		})
	}
}

// The fleet file of a one-type demo names every tail with that type: the
// report with --fleet is the report with --type, tail by tail.
func TestDemoFleetFile(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "6", "--days", "120", "--seed", "2", "--type", "../../testdata/types/widebody.toml"); code != 0 {
		t.Fatal(errs)
	}
	snaps := filepath.Join(dir, "snapshots")
	byType := runFleetReport(t, "--type", filepath.Join(dir, demo.TypeFilePath("WB-9")), snaps)
	byFleet := runFleetReport(t, "--fleet", filepath.Join(dir, "fleet.toml"), snaps)
	if len(byType.Tails) != 6 || len(byFleet.Tails) != 6 || byType.Rejected != byFleet.Rejected {
		t.Fatalf("tails %d / %d, rejected %d / %d", len(byType.Tails), len(byFleet.Tails), byType.Rejected, byFleet.Rejected)
	}
	for i, a := range byType.Tails {
		b := byFleet.Tails[i]
		if a.Tail != b.Tail || fmtPtr(a.DeviationPct) != fmtPtr(b.DeviationPct) || b.Type != "WB-9" {
			t.Errorf("tail %d: --type %s %s, --fleet %s %s (type %q)", i, a.Tail, fmtPtr(a.DeviationPct), b.Tail, fmtPtr(b.DeviationPct), b.Type)
		}
	}
}

// A fleet file beside the snapshots, not given: the reading commands say
// so on stderr (the data would be analysed as the built-in type), and say
// nothing once --fleet or --type is given.
func TestFleetBesideNote(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "3", "--days", "20", "--seed", "2"); code != 0 {
		t.Fatal(errs)
	}
	snaps := filepath.Join(dir, "snapshots")
	cases := []struct {
		name string
		args []string
		note bool
	}{
		{"folder, no fleet", []string{"report", snaps}, true},
		{"file, no fleet", []string{"report", filepath.Join(dir, demo.SnapshotFile)}, true},
		{"with --fleet", []string{"report", "--fleet", filepath.Join(dir, demo.FleetFile), snaps}, false},
		{"with --type", []string{"report", "--type", filepath.Join(dir, demo.TypeFilePath("DD-200")), snaps}, false},
		{"fit, no fleet", []string{"fit", snaps}, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, _, errs := runArgs(c.args...)
			if got := strings.Contains(errs, "fleet.toml lies beside the snapshots"); got != c.note {
				t.Errorf("note %v, want %v; stderr:\n%s", got, c.note, errs)
			}
		})
	}
}
