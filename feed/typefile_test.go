package feed

import (
	"bytes"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"dragdeck/model"
)

func TestDemoTypeLoads(t *testing.T) {
	ty := DemoType()
	if err := ty.Validate(); err != nil {
		t.Fatal(err)
	}
	if ty.EngineCount != 2 || ty.MaxThrustPerDelta <= 0 {
		t.Errorf("demo type should be a twin with a thrust limit: %+v", ty)
	}
	if ty2, err := LoadType(""); err != nil || ty2.Name != ty.Name {
		t.Errorf("LoadType(\"\") = %v, %v; want the demo type", ty2, err)
	}
}

// The invented demo type must behave like a narrow-body twin (issue 2): at
// mid weights maximum-range Mach 0.76–0.79, long-range about 0.02 above it,
// optimum altitude 33,000–39,000 ft below a buffet-limited maximum altitude,
// cruise fuel flow 2,000–3,000 kg/h. A plausibility check of invented data.
func TestDemoTypeIsPlausible(t *testing.T) {
	ty := DemoType()
	for _, w := range []float64{62000, 66000, 70000} {
		maxAlt, lim := model.MaxAltitude(ty, w, 0, 0)
		opt, _ := model.OptimumAltitude(ty, w, 0, 0, maxAlt)
		air := model.AirISA(opt, 0)
		mr := model.MaxRangeMach(ty, w, air, 0)
		lrc := model.LongRangeMach(ty, w, air, 0, mr)
		ff := mr.FuelFlow * model.Hour
		optFt, maxFt := opt/model.Foot, maxAlt/model.Foot
		if mr.Mach < 0.76 || mr.Mach > 0.79 {
			t.Errorf("%.0f kg: max-range Mach %.3f outside 0.76–0.79", w, mr.Mach)
		}
		if d := lrc.Mach - mr.Mach; d < 0.015 || d > 0.03 {
			t.Errorf("%.0f kg: long-range Mach %.3f is %.3f above max-range", w, lrc.Mach, d)
		}
		if optFt < 33000 || optFt > 39000 || optFt >= maxFt || lim != model.LimitBuffet {
			t.Errorf("%.0f kg: optimum %.0f ft, maximum %.0f ft (%s)", w, optFt, maxFt, lim)
		}
		if ff < 2000 || ff > 3000 {
			t.Errorf("%.0f kg: cruise fuel flow %.0f kg/h outside 2,000–3,000", w, ff)
		}
	}
}

func TestParseTypeErrors(t *testing.T) {
	demo := string(demoWithoutThrust())
	tests := []struct {
		name string
		toml string
		want string // substring of the error
	}{
		{"impossible value names key and line", strings.Replace(demo, "area_m2 = 112.0", "area_m2 = -112.0", 1), "x.toml:12: wing.area_m2: must be 5 … 2000 m²"},
		{"oswald above 1.2", strings.Replace(demo, "oswald = 0.74", "oswald = 1.5", 1), "x.toml:17: polar.oswald: must be 0.4 … 1.2"},
		{"mmo of 1", strings.Replace(demo, "mmo = 0.82", "mmo = 1.0", 1), "limits.mmo: must be 0.4 … 0.99"},
		{"missing key", strings.Replace(demo, "cl_buffet = 0.85", "", 1), "x.toml: limits.cl_buffet: missing (required)"},
		{"unknown key", strings.Replace(demo, "sweep_deg = 25.0", "sweep_deg = 25.0\nflap = 3", 1), "x.toml:23: wave.flap: unknown key"},
		{"wrong type", strings.Replace(demo, "mmo = 0.82", `mmo = "fast"`, 1), "x.toml:31: limits.mmo: must be a number"},
		{"escape in the name", strings.Replace(demo, `name = "DD-200`, `name = "\u001b]0;pwn\u0007DD-200`, 1), "x.toml: name: holds a control character"},
		{"count not whole", strings.Replace(demo, "count = 2", "count = 2.5", 1), "engine.count: must be a whole number"},
		{"two unknown keys, each with its line", strings.Replace(demo, "sweep_deg = 25.0", "sweep_deg = 25.0\nflap = 3\nslat = 1", 1), "x.toml:23: wave.flap: unknown key; x.toml:24: wave.slat: unknown key"},
		{"syntax error", demo + "\n[limits\n", ":35: expected ']' to close table name"},
		{"zero thrust when given", strings.Replace(demo, "= 125000.0", "= 0.0", 1), "engine.max_cruise_thrust_per_delta_n: must be > 0 when given"},
		{"empty file lists every missing key", "", "x.toml: name, wing.area_m2, wing.span_m, polar.cd0"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseType("x.toml", []byte(tc.toml))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want it to contain %q", err, tc.want)
			}
		})
	}
}

