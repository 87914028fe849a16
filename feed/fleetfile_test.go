package feed

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"dragdeck/model"
)

func TestLoadFleet(t *testing.T) {
	r, err := LoadFleet(filepath.Join("..", "testdata", "fleets", "mixed", "fleet.toml"))
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(r.TypeNames(), ","); got != "DT,DT-W,WB" {
		t.Errorf("types %s", got)
	}
	if got := strings.Join(r.Tails(), ","); got != "DT101,DT102,WB201" {
		t.Errorf("tails %s", got)
	}
	at := func(s string) time.Time { v, _ := time.Parse(time.RFC3339, s); return v }
	cases := []struct {
		name, tail, at, typ string
		hours, corr         float64
	}{
		{"before the retrofit", "DT102", "2026-02-28T23:59:00Z", "DT", 0, 0},
		{"after the retrofit", "DT102", "2026-03-01T00:00:00Z", "DT-W", 0, 0},
		{"own hours and meter correction", "WB201", "2025-01-01T00:00:00Z", "WB", 3100, -0.8},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			e, typ, why := r.At(c.tail, at(c.at))
			if typ == nil || e.Type != c.typ || e.CruiseHours != c.hours || e.FuelFlowCorrectionPct != c.corr {
				t.Fatalf("got %+v %q", e, why)
			}
		})
	}
	if _, _, why := r.At("XX999", at("2026-01-01T00:00:00Z")); !strings.Contains(why, "not in the fleet file") {
		t.Errorf("unnamed tail: %q", why)
	}
}

