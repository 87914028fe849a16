package feed

import (
	"bytes"
	"strings"
)

// column identifies a known snapshot column.
type column int

const (
	colTime column = iota
	colTail
	colFlight
	colWeight
	colAlt
	colMach
	colFuelFlow
	colTemp
	colBank
	colVS
	colAccel
	colN1
	colSamples // written by extract: the samples of the window
	colSeconds // written by extract: the window's length
	numColumns
)

// unit flags of the columns that come in two units.
const (
	unitKg   = "weight_kg"
	unitLb   = "weight_lb"
	unitFt   = "alt_ft"
	unitM    = "alt_m"
	unitKgph = "fuel_flow_kgph"
	unitLbph = "fuel_flow_lbph"
	unitSAT  = "sat_c"
	unitTAT  = "tat_c"
)

// knownColumns maps each accepted header name (lower case) to its column.
var knownColumns = map[string]column{
	"time": colTime, "tail": colTail, "flight": colFlight,
	unitKg: colWeight, unitLb: colWeight,
	unitFt: colAlt, unitM: colAlt,
	"mach":   colMach,
	unitKgph: colFuelFlow, unitLbph: colFuelFlow,
	unitSAT: colTemp, unitTAT: colTemp,
	"bank_deg": colBank, "vs_fpm": colVS, "accel_kt_per_min": colAccel, "n1_pct": colN1,
	"samples": colSamples, "seconds": colSeconds,
}

// requiredColumns names, for each required column, how to ask for it.
var requiredColumns = []struct {
	col  column
	name string
}{
	{colTime, "time"},
	{colTail, "tail"},
	{colWeight, "weight_kg (or weight_lb)"},
	{colAlt, "alt_ft (or alt_m)"},
	{colMach, "mach"},
	{colFuelFlow, "fuel_flow_kgph (or fuel_flow_lbph)"},
	{colTemp, "sat_c (or tat_c)"},
}

// header is the column layout of one file.
type header struct {
	n       int                // fields per row
	idx     [numColumns]int    // field index of each column, −1 if absent
	name    [numColumns]string // the file's name of each column present
	fields  []string           // the file's name of each field, in order
	unknown []string           // columns that are ignored
	// unit is the unit each value is in once read (unitKg, unitLb, …:
	// the column's name in a plain header, dragdeck's unit under a
	// layout); sep and dec the separator and the decimal mark; m what a
	// layout made of the header (nil: dragdeck's own columns)
	unit     [numColumns]string
	sep, dec byte
	m        *mapping
}

// layout names the columns with a unit of their own (weight, altitude,
// fuel flow, temperature), for notices: "weight_lb, alt_ft, …".
func (h *header) layout() string {
	var out []string
	for _, c := range []column{colWeight, colAlt, colFuelFlow, colTemp} {
		if h.idx[c] >= 0 {
			out = append(out, h.name[c])
		}
	}
	return strings.Join(out, ", ")
}

// fieldName is the name of field i, or "row" when the header has no such field.
func (h *header) fieldName(i int) string {
	if i >= 0 && i < len(h.fields) && h.fields[i] != "" {
		return h.fields[i]
	}
	return "row"
}

// acceptedColumns lists the column names a snapshot file may have, for
// messages.
const acceptedColumns = "time, tail, flight, weight_kg|weight_lb, alt_ft|alt_m, mach, fuel_flow_kgph|fuel_flow_lbph, " +
	"sat_c|tat_c, bank_deg, vs_fpm, accel_kt_per_min, n1_pct, samples, seconds"

// eventsHeader is parseHeader's answer for the header of an events file
// (time,tail,kind,note; DESIGN.md §3.3), which a folder may hold beside the
// snapshots.
const eventsHeader = "an events file (time, tail, kind, note), not snapshots"

// parseHeader builds the layout from the header fields.
func parseHeader(fields [][]byte) (*header, string) {
	h := &header{n: len(fields), sep: ',', dec: '.'}
	for i := range h.idx {
		h.idx[i] = -1
	}
	seen := map[string]bool{}
	for i, f := range fields {
		name := strings.ToLower(string(bytes.TrimSpace(f)))
		h.fields = append(h.fields, name)
		if seen[name] {
			return nil, "column " + quoteName(name) + " appears twice"
		}
		seen[name] = true
		c, ok := knownColumns[name]
		if !ok {
			h.unknown = append(h.unknown, quoteName(name))
			continue
		}
		if h.idx[c] >= 0 {
			return nil, "columns " + h.name[c] + " and " + name + " both given; keep one"
		}
		h.idx[c], h.name[c], h.unit[c] = i, name, name
	}
	if h.idx[colWeight] < 0 && seen["kind"] && seen["note"] && h.idx[colTime] >= 0 && h.idx[colTail] >= 0 {
		return nil, eventsHeader
	}
	var missing []string
	for _, r := range requiredColumns {
		if h.idx[r.col] < 0 {
			missing = append(missing, r.name)
		}
	}
	if len(missing) > 0 {
		return nil, "missing required column(s) " + strings.Join(missing, ", ") + "; the accepted columns are " + acceptedColumns
	}
	return h, ""
}

// quoteName is a column name for a message: as it is when it is plain
// (letters, digits, '_', '-', '.', ' ', at most 40 bytes), else quoted and
// cut, so that a hostile header cannot drive the terminal.
func quoteName(s string) string {
	if s == "" || len(s) > 40 {
		return quoteField([]byte(s))
	}
	for _, c := range []byte(s) {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '_' || c == '-' || c == '.' || c == ' ') {
			return quoteField([]byte(s))
		}
	}
	return s
}
