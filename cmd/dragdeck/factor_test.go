package main

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

type proposeJSON struct {
	Filed     int            `json:"filed"`
	Kept      int            `json:"kept"`
	Proposals []proposalJSON `json:"proposals"`
	Caution   string         `json:"caution"`
}

// From import to an exported factor file, each step once, as the README
// tells a new user; then the refused moves, and a second propose that
// finds the factors in use right.
func TestFactorCommands(t *testing.T) {
	dir := demoFleet(t, "10", "240", "31")
	db := filepath.Join(dir, "s.db")
	importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"), filepath.Join(dir, "events.csv"), filepath.Join(dir, "fleet.toml"))
	factor := func(args ...string) (int, string, string) {
		return runArgs(append([]string{"factor", "--store", db, "--by", "tester"}, args...)...)
	}
	code, out, errs := factor("propose", "--json")
	var p proposeJSON
	if err := json.Unmarshal([]byte(out), &p); code != 0 || err != nil || p.Filed == 0 || len(p.Proposals) != p.Filed || p.Caution == "" {
		t.Fatalf("propose: exit %d %v %s %s", code, err, out, errs)
	}
	refused := []struct {
		name string
		args []string
	}{
		{"reject without a note", []string{"reject", "1"}},
		{"apply what is not approved", []string{"apply", "1"}},
		{"approve no such proposal", []string{"approve", "999"}},
		{"approve a word", []string{"approve", "first"}},
		{"set without a note", []string{"set", "DD101", "1.5"}},
		{"set a factor that is no number", []string{"set", "DD101", "lots", "--note", "x"}},
		{"a bad period", []string{"list", "--period", "2026-13"}},
		{"a flag of another verb", []string{"list", "--out", "x.csv"}},
		{"export without --out", []string{"export"}},
		{"an unknown verb", []string{"frobnicate"}},
	}
	for _, r := range refused {
		if code, _, errs := factor(r.args...); code != 2 || strings.Count(strings.TrimSpace(errs), "\n") != 0 {
			t.Errorf("%s: exit %d, stderr %q; want 2 and one line", r.name, code, errs)
		}
	}
	if code, _, errs := factor("approve", "all"); code != 0 {
		t.Fatalf("approve all: %s", errs)
	}
	if code, _, errs := factor("apply", "all", "--effective", "2026-12-01"); code != 0 {
		t.Fatalf("apply all: %s", errs)
	}
	code, out, _ = factor("history", "--json")
	var hist []settingJSON
	if err := json.Unmarshal([]byte(out), &hist); code != 0 || err != nil || len(hist) != p.Filed {
		t.Fatalf("history: %d entries, want %d (%v)", len(hist), p.Filed, err)
	}
	for i, h := range hist {
		pr := p.Proposals[i] // both by tail (proposals are filed in tail order)
		if h.Tail != pr.Tail || h.FactorPct != pr.FactorPct || h.Effective != "2026-12-01T00:00:00Z" || h.By != "tester" || h.Proposal == nil || *h.Proposal != pr.ID {
			t.Errorf("history %+v, proposal %+v", h, pr)
		}
	}
	csvOut := filepath.Join(dir, "factors.csv")
	if code, _, errs := factor("export", "--out", csvOut); code != 0 {
		t.Fatalf("export: %s", errs)
	}
	f, _ := os.Open(csvOut)
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil || len(rows) != p.Filed+1 || !slices.Equal(rows[0], exportColumns) {
		t.Fatalf("export: %v, %d rows, header %v", err, len(rows), rows)
	}
	for i, row := range rows[1:] {
		if row[0] != p.Proposals[i].Tail || row[3] != "2026-12-01" || row[7] == "" || row[9] != "proposal "+itoa(p.Proposals[i].ID) {
			t.Errorf("export row %v", row)
		}
	}
	// the factors in use are what the policy wants now: nothing new
	code, out, _ = factor("propose", "--json")
	var again proposeJSON
	json.Unmarshal([]byte(out), &again)
	if code != 0 || again.Filed != 0 || len(again.Proposals) != 0 {
		t.Errorf("propose after applying: filed %d, open %d; want none", again.Filed, len(again.Proposals))
	}
	// the report of the store shows the factor in use and the monitored one
	_, out, _ = runArgs("report", "--format", "json", "--store", db)
	var rep struct {
		Tails []struct {
			Tail   string `json:"tail"`
			Factor struct {
				InUsePct     *float64 `json:"in_use_pct"`
				MonitoredPct *float64 `json:"monitored_pct"`
			} `json:"fuel_factor"`
		} `json:"tails"`
	}
	json.Unmarshal([]byte(out), &rep)
	inUse := 0
	for _, tl := range rep.Tails {
		if tl.Factor.InUsePct != nil {
			inUse++
		}
	}
	if inUse != p.Filed {
		t.Errorf("the report shows %d factors in use, want %d", inUse, p.Filed)
	}
}

