package model

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
	"time"
)

func TestRosterAt(t *testing.T) {
	a, b := twin(), twin()
	b.Name, b.CD0 = "variant", a.CD0-0.0005
	day := func(s string) time.Time { v, _ := time.Parse("2006-01-02", s); return v }
	r, err := NewRoster("test", map[string]*Type{"A": a, "B": b}, []RosterEntry{
		{Tail: "T1", Type: "A", Line: 1},
		{Tail: "T1", Type: "B", Since: day("2026-03-01"), Line: 2},
		{Tail: "T2", Type: "B", Since: day("2026-02-01"), CruiseHours: 3000, FuelFlowCorrectionPct: -2, Line: 3},
	})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, tail string
		at         time.Time
		want       string // type name, "" for none
		why        string // part of the reason when none
	}{
		{"before the retrofit", "T1", day("2026-02-28"), "A", ""},
		{"at the retrofit", "T1", day("2026-03-01"), "B", ""},
		{"after the retrofit", "T1", day("2027-01-01"), "B", ""},
		{"before the first entry", "T2", day("2026-01-31"), "", "no fleet-file entry before 2026-02-01"},
		{"from the first entry", "T2", day("2026-02-01"), "B", ""},
		{"unnamed tail", "T9", day("2026-02-01"), "", "not in the fleet file"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			e, typ, why := r.At(c.tail, c.at)
			// the tail's own roster analyses as the roster does (NaN and
			// all: compared as printed)
			tr := r.Tail(c.tail)
			s := cruiseSnapshot(a, 0)
			one := fmt.Sprint(r.Analyze(c.tail, c.at, s))
			if got := fmt.Sprint(tr.Analyze(c.at, s)); got != one {
				t.Errorf("TailRoster.Analyze gives %s; Roster.Analyze %s", got, one)
			}
			if c.want == "" {
				if typ != nil || !strings.Contains(why, c.why) {
					t.Fatalf("got %v %q, want none with %q", typ, why, c.why)
				}
				return
			}
			if typ == nil || e.Type != c.want || typ != r.Types[c.want] || why != "" {
				t.Fatalf("got %q %v %q, want %s", e.Type, typ, why, c.want)
			}
		})
	}
	ch := r.Changes("T1")
	if len(ch) != 1 || !ch[0].Time.Equal(day("2026-03-01")) || !strings.Contains(ch[0].Kind, "B") || EngineEvent(ch[0].Kind) {
		t.Errorf("changes of T1 = %+v, want one airframe event at 2026-03-01", ch)
	}
	if ch := r.Changes("T2"); len(ch) != 0 {
		t.Errorf("changes of T2 = %+v, want none", ch)
	}
	if got := strings.Join(r.Tails(), ","); got != "T1,T2" {
		t.Errorf("tails %s", got)
	}
	one, err := NewRoster("one type", map[string]*Type{"A": a}, []RosterEntry{{Tail: "T1", Type: "A"}})
	if err != nil || !r.Mixed() || one.Mixed() || SingleType(a).Mixed() {
		t.Errorf("mixed: two types %v, a fleet file of one %v (%v), a single type %v", r.Mixed(), one.Mixed(), err, SingleType(a).Mixed())
	}
}

func TestSingleTypeRoster(t *testing.T) {
	typ := twin()
	r := SingleType(typ)
	e, got, why := r.At("ANY", time.Time{})
	if got != typ || why != "" || e.Type != typ.Name || r.Single() != typ {
		t.Fatalf("single roster: %v %q", got, why)
	}
}

func TestNewRosterErrors(t *testing.T) {
	types := map[string]*Type{"A": twin()}
	since := time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)
	cases := []struct {
		name    string
		entries []RosterEntry
		key     string
	}{
		{"no entries", nil, "tail"},
		{"empty tail", []RosterEntry{{Tail: " ", Type: "A", Line: 4}}, "tail.id"},
		{"unknown type", []RosterEntry{{Tail: "T", Type: "Z", Line: 4}}, "tail.type"},
		{"same since twice", []RosterEntry{{Tail: "T", Type: "A", Since: since, Line: 4}, {Tail: "T", Type: "A", Since: since, Line: 8}}, "tail.since"},
		{"two without since", []RosterEntry{{Tail: "T", Type: "A", Line: 4}, {Tail: "T", Type: "A", Line: 8}}, "tail.since"},
		{"hours beyond a year", []RosterEntry{{Tail: "T", Type: "A", CruiseHours: 9000, Line: 4}}, "tail.cruise_hours_per_year"},
		{"correction too large", []RosterEntry{{Tail: "T", Type: "A", FuelFlowCorrectionPct: 60, Line: 4}}, "tail.fuel_flow_correction_pct"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := NewRoster("x", types, c.entries)
			var ee *EntryError
			if !errors.As(err, &ee) || ee.Key != c.key {
				t.Fatalf("err = %v, want an EntryError for %s", err, c.key)
			}
			if len(c.entries) > 0 && ee.Line != 4 && ee.Line != 8 {
				t.Errorf("line %d not given", ee.Line)
			}
		})
	}
	if _, err := NewRoster("x", nil, []RosterEntry{{Tail: "T", Type: "A"}}); err == nil {
		t.Error("no types: no error")
	}
}

func TestLevelFlagAgainstOwnType(t *testing.T) {
	// Two types: A's tails sit near 0 %, B's near +3 %. A B tail at +3.5 %
	// is normal for its type; an A tail at +2.6 % is high for its own.
	c := DefaultTrendConfig()
	mk := func(tail, typ string, recent float64) TailTrend {
		return TailTrend{Tail: tail, Type: typ, RecentPct: recent, FuelFlowExpected: 0.6,
			Drift: Slope{Slope: math.NaN(), Lo: math.NaN(), Hi: math.NaN()}}
	}
	trends := []TailTrend{
		mk("A1", "A", 0), mk("A2", "A", 0.2), mk("A3", "A", 2.6), mk("A4", "A", -0.1),
		mk("B1", "B", 3), mk("B2", "B", 3.2), mk("B3", "B", 3.5),
	}
	f := AssessFleet(trends, c)
	flagged := map[string]bool{}
	for _, a := range f.Tails {
		flagged[a.Tail] = len(a.Flags) > 0
	}
	for tail, want := range map[string]bool{"A3": true, "B3": false, "B1": false, "A1": false} {
		if flagged[tail] != want {
			t.Errorf("%s flagged %v, want %v (type medians %+v)", tail, flagged[tail], want, f.Types)
		}
	}
	if g := f.Types["B"]; g.Tails != 3 || g.MedianRecentPct != 3.2 {
		t.Errorf("type B group %+v", g)
	}
	trends[0].CruiseHours = 5000
	trends[0].RecentPct = 1
	f = AssessFleet(trends, c)
	for _, a := range f.Tails {
		if a.Tail == "A1" {
			want := 0.01 * 0.6 * Hour * 5000
			if d := a.ExcessFuel - want; d > 1e-6 || d < -1e-6 {
				t.Errorf("A1 excess fuel %g, want %g with its own cruise hours", a.ExcessFuel, want)
			}
		}
	}
}
