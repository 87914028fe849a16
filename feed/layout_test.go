package feed

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"dragdeck/model"
)

const layoutDir = "../testdata/layouts"

// readWith reads a file through a layout (nil: dragdeck's columns) with the
// parallel reader and the plain one, which must agree.
func readWith(t *testing.T, path string, l *Layout) ([]Record, []*RowError, FileResult) {
	t.Helper()
	var recs []Record
	var rejects []*RowError
	res := ReadFileWith(path, ReadOptions{Layout: l}, func(r Record) { recs = append(recs, r) }, func(e *RowError) { rejects = append(rejects, e) })
	var par []Record
	ReadFileParallel(path, ReadOptions{Layout: l}, 4, func(r Record) { par = append(par, r) }, nil)
	if len(par) != len(recs) {
		t.Fatalf("%s: the parallel reader gave %d records, the plain one %d", path, len(par), len(recs))
	}
	return recs, rejects, res
}

// Three invented exports, each with its layout file, read to the same
// snapshots as the same data in dragdeck's own columns, and to the same
// analysed points (drag deviation within 1e-9 pp): per-engine lb/h with a
// date and a time column in New York time; semicolons, decimal commas,
// kelvin, tonnes and metres in Berlin time; one aircraft's file with the
// tail as a constant, weight in hundreds of kg and fuel flow in kg/min.
func TestLayoutsReadAsTheReference(t *testing.T) {
	ref, rejects, res := readWith(t, filepath.Join(layoutDir, "reference.csv"), nil)
	if res.Err != nil || len(rejects) > 0 || len(ref) != 6 {
		t.Fatalf("reference: %v, %d rejects, %d records", res.Err, len(rejects), len(ref))
	}
	ty := DemoType()
	cases := []struct {
		name string
		n1   bool // the layout maps fan speed
	}{
		{"recorder_lbh", true},
		{"spreadsheet_eu", false},
		{"one_tail", true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			l, err := LoadLayout(filepath.Join(layoutDir, c.name+".toml"))
			if err != nil {
				t.Fatal(err)
			}
			got, rejects, res := readWith(t, filepath.Join(layoutDir, c.name+".csv"), l)
			if res.Err != nil || len(rejects) > 0 || len(got) != len(ref) {
				t.Fatalf("%v, rejects %v, %d records", res.Err, rejects, len(got))
			}
			if len(res.Mapping) == 0 {
				t.Error("no mapping reported for check")
			}
			near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }
			for i, w := range ref {
				g := got[i]
				if !g.Time.Equal(w.Time) || g.Tail != w.Tail || g.Flight != w.Flight {
					t.Fatalf("row %d: %s %s %s, want %s %s %s", i, g.Time, g.Tail, g.Flight, w.Time, w.Tail, w.Flight)
				}
				ws := w.Snap
				if !c.n1 {
					ws.N1 = 0
				}
				gs := g.Snap
				for _, f := range []struct {
					name string
					g, w float64
				}{{"weight", gs.Weight, ws.Weight}, {"altitude", gs.Altitude, ws.Altitude}, {"mach", gs.Mach, ws.Mach},
					{"SAT", gs.SAT, ws.SAT}, {"fuel flow", gs.FuelFlow, ws.FuelFlow}, {"N1", gs.N1, ws.N1}, {"bank", gs.Bank, ws.Bank}} {
					if !near(f.g, f.w) {
						t.Errorf("row %d %s: %.12g, want %.12g", i, f.name, f.g, f.w)
					}
				}
				pg, pw := model.Analyze(ty, gs), model.Analyze(ty, ws)
				if math.Abs(pg.DragDevPct-pw.DragDevPct) > 1e-9 {
					t.Errorf("row %d: deviation %.12f %%, want %.12f %%", i, pg.DragDevPct, pw.DragDevPct)
				}
			}
		})
	}
}

// tempFile writes a file in a test's folder.
func tempFile(t *testing.T, name, text string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const goodLayout = `name = "test"
[time]
column = "T"
[fields]
tail = { column = "REG" }
weight = { column = "GW", unit = "t" }
altitude = { column = "ALT" }
mach = { column = "M" }
sat = { column = "SAT" }
fuel_flow = { engines = ["FF1", "FF2"], unit = "kg/h" }
`

// A bad layout is refused with the line at fault.
func TestLayoutErrors(t *testing.T) {
	cases := []struct {
		name, text, want string
	}{
		{"a column mapped twice", strings.Replace(goodLayout, `mach = { column = "M" }`, `mach = { column = "GW" }`, 1), "layout.toml:8: fields.mach: column GW is mapped already by fields.weight"},
		{"an unknown unit", strings.Replace(goodLayout, `unit = "t"`, `unit = "stone"`, 1), "layout.toml:6: fields.weight.unit: \"stone\" is not a unit of weight"},
		{"an unknown field", goodLayout + "wind = { column = \"W\" }\n", "layout.toml:11: fields.wind: unknown key"},
		{"an unknown key of a field", strings.Replace(goodLayout, `{ column = "ALT" }`, `{ column = "ALT", units = "ft" }`, 1), "layout.toml:7: fields.altitude.units: unknown key"},
		{"a zone that is none", strings.Replace(goodLayout, `column = "T"`, "column = \"T\"\nzone = \"Mars/Olympus\"", 1), "layout.toml:4: time.zone:"},
		{"a format with a stray letter", strings.Replace(goodLayout, `column = "T"`, "column = \"T\"\nformat = \"%Y-%m-%d h%H\"", 1), "layout.toml:4: time.format:"},
		{"a missing required field", strings.Replace(goodLayout, "mach = { column = \"M\" }\n", "", 1), "fields.mach: missing"},
		{"both sat and tat", goodLayout + "tat = { column = \"TAT\" }\n", "layout.toml:11: fields.tat: the temperature is mapped already by fields.sat"},
		{"per-engine weight", strings.Replace(goodLayout, `{ column = "GW", unit = "t" }`, `{ engines = ["GW1", "GW2"] }`, 1), "layout.toml:6: fields.weight.engines: per-engine columns are for fuel_flow and n1"},
		{"a zero scale", strings.Replace(goodLayout, `unit = "t" }`, `unit = "t", scale = 0 }`, 1), "layout.toml:6: fields.weight.scale: must be > 0"},
		{"a decimal comma beside comma separators", "decimal = \",\"\n" + goodLayout, "layout.toml:1: decimal: the decimal mark \",\" is also the separator"},
		{"no time", strings.Replace(goodLayout, "[time]\ncolumn = \"T\"\n", "", 1), "[time]: missing"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ParseLayout("layout.toml", []byte(c.text))
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("got %v, want it to say %q", err, c.want)
			}
		})
	}
	if _, err := ParseLayout("layout.toml", []byte(goodLayout)); err != nil {
		t.Fatalf("the good layout: %v", err)
	}
	if _, err := ParseLayout(LayoutFile, []byte(BuiltinLayout)); err != nil {
		t.Fatalf("the built-in layout: %v", err)
	}
}