func TestParseTypeUnits(t *testing.T) {
	ty := DemoType()
	const tol = 1e-9
	checks := []struct {
		name      string
		got, want float64
	}{
		{"sweep 25° in rad", ty.Sweep, 25 * 3.141592653589793 / 180},
		{"ceiling 41,000 ft in m", ty.MaxAltitude, 41000 * 0.3048},
		{"TSFC a 0.38 /h in kg/(N·s)", ty.TSFCA, 0.38 / (9.80665 * 3600)},
	}
	for _, c := range checks {
		if d := c.got - c.want; d > tol || d < -tol {
			t.Errorf("%s: got %g, want %g", c.name, c.got, c.want)
		}
	}
	// Without the optional thrust key there is no thrust limit.
	demo := strings.Replace(string(demoWithoutThrust()), "max_cruise_thrust_per_delta_n = 125000.0", "", 1)
	nt, err := ParseType("x.toml", []byte(demo))
	if err != nil || nt.MaxThrustPerDelta != 0 {
		t.Errorf("without the thrust key: %v, thrust %g", err, nt.MaxThrustPerDelta)
	}
}

func TestLoadTypeFile(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "t.toml")
	if err := os.WriteFile(p, DemoTypeTOML(), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := LoadType(p); err != nil {
		t.Errorf("LoadType(%s): %v", p, err)
	}
	if _, err := LoadType(filepath.Join(dir, "missing.toml")); err == nil || !strings.Contains(err.Error(), "missing.toml") {
		t.Errorf("missing file: error %v should name the file", err)
	}
}

// FormatType and ParseType are inverses (TOML strings are quoted by Go's
// rules, which TOML accepts for plain text).
// thrustTOML is an invented [thrust] table (integers where the file may
// write them so).
const thrustTOML = `
[thrust]
n1_corrected_pct = [70, 80, 90, 100]
mach = [0.6, 0.7, 0.8, 0.9]
fn_per_delta_n = [
  [40000, 62000, 88000, 118000],
  [38000, 60000, 86000, 115000],
  [36500, 58000, 83500, 112000],
  [35000, 56000, 81000, 109000],
]
`

func TestParseTypeThrust(t *testing.T) {
	demo := string(demoWithoutThrust())
	ty, err := ParseType("x.toml", []byte(demo+thrustTOML))
	if err != nil {
		t.Fatal(err)
	}
	if f, ok := ty.Thrust.At(85, 0.75); !ok || f != (60000+86000+58000+83500)/4.0 {
		t.Errorf("At(85, 0.75) = %g, %v", f, ok)
	}
	if plain, err := ParseType("x.toml", demoWithoutThrust()); err != nil || plain.Thrust != nil {
		t.Errorf("a type without [thrust] has a table (%v)", err)
	}
	if DemoType().Thrust == nil {
		t.Error("the built-in demo type has no thrust table")
	}
	tests := []struct {
		name, toml, want string
	}{
		{"row too short names key and line", strings.Replace(thrustTOML, "[36500, 58000, 83500, 112000]", "[36500, 58000, 83500]", 1),
			"x.toml:38: thrust.fn_per_delta_n: row 3 (Mach 0.8) has 3 values, the N1 grid 4"},
		{"grid not ascending", strings.Replace(thrustTOML, "[0.6, 0.7, 0.8, 0.9]", "[0.6, 0.8, 0.7, 0.9]", 1), "x.toml:37: thrust.mach: must be strictly ascending"},
		{"falls with N1", strings.Replace(thrustTOML, "[35000, 56000, 81000, 109000]", "[35000, 56000, 51000, 109000]", 1), "thrust.fn_per_delta_n: row 4 (Mach 0.9) must rise with N1"},
		{"a key missing", strings.Replace(thrustTOML, "mach = [0.6, 0.7, 0.8, 0.9]\n", "", 1), "x.toml: thrust.mach: missing (required in a [thrust] table)"},
		{"not an array", strings.Replace(thrustTOML, "[70, 80, 90, 100]", `"70-100"`, 1), "thrust.n1_corrected_pct: must be an array of numbers"},
		{"unknown key", thrustTOML + "n2 = [1, 2]\n", "thrust.n2: unknown key"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseType("x.toml", []byte(demo+tc.toml))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want it to contain %q", err, tc.want)
			}
		})
	}
}

