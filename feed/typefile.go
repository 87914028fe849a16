package feed

import (
	"bufio"
	"bytes"
	_ "embed"
	"errors"
	"fmt"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"dragdeck/model"
)

// demoTypeTOML is the invented demo type, a narrow-body twin of no real
// manufacturer; it is the default for --type.
//
//go:embed demo_type.toml
var demoTypeTOML []byte

// DemoTypeName is the name under which the built-in demo type is reported.
const DemoTypeName = "demo_type.toml (built in)"

// DemoTypeTOML returns the bytes of the built-in demo type file.
func DemoTypeTOML() []byte { return bytes.Clone(demoTypeTOML) }

// DemoType returns the built-in demo aircraft type.
func DemoType() *model.Type {
	t, err := ParseType(DemoTypeName, demoTypeTOML)
	if err != nil {
		panic("feed: built-in demo type is invalid: " + err.Error()) // a build defect, covered by tests
	}
	return t
}

// LoadType reads and validates a type file. An empty path gives the demo type.
func LoadType(path string) (*model.Type, error) {
	if path == "" {
		return DemoType(), nil
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("type file: %w", err)
	}
	return ParseType(path, data)
}

// typeFile mirrors the TOML layout of DESIGN.md §3.2, in the file's units.
type typeFile struct {
	Name string `toml:"name"`
	Wing struct {
		AreaM2 float64 `toml:"area_m2"`
		SpanM  float64 `toml:"span_m"`
	} `toml:"wing"`
	Polar struct {
		CD0    float64 `toml:"cd0"`
		Oswald float64 `toml:"oswald"`
	} `toml:"polar"`
	Wave struct {
		KappaA         float64 `toml:"kappa_a"`
		ThicknessRatio float64 `toml:"thickness_ratio"`
		SweepDeg       float64 `toml:"sweep_deg"`
	} `toml:"wave"`
	Engine struct {
		Count             int     `toml:"count"`
		TSFCAPerH         float64 `toml:"tsfc_a_per_h"`
		TSFCBPerH         float64 `toml:"tsfc_b_per_h"`
		MaxThrustPerDelta float64 `toml:"max_cruise_thrust_per_delta_n"`
	} `toml:"engine"`
	Limits struct {
		MMO      float64 `toml:"mmo"`
		MaxAltFt float64 `toml:"max_alt_ft"`
		CLBuffet float64 `toml:"cl_buffet"`
	} `toml:"limits"`
}

// requiredTypeKeys lists every key a type file must have.
var requiredTypeKeys = []string{
	"name",
	"wing.area_m2", "wing.span_m",
	"polar.cd0", "polar.oswald",
	"wave.kappa_a", "wave.thickness_ratio", "wave.sweep_deg",
	"engine.count", "engine.tsfc_a_per_h", "engine.tsfc_b_per_h",
	"limits.mmo", "limits.max_alt_ft", "limits.cl_buffet",
}

// decodeErr matches the TOML decoder's type errors, which carry the line and
// key only in their text: `toml: line 31 (last key "limits.mmo"): reason`.
var decodeErr = regexp.MustCompile(`^toml: (?:line (\d+) )?\(last key "([^"]*)"\): (.*)$`)