// A file without a mapped column is refused naming the column and the
// layout's line; an engine-out row, and a number in the wrong decimal
// mark, are rejected alone with their reasons, the other rows read.
func TestLayoutFileErrors(t *testing.T) {
	l, err := ParseLayout("layout.toml", []byte(goodLayout))
	if err != nil {
		t.Fatal(err)
	}
	missing := tempFile(t, "a.csv", "T,REG,GW,ALT,M,SAT,FF1\n2026-01-01T10:00:00Z,DX1,70,35000,0.78,-55,1200\n")
	_, _, res := readWith(t, missing, l)
	if res.Err == nil || !strings.Contains(res.Err.Error(), "column FF2 of fields.fuel_flow.engines (layout.toml:10) is not in the header") {
		t.Errorf("a missing mapped column: %v", res.Err)
	}
	rows := "T,REG,GW,ALT,M,SAT,FF1,FF2\n" +
		"2026-01-01T10:00:00Z,DX1,70,35000,0.78,-55,1200,1210\n" +
		"2026-01-01T10:10:00Z,DX1,70,35000,0.78,-55,1200,0\n" +
		"2026-01-01T10:20:00Z,DX1,70,35000,0.78,-55,,1190\n" +
		"2026-01-01T10:30:00Z,DX1,69.9,35000,0.78,-55,1195,1205\n"
	recs, rejects, res := readWith(t, tempFile(t, "b.csv", rows), l)
	if res.Err != nil || len(recs) != 2 || len(rejects) != 2 {
		t.Fatalf("%v: %d records, rejects %v", res.Err, len(recs), rejects)
	}
	for i, want := range []struct {
		line int
		col  string
	}{{3, "FF2"}, {4, "FF1"}} {
		r := rejects[i]
		if !errors.Is(r, ErrEngineOut) || r.Line != want.line || r.Column != want.col || !strings.Contains(r.Reason, "engine-out row") {
			t.Errorf("reject %d: %v (want line %d, column %s, engine out)", i, r, want.line, want.col)
		}
	}
	if got := recs[0].Snap.FuelFlow * 3600; math.Abs(got-2410) > 1e-9 || math.Abs(recs[0].Snap.Weight-70000) > 1e-9 {
		t.Errorf("fuel flow %g kg/h (want 1200 + 1210), weight %g kg", got, recs[0].Snap.Weight)
	}
	eu := strings.Replace(goodLayout, `name = "test"`, "name = \"test\"\nseparator = \";\"\ndecimal = \",\"", 1)
	le, err := ParseLayout("layout.toml", []byte(eu))
	if err != nil {
		t.Fatal(err)
	}
	recs, rejects, _ = readWith(t, tempFile(t, "c.csv", "T;REG;GW;ALT;M;SAT;FF1;FF2\n"+
		"2026-01-01T10:00:00Z;DX1;70,5;35000;0,78;-55;1200;1210\n"+
		"2026-01-01T10:10:00Z;DX1;70.5;35000;0,78;-55;1200;1210\n"), le)
	if len(recs) != 1 || math.Abs(recs[0].Snap.Weight-70500) > 1e-9 || len(rejects) != 1 || !errors.Is(rejects[0], ErrNumber) || rejects[0].Column != "GW" {
		t.Errorf("decimal commas: %d records (weight %v), rejects %v", len(recs), recs, rejects)
	}
}

// The layout parser returns a layout or an error, never panics, and a
// layout it accepts resolves against its own column names.
func FuzzParseLayout(f *testing.F) {
	f.Add([]byte(goodLayout))
	f.Add([]byte(BuiltinLayout))
	for _, n := range []string{"recorder_lbh", "spreadsheet_eu", "one_tail"} {
		if b, err := os.ReadFile(filepath.Join(layoutDir, n+".toml")); err == nil {
			f.Add(b)
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		l, err := ParseLayout("fuzz.toml", data)
		if err != nil {
			if l != nil {
				t.Fatal("a layout and an error")
			}
			return
		}
		if l.Sep == l.Decimal {
			t.Fatalf("separator and decimal mark both %q", l.Sep)
		}
	})
}
