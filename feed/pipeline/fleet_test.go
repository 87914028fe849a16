package pipeline

import (
	"math"
	"slices"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/model"
)

// A mixed fleet made of two demo fleets of one seed flown on two types (the
// demo twin and a widebody): the same planted tails, each analysed on its
// own type. The widebody tails' fuel-flow meters all read 5 % high (their
// type's median sits 5 pp above the twin's), and one steady tail is
// retrofitted from the twin to the widebody half-way (its data then come
// from the widebody fleet, unbiased). The level flag must compare each tail
// with its own type, the retrofit must give no step, and the recent levels
// must stay within 0.5 pp of the truth.
func TestMixedFleetRoster(t *testing.T) {
	wb, err := feed.LoadType("../../testdata/types/widebody.toml")
	if err != nil {
		t.Fatal(err)
	}
	for _, seed := range []uint64{3, 11} {
		cfg := demo.Config{Tails: 16, Days: 400, Seed: seed}
		cfg.Type = feed.DemoType()
		da, err := demo.NewFleet(cfg)
		if err != nil {
			t.Fatal(err)
		}
		cfg.Type = wb
		db, err := demo.NewFleet(cfg)
		if err != nil {
			t.Fatal(err)
		}
		truth := map[string]demo.TailTruth{}
		for i, tt := range da.Truth.Tails {
			if o := db.Truth.Tails[i]; o.Tail != tt.Tail || o.Role != tt.Role || o.OffsetPct != tt.OffsetPct {
				t.Fatalf("seed %d: the two types' demo fleets plant different tails (%+v, %+v)", seed, tt, o)
			}
			truth[tt.Tail] = tt
		}
		// Every other tail flies the widebody; the first steady twin tail
		// is retrofitted half-way.
		types := map[string]*model.Type{"TW": da.Type, "WB": wb}
		var entries []model.RosterEntry
		onWB := map[string]bool{}
		retro := ""
		start, _ := time.Parse("2006-01-02", da.Truth.Start)
		retroTime := start.AddDate(0, 0, cfg.Days/2)
		for i, tt := range da.Truth.Tails {
			switch {
			case i%2 == 1:
				onWB[tt.Tail] = true
				entries = append(entries, model.RosterEntry{Tail: tt.Tail, Type: "WB"})
			case retro == "" && tt.Role == demo.RoleSteady:
				retro = tt.Tail
				entries = append(entries, model.RosterEntry{Tail: tt.Tail, Type: "TW"},
					model.RosterEntry{Tail: tt.Tail, Type: "WB", Since: retroTime})
			default:
				entries = append(entries, model.RosterEntry{Tail: tt.Tail, Type: "TW"})
			}
		}
		roster, err := model.NewRoster("test", types, entries)
		if err != nil {
			t.Fatal(err)
		}
		var recs []feed.Record
		for _, r := range da.Records {
			if !onWB[r.Tail] && !(r.Tail == retro && !r.Time.Before(retroTime)) {
				recs = append(recs, r)
			}
		}
		for _, r := range db.Records {
			if onWB[r.Tail] {
				r.Snap.FuelFlow *= 1.05
				recs = append(recs, r)
			} else if r.Tail == retro && !r.Time.Before(retroTime) {
				recs = append(recs, r)
			}
		}
		slices.SortStableFunc(recs, func(a, b feed.Record) int { return a.Time.Compare(b.Time) })
		res := FromRecords(recs, feed.Stats{Read: len(recs), Accepted: len(recs)}, Input{Roster: roster, Events: da.Events(), Config: model.DefaultTrendConfig()})

		twMed, wbMed := res.Fleet.Types["TW"].MedianRecentPct, res.Fleet.Types["WB"].MedianRecentPct
		if d := wbMed - twMed; math.Abs(d-5) > 1.2 {
			t.Errorf("seed %d: type medians TW %.2f, WB %.2f: want WB about 5 pp above", seed, twMed, wbMed)
		}
		for _, a := range res.Fleet.Tails {
			tt := truth[a.Tail]
			want := tt.RecentLevelPct
			if onWB[a.Tail] {
				want = (1+want/100)*1.05*100 - 100 // the meter bias, thrust from fuel flow
			}
			if math.Abs(a.RecentPct-want) > 0.5 {
				t.Errorf("seed %d %s (%s, %s): recent %.2f %%, truth %.2f %%", seed, a.Tail, a.Type, tt.Role, a.RecentPct, want)
			}
			high := slices.Contains(a.Flags, model.FlagLevel)
			if wantHigh := slices.Contains(tt.ExpectedFlags, model.FlagLevel); high != wantHigh {
				t.Errorf("seed %d %s (%s, %s): level flag %v, truth %v (type median %.2f)", seed, a.Tail, a.Type, tt.Role, high, wantHigh, res.Fleet.Types[a.Type].MedianRecentPct)
			}
			if a.Tail == retro {
				if a.Type != "WB" {
					t.Errorf("retrofitted %s has type %q at its last snapshot", a.Tail, a.Type)
				}
				for _, s := range a.Steps {
					if math.Abs(s.Time.Sub(retroTime).Hours()/24) < 30 {
						t.Errorf("seed %d: retrofit of %s gave a false step %+.2f pp on %s", seed, a.Tail, s.SizePct, s.Time.Format("2006-01-02"))
					}
				}
			}
		}
	}
}
