package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dragdeck/model"
)

// Every tail gets a file name of its own, short and safe, the same in any
// order; no tail can take the overview's name.
func TestPlotNames(t *testing.T) {
	long := strings.Repeat("X", 300)
	tails := []string{"DD-101", "DD 101", "DD.101", "DD/101", "dd-101", "fleet", long, "../etc/passwd"}
	names := plotNames(tails)
	seen := map[string]string{}
	for _, tail := range tails {
		n := names[tail]
		if !strings.HasPrefix(n, "tail-") || !strings.HasSuffix(n, ".png") || len(n) > 5+60+9+4 {
			t.Errorf("%q: file name %q", tail, n)
		}
		if strings.Count(n, ".") != 1 || strings.Contains(n, "/") {
			t.Errorf("%q: file name %q is not one plain name", tail, n)
		}
		if o, ok := seen[strings.ToLower(n)]; ok {
			t.Errorf("%q and %q share %q", tail, o, n)
		}
		seen[strings.ToLower(n)] = tail
	}
	if names["DD-101"] != "tail-DD-101.png" || names["fleet"] != "tail-fleet.png" {
		t.Errorf("plain names changed: %q, %q", names["DD-101"], names["fleet"])
	}
	rev := append([]string(nil), tails...)
	for i, j := 0, len(rev)-1; i < j; i, j = i+1, j-1 {
		rev[i], rev[j] = rev[j], rev[i]
	}
	for tail, n := range plotNames(rev) {
		if names[tail] != n {
			t.Errorf("%q: %q in one order, %q in the other", tail, names[tail], n)
		}
	}
}

// The overview shows at most maxOverview tails, the most severe, and says
// so: 20,000 tails once made a 340,000-pixel picture.
func TestFleetPlotCapped(t *testing.T) {
	for _, n := range []int{3, maxOverview, 500} {
		f := model.Fleet{MedianRecentPct: 0.1}
		for i := 0; i < n; i++ {
			f.Tails = append(f.Tails, model.TailAssessment{TailTrend: model.TailTrend{Tail: fmt.Sprintf("T%04d", i), RecentPct: math.Sin(float64(i))}})
		}
		p, shown := fleetPlot(f)
		want := min(n, maxOverview)
		if shown != want || (n > maxOverview) != strings.Contains(p.Title.Text, "most severe") {
			t.Errorf("%d tails: %d shown, title %q; want %d", n, shown, p.Title.Text, want)
		}
	}
}

// --plots never writes over an input file, whatever it is called.
func TestPlotsSpareInputs(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "fleet.png") // an input named like the overview
	os.WriteFile(in, []byte("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n2026-03-01T10:00:00Z,DD101,65000,35000,0.78,-54.3,2380\n"), 0o644)
	before, _ := os.ReadFile(in)
	code, _, errs := runArgs("report", "--plots", dir, in)
	after, _ := os.ReadFile(in)
	if code != 2 || string(after) != string(before) || !strings.Contains(errs, "would destroy it") {
		t.Errorf("exit %d, input changed %v:\n%s", code, string(after) != string(before), errs)
	}
}
