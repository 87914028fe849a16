package feed

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"time"
)

// mappedRow reads the fields of data line n under the header's layout
// into rec and v (values in the units of dragdeck's own columns, as
// finish takes them): the time from its column or columns in the
// layout's zone, constants where the layout gives them, per-engine fuel
// flow summed and fan speed averaged over the running engines. A row
// with an engine's fuel flow empty or zero while another runs is an
// engine-out row, rejected with that reason.
func (d *Decoder) mappedRow(rec *Record, n int, v *[numColumns]float64) (bool, error) {
	h, m := d.hdr, d.hdr.m
	t, ok, err := d.mappedTime(n)
	if !ok {
		return false, err
	}
	rec.Time = t.UTC()
	var why string
	if m.konst[colTail] {
		rec.Tail, why = d.tails.intern(m.ktext[colTail])
	} else {
		tail := d.fields[h.idx[colTail]]
		if len(tail) == 0 {
			return d.reject(n, h.name[colTail], ErrEmpty, "empty")
		}
		rec.Tail, why = d.tails.intern(tail)
	}
	if why != "" {
		return d.reject(n, h.name[colTail], ErrID, why)
	}
	if h.idx[colFlight] != -1 {
		if d.flights.n > 1<<16 {
			d.flights.reset()
		}
		fl := m.ktext[colFlight]
		if !m.konst[colFlight] {
			fl = d.fields[h.idx[colFlight]]
		}
		if rec.Flight, why = d.flights.intern(fl); why != "" {
			return d.reject(n, h.name[colFlight], ErrID, why)
		}
	}
	for c := colWeight; c <= colN1; c++ {
		switch {
		case h.idx[c] == -1:
			continue
		case m.konst[c]:
			v[c] = m.kval[c]
			continue
		case len(m.eng[c]) > 0:
			x, ok, err := d.engines(n, c)
			if !ok {
				return false, err
			}
			v[c] = x*m.conv[c][0] + m.conv[c][1]
			continue
		}
		x, ok, err := d.value(n, c)
		if !ok {
			return false, err
		}
		if len(d.fields[h.idx[c]]) > 0 { // an optional field left empty stays 0, not converted
			v[c] = x*m.conv[c][0] + m.conv[c][1]
		}
	}
	return true, nil
}

// engines is the total fuel flow of the per-engine columns, or the mean
// fan speed of the engines that run (those with a fuel flow, when it is
// per engine too, as the row's fuel-flow pass left them in d.running;
// else those with a fan speed), in the layout's unit.
func (d *Decoder) engines(n int, c column) (float64, bool, error) {
	m := d.hdr.m
	names := m.lay.Fields[c].Engines
	sum, k, running := 0.0, 0, 0
	var off string
	for j, i := range m.eng[c] {
		b := d.fields[i]
		x := 0.0
		if len(b) > 0 {
			var kind error
			var msg string
			if x, msg, kind = d.number(b); kind != nil {
				return 0, false, d.rejectErr(n, names[j], kind, msg)
			}
		}
		if c == colFuelFlow {
			if j == 0 {
				d.running = d.running[:0]
			}
			d.running = append(d.running, x > 0)
			if x > 0 {
				running++
			} else if off == "" {
				off = names[j]
			}
			sum += x
			continue
		}
		if len(b) > 0 && x > 0 && (len(d.running) != len(m.eng[c]) || d.running[j]) {
			sum += x
			k++
		}
	}
	if c == colFuelFlow {
		if running > 0 && off != "" {
			return 0, false, d.rejectErr(n, off, ErrEngineOut, fmt.Sprintf("engine-out row: %s is empty or 0 while %d other engine(s) run", off, running))
		}
		return sum, true, nil
	}
	if k == 0 {
		return 0, true, nil // not recorded
	}
	return sum / float64(k), true, nil
}

func (d *Decoder) rejectErr(n int, col string, kind error, reason string) error {
	_, err := d.reject(n, col, kind, reason)
	return err
}

// number reads a number with the header's decimal mark: the reject kind
// and reason when it is none.
func (d *Decoder) number(b []byte) (x float64, msg string, kind error) {
	if d.hdr.dec == ',' {
		d.num = d.num[:0]
		for _, c := range b {
			switch c {
			case ',':
				c = '.'
			case '.':
				return 0, fmt.Sprintf("%s is not a number (the decimal mark is a comma)", quoteField(b)), ErrNumber
			}
			d.num = append(d.num, c)
		}
		b = d.num
	}
	x, plain, fast := parseDecimal(b)
	if fast {
		return x, "", nil
	}
	x, err := strconv.ParseFloat(string(b), 64)
	if err == nil && (math.IsNaN(x) || math.IsInf(x, 0)) {
		return 0, "not a finite number", ErrNotFinite
	}
	if err != nil || !plain {
		return 0, fmt.Sprintf("%s is not a number", quoteField(b)), ErrNumber
	}
	return x, "", nil
}

