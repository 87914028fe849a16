package main

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/model"
)

// writeRecording writes a 1 Hz recording of one flight of the demo type
// (without fan speed: thrust from fuel flow) with a true drag deviation
// devPct: the fuel flow is the model's for the
// drag with the lift-independent excess, so every stable window must give
// devPct back. Stretches: steady, a turn, steady, a step climb, steady with
// a gap. It returns the steady stretches' spans.
func writeRecording(t *testing.T, path string, devPct float64, seed uint64) [][2]time.Time {
	t.Helper()
	ty := feed.DemoType()
	rng := rand.New(rand.NewPCG(seed, 3))
	start := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	var b strings.Builder
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg\n")
	w, alt, m := 66000.0, 35000.0, 0.78
	refCD := 0.0
	var steady [][2]time.Time
	sec := 0
	emit := func(kind string, n int) {
		from := start.Add(time.Duration(sec) * time.Second)
		for k := 0; k < n; k++ {
			if kind == "gap" {
				sec++
				continue
			}
			bank, vs := 0.0, 0.0
			switch kind {
			case "turn":
				bank = 20
			case "climb":
				vs = 1000
			}
			h := alt * model.Foot
			tISA, _ := model.ISA(h)
			air := model.AirISA(h, 2)
			q := air.DynamicPressure(m)
			cl := model.LiftCoefficient(model.LoadFactor(bank*math.Pi/180), w, q, ty.WingArea)
			if refCD == 0 {
				refCD = ty.CD(cl, m, 0)
			}
			cd := ty.CD(cl, m, devPct/100*refCD)
			thrust := cd*q*ty.WingArea + w*model.G0*feed.MPerSFromFtPerMin(vs)/air.TAS(m)
			ff := ty.TSFC(m, air.Theta()) * thrust * model.Hour * (1 + 0.002*rng.NormFloat64())
			fmt.Fprintf(&b, "%s,R1,X1,%.0f,%.1f,%.4f,%.2f,%.1f,%.2f\n", start.Add(time.Duration(sec)*time.Second).Format(time.RFC3339),
				w, alt+rng.NormFloat64()*2, m+rng.NormFloat64()*0.0003, tISA+2-model.CelsiusZero+rng.NormFloat64()*0.05, ff, bank)
			alt += vs / 60
			w -= ff / 3600
			sec++
		}
		if kind == "steady" {
			steady = append(steady, [2]time.Time{from, start.Add(time.Duration(sec) * time.Second)})
		}
	}
	emit("steady", 600)
	emit("turn", 120)
	emit("steady", 400)
	emit("climb", 120)
	emit("steady", 250)
	emit("gap", 20)
	emit("steady", 250)
	b.WriteString("2026-03-01T12:00:00Z,R1,X1,66000,35000,0.78\n") // a broken row
	b.WriteString("2026-03-01T12:00:01Z,R1,X1,660")                // a half-written last row
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return steady
}

// extract writes snapshots only inside the steady stretches (a few seconds
// of slack at their edges), at least one in each, none across the gap; the
// output reads back through check with no reject, and each snapshot gives
// the planted deviation within 0.3 pp.
func TestExtractRecording(t *testing.T) {
	dir := t.TempDir()
	rec := filepath.Join(dir, "rec.csv")
	const dev = 1.8
	steady := writeRecording(t, rec, dev, 1)
	code, out, errs := runArgs("extract", rec)
	if code != 0 {
		t.Fatalf("exit %d\n%s", code, errs)
	}
	if !strings.Contains(errs, "rejected") || !strings.Contains(errs, "1 flight(s)") || !strings.Contains(errs, "bank") {
		t.Errorf("summary and rejects on stderr:\n%s", errs)
	}
	snaps := filepath.Join(dir, "snaps.csv")
	os.WriteFile(snaps, []byte(out), 0o644)
	if code, cout, _ := runArgs("check", snaps); code != 0 || !strings.Contains(cout, "0 rejected") {
		t.Fatalf("check on the output: exit %d\n%s\n%s", code, cout, out)
	}
	var recs []feed.Record
	res := feed.ReadFile(snaps, func(r feed.Record) { recs = append(recs, r) }, nil)
	if res.Err != nil || len(recs) < 4 {
		t.Fatalf("%d snapshots, %v\n%s", len(recs), res.Err, out)
	}
	covered := make([]bool, len(steady))
	for _, r := range recs {
		half := time.Duration(r.Seconds/2) * time.Second
		a, b := r.Time.Add(-half), r.Time.Add(half)
		in := -1
		for k, sp := range steady {
			if !a.Before(sp[0].Add(-5*time.Second)) && !b.After(sp[1].Add(5*time.Second)) {
				in = k
			}
		}
		if in < 0 {
			t.Errorf("window %v … %v outside the steady stretches", a.Format("15:04:05"), b.Format("15:04:05"))
			continue
		}
		covered[in] = true
		if r.Samples < 120 || r.Seconds < 119 || r.Seconds > 300 {
			t.Errorf("window of %d samples, %g s", r.Samples, r.Seconds)
		}
		p := model.Analyze(feed.DemoType(), r.Snap)
		if math.Abs(p.DragDevPct-dev) > 0.3 {
			t.Errorf("%v: deviation %.2f %%, planted %.1f %%", r.Time, p.DragDevPct, dev)
		}
	}
	for k, c := range covered {
		if !c {
			t.Errorf("steady stretch %d has no window", k)
		}
	}
	if code, _, errs := runArgs("report", "--format", "json", snaps); code != 0 {
		t.Errorf("report on the output: exit %d %s", code, errs)
	}
}