func TestParseFleetErrors(t *testing.T) {
	load := func(rel string) (*model.Type, error) {
		if rel == "missing.toml" {
			_, err := os.ReadFile("no/such/file.toml")
			return nil, err
		}
		return DemoType(), nil
	}
	cases := []struct {
		name, doc, want string
	}{
		{"unknown type", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"Z\"\n", "f.toml:3: tail.type: \"Z\" is not a type"},
		{"missing type file", "[types]\nA = \"missing.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\n", "f.toml:2: types.A:"},
		{"same since twice", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\nsince = 2026-01-01\n[[tail]]\nid = \"T\"\ntype = \"A\"\nsince = 2026-01-01\n", "f.toml:7: tail.since: tail T has two entries with since 2026-01-01 (the other on line 3)"},
		{"missing id", "[types]\nA = \"a.toml\"\n[[tail]]\ntype = \"A\"\n", "f.toml:3: tail.id: missing"},
		{"missing type", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\n", "f.toml:3: tail.type: missing"},
		{"bad since", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\nsince = 12\n", "f.toml:3: tail.since: must be a date"},
		{"hours not positive", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\ncruise_hours_per_year = 0\n", "tail.cruise_hours_per_year: must be > 0"},
		{"unknown key", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\ncolour = 1\n", "f.toml:6: tail.colour: unknown key"},
		{"no tails", "[types]\nA = \"a.toml\"\n", "f.toml: tail: no [[tail]] entry"},
		{"syntax", "[types\n", "f.toml:1:"},
		{"escape in a tail id", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\\u001b[2J\"\ntype = \"A\"\n", "f.toml:3: tail.id: \"T\\x1b[2J\" holds a control character"},
		{"escape in the name", "name = \"\\u0007\"\n[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\n", "f.toml:1: name: holds a control character"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseFleet("f.toml", []byte(c.doc), load)
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("err = %v, want %q", err, c.want)
			}
		})
	}
}

func TestTailCheckRejects(t *testing.T) {
	csv := "time,tail,weight_kg,alt_ft,mach,fuel_flow_kgph,sat_c\n" +
		"2026-03-01T10:00:00Z,IN1,65000,37000,0.78,2300,-56\n" +
		"2026-03-01T10:05:00Z,OUT9,65000,37000,0.78,2300,-56\n"
	r := NewReader(strings.NewReader(csv), "x.csv")
	r.SetTailCheck(func(tail string, _ time.Time) string {
		if tail != "IN1" {
			return "tail " + tail + " is not in the fleet file"
		}
		return ""
	})
	var accepted int
	var rejects []string
	for {
		_, err := r.Next()
		if err == nil {
			accepted++
			continue
		}
		var re *RowError
		if errors.As(err, &re) {
			rejects = append(rejects, re.Error())
			if !errors.Is(err, ErrNotInFleet) {
				t.Errorf("reject %v is not ErrNotInFleet", err)
			}
			continue
		}
		break
	}
	st := r.Stats()
	if accepted != 1 || len(rejects) != 1 || rejects[0] != "x.csv:3: tail: tail OUT9 is not in the fleet file" || st.Read != 2 || st.Rejected != 1 {
		t.Fatalf("accepted %d, rejects %q, stats %+v", accepted, rejects, st)
	}
}

// Unknown keys are found in one pass, in inline tables and arrays of them
// too, with their lines, at most ten listed: go-toml's strict mode counted
// lines from the start for each (20,000 unknown [[tail]] tables took 45 s).
func TestUnknownKeysOnePass(t *testing.T) {
	load := func(string) (*model.Type, error) { return DemoType(), nil }
	cases := []struct {
		name, doc, want string
	}{
		{"in an inline table", "[types]\nA = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A\"\nx = {y = 1}\n", "f.toml:6: tail.x: unknown key"},
		{"an unknown table", "[types]\nA = \"a.toml\"\n[extra]\n[[tail]]\nid = \"T\"\ntype = \"A\"\n", "f.toml:3: extra: unknown key"},
		{"array of inline tables", "types = {A = \"a.toml\"}\ntail = [{id = \"T\", type = \"A\", colour = 2}]\n", "f.toml:2: tail.colour: unknown key"},
		{"20,000 unknown tables", strings.Repeat("[[tails]]\nid = 1\n", 20000), "and 39990 more unknown keys"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseFleet("f.toml", []byte(c.doc), load)
			if err == nil || !strings.Contains(err.Error(), c.want) || len(err.Error()) > 1000 {
				t.Fatalf("error %.300v, want %q in at most 1000 bytes", err, c.want)
			}
		})
	}
	// the quoted type name with a dot is a key under [types], not unknown
	if _, err := ParseFleet("f.toml", []byte("[types]\n\"A.1\" = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"A.1\"\n"), load); err != nil {
		t.Errorf("a dotted type name: %v", err)
	}
}

// BenchmarkParseFleet20000: a fleet file of 20,000 tails (it took two
// minutes when each key's line was counted from the start).
func BenchmarkParseFleet20000(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("[types]\nA = \"a.toml\"\n")
	for i := 0; i < 20000; i++ {
		fmt.Fprintf(&sb, "\n[[tail]]\nid = \"T%05d\"\ntype = \"A\"\n", i)
	}
	doc := []byte(sb.String())
	load := func(string) (*model.Type, error) { return DemoType(), nil }
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := ParseFleet("f.toml", doc, load); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(20000*b.N)/b.Elapsed().Seconds(), "tails/s")
}

// The [fuel_factor] table: keys over the defaults, errors with their key
// and line.
func TestParseFleetFuelFactor(t *testing.T) {
	load := func(string) (*model.Type, error) { return DemoType(), nil }
	head := "[types]\n\"DD-200\" = \"a.toml\"\n[[tail]]\nid = \"T\"\ntype = \"DD-200\"\n"
	tests := []struct {
		name, doc string
		check     func(p *model.FactorPolicy) bool
		want      string // an error's text; "" for none
	}{
		{"none: defaults apply", "", func(p *model.FactorPolicy) bool { return p == nil }, ""},
		{"some keys", "[fuel_factor]\ndead_band_pct = 0.8\nperiods = 3\n[fuel_factor.basic_pct]\n\"DD-200\" = 0.4\n",
			func(p *model.FactorPolicy) bool {
				return p.DeadBandPct == 0.8 && p.Periods == 3 && p.BasicPct["DD-200"] == 0.4 && p.RoundPct == 0.1 && p.MinFlights == 20
			}, ""},
		{"a bad value", "[fuel_factor]\nround_pct = 0\n", nil, "f.toml:7: fuel_factor.round_pct: must be > 0"},
		{"range upside down", "[fuel_factor]\nmin_pct = 9\n", nil, "f.toml:7: fuel_factor.min_pct, max_pct: need min < max"},
		{"basic of an unknown type", "[fuel_factor.basic_pct]\nXX = 1\n", nil, "f.toml:7: fuel_factor.basic_pct: \"XX\" is not a type"},
		{"an unknown key", "[fuel_factor]\nband = 1\n", nil, "f.toml:7: fuel_factor.band: unknown key"},
		{"a wrong kind", "[fuel_factor]\nperiods = \"two\"\n", nil, "f.toml:7"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, err := ParseFleet("f.toml", []byte(head+tc.doc), load)
			if tc.want != "" {
				if err == nil || !strings.Contains(err.Error(), tc.want) {
					t.Errorf("error %v, want %q", err, tc.want)
				}
				return
			}
			if err != nil || !tc.check(r.FuelFactor) {
				t.Errorf("policy %+v, error %v", r.FuelFactor, err)
			}
		})
	}
}
