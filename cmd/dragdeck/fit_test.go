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

// The fit recovers the polar the demo fleet was made with. The generator
// scales a tail's whole polar by (1 + offset/100), so a steady tail's true
// polar is CD0 (1 + d/100) and k (1 + d/100) with d its known offset. Each
// steady tail's fit lands within 3 standard errors of both, and the errors
// in units of the stated SE have an RMS near 1: the SEs mean what they say.
// (Tails with different offsets are fitted one at a time: pooled, their
// differences are not the independent noise that OLS errors assume.)
func TestFitRecoversDemoPolar(t *testing.T) {
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "24", "--days", "365", "--seed", "12"); code != 0 {
		t.Fatal(errs)
	}
	var truth demo.Truth
	js, _ := os.ReadFile(filepath.Join(dir, demo.TruthFile))
	json.Unmarshal(js, &truth)
	snaps := filepath.Join(dir, "snapshots")
	ty := feed.DemoType()
	var sumZ2 float64
	n := 0
	for _, tt := range truth.Tails {
		if tt.Role != demo.RoleSteady {
			continue
		}
		code, out, errs := runArgs("fit", "--tail", tt.Tail, snaps)
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
		scale := 1 + tt.OffsetPct/100
		zCD0 := (v[0] - ty.CD0*scale) / v[1]
		zK := (v[2] - ty.K()*scale) / v[3]
		if math.Abs(zCD0) > 3 || math.Abs(zK) > 3 {
			t.Errorf("%s: CD0 %.6f ± %.6f, k %.5f ± %.5f; want %.6f, %.5f", tt.Tail, v[0], v[1], v[2], v[3], ty.CD0*scale, ty.K()*scale)
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