// Snapshots given to extract (rows minutes apart) give no window and a
// note that says what they look like.
func TestExtractOnSnapshots(t *testing.T) {
	p := filepath.Join(t.TempDir(), "snaps.csv")
	var b strings.Builder
	b.WriteString("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n")
	for i := 0; i < 20; i++ {
		fmt.Fprintf(&b, "2026-03-01T%02d:%02d:00Z,DD101,65000,35000,0.78,-54.3,2380\n", 10+i/3, 20*(i%3))
	}
	os.WriteFile(p, []byte(b.String()), 0o644)
	code, out, errs := runArgs("extract", p)
	if code != 0 || strings.Count(out, "\n") > 0 || !strings.Contains(errs, "snapshots rather than a recording") {
		t.Errorf("exit %d, out %q, stderr %s", code, out, errs)
	}
}

func TestExtractFlags(t *testing.T) {
	for _, args := range [][]string{{"extract"}, {"extract", "--min-seconds", "0", "x.csv"},
		{"extract", "--min-seconds", "300", "--max-seconds", "200", "x.csv"}, {"extract", "--max-bank-deg", "nan", "x.csv"}} {
		if code, _, _ := runArgs(args...); code != 2 {
			t.Errorf("%v: exit %d, want 2", args, code)
		}
	}
}

// BenchmarkExtract: samples a second through the whole command (read,
// windows, write) on a 1 Hz recording of 40 flights of 6 hours, and the
// heap in use (flat: one flight per tail at a time).
func BenchmarkExtract(b *testing.B) {
	dir := b.TempDir()
	p := filepath.Join(dir, "rec.csv")
	var sb strings.Builder
	sb.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg\n")
	rng := rand.New(rand.NewPCG(1, 1))
	t0 := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	n := 0
	for f := 0; f < 40; f++ {
		for s := 0; s < 6*3600; s++ {
			bank := 0.0
			if (s/600)%5 == 4 {
				bank = 20
			}
			fmt.Fprintf(&sb, "%s,T%d,F%d,%.0f,%.0f,%.4f,%.2f,%.1f,%.1f\n", t0.Add(time.Duration(8*3600*f+s)*time.Second).Format(time.RFC3339),
				f%2, f, 66000-float64(s)*0.6, 35000+rng.NormFloat64()*2, 0.78+rng.NormFloat64()*0.0003, -52+rng.NormFloat64()*0.05, 2300*(1+rng.NormFloat64()*0.002), bank)
			n++
		}
	}
	os.WriteFile(p, []byte(sb.String()), 0o644)
	b.SetBytes(int64(sb.Len()))
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if code, _, errs := runArgs("extract", p); code != 0 {
			b.Fatal(errs)
		}
	}
	b.ReportMetric(float64(n*b.N)/b.Elapsed().Seconds(), "samples/s")
}

// The demo's 1 Hz recordings, through extract: windows only in the steady
// stretches that truth.json lists (5 s of edge), every steady stretch of 10
// minutes or more covered, and each snapshot within 0.3 pp of the tail's
// true deviation, on two seeds and all the demo's types.
func TestExtractDemoRecordings(t *testing.T) {
	for _, seed := range []string{"3", "8"} {
		dir := t.TempDir()
		if code, _, errs := runArgs("demo", "--out", dir, "--tails", "12", "--days", "200", "--seed", seed); code != 0 {
			t.Fatal(errs)
		}
		var truth demo.Truth
		js, _ := os.ReadFile(filepath.Join(dir, demo.TruthFile))
		if err := json.Unmarshal(js, &truth); err != nil || len(truth.Recordings) != 2 {
			t.Fatalf("%v: %d recordings", err, len(truth.Recordings))
		}
		roster, err := feed.LoadFleet(filepath.Join(dir, demo.FleetFile))
		if err != nil {
			t.Fatal(err)
		}
		for _, rt := range truth.Recordings {
			code, out, errs := runArgs("extract", filepath.Join(dir, rt.File))
			if code != 0 {
				t.Fatalf("%s: exit %d %s", rt.File, code, errs)
			}
			p := filepath.Join(dir, "w.csv")
			os.WriteFile(p, []byte(out), 0o644)
			var recs []feed.Record
			feed.ReadFile(p, func(r feed.Record) { recs = append(recs, r) }, nil)
			type span struct{ a, b time.Time }
			var steady []span
			for _, s := range rt.Stretches {
				if s.Kind == "steady" {
					a, _ := time.Parse(time.RFC3339, s.From)
					b, _ := time.Parse(time.RFC3339, s.To)
					steady = append(steady, span{a, b})
				}
			}
			covered := make([]bool, len(steady))
			for _, r := range recs {
				half := time.Duration(r.Seconds/2) * time.Second
				a, b := r.Time.Add(-half), r.Time.Add(half)
				in := -1
				for k, sp := range steady {
					if !a.Before(sp.a.Add(-5*time.Second)) && !b.After(sp.b.Add(5*time.Second)) {
						in = k
					}
				}
				if in < 0 {
					t.Errorf("seed %s %s: window %v … %v outside the steady stretches", seed, rt.File, a.Format("15:04:05"), b.Format("15:04:05"))
					continue
				}
				covered[in] = true
				pt, _, _, why := roster.Analyze(r.Tail, r.Time, r.Snap)
				if why != "" || math.Abs(pt.DragDevPct-rt.DeviationPct) > 0.3 {
					t.Errorf("seed %s %s at %v: deviation %.2f %%, truth %.2f %% (%s)", seed, rt.File, r.Time.Format("15:04"), pt.DragDevPct, rt.DeviationPct, why)
				}
			}
			for k, sp := range steady {
				if sp.b.Sub(sp.a) >= 10*time.Minute && !covered[k] {
					t.Errorf("seed %s %s: steady stretch %v … %v without a window", seed, rt.File, sp.a.Format("15:04"), sp.b.Format("15:04"))
				}
			}
		}
	}
}
