package feed

import (
	"bytes"
	_ "embed"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

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
	data, err := ReadSmall(path, MaxTypeFile)
	if err != nil {
		return nil, fmt.Errorf("type file: %w", err)
	}
	return ParseType(path, data)
}

// typeFile mirrors the TOML layout of a type file, in the file's units.
// Every key is a pointer, so that a missing key is told from a zero.
type typeFile struct {
	Name *string `toml:"name"`
	Wing struct {
		AreaM2 *float64 `toml:"area_m2"`
		SpanM  *float64 `toml:"span_m"`
	} `toml:"wing"`
	Polar struct {
		CD0    *float64 `toml:"cd0"`
		Oswald *float64 `toml:"oswald"`
	} `toml:"polar"`
	Wave struct {
		KappaA         *float64 `toml:"kappa_a"`
		ThicknessRatio *float64 `toml:"thickness_ratio"`
		SweepDeg       *float64 `toml:"sweep_deg"`
	} `toml:"wave"`
	Engine struct {
		Count             *int     `toml:"count"`
		TSFCAPerH         *float64 `toml:"tsfc_a_per_h"`
		TSFCBPerH         *float64 `toml:"tsfc_b_per_h"`
		MaxThrustPerDelta *float64 `toml:"max_cruise_thrust_per_delta_n"`
	} `toml:"engine"`
	Limits struct {
		MMO      *float64 `toml:"mmo"`
		MaxAltFt *float64 `toml:"max_alt_ft"`
		CLBuffet *float64 `toml:"cl_buffet"`
	} `toml:"limits"`
	// Thrust is the optional thrust table: net thrust of one engine per δ
	// from the corrected fan speed and Mach.
	Thrust *struct {
		N1Corrected []float64   `toml:"n1_corrected_pct"`
		Mach        []float64   `toml:"mach"`
		FnPerDelta  [][]float64 `toml:"fn_per_delta_n"`
	} `toml:"thrust"`
}

// typeSchema is the keys a type file may hold.
var typeSchema = newTOMLSchema(typeFile{})

// typeKeyKinds is what each key of a type file holds, for the error when a
// value cannot be decoded into it.
var typeKeyKinds = map[string]string{
	"name": "a string", "engine.count": "a whole number",
	"wing.area_m2": "a number", "wing.span_m": "a number", "polar.cd0": "a number", "polar.oswald": "a number",
	"wave.kappa_a": "a number", "wave.thickness_ratio": "a number", "wave.sweep_deg": "a number",
	"engine.tsfc_a_per_h": "a number", "engine.tsfc_b_per_h": "a number", "engine.max_cruise_thrust_per_delta_n": "a number",
	"limits.mmo": "a number", "limits.max_alt_ft": "a number", "limits.cl_buffet": "a number",
	"thrust.n1_corrected_pct": "an array of numbers", "thrust.mach": "an array of numbers",
	"thrust.fn_per_delta_n": "an array of arrays of numbers, one per Mach",
}

