package feed

import (
	"bytes"
	"fmt"
	"strings"
	"time"
	_ "time/tzdata" // zone names on a machine without a zone database
)

// A Layout says how an airline's own export maps onto dragdeck's fields:
// for each field its source column (candidate names, matched without
// regard to case), its unit and a scale, or per-engine columns (fuel flow
// summed, fan speed averaged over the running engines), or a constant;
// the time from one column or from a date and a time column in a named
// zone; the separator and the decimal mark. It is read from a TOML file
// (ParseLayout, README: layout files) and resolved against each file's
// header once (header.mapped), never per row.
type Layout struct {
	Name    string
	Source  string // the file it was read from
	Text    []byte // the file as read (the store keeps it with an import)
	Sep     byte   // ',', ';' or '\t'
	Decimal byte   // '.' or ','
	Time    LayoutTime
	Fields  [numColumns]LayoutField // by column; Time and the extract columns unused
}

// LayoutTime is where the time of a row comes from: Column (RFC 3339, or
// Format), or Date and Clock joined by a space and read with DateFormat
// and ClockFormat; a time without an offset is in Zone (UTC by default).
type LayoutTime struct {
	Column, Date, Clock      []string // candidate column names
	Format                   string   // Go layout of Column ("" : RFC 3339)
	DateFormat, ClockFormat  string   // Go layouts
	Zone                     *time.Location
	FormatText, DateText     string // as the file gives them (strftime), for messages
	ClockText, ZoneText      string
	Line, DateLine, TimeLine int // lines in the layout file
}

// LayoutField is where one dragdeck field comes from.
type LayoutField struct {
	Columns []string // candidate names of one column
	Engines []string // per-engine columns (fuel flow: summed; fan speed: averaged)
	Unit    string   // as written ("" : the field's default)
	Scale   float64  // the layout's scale (1: none)
	Mul     float64  // value in dragdeck's column unit = raw × Mul + Add (Mul holds the scale)
	Add     float64
	Const   string // a constant for every row (the text of a tail or flight, or a number)
	Set     bool   // the field is mapped
	Line    int    // the field's line in the layout file
	Key     string // the layout's name of the field
}

// layoutKeys are the layout's names of dragdeck's fields, in the order
// check prints them; tat is the temperature given as total air
// temperature.
var layoutKeys = []struct {
	key string
	col column
}{
	{"tail", colTail}, {"flight", colFlight}, {"weight", colWeight}, {"altitude", colAlt}, {"mach", colMach},
	{"sat", colTemp}, {"tat", colTemp}, {"fuel_flow", colFuelFlow}, {"bank", colBank}, {"vs", colVS},
	{"accel", colAccel}, {"n1", colN1},
}

// layoutUnits are the units each field may be given in, as the factor and
// offset to the unit of dragdeck's own column (kg, ft, kg/h, °C, deg,
// ft/min, kt/min, %): value = raw × mul + add. The first is the default.
var layoutUnits = map[column][]struct {
	name     string
	mul, add float64
}{
	colWeight:   {{"kg", 1, 0}, {"lb", lbKg, 0}, {"t", 1000, 0}},
	colAlt:      {{"ft", 1, 0}, {"m", 1 / footM, 0}},
	colMach:     {{"1", 1, 0}},
	colTemp:     {{"C", 1, 0}, {"K", 1, -273.15}},
	colFuelFlow: {{"kg/h", 1, 0}, {"lb/h", lbKg, 0}, {"t/h", 1000, 0}, {"kg/min", 60, 0}, {"kg/s", 3600, 0}},
	colBank:     {{"deg", 1, 0}},
	colVS:       {{"ft/min", 1, 0}, {"m/s", 60 / footM, 0}},
	colAccel:    {{"kt/min", 1, 0}},
	colN1:       {{"%", 1, 0}},
}

// The exact unit definitions the conversions use (NIST SP 811, appendix
// B: 1 lb = 0.45359237 kg, 1 ft = 0.3048 m).
const (
	lbKg  = 0.45359237
	footM = 0.3048
)

