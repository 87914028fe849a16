package pipeline

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// n1For returns the fan speed N1 (%) that gives thrust fn (N, all engines)
// at Mach m, δ and θ, by bisection on the type's table (test helper: the
// table rises with N1, so the root is unique).
func n1For(ty *model.Type, fn, m, delta, theta float64) float64 {
	want := fn / (float64(ty.EngineCount) * delta)
	lo, hi := ty.Thrust.N1[0], ty.Thrust.N1[len(ty.Thrust.N1)-1]
	for range 100 {
		mid := (lo + hi) / 2
		if f, _ := ty.Thrust.At(mid, m); f < want {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2 * math.Sqrt(theta*(1+0.2*m*m))
}

// Two tails with fan speed, one without, 300 days of two flights a day.
// Tail E01's fuel-flow meter reads 3 % high from day 150 and its airframe
// is unchanged; tail A01's airframe drag steps up 3 % on day 150 and its
// engines are as the model says. The pipeline must put each step in its own
// series: E01 an engine step and a steady airframe, A01 an airframe step
// and a steady engine; the tail without N1 has no engine series.
func TestEngineSeriesApart(t *testing.T) {
	ty, err := feed.LoadType("../../testdata/types/twin_thrust.toml")
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(9, 9))
	var b strings.Builder
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,n1_pct\n")
	start := time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC)
	for day := range 300 {
		for f := range 2 {
			for _, tail := range []string{"E01", "A01", "F01"} {
				tm := start.AddDate(0, 0, day).Add(time.Duration(8+6*f) * time.Hour)
				w := 62000 + 6000*rng.Float64()
				alt := (35000 + 2000*float64(rng.IntN(2))) * model.Foot
				m := 0.77 + 0.02*rng.Float64()
				sat := model.AirISA(alt, 0).T + 3*rng.NormFloat64()
				s := model.Snapshot{Weight: w, Altitude: alt, Mach: m, SAT: sat}
				p := model.Analyze(ty, model.Snapshot{Weight: w, Altitude: alt, Mach: m, SAT: sat, FuelFlow: 1})
				drag := p.CDBaseline * p.Q * ty.WingArea * (1 + 0.004*rng.NormFloat64())
				meter := 1.0
				if tail == "A01" && day >= 150 {
					drag *= 1.03
				}
				if tail == "E01" && day >= 150 {
					meter = 1.03
				}
				s.FuelFlow = p.TSFC * drag * meter
				n1 := ""
				if tail != "F01" {
					n1 = fmt.Sprintf("%.4f", n1For(ty, drag, m, p.Delta, p.Theta))
				}
				fmt.Fprintf(&b, "%s,%s,%s%d,%.1f,%.1f,%.4f,%.3f,%.2f,%s\n", tm.Format(time.RFC3339), tail, tail, f,
					s.Weight, alt/model.Foot, m, sat-model.CelsiusZero, s.FuelFlow*model.Hour, n1)
			}
		}
	}
	path := filepath.Join(t.TempDir(), "n1.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	in := input(path)
	in.Type = ty
	r := Run(in)
	if r.Stats.Rejected != 0 {
		t.Fatalf("rejected %d rows", r.Stats.Rejected)
	}
	stepOf := func(a model.TailAssessment) float64 {
		if len(a.Steps) == 0 {
			return 0
		}
		return a.Steps[len(a.Steps)-1].SizePct
	}
	const tol = 0.5 // pp, against a planted 3 % and 0.4 % noise
	for _, tc := range []struct {
		tail             string
		airframe, engine float64 // planted step, pp
	}{{"E01", 0, 3}, {"A01", 3, 0}} {
		af, _ := r.Tail(tc.tail)
		en, ok := r.EngineTail(tc.tail)
		if !ok {
			t.Fatalf("%s: no engine series", tc.tail)
		}
		if got := stepOf(af); math.Abs(got-tc.airframe) > tol {
			t.Errorf("%s airframe step %+.2f pp, want %+.1f (steps %+v)", tc.tail, got, tc.airframe, af.Steps)
		}
		if got := stepOf(en); math.Abs(got-tc.engine) > tol {
			t.Errorf("%s engine step %+.2f pp, want %+.1f (steps %+v)", tc.tail, got, tc.engine, en.Steps)
		}
	}
	hasFlag := func(a model.TailAssessment, f string) bool { return slices.Contains(a.Flags, f) }
	eAF, _ := r.Tail("E01")
	eEN, _ := r.EngineTail("E01")
	aAF, _ := r.Tail("A01")
	aEN, _ := r.EngineTail("A01")
	if len(eAF.Flags) != 0 || !hasFlag(eEN, model.FlagStep) || !hasFlag(aAF, model.FlagStep) || len(aEN.Flags) != 0 {
		t.Errorf("flags: E01 airframe %v engine %v; A01 airframe %v engine %v", eAF.Flags, eEN.Flags, aAF.Flags, aEN.Flags)
	}
	// The engine thresholds are the engine series' own.
	in.Config.EngineStepPP = 5
	r5 := Run(in)
	e5, _ := r5.EngineTail("E01")
	a5, _ := r5.Tail("A01")
	if hasFlag(e5, model.FlagStep) || len(e5.Steps) == 0 || !hasFlag(a5, model.FlagStep) {
		t.Errorf("engine step threshold 5 pp: E01 engine flags %v (steps %d); A01 airframe %v", e5.Flags, len(e5.Steps), a5.Flags)
	}
	if _, ok := r.EngineTail("F01"); ok {
		t.Error("F01 has no fan speed but an engine series")
	}
	if a, _ := r.Tail("F01"); len(a.Steps) != 0 {
		t.Errorf("F01 (thrust from fuel flow, nothing planted) has steps %+v", a.Steps)
	}
}
