package feed

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"
)

// mapping is what a layout makes of one file's header, resolved once:
// the header's idx holds each field's column (the first engine's for
// per-engine fields), and these the rest.
type mapping struct {
	lay       *Layout
	eng       [numColumns][]int      // per-engine field indices
	konst     [numColumns]bool       // the field is the layout's constant
	kval      [numColumns]float64    // a constant number, in dragdeck's column unit
	ktext     [numColumns][]byte     // a constant tail or flight
	conv      [numColumns][2]float64 // raw × [0] + [1] in dragdeck's column unit
	date, clk int                    // field indices of a date and a time column (−1: one time column)
	describe  []string               // how each field is found (check --layout)
}

// mapHeader resolves layout l against the header fields: each mapped
// field's column is found (the first candidate present, matched without
// regard to case), or the header is refused naming the column and the
// layout's line.
func mapHeader(fields [][]byte, l *Layout) (*header, string) {
	h := &header{n: len(fields), sep: l.Sep, dec: l.Decimal}
	for i := range h.idx {
		h.idx[i] = -1
	}
	m := &mapping{lay: l, date: -1, clk: -1}
	h.m = m
	at := map[string]int{}
	for i, f := range fields {
		name := strings.ToLower(string(bytes.TrimSpace(f)))
		h.fields = append(h.fields, name)
		if _, dup := at[name]; dup {
			return nil, "column " + quoteName(name) + " appears twice"
		}
		at[name] = i
	}
	where := func(line int) string {
		if line > 0 {
			return fmt.Sprintf("%s:%d", l.Source, line)
		}
		return l.Source
	}
	find := func(cands []string, what string, line int) (int, string, string) {
		for _, c := range cands {
			if i, ok := at[strings.ToLower(strings.TrimSpace(c))]; ok {
				return i, c, ""
			}
		}
		q := make([]string, len(cands))
		for i, c := range cands {
			q[i] = quoteName(c)
		}
		col := "column " + q[0]
		if len(q) > 1 {
			col = "none of the columns " + strings.Join(q, ", ")
		}
		return -1, "", fmt.Sprintf("%s of %s (%s) is not in the header", col, what, where(line))
	}
	used := map[int]bool{}
	t := &l.Time
	if len(t.Column) > 0 {
		i, name, msg := find(t.Column, "time.column", t.Line)
		if msg != "" {
			return nil, msg
		}
		h.idx[colTime], h.name[colTime], used[i] = i, name, true
		f := "RFC 3339"
		if t.FormatText != "" {
			f = t.FormatText
		}
		m.describe = append(m.describe, fmt.Sprintf("time       %s, %s, zone %s → UTC", name, f, t.ZoneText))
	} else {
		i, dn, msg := find(t.Date, "time.date", t.DateLine)
		if msg != "" {
			return nil, msg
		}
		j, cn, msg := find(t.Clock, "time.time", t.TimeLine)
		if msg != "" {
			return nil, msg
		}
		m.date, m.clk, used[i], used[j] = i, j, true, true
		h.idx[colTime], h.name[colTime] = i, dn+"+"+cn
		m.describe = append(m.describe, fmt.Sprintf("time       %s %s + %s %s, zone %s → UTC", dn, t.DateText, cn, t.ClockText, t.ZoneText))
	}
	for _, k := range layoutKeys {
		fld := &l.Fields[k.col]
		if !fld.Set || fld.Key != k.key {
			continue
		}
		c := k.col
		m.conv[c] = [2]float64{fld.Mul, fld.Add}
		unit := ""
		if fld.Unit != "" && fld.Unit != "1" {
			unit = ", " + fld.Unit
		}
		if fld.Scale != 1 {
			unit += fmt.Sprintf(", × %g", fld.Scale)
		}
		switch {
		case fld.Const != "":
			m.konst[c], m.ktext[c] = true, []byte(fld.Const)
			if c != colTail && c != colFlight {
				v, err := strconv.ParseFloat(fld.Const, 64)
				if err != nil {
					return nil, fmt.Sprintf("fields.%s.value (%s): %q is not a number", k.key, where(fld.Line), fld.Const)
				}
				m.kval[c] = v*fld.Mul + fld.Add
			}
			h.name[c] = "fields." + k.key + ".value"
			h.idx[c] = -2 // present, from no column
			m.describe = append(m.describe, fmt.Sprintf("%-10s the value %s%s", k.key, fld.Const, unit))
		case len(fld.Engines) > 0:
			for _, e := range fld.Engines {
				i, _, msg := find([]string{e}, "fields."+k.key+".engines", fld.Line)
				if msg != "" {
					return nil, msg
				}
				m.eng[c], used[i] = append(m.eng[c], i), true
			}
			h.idx[c], h.name[c] = m.eng[c][0], strings.Join(fld.Engines, "+")
			how := "summed"
			if c == colN1 {
				how = "averaged over the running engines"
			}
			m.describe = append(m.describe, fmt.Sprintf("%-10s %s, %s%s", k.key, strings.Join(fld.Engines, " + "), how, unit))
		default:
			i, name, msg := find(fld.Columns, "fields."+k.key, fld.Line)
			if msg != "" {
				return nil, msg
			}
			h.idx[c], h.name[c], used[i] = i, name, true
			m.describe = append(m.describe, fmt.Sprintf("%-10s %s%s", k.key, name, unit))
		}
		h.unit[c] = builtinUnit(c, k.key)
	}
	for i, f := range h.fields {
		if !used[i] {
			h.unknown = append(h.unknown, quoteName(f))
		}
	}
	return h, ""
}

// builtinUnit is the unit of dragdeck's own column a mapped value is
// converted to, as the plain header names it.
func builtinUnit(c column, key string) string {
	switch c {
	case colWeight:
		return unitKg
	case colAlt:
		return unitFt
	case colFuelFlow:
		return unitKgph
	case colTemp:
		if key == "tat" {
			return unitTAT
		}
		return unitSAT
	}
	return ""
}

// Describe is how each dragdeck field of the file is found under the
// layout, a line a field ("" without a layout).
func (h *header) Describe() []string {
	if h == nil || h.m == nil {
		return nil
	}
	return h.m.describe
}