// ParseType decodes and validates a type file; name is used in errors.
// Errors read "name:line: key: reason" (line omitted where unknown).
//
// The TOML decoder is pelletier/go-toml/v2: a syntax or type error is a
// *toml.DecodeError with its line and key. Unknown keys, each with its
// line, and the lines of the values that fail validation come from one
// pass of the same library's parser (decodeTOML).
func ParseType(name string, data []byte) (*model.Type, error) {
	var f typeFile
	_, at, err := decodeTOML(name, data, &f, typeSchema, typeKeyKinds)
	if err != nil {
		return nil, err
	}
	required := []struct {
		key string
		set bool
	}{
		{"name", f.Name != nil},
		{"wing.area_m2", f.Wing.AreaM2 != nil}, {"wing.span_m", f.Wing.SpanM != nil},
		{"polar.cd0", f.Polar.CD0 != nil}, {"polar.oswald", f.Polar.Oswald != nil},
		{"wave.kappa_a", f.Wave.KappaA != nil}, {"wave.thickness_ratio", f.Wave.ThicknessRatio != nil}, {"wave.sweep_deg", f.Wave.SweepDeg != nil},
		{"engine.count", f.Engine.Count != nil}, {"engine.tsfc_a_per_h", f.Engine.TSFCAPerH != nil}, {"engine.tsfc_b_per_h", f.Engine.TSFCBPerH != nil},
		{"limits.mmo", f.Limits.MMO != nil}, {"limits.max_alt_ft", f.Limits.MaxAltFt != nil}, {"limits.cl_buffet", f.Limits.CLBuffet != nil},
	}
	var missing []string
	for _, r := range required {
		if !r.set {
			missing = append(missing, r.key)
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("%s: %s: missing (required)", name, strings.Join(missing, ", "))
	}
	if why := badText([]byte(*f.Name)); why != "" || len(*f.Name) > 200 {
		if why == "" {
			why = "longer than 200 bytes"
		}
		return nil, fmt.Errorf("%s: name: %s", name, why)
	}
	t := &model.Type{
		Name:           *f.Name,
		WingArea:       *f.Wing.AreaM2,
		Span:           *f.Wing.SpanM,
		CD0:            *f.Polar.CD0,
		Oswald:         *f.Polar.Oswald,
		KappaA:         *f.Wave.KappaA,
		ThicknessRatio: *f.Wave.ThicknessRatio,
		Sweep:          *f.Wave.SweepDeg * math.Pi / 180,
		EngineCount:    *f.Engine.Count,
		TSFCA:          model.TSFCPerHour(*f.Engine.TSFCAPerH),
		TSFCB:          model.TSFCPerHour(*f.Engine.TSFCBPerH),
		MMO:            *f.Limits.MMO,
		MaxAltitude:    *f.Limits.MaxAltFt * model.Foot,
		CLBuffet:       *f.Limits.CLBuffet,
	}
	if v := f.Engine.MaxThrustPerDelta; v != nil {
		if !(*v > 0) {
			return nil, fmt.Errorf("%s: engine.max_cruise_thrust_per_delta_n: must be > 0 when given, got %g",
				at("engine.max_cruise_thrust_per_delta_n"), *v)
		}
		t.MaxThrustPerDelta = *v
	}
	if th := f.Thrust; th != nil {
		var missing []string
		for _, k := range []struct {
			key string
			set bool
		}{{"thrust.n1_corrected_pct", th.N1Corrected != nil}, {"thrust.mach", th.Mach != nil}, {"thrust.fn_per_delta_n", th.FnPerDelta != nil}} {
			if !k.set {
				missing = append(missing, k.key)
			}
		}
		if len(missing) > 0 {
			return nil, fmt.Errorf("%s: %s: missing (required in a [thrust] table)", name, strings.Join(missing, ", "))
		}
		tt, err := model.NewThrustTable(th.N1Corrected, th.Mach, th.FnPerDelta)
		if err != nil {
			var fe *model.FieldError
			if errors.As(err, &fe) {
				return nil, fmt.Errorf("%s: %w", at(fe.Key), err)
			}
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		t.Thrust = tt
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

// FormatType writes t as a type file that ParseType reads back to the same
// values.
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
	if tt := t.Thrust; tt != nil {
		list := func(v []float64) string {
			s := make([]string, len(v))
			for i, x := range v {
				s[i] = f(x)
			}
			return "[" + strings.Join(s, ", ") + "]"
		}
		fmt.Fprintf(&b, "\n[thrust]\nn1_corrected_pct = %s\nmach = %s\nfn_per_delta_n = [\n", list(tt.N1), list(tt.Mach))
		for _, row := range tt.PerDelta {
			fmt.Fprintf(&b, "  %s,\n", list(row))
		}
		b.WriteString("]\n")
	}
	return b.Bytes()
}
