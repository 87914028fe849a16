package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dragdeck/feed/demo"
)

func TestCheck(t *testing.T) {
	tests := []struct {
		name   string
		args   []string
		code   int
		stdout []string
		stderr string
	}{
		{"every reject listed, exit 1", []string{"check", "../../testdata/snapshots/rejects.csv"}, 1,
			[]string{"rejects.csv:4: row: 8 fields, the header has 9", "rejects.csv:20: flight:", "20 rows read, 3 accepted, 17 rejected", "mach: out of range"}, ""},
		{"clean file, exit 0", []string{"check", "../../testdata/snapshots/good_kg_sat.csv"}, 0,
			[]string{"5 rows read, 5 accepted, 0 rejected"}, ""},
		{"folder, unknown column warned once", []string{"check", "../../testdata/snapshots"}, 1,
			[]string{"checked 3 file(s)"}, "good_lb_tat.csv: ignoring unknown column(s) remarks"},
		{"missing file, exit 2", []string{"check", "no-such.csv"}, 2, nil, "no-such.csv"},
		{"missing file beside a good one: both reported, exit 2", []string{"check", "no-such.csv", "../../testdata/snapshots/rejects.csv"}, 2,
			[]string{"rejects.csv:4: row:", "checked 1 file(s) from 2 path(s)", "1 could not be read"}, "no-such.csv"},
		// One broken file is one file, not two.
		{"one broken file counts once", []string{"check", "../../testdata/bad/semicolons.csv"}, 2,
			[]string{"checked 1 file(s) from 1 path(s)", "1 could not be read"}, "separated by semicolons"},
		{"no path, exit 2", []string{"check"}, 2, nil, "give at least one snapshot file or folder"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, out, errs := runArgs(tc.args...)
			if code != tc.code {
				t.Fatalf("exit %d, want %d; stderr %q", code, tc.code, errs)
			}
			for _, w := range tc.stdout {
				if !strings.Contains(out, w) {
					t.Errorf("stdout lacks %q:\n%s", w, out)
				}
			}
			if !strings.Contains(errs, tc.stderr) {
				t.Errorf("stderr %q lacks %q", errs, tc.stderr)
			}
		})
	}
}

// A file that is missing a required column is a file-level error: exit 2,
// and the other files are still checked.
func TestCheckMissingColumn(t *testing.T) {
	dir := t.TempDir()
	bad := filepath.Join(dir, "a.csv")
	os.WriteFile(bad, []byte("time,tail,weight_kg,alt_ft,mach,sat_c\n"), 0o644)
	code, out, errs := runArgs("check", bad, "../../testdata/snapshots/good_kg_sat.csv")
	if code != 2 || !strings.Contains(errs, "a.csv:1: missing required column(s) fuel_flow_kgph") || !strings.Contains(out, "5 accepted") ||
		!strings.Contains(out, "checked 2 file(s) from 2 path(s)") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errs)
	}
}

func TestDemoCommand(t *testing.T) {
	dir := t.TempDir()
	code, out, errs := runArgs("demo", "--out", dir, "--tails", "5", "--days", "40", "--seed", "3")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, f := range []string{demo.SnapshotFile, demo.FleetFile, demo.TypeFilePath("DD-200"), demo.EventsFile, demo.TruthFile} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("%s not written: %v", f, err)
		}
	}
	if !strings.Contains(out, "invented") {
		t.Errorf("summary should say the data is invented: %s", out)
	}
	// check on the whole folder skips the events file and finds the broken rows.
	code, out, errs = runArgs("check", dir)
	if code != 1 || !strings.Contains(errs, "an events file, skipped") || !strings.Contains(out, "8 rejected") {
		t.Errorf("check on the demo folder: exit %d\n%s\n%s", code, out, errs)
	}
	for _, args := range [][]string{{"demo"}, {"demo", "--out", dir, "--tails", "0"}, {"demo", "--out", dir, "--days", "-1"}} {
		if code, _, _ := runArgs(args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
}

// A header of 100,000 unknown columns gives one short warning (it was a
// 730 KB line), and a hostile column name is quoted, not printed raw.
func TestUnknownColumnsWarningCapped(t *testing.T) {
	var b strings.Builder
	b.WriteString("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,\"x\x1b[2J\"")
	for i := 0; i < 100000; i++ {
		fmt.Fprintf(&b, ",x%d", i)
	}
	b.WriteString("\n")
	p := filepath.Join(t.TempDir(), "wide.csv")
	os.WriteFile(p, []byte(b.String()), 0o644)
	_, _, errs := runArgs("check", p)
	if len(errs) > 1000 || !strings.Contains(errs, "and 99991 more") || strings.Contains(errs, "\x1b") {
		t.Errorf("warning of %d bytes:\n%.600s", len(errs), errs)
	}
}
