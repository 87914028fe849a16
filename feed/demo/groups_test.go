package demo

import (
	"path/filepath"
	"slices"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

func TestSplit(t *testing.T) {
	mixed := MixedGroups()
	cases := []struct {
		name   string
		n      int
		groups []Group
		want   []int
	}{
		{"built-in shares, 24 tails", 24, mixed, []int{12, 5, 7}},
		{"built-in shares, 10 tails", 10, mixed, []int{5, 2, 3}},
		{"fewer tails than groups: the largest shares", 2, mixed, []int{1, 0, 1}},
		{"one tail a group", 3, mixed, []int{1, 1, 1}},
		{"a tiny share still gets one", 5, []Group{{Share: 0.98}, {Share: 0.02}}, []int{4, 1}},
		{"no shares: even", 7, []Group{{}, {}}, []int{4, 3}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := split(c.n, c.groups)
			sum := 0
			for _, v := range got {
				sum += v
			}
			if !slices.Equal(got, c.want) || sum != c.n {
				t.Fatalf("split(%d) = %v, want %v", c.n, got, c.want)
			}
		})
	}
}

// The built-in demo flies three invented types with thrust tables: the
// twin, its wingtip variant (one twin retrofitted half-way) and a
// long-range twin. Its fleet file says so, each type file loads, fan speed
// is on most tails of each type, and the engine change and the shop visit
// come with their events.
func TestMixedDemo(t *testing.T) {
	for _, cfg := range []Config{{Tails: 24, Days: 400, Seed: 2}, {Tails: 30, Days: 300, Seed: 9}} {
		dir := t.TempDir()
		truth, err := Write(dir, cfg)
		if err != nil {
			t.Fatal(err)
		}
		roster, err := feed.LoadFleet(filepath.Join(dir, FleetFile))
		if err != nil {
			t.Fatal(err)
		}
		if got := roster.TypeNames(); !slices.Equal(got, []string{"DD-200", "DD-200W", "DW-300"}) || len(truth.Types) != 3 {
			t.Fatalf("types %v, truth %+v", got, truth.Types)
		}
		for _, ty := range roster.Types {
			if ty.Thrust == nil {
				t.Errorf("%s has no thrust table", ty.Name)
			}
		}
		retrofits, fan, flights := 0, map[string]int{}, map[string]int{} // by starting type
		for _, tt := range truth.Tails {
			flights[tt.Type]++
			if tt.FanSpeed {
				fan[tt.Type]++
			}
			r := tt.Retrofit
			if r == nil {
				continue
			}
			retrofits++
			at, _ := time.Parse(time.DateOnly, r.Date)
			_, before, _ := roster.At(tt.Tail, at.Add(-time.Hour))
			_, after, _ := roster.At(tt.Tail, at)
			if tt.Type != "DD-200" || r.Type != "DD-200W" || before != roster.Types["DD-200"] || after != roster.Types["DD-200W"] {
				t.Errorf("%s: retrofit %+v, fleet file gives %v then %v", tt.Tail, r, before, after)
			}
		}
		if retrofits != 1 {
			t.Errorf("%d retrofits, want 1", retrofits)
		}
		withFan := 0
		for name := range flights {
			withFan += fan[name]
			if fan[name] == 0 {
				t.Errorf("%s: no tail with fan speed", name)
			}
		}
		if withFan == len(truth.Tails) {
			t.Errorf("fan speed on all %d tails: no older recorder", withFan)
		}
		kinds := map[string]bool{}
		for _, e := range truth.Events {
			kinds[e.Kind] = true
		}
		for _, k := range []string{EngineChange, EngineShopVisit, "repair"} {
			if !kinds[k] || !model.EngineEvent(k) && k != "repair" {
				t.Errorf("%+v: no %q event in %v", cfg, k, kinds)
			}
		}
		// Each tail's level flag is against its own type's median.
		for _, tt := range truth.Tails {
			var med float64
			for _, ty := range truth.Types {
				if ty.Name == tt.finalType() {
					med = *ty.MedianRecentPct
				}
			}
			if level := slices.Contains(tt.ExpectedFlags, model.FlagLevel); level != (tt.RecentLevelPct >= med+truthLevelPP) {
				t.Errorf("%s: level flag %v, level %.2f against its type's median %.2f", tt.Tail, level, tt.RecentLevelPct, med)
			}
		}
	}
}
