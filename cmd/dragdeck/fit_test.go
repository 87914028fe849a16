package main

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"dragdeck/feed"
	"dragdeck/feed/demo"
)

// fitNumbers reads "CD0 = a ± b" and "k = c ± d" from the fit's comments.
var fitLine = regexp.MustCompile(`CD0 = ([0-9.]+) ± ([0-9.]+) \(1 SE\); k = ([0-9.]+) ± ([0-9.]+)`)

// The fit recovers the polar the demo fleet was made with. A tail's excess
// is lift-independent, ΔCD = d/100 × reference_cd_baseline with d its known
// offset, so a steady tail's true polar is CD0 + ΔCD with the baseline k.
// The demo is made --clean: a weight error per flight is an error in CL,
// which biases a least-squares slope low (errors in variables; with the
// sensor effects on, k comes out about 1 % low), a property of the data
// and not of the fit. The type has no thrust table, so the thrust comes
// from fuel flow and its per-snapshot noise gives the scatter whose
// standard errors the test checks (with fan speed the clean data are
// nearly noise-free, and the rounding of the written values dominates).
// Each steady tail's fit lands within 3 standard errors of both, and the errors
// in units of the stated SE have an RMS near 1: the SEs mean what they say.
// (Tails with different offsets are fitted one at a time: pooled, their
// differences are not the independent noise that OLS errors assume.)
func TestFitRecoversDemoPolar(t *testing.T) {
	const widebodyType = "../../testdata/types/widebody.toml"
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "24", "--days", "365", "--seed", "12", "--clean", "--type", widebodyType); code != 0 {
		t.Fatal(errs)
	}
	var truth demo.Truth
	js, _ := os.ReadFile(filepath.Join(dir, demo.TruthFile))
	json.Unmarshal(js, &truth)
	snaps := filepath.Join(dir, "snapshots")
	ty, err := feed.LoadType(widebodyType)
	if err != nil {
		t.Fatal(err)
	}
	var sumZ2 float64
	n := 0
	for _, tt := range truth.Tails {
		if tt.Role != demo.RoleSteady {
			continue
		}
		code, out, errs := runArgs("fit", "--type", widebodyType, "--tail", tt.Tail, snaps)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", tt.Tail, code, errs)
		}
		m := fitLine.FindStringSubmatch(out)
		if m == nil {
			t.Fatalf("no fit line in\n%s", out)
		}
		v := make([]float64, 4)
		for i := range v {
			v[i], _ = strconv.ParseFloat(m[i+1], 64)
		}
		cd0 := ty.CD0 + tt.OffsetPct/100*truth.ReferenceCD[tt.Type]
		zCD0 := (v[0] - cd0) / v[1]
		zK := (v[2] - ty.K()) / v[3]
		if math.Abs(zCD0) > 3 || math.Abs(zK) > 3 {
			t.Errorf("%s: CD0 %.6f ± %.6f, k %.5f ± %.5f; want %.6f, %.5f", tt.Tail, v[0], v[1], v[2], v[3], cd0, ty.K())
		}
		sumZ2 += zCD0*zCD0 + zK*zK
		n += 2
		if n == 2 { // the output is a type file that loads
			p := filepath.Join(dir, "fitted.toml")
			os.WriteFile(p, []byte(out), 0o644)
			if _, err := feed.LoadType(p); err != nil {
				t.Errorf("fitted type does not load: %v", err)
			}
		}
	}
	if rms := math.Sqrt(sumZ2 / float64(n)); n < 20 || rms < 0.5 || rms > 1.5 {
		t.Errorf("RMS error %.2f SE over %d coefficients, want about 1", rms, n)
	}
}

func TestFitRefusesNarrowCL(t *testing.T) {
	p := filepath.Join(t.TempDir(), "narrow.csv")
	var b strings.Builder
	b.WriteString("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n")
	for i := 0; i < 30; i++ {
		b.WriteString("2026-03-01T10:" + strconv.Itoa(10+i) + ":00Z,DD101,65000,35000,0.78,-54," + strconv.Itoa(2390+i) + "\n")
	}
	os.WriteFile(p, []byte(b.String()), 0o644)
	code, out, errs := runArgs("fit", p)
	if code != 2 || out != "" || !strings.Contains(errs, "the fit needs a spread of at least 0.05") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errs)
	}
	if code, _, errs := runArgs("fit", "--from", "March", p); code != 2 || !strings.Contains(errs, "--from") {
		t.Errorf("bad date: exit %d %s", code, errs)
	}
}