// ParseType decodes and validates a type file; name is used in errors.
// Errors read "name:line: key: reason" (line omitted where unknown).
func ParseType(name string, data []byte) (*model.Type, error) {
	var f typeFile
	md, err := toml.Decode(string(data), &f)
	if err != nil {
		var pe toml.ParseError
		if errors.As(err, &pe) {
			key := ""
			if pe.LastKey != "" {
				key = " " + pe.LastKey + ":"
			}
			return nil, fmt.Errorf("%s:%d:%s %s", name, pe.Position.Line, key, pe.Message)
		}
		if m := decodeErr.FindStringSubmatch(err.Error()); m != nil {
			line := ""
			if m[1] != "" {
				line = ":" + m[1]
			}
			return nil, fmt.Errorf("%s%s: %s: %s", name, line, m[2], strings.Replace(m[3], "destination has type", "want", 1))
		}
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	lines := keyLines(data)
	at := func(key string) string {
		if l, ok := lines[key]; ok {
			return fmt.Sprintf("%s:%d", name, l)
		}
		return name
	}
	for _, k := range md.Undecoded() {
		return nil, fmt.Errorf("%s: %s: unknown key", at(k.String()), k)
	}
	for _, k := range requiredTypeKeys {
		if !md.IsDefined(strings.Split(k, ".")...) {
			return nil, fmt.Errorf("%s: %s: missing (required)", name, k)
		}
	}
	t := &model.Type{
		Name:              f.Name,
		WingArea:          f.Wing.AreaM2,
		Span:              f.Wing.SpanM,
		CD0:               f.Polar.CD0,
		Oswald:            f.Polar.Oswald,
		KappaA:            f.Wave.KappaA,
		ThicknessRatio:    f.Wave.ThicknessRatio,
		Sweep:             f.Wave.SweepDeg * math.Pi / 180,
		EngineCount:       f.Engine.Count,
		TSFCA:             model.TSFCPerHour(f.Engine.TSFCAPerH),
		TSFCB:             model.TSFCPerHour(f.Engine.TSFCBPerH),
		MaxThrustPerDelta: f.Engine.MaxThrustPerDelta,
		MMO:               f.Limits.MMO,
		MaxAltitude:       f.Limits.MaxAltFt * model.Foot,
		CLBuffet:          f.Limits.CLBuffet,
	}
	if md.IsDefined("engine", "max_cruise_thrust_per_delta_n") && f.Engine.MaxThrustPerDelta <= 0 {
		return nil, fmt.Errorf("%s: engine.max_cruise_thrust_per_delta_n: must be > 0 when given, got %g",
			at("engine.max_cruise_thrust_per_delta_n"), f.Engine.MaxThrustPerDelta)
	}
	if err := t.Validate(); err != nil {
		var fe *model.FieldError
		if errors.As(err, &fe) {
			return nil, fmt.Errorf("%s: %w", at(fe.Key), err)
		}
		return nil, fmt.Errorf("%s: %w", name, err)
	}
	return t, nil
}

// keyLines maps each dotted key of a simple TOML document (tables and
// key = value lines) to its 1-based line, for error messages.
func keyLines(data []byte) map[string]int {
	out := map[string]int{}
	table := ""
	sc := bufio.NewScanner(bytes.NewReader(data))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		switch {
		case line == "" || line[0] == '#':
		case line[0] == '[':
			table = strings.TrimSpace(strings.Trim(line[:strings.IndexByte(line+"]", ']')], "[]"))
		default:
			k, _, ok := strings.Cut(line, "=")
			if !ok {
				continue
			}
			k = strings.Trim(strings.TrimSpace(k), `"'`)
			if table != "" {
				k = table + "." + k
			}
			if _, seen := out[k]; !seen {
				out[k] = n
			}
		}
	}
	return out
}

// FormatType writes t as a type file (DESIGN.md §3.2) that ParseType reads
// back to the same values.
func FormatType(t *model.Type) []byte {
	var b bytes.Buffer
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 15, 64) } // 15 digits hide the rounding of unit conversions
	fmt.Fprintf(&b, "name = %s\n\n", strconv.Quote(t.Name))
	fmt.Fprintf(&b, "[wing]\narea_m2 = %s\nspan_m = %s\n\n", f(t.WingArea), f(t.Span))
	fmt.Fprintf(&b, "[polar]\ncd0 = %s\noswald = %s\n\n", f(t.CD0), f(t.Oswald))
	fmt.Fprintf(&b, "[wave]\nkappa_a = %s\nthickness_ratio = %s\nsweep_deg = %s\n\n", f(t.KappaA), f(t.ThicknessRatio), f(t.Sweep*180/math.Pi))
	fmt.Fprintf(&b, "[engine]\ncount = %d\ntsfc_a_per_h = %s\ntsfc_b_per_h = %s\n", t.EngineCount, f(t.TSFCA*model.G0*model.Hour), f(t.TSFCB*model.G0*model.Hour))
	if t.MaxThrustPerDelta > 0 {
		fmt.Fprintf(&b, "max_cruise_thrust_per_delta_n = %s\n", f(t.MaxThrustPerDelta))
	}
	fmt.Fprintf(&b, "\n[limits]\nmmo = %s\nmax_alt_ft = %s\ncl_buffet = %s\n", f(t.MMO), f(t.MaxAltitude/model.Foot), f(t.CLBuffet))
	return b.Bytes()
}
