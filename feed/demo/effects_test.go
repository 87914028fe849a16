package demo

import (
	"math"
	"testing"

	"dragdeck/feed"
)

// Each sensor effect is recorded in the truth, --clean (Config.Clean)
// leaves them all out, and switching one effect off changes only the
// column it concerns: the draws are made either way.
func TestEffectsSwitch(t *testing.T) {
	base := Config{Tails: 4, Days: 30, Seed: 9}
	def, err := NewFleet(base)
	if err != nil {
		t.Fatal(err)
	}
	if def.Truth.Effects != DefaultEffects() {
		t.Errorf("default truth effects %+v, want %+v", def.Truth.Effects, DefaultEffects())
	}
	clean := base
	clean.Clean = true
	cf, _ := NewFleet(clean)
	if cf.Truth.Effects != (Effects{}) {
		t.Errorf("clean truth effects %+v, want none", cf.Truth.Effects)
	}
	noWeight := DefaultEffects()
	noWeight.WeightErrorPct = 0
	nw := base
	nw.Effects = &noWeight
	wf, _ := NewFleet(nw)
	if len(wf.Records) != len(def.Records) {
		t.Fatalf("%d records without the weight error, %d with", len(wf.Records), len(def.Records))
	}
	var dw, other float64
	for i := range def.Records {
		a, b := def.Records[i].Snap, wf.Records[i].Snap
		dw = math.Max(dw, math.Abs(a.Weight/b.Weight-1))
		other = math.Max(other, math.Abs(a.Mach-b.Mach)+math.Abs(a.SAT-b.SAT)+math.Abs(a.FuelFlow-b.FuelFlow))
	}
	// 0.3 % per flight: some flight is off by more than 0.3 %; nothing
	// else moves.
	if dw < 0.003 || dw > 0.02 {
		t.Errorf("largest weight error %.4f, want a few tenths of a per cent", dw)
	}
	if other != 0 {
		t.Errorf("switching the weight error off moved other columns by %g", other)
	}
}

// With a thrust table about three tails in four record fan speed, and at
// least one older recorder does not, whatever the size.
func TestFanSpeedShare(t *testing.T) {
	ty, err := feed.LoadType("../../testdata/types/twin_thrust.toml")
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{2, 5, 12, 40} {
		d, err := NewFleet(Config{Tails: n, Days: 10, Seed: 4, Type: ty})
		if err != nil {
			t.Fatal(err)
		}
		with := 0
		for _, tt := range d.Truth.Tails {
			if tt.FanSpeed != (tt.Engine != nil) {
				t.Errorf("%s: fan speed %v, engine truth %v", tt.Tail, tt.FanSpeed, tt.Engine)
			}
			if tt.FanSpeed {
				with++
			}
		}
		if with == 0 || with == n || math.Abs(float64(with)/float64(n)-0.75) > 0.26 {
			t.Errorf("%d tails: %d with fan speed", n, with)
		}
	}
}