type layoutFile struct {
	Name      string          `toml:"name"`
	Separator string          `toml:"separator"`
	Decimal   string          `toml:"decimal"`
	Time      *layoutTimeFile `toml:"time"`
	Fields    layoutFields    `toml:"fields"`
}

type layoutFields struct {
	Tail     *layoutFieldFile `toml:"tail"`
	Flight   *layoutFieldFile `toml:"flight"`
	Weight   *layoutFieldFile `toml:"weight"`
	Altitude *layoutFieldFile `toml:"altitude"`
	Mach     *layoutFieldFile `toml:"mach"`
	SAT      *layoutFieldFile `toml:"sat"`
	TAT      *layoutFieldFile `toml:"tat"`
	FuelFlow *layoutFieldFile `toml:"fuel_flow"`
	Bank     *layoutFieldFile `toml:"bank"`
	VS       *layoutFieldFile `toml:"vs"`
	Accel    *layoutFieldFile `toml:"accel"`
	N1       *layoutFieldFile `toml:"n1"`
}

// byKey is the fields by their layout names (nil: not given).
func (f *layoutFields) byKey() map[string]*layoutFieldFile {
	return map[string]*layoutFieldFile{"tail": f.Tail, "flight": f.Flight, "weight": f.Weight, "altitude": f.Altitude,
		"mach": f.Mach, "sat": f.SAT, "tat": f.TAT, "fuel_flow": f.FuelFlow, "bank": f.Bank, "vs": f.VS, "accel": f.Accel, "n1": f.N1}
}

type layoutTimeFile struct {
	Column      any    `toml:"column"`
	Format      string `toml:"format"`
	Date        any    `toml:"date"`
	Clock       any    `toml:"time"`
	DateFormat  string `toml:"date_format"`
	ClockFormat string `toml:"time_format"`
	Zone        string `toml:"zone"`
}

type layoutFieldFile struct {
	Column  any      `toml:"column"`
	Engines []string `toml:"engines"`
	Unit    string   `toml:"unit"`
	Scale   *float64 `toml:"scale"`
	Value   any      `toml:"value"`
}