// mappedTime reads the time of a row: one column (RFC 3339, or the
// layout's format in its zone) or a date and a time column.
func (d *Decoder) mappedTime(n int) (time.Time, bool, error) {
	h, lt := d.hdr, &d.hdr.m.lay.Time
	if d.hdr.m.date < 0 {
		tf := d.fields[h.idx[colTime]]
		if len(tf) == 0 {
			return time.Time{}, false, d.rejectErr(n, h.name[colTime], ErrEmpty, "empty")
		}
		if lt.Format == "" {
			t, ok := d.day.time(tf)
			var err error
			if !ok {
				t, err = time.Parse(time.RFC3339, string(tf))
				if _, off := t.Zone(); err == nil && (off <= -24*3600 || off >= 24*3600) {
					err = errors.New("offset of 24 h or more")
				}
			}
			if err != nil {
				return t, false, d.rejectErr(n, h.name[colTime], ErrTime, fmt.Sprintf("%s is not an RFC 3339 time such as 2026-03-01T10:22:00Z", quoteField(tf)))
			}
			return t, true, nil
		}
		t, err := time.ParseInLocation(lt.Format, string(tf), lt.Zone)
		if err != nil {
			return t, false, d.rejectErr(n, h.name[colTime], ErrTime, fmt.Sprintf("%s is not a time of the form %s", quoteField(tf), lt.FormatText))
		}
		return t, true, nil
	}
	df, cf := d.fields[d.hdr.m.date], d.fields[d.hdr.m.clk]
	if len(df) == 0 || len(cf) == 0 {
		return time.Time{}, false, d.rejectErr(n, h.name[colTime], ErrEmpty, "empty")
	}
	date, err := d.dates.date(df, lt)
	if err != nil {
		return time.Time{}, false, d.rejectErr(n, h.name[colTime], ErrTime, fmt.Sprintf("%s is not a date of the form %s", quoteField(df), lt.DateText))
	}
	secs, ns, ok := clockOf(cf, lt.ClockFormat)
	if !ok {
		clock, err := time.Parse(lt.ClockFormat, string(cf))
		if err != nil {
			return time.Time{}, false, d.rejectErr(n, h.name[colTime], ErrTime, fmt.Sprintf("%s is not a time of day of the form %s", quoteField(cf), lt.ClockText))
		}
		secs, ns = int64(clock.Hour()*3600+clock.Minute()*60+clock.Second()), clock.Nanosecond()
	}
	return d.zone.at(date.Unix()+secs, ns, lt.Zone), true, nil
}

// clockOf reads a time of day written as the layout "15:04:05" says
// (the usual one) without time.Parse: its seconds and nanoseconds.
func clockOf(b []byte, layout string) (int64, int, bool) {
	if layout != "15:04:05" || len(b) != 8 || b[2] != ':' || b[5] != ':' {
		return 0, 0, false
	}
	h, m, s := twoDigits(b[0], b[1]), twoDigits(b[3], b[4]), twoDigits(b[6], b[7])
	if h < 0 || h > 23 || m < 0 || m > 59 || s < 0 || s > 59 {
		return 0, 0, false
	}
	return int64(h*3600 + m*60 + s), 0, true
}

// zoneCache keeps the offset of the zone's period the last time fell in,
// so that a local time in that period is turned into UTC without a
// lookup in the zone's rules.
type zoneCache struct {
	loc        *time.Location
	off        int64 // seconds east of UTC
	start, end int64 // the period, Unix seconds (0: open)
}

// at is the instant of the local wall time wall (seconds since 1970 as
// if the zone were UTC) and ns in loc, as time.Date gives it.
func (z *zoneCache) at(wall int64, ns int, loc *time.Location) time.Time {
	if z.loc == loc {
		if u := wall - z.off; (z.start == 0 || u >= z.start) && (z.end == 0 || u < z.end) {
			return time.Unix(u, int64(ns)).UTC()
		}
	}
	w := time.Unix(wall, int64(ns)).UTC()
	t := time.Date(w.Year(), w.Month(), w.Day(), w.Hour(), w.Minute(), w.Second(), ns, loc)
	_, off := t.Zone()
	start, end := t.ZoneBounds()
	z.loc, z.off, z.start, z.end = loc, int64(off), 0, 0
	if !start.IsZero() {
		z.start = start.Unix()
	}
	if !end.IsZero() {
		z.end = end.Unix()
	}
	return t.UTC()
}

// dateCache keeps the date read last: the rows of a day share it.
type dateCache struct {
	key []byte
	day time.Time
}

func (c *dateCache) date(b []byte, lt *LayoutTime) (time.Time, error) {
	if c.key != nil && string(b) == string(c.key) {
		return c.day, nil
	}
	t, err := time.Parse(lt.DateFormat, string(b)) // midnight UTC of the date
	if err != nil {
		return t, err
	}
	c.key, c.day = append(c.key[:0], b...), t
	return t, nil
}