func itoa(v int64) string { b, _ := json.Marshal(v); return string(b) }

// A hostile tail name stays one CSV field of the export, and cannot be
// read as a formula; an export that cannot be put in place leaves nothing
// behind.
func TestFactorExportHostileAndAtomic(t *testing.T) {
	dir := demoFleet(t, "4", "60", "8")
	db := filepath.Join(dir, "s.db")
	importJSONOf(t, "--store", db, filepath.Join(dir, "snapshots"))
	hostile := `=HYPERLINK("x","y"),1;2 "q"`
	if code, _, errs := runArgs("factor", "--store", db, "set", hostile, "1.5", "--note", `a note, with "quotes"`); code != 0 {
		t.Fatalf("set: %s", errs)
	}
	if code, _, _ := runArgs("factor", "--store", db, "set", "T\nX", "1", "--note", "n"); code != 2 {
		t.Errorf("a tail with a line break: exit %d, want 2", code)
	}
	out := filepath.Join(dir, "f.csv")
	if code, _, errs := runArgs("factor", "--store", db, "export", "--out", out); code != 0 {
		t.Fatalf("export: %s", errs)
	}
	f, _ := os.Open(out)
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil || len(rows) != 2 || len(rows[1]) != len(exportColumns) || rows[1][0] != "'"+hostile || rows[1][9] != `a note, with "quotes"` {
		t.Fatalf("export %q: %v", rows, err)
	}
	jsonOut := filepath.Join(dir, "f.json")
	if code, _, errs := runArgs("factor", "--store", db, "export", "--out", jsonOut, "--format", "json"); code != 0 {
		t.Fatalf("export json: %s", errs)
	}
	var j exportJSON
	data, _ := os.ReadFile(jsonOut)
	if err := json.Unmarshal(data, &j); err != nil || len(j.Factors) != 1 || j.Factors[0].Tail != hostile || j.Caution == "" {
		t.Errorf("export json: %v %s", err, data)
	}
	// a folder where the file should go: refused, nothing left behind
	folder := filepath.Join(dir, "out")
	os.Mkdir(folder, 0o755)
	if code, _, _ := runArgs("factor", "--store", db, "export", "--out", folder); code != 2 {
		t.Errorf("export onto a folder: exit %d, want 2", code)
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".out.*"))
	if len(left) != 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// The back-test from the command line, on files of a seed no other test
// uses: per-tail factors beat no factor and one fleet factor.
func TestFactorBacktestCommand(t *testing.T) {
	dir := demoFleet(t, "14", "300", "77")
	code, out, errs := runArgs("factor", "backtest", "--json", "--fleet", filepath.Join(dir, "fleet.toml"), "--events", filepath.Join(dir, "events.csv"), filepath.Join(dir, "snapshots"))
	if code != 0 {
		t.Fatalf("backtest: exit %d %s", code, errs)
	}
	var bt struct {
		None, Fleet, PerTail struct {
			Flights int      `json:"flights"`
			Median  *float64 `json:"median_abs_kg_per_h"`
			P95     *float64 `json:"p95_abs_kg_per_h"`
		}
	}
	if err := json.Unmarshal([]byte(strings.ReplaceAll(out, `"per_tail"`, `"pertail"`)), &bt); err != nil || bt.PerTail.Median == nil || bt.None.Median == nil || bt.Fleet.Median == nil {
		t.Fatalf("backtest json: %v %s", err, out)
	}
	if !(*bt.PerTail.Median < *bt.None.Median && *bt.PerTail.Median < *bt.Fleet.Median && *bt.PerTail.P95 < *bt.None.P95 && *bt.PerTail.P95 < *bt.Fleet.P95) {
		t.Errorf("per tail %.1f/%.1f, none %.1f/%.1f, fleet %.1f/%.1f kg/h", *bt.PerTail.Median, *bt.PerTail.P95, *bt.None.Median, *bt.None.P95, *bt.Fleet.Median, *bt.Fleet.P95)
	}
	if code, out, _ := runArgs("factor", "backtest", "--fleet", filepath.Join(dir, "fleet.toml"), filepath.Join(dir, "snapshots")); code != 0 || !strings.Contains(out, "per-tail factors") {
		t.Errorf("backtest table: exit %d\n%s", code, out)
	}
}