// LoadLayout reads and checks a layout file.
func LoadLayout(path string) (*Layout, error) {
	f, err := OpenRegular(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var buf bytes.Buffer
	if _, err := buf.ReadFrom(f); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return ParseLayout(path, buf.Bytes())
}

// ParseLayout decodes and checks a layout file called name: unknown keys,
// unknown fields and units, a column mapped twice, a missing required
// field, a bad format or zone are errors with their lines.
func ParseLayout(name string, data []byte) (*Layout, error) {
	var f layoutFile
	doc, at, err := decodeTOML(name, data, &f, layoutSchema, nil)
	if err != nil {
		return nil, err
	}
	lines := doc.lines()
	line := func(key string) int {
		if l, ok := lines[key]; ok {
			return l
		}
		for _, t := range doc.tables {
			if t.key == key {
				return t.line
			}
		}
		return 0
	}
	l := &Layout{Name: f.Name, Source: name, Text: bytes.Clone(data), Sep: ',', Decimal: '.'}
	switch f.Separator {
	case "", ",":
	case ";":
		l.Sep = ';'
	case "\t", "tab":
		l.Sep = '\t'
	default:
		return nil, fmt.Errorf("%s: separator: %q is not \",\", \";\" or \"tab\"", at("separator"), f.Separator)
	}
	switch f.Decimal {
	case "", ".":
	case ",":
		l.Decimal = ','
	default:
		return nil, fmt.Errorf("%s: decimal: %q is not \".\" or \",\"", at("decimal"), f.Decimal)
	}
	if l.Decimal == l.Sep {
		return nil, fmt.Errorf("%s: decimal: the decimal mark %q is also the separator", at("decimal"), string(l.Decimal))
	}
	used := map[string]string{} // column name (lower case) → the key that maps it
	claim := func(key string, names []string) error {
		for _, n := range names {
			k := strings.ToLower(strings.TrimSpace(n))
			if k == "" {
				return fmt.Errorf("%s: %s: an empty column name", at(key), key)
			}
			if prev, dup := used[k]; dup && prev != key {
				return fmt.Errorf("%s: %s: column %s is mapped already by %s", at(key), key, quoteName(n), prev)
			}
			used[k] = key
		}
		return nil
	}
	if err := l.parseTime(f.Time, at, line, claim); err != nil {
		return nil, err
	}
	given := f.Fields.byKey()
	for _, k := range layoutKeys {
		if ff := given[k.key]; ff != nil {
			if err := l.parseField(k.key, *ff, at, line, claim); err != nil {
				return nil, err
			}
		}
	}
	for _, r := range []struct {
		col  column
		name string
	}{{colTail, "tail"}, {colWeight, "weight"}, {colAlt, "altitude"}, {colMach, "mach"}, {colFuelFlow, "fuel_flow"}, {colTemp, "sat (or tat)"}} {
		if !l.Fields[r.col].Set {
			return nil, fmt.Errorf("%s: fields.%s: missing (required; a column or a value)", name, strings.Fields(r.name)[0])
		}
	}
	return l, nil
}

var layoutSchema = newTOMLSchema(layoutFile{})

// names reads a column given as a name or a list of candidate names.
func names(v any) ([]string, bool) {
	switch x := v.(type) {
	case nil:
		return nil, true
	case string:
		return []string{x}, true
	case []any:
		out := make([]string, 0, len(x))
		for _, e := range x {
			s, ok := e.(string)
			if !ok {
				return nil, false
			}
			out = append(out, s)
		}
		return out, len(out) > 0
	}
	return nil, false
}

func (l *Layout) parseTime(t *layoutTimeFile, at func(string) string, line func(string) int, claim func(string, []string) error) error {
	if t == nil {
		return fmt.Errorf("%s: [time]: missing (column, or date and time)", l.Source)
	}
	lt := &l.Time
	var ok bool
	if lt.Column, ok = names(t.Column); !ok {
		return fmt.Errorf("%s: time.column: a column name or a list of candidate names", at("time.column"))
	}
	if lt.Date, ok = names(t.Date); !ok {
		return fmt.Errorf("%s: time.date: a column name or a list of candidate names", at("time.date"))
	}
	if lt.Clock, ok = names(t.Clock); !ok {
		return fmt.Errorf("%s: time.time: a column name or a list of candidate names", at("time.time"))
	}
	lt.Line, lt.DateLine, lt.TimeLine = line("time.column"), line("time.date"), line("time.time")
	switch {
	case len(lt.Column) > 0 && (len(lt.Date) > 0 || len(lt.Clock) > 0):
		return fmt.Errorf("%s: time: give column, or date and time, not both", at("time"))
	case len(lt.Column) > 0:
		if err := claim("time.column", lt.Column); err != nil {
			return err
		}
		if t.DateFormat != "" || t.ClockFormat != "" {
			return fmt.Errorf("%s: time: date_format and time_format go with date and time; a time column has format", at("time"))
		}
		if t.Format != "" {
			f, err := goLayout(t.Format)
			if err != nil {
				return fmt.Errorf("%s: time.format: %v", at("time.format"), err)
			}
			lt.Format, lt.FormatText = f, t.Format
		}
	case len(lt.Date) > 0 && len(lt.Clock) > 0:
		if err := claim("time.date", lt.Date); err != nil {
			return err
		}
		if err := claim("time.time", lt.Clock); err != nil {
			return err
		}
		if t.Format != "" {
			return fmt.Errorf("%s: time.format goes with a time column; date and time have date_format and time_format", at("time.format"))
		}
		df, tf := t.DateFormat, t.ClockFormat
		if df == "" {
			df = "%Y-%m-%d"
		}
		if tf == "" {
			tf = "%H:%M:%S"
		}
		var err error
		if lt.DateFormat, err = goLayout(df); err != nil {
			return fmt.Errorf("%s: time.date_format: %v", at("time.date_format"), err)
		}
		if lt.ClockFormat, err = goLayout(tf); err != nil {
			return fmt.Errorf("%s: time.time_format: %v", at("time.time_format"), err)
		}
		lt.DateText, lt.ClockText = df, tf
	default:
		return fmt.Errorf("%s: time: give column, or both date and time", at("time"))
	}
	lt.Zone, lt.ZoneText = time.UTC, "UTC"
	if t.Zone != "" {
		z, err := time.LoadLocation(t.Zone)
		if err != nil || t.Zone == "Local" {
			return fmt.Errorf("%s: time.zone: %q is not a zone name such as Europe/Lisbon or UTC", at("time.zone"), t.Zone)
		}
		lt.Zone, lt.ZoneText = z, t.Zone
	}
	return nil
}

func (l *Layout) parseField(key string, ff layoutFieldFile, at func(string) string, line func(string) int, claim func(string, []string) error) error {
	full := "fields." + key
	col, ok := column(-1), false
	for _, k := range layoutKeys {
		if k.key == key {
			col, ok = k.col, true
		}
	}
	if !ok {
		var all []string
		for _, k := range layoutKeys {
			all = append(all, k.key)
		}
		return fmt.Errorf("%s: %s: unknown field (the fields are %s)", at(full), full, strings.Join(all, ", "))
	}
	fld := &l.Fields[col]
	if fld.Set {
		return fmt.Errorf("%s: %s: the temperature is mapped already by fields.%s; give sat or tat", at(full), full, fld.Key)
	}
	fld.Set, fld.Key, fld.Line, fld.Mul, fld.Scale = true, key, line(full), 1, 1
	cols, ok := names(ff.Column)
	if !ok {
		return fmt.Errorf("%s: %s.column: a column name or a list of candidate names", at(full+".column"), full)
	}
	fld.Columns, fld.Engines = cols, ff.Engines
	given := 0
	for _, g := range []bool{len(cols) > 0, len(ff.Engines) > 0, ff.Value != nil} {
		if g {
			given++
		}
	}
	if given != 1 {
		return fmt.Errorf("%s: %s: give one of column, engines or value", at(full), full)
	}
	if len(ff.Engines) > 0 && col != colFuelFlow && col != colN1 {
		return fmt.Errorf("%s: %s.engines: per-engine columns are for fuel_flow and n1", at(full+".engines"), full)
	}
	if err := claim(full, append(append([]string(nil), cols...), ff.Engines...)); err != nil {
		return err
	}
	if ff.Value != nil {
		switch v := ff.Value.(type) {
		case string:
			if col != colTail && col != colFlight {
				return fmt.Errorf("%s: %s.value: a number", at(full+".value"), full)
			}
			if why := badID([]byte(v)); why != "" || strings.TrimSpace(v) == "" {
				return fmt.Errorf("%s: %s.value: %s is not a usable name", at(full+".value"), full, quoteField([]byte(v)))
			}
			fld.Const = v
		case int64:
			fld.Const = fmt.Sprint(v)
		case float64:
			fld.Const = fmt.Sprint(v)
		default:
			return fmt.Errorf("%s: %s.value: a text or a number", at(full+".value"), full)
		}
		if (col == colTail || col == colFlight) != isText(ff.Value) {
			return fmt.Errorf("%s: %s.value: a tail or flight is a text, the others numbers", at(full+".value"), full)
		}
	}
	if col == colTail || col == colFlight {
		if ff.Unit != "" || ff.Scale != nil {
			return fmt.Errorf("%s: %s: a name has no unit or scale", at(full), full)
		}
		return nil
	}
	units := layoutUnits[col]
	u := units[0]
	if ff.Unit != "" {
		found := false
		for _, c := range units {
			if strings.EqualFold(c.name, strings.TrimPrefix(ff.Unit, "°")) {
				u, found = c, true
			}
		}
		if !found {
			var all []string
			for _, c := range units {
				all = append(all, c.name)
			}
			return fmt.Errorf("%s: %s.unit: %q is not a unit of %s (%s)", at(full+".unit"), full, ff.Unit, key, strings.Join(all, ", "))
		}
	}
	scale := 1.0
	if ff.Scale != nil {
		scale = *ff.Scale
		if !(scale > 0) || scale > 1e9 {
			return fmt.Errorf("%s: %s.scale: must be > 0, got %g", at(full+".scale"), full, scale)
		}
	}
	fld.Unit, fld.Scale, fld.Mul, fld.Add = u.name, scale, scale*u.mul, u.add
	return nil
}

func isText(v any) bool { _, ok := v.(string); return ok }

// strftime maps the conversions a layout's formats may use to Go's
// reference layout.
var strftime = map[byte]string{
	'Y': "2006", 'y': "06", 'm': "01", 'd': "02", 'H': "15", 'M': "04", 'S': "05", 'b': "Jan", 'j': "002",
	'f': "000000", 'z': "-0700", 'Z': "MST", '%': "%",
}

// goLayout turns a strftime-style format (%Y-%m-%d %H:%M:%S) into Go's
// layout; other text stands for itself.
func goLayout(f string) (string, error) {
	var b strings.Builder
	for i := 0; i < len(f); i++ {
		c := f[i]
		if c != '%' {
			// a literal: only marks that Go's reference layout cannot
			// mistake for a part of a date
			if !strings.ContainsRune("-/.: T,", rune(c)) {
				return "", fmt.Errorf("%q: %q may not stand in a format (write the parts with %%-conversions, the marks as - / . : , space or T)", f, string(c))
			}
			b.WriteByte(c)
			continue
		}
		if i+1 >= len(f) {
			return "", fmt.Errorf("%q ends in a lone %%", f)
		}
		g, ok := strftime[f[i+1]]
		if !ok {
			return "", fmt.Errorf("%q: %%%c is not a conversion dragdeck knows (%%Y %%y %%m %%d %%j %%b %%H %%M %%S %%f %%z %%Z)", f, f[i+1])
		}
		if f[i+1] == 'f' {
			if b.Len() == 0 || !strings.HasSuffix(b.String(), ".") && !strings.HasSuffix(b.String(), ",") {
				return "", fmt.Errorf("%q: %%f follows a '.' or ','", f)
			}
		}
		b.WriteString(g)
		i++
	}
	if b.Len() == 0 {
		return "", fmt.Errorf("an empty format")
	}
	return b.String(), nil
}

// BuiltinLayout is dragdeck's own columns written as a layout file: the
// example demo --out writes beside the fleet (reading a file of its own
// columns with it gives what reading it without a layout gives, but that
// the unit columns are fixed to kg, ft, kg/h and °C).
const BuiltinLayout = `# dragdeck's own snapshot columns as a layout file (README: layout files).
# Copy it and rename the columns to read an export as it is.
name = "dragdeck columns"
separator = ","          # ",", ";" or "tab"
decimal = "."            # "." or ","

[time]
column = "time"          # RFC 3339 (2026-03-01T10:22:00Z); or format = "%Y-%m-%d %H:%M:%S"
# or: date = "DATE", time = "TIME", date_format = "%d.%m.%Y", time_format = "%H:%M:%S"
zone = "UTC"             # the zone of a time without an offset (IANA name)

[fields]
tail = { column = "tail" }                 # or value = "DX901" for a one-tail file
flight = { column = "flight" }
weight = { column = "weight_kg", unit = "kg" }          # kg, lb, t; scale = 100 for hundreds
altitude = { column = "alt_ft", unit = "ft" }           # ft, m (pressure altitude)
mach = { column = "mach" }
sat = { column = "sat_c", unit = "C" }                  # C, K; or tat = { ... }
fuel_flow = { column = "fuel_flow_kgph", unit = "kg/h" } # or engines = ["FF1", "FF2"], summed
bank = { column = "bank_deg" }
vs = { column = "vs_fpm" }
accel = { column = "accel_kt_per_min" }
n1 = { column = "n1_pct" }                 # or engines = ["N1_1", "N1_2"], averaged
`

// LayoutFile is the name demo --out gives BuiltinLayout.
const LayoutFile = "layout.toml"