func TestFormatTypeRoundTrip(t *testing.T) {
	for _, path := range []string{"", "../testdata/types/widebody.toml"} {
		ty, err := LoadType(path)
		if err != nil {
			t.Fatal(err)
		}
		back, err := ParseType("formatted", FormatType(ty))
		if err != nil {
			t.Fatalf("%s: %v\n%s", path, err, FormatType(ty))
		}
		const rel = 1e-12
		pairs := [][2]float64{{ty.WingArea, back.WingArea}, {ty.Sweep, back.Sweep}, {ty.TSFCA, back.TSFCA}, {ty.TSFCB, back.TSFCB},
			{ty.MaxAltitude, back.MaxAltitude}, {ty.MaxThrustPerDelta, back.MaxThrustPerDelta}, {ty.CD0, back.CD0}}
		for i, p := range pairs {
			if d := p[0] - p[1]; d > rel*p[0] || d < -rel*p[0] {
				t.Errorf("%s: value %d: %g became %g", path, i, p[0], p[1])
			}
		}
		if back.Name != ty.Name || back.EngineCount != ty.EngineCount {
			t.Errorf("%s: %+v", path, back)
		}
	}
	ty, err := ParseType("x.toml", append(demoWithoutThrust(), thrustTOML...))
	if err != nil {
		t.Fatal(err)
	}
	back, err := ParseType("formatted", FormatType(ty))
	if err != nil || back.Thrust == nil || !reflect.DeepEqual(back.Thrust.PerDelta, ty.Thrust.PerDelta) ||
		!reflect.DeepEqual(back.Thrust.N1, ty.Thrust.N1) || !reflect.DeepEqual(back.Thrust.Mach, ty.Thrust.Mach) {
		t.Errorf("thrust table did not come back: %v\n%s", err, FormatType(ty))
	}
}

// FuzzParseType: any bytes give a type or an error, never a panic, and a
// type that parses is valid. Run with 'go test ./feed -fuzz FuzzParseType'.
func FuzzParseType(f *testing.F) {
	f.Add(DemoTypeTOML())
	f.Add(append(demoWithoutThrust(), thrustTOML...))
	f.Add([]byte(""))
	f.Add([]byte("[limits\n"))
	f.Add([]byte("name = 3\n[wing]\narea_m2 = \"x\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		ty, err := ParseType("fuzz.toml", data)
		if err == nil {
			if verr := ty.Validate(); verr != nil {
				t.Fatalf("parsed an invalid type: %v", verr)
			}
		}
	})
}

// demoWithoutThrust is the demo type file without its [thrust] table, the
// base of the tests that add their own or count lines.
func demoWithoutThrust() []byte {
	b := DemoTypeTOML()
	if i := bytes.Index(b, []byte("\n\n# Invented thrust table")); i >= 0 {
		return append(b[:i:i], '\n')
	}
	return b
}

// Deeply nested TOML (10,000 levels in about 40 KB, in three forms) is an
// error naming the line, not a hang or gigabytes of memory.
func TestParseTypeDeepNesting(t *testing.T) {
	n := 10000
	cases := map[string]string{
		"arrays":        "name = " + strings.Repeat("[", n) + strings.Repeat("]", n) + "\n",
		"inline tables": "name = " + strings.Repeat("{a = ", n) + "1" + strings.Repeat("}", n) + "\n",
		"dotted table":  "[" + strings.TrimSuffix(strings.Repeat("a.", n), ".") + "]\nx = 1\n",
	}
	for name, doc := range cases {
		t.Run(name, func(t *testing.T) {
			_, err := ParseType("deep.toml", []byte(doc))
			if err == nil || !strings.Contains(err.Error(), "deep.toml:1") || len(err.Error()) > 300 {
				t.Fatalf("error %.400v, want one at deep.toml:1 of at most 300 bytes", err)
			}
		})
	}
}
