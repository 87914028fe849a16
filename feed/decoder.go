package feed

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"math/bits"
	"time"
)

// maxLine bounds one physical line, so that memory stays flat on any input.
const maxLine = 1 << 20

var utf8BOM = []byte{0xEF, 0xBB, 0xBF}

// Decoder turns the physical lines of a snapshot CSV into records. It is fed
// one line at a time, so the file reader and the follower of a growing file
// share it. Lines starting with '#' and blank lines are skipped; the first
// other line is the header. Fields are quoted as in RFC 4180 ("" is a quote
// inside a quoted field), but a field may not span lines: a quoted field
// still open at the end of its line rejects that row alone, and reading goes
// on with the next line, so that one stray quote cannot swallow the rows
// after it.
type Decoder struct {
	name  string
	hdr   *header
	first bool // no line seen yet (a UTF-8 BOM may lead it)
	// layout maps an export's own columns (nil: dragdeck's); sep is the
	// field separator; num a buffer for a number with a decimal comma
	layout  *Layout
	sep     byte
	num     []byte
	running []bool // the engines with a fuel flow in the row (per-engine columns)

	fields  [][]byte
	scratch []byte
	// the interned tail and flight names
	tails, flights idTable
	// the day of the row before: its rows share it too (dates: of a
	// layout's date column)
	day   dayCache
	dates dateCache
	zone  zoneCache

	stats Stats

	// CheckTail, when set, rejects the rows of tails it gives a reason
	// for (a tail that the fleet file does not name, §3.4).
	CheckTail TailCheck
	// Notice, when set, is told of a new header line in the middle of
	// the input (two exports joined): the rows after it are read with its
	// columns and units.
	Notice func(string)
	// stopAtHeader makes a header line inside the input an errHeaderInPart
	// (a part of a file read on its own cannot know the layout after it).
	stopAtHeader bool
}

// errHeaderInPart is a header line met by a decoder with stopAtHeader.
var errHeaderInPart = errors.New("a header line inside the part")

// TailCheck says why a tail's snapshot at time t cannot be analysed, or ""
// when it can.
type TailCheck func(tail string, t time.Time) string

// NewDecoder returns a decoder for the file called name (used in errors).
func NewDecoder(name string) *Decoder {
	return &Decoder{name: name, first: true, sep: ','}
}

// SetLayout reads the input through layout l (nil: dragdeck's own
// columns); it must be set before the header line.
func (d *Decoder) SetLayout(l *Layout) {
	d.layout, d.sep = l, ','
	if l != nil {
		d.sep = l.Sep
	}
}

// Mapping is how each dragdeck field is found under the layout, a line a
// field, once the header is read (nil without a layout).
func (d *Decoder) Mapping() []string { return d.hdr.Describe() }

// Stats returns the rows counted so far.
func (d *Decoder) Stats() Stats { return d.stats }

// Unknown returns the ignored columns of the header, if any.
func (d *Decoder) Unknown() []string {
	if d.hdr == nil {
		return nil
	}
	return d.hdr.unknown
}

// Line feeds physical line n (1-based, without its line terminator). It
// returns ok = true and the record for an accepted row; a *RowError for a
// rejected row; a *FileError when the file cannot be read as snapshots; or
// nothing for a comment, a blank line or the header. The decoder does not
// keep line after it returns.
func (d *Decoder) Line(line []byte, n int) (rec Record, ok bool, err error) {
	ok, err = d.lineInto(&rec, line, n)
	return rec, ok, err
}

// lineInto is Line writing the record into rec (a slot of the caller's, so
// that a record of about 180 bytes is not copied on its way out); rec is
// unspecified unless ok.
func (d *Decoder) lineInto(rec *Record, line []byte, n int) (ok bool, err error) {
	if d.first {
		line = bytes.TrimPrefix(line, utf8BOM)
		d.first = false
	}
	if k := len(line); k > 0 && line[k-1] == '\r' {
		line = line[:k-1]
	}
	if len(line) > 0 && line[0] == '#' || len(bytes.TrimSpace(line)) == 0 {
		return false, nil
	}
	return d.record(rec, line, n)
}

// End finishes the input: a file with no header is a *FileError.
func (d *Decoder) End() error {
	if d.hdr == nil {
		return &FileError{File: d.name, Reason: "no header line (the file is empty or holds only comments)"}
	}
	return nil
}

// TooLong rejects line n for being longer than the reader accepts.
func (d *Decoder) TooLong(n int) error {
	if d.hdr == nil {
		return &FileError{File: d.name, Line: n, Reason: fmt.Sprintf("header line longer than %d MiB", maxLine>>20)}
	}
	_, err := d.reject(n, "row", ErrTooLong, fmt.Sprintf("line longer than %d MiB", maxLine>>20))
	return err
}

func (d *Decoder) reject(n int, col string, kind error, reason string) (bool, error) {
	d.stats.Read++
	d.stats.Rejected++
	return false, &RowError{File: d.name, Line: n, Column: col, Reason: reason, Err: kind}
}

// record handles one complete CSV record that starts on line n: an
// accepted row is written into out.
func (d *Decoder) record(out *Record, rec []byte, n int) (bool, error) {
	if msg, bad := d.split(rec); msg != "" {
		if d.hdr == nil {
			return false, &FileError{File: d.name, Line: n, Reason: "header: " + msg}
		}
		return d.reject(n, d.hdr.fieldName(bad), ErrQuote, msg)
	}
	if d.hdr == nil {
		if d.layout == nil && len(d.fields) == 1 && bytes.Count(rec, []byte{';'}) > 0 {
			return false, &FileError{File: d.name, Line: n, Reason: "the header is separated by semicolons, not commas " +
				"(a spreadsheet export with decimal commas?): save the file as comma-separated with decimal points"}
		}
		var h *header
		var msg string
		if d.layout != nil {
			h, msg = mapHeader(d.fields, d.layout)
		} else {
			h, msg = parseHeader(d.fields)
		}
		if msg != "" {
			return false, &FileError{File: d.name, Line: n, Reason: msg, Events: msg == eventsHeader}
		}
		d.hdr = h
		return false, nil
	}
	if d.hdr.m == nil && d.hdr.idx[colTime] < len(d.fields) && !isDigit(d.fields[d.hdr.idx[colTime]]) && isHeader(d.fields) {
		if d.stopAtHeader {
			return false, errHeaderInPart
		}
		h, msg := parseHeader(d.fields)
		if msg != "" {
			return false, &FileError{File: d.name, Line: n, Reason: "a second header line that cannot be used: " + msg}
		}
		if d.Notice != nil {
			d.Notice(fmt.Sprintf("%s:%d: a new header line; the rows after it are read with its columns (%s)", d.name, n, h.layout()))
		}
		d.hdr = h
		return false, nil
	}
	return d.row(out, n)
}

// isDigit reports whether b starts with a digit, as every time does (so
// that a data row is not looked at as a header again).
func isDigit(b []byte) bool { return len(b) > 0 && b[0] >= '0' && b[0] <= '9' }

// isHeader reports whether the fields of a line after the header are a
// header again (two exports joined into one file): they name the time and
// tail columns, which no data row can hold as its time.
func isHeader(fields [][]byte) bool {
	var t, tail bool
	for _, f := range fields {
		t = t || bytes.EqualFold(f, []byte("time"))
		tail = tail || bytes.EqualFold(f, []byte("tail"))
	}
	return t && tail
}

// splitPlain splits a line with no quote in one pass over its bytes (the
// fields of a snapshot row are short, so one pass beats a search per
// field), eight bytes at a time: a word with neither a comma nor a quote
// is skipped whole. It reports false, with d.fields to be discarded, at a
// quote.
func (d *Decoder) splitPlain(rec []byte) bool {
	start, i := 0, 0
	for ; i+8 <= len(rec); i += 8 {
		w := binary.LittleEndian.Uint64(rec[i:])
		m := byteMask(w, d.sep) | byteMask(w, '"')
		for m != 0 {
			k := i + bits.TrailingZeros64(m)/8
			if rec[k] == '"' {
				return false
			}
			d.appendField(rec[start:k])
			start = k + 1
			m &= m - 1
		}
	}
	for ; i < len(rec); i++ {
		switch rec[i] {
		case d.sep:
			d.appendField(rec[start:i])
			start = i + 1
		case '"':
			return false
		}
	}
	d.appendField(rec[start:])
	return true
}

// byteMask has the top bit of each byte of w that equals c set, and no
// other bit (exact per byte, with no borrow from one byte to the next).
func byteMask(w uint64, c byte) uint64 {
	const lo7 = 0x7f7f7f7f7f7f7f7f
	x := w ^ (0x0101010101010101 * uint64(c))
	return ^((x&lo7 + lo7) | x | lo7)
}

// appendField adds one unquoted field, trimmed as bytes.TrimSpace trims.
func (d *Decoder) appendField(f []byte) {
	if !plainField(f) {
		f = bytes.TrimSpace(f)
	}
	d.fields = append(d.fields, f)
}

// plainField says that a field neither starts nor ends with a space or a
// non-ASCII byte, so that bytes.TrimSpace would return it as it is: the
// usual field, checked inline in the split loop.
func plainField(f []byte) bool {
	n := len(f)
	return n > 0 && f[0]-'!' < 0x7f-'!' && f[n-1]-'!' < 0x7f-'!'
}

// split splits one line into d.fields by RFC 4180 rules, and is the one
// place that knows them. Unquoted fields are trimmed of spaces; quoted
// fields keep their content with "" as one quote. On a quoting error it
// returns the reason and the index of the field at fault.
func (d *Decoder) split(rec []byte) (string, int) {
	d.fields = d.fields[:0]
	if d.splitPlain(rec) { // fast path: no quoting
		return "", 0
	}
	d.fields = d.fields[:0]
	if cap(d.scratch) < len(rec) {
		d.scratch = make([]byte, 0, len(rec))
	}
	buf := d.scratch[:0]
	for {
		rest := bytes.TrimLeft(rec, " \t")
		if len(rest) > 0 && rest[0] == '"' {
			start := len(buf)
			rest = rest[1:]
			for {
				i := bytes.IndexByte(rest, '"')
				if i < 0 {
					return "quoted field not closed on its line (fields may not span lines)", len(d.fields)
				}
				buf = append(buf, rest[:i]...)
				rest = rest[i+1:]
				if len(rest) > 0 && rest[0] == '"' {
					buf = append(buf, '"')
					rest = rest[1:]
					continue
				}
				break
			}
			d.fields = append(d.fields, buf[start:len(buf):len(buf)])
			rest = bytes.TrimLeft(rest, " \t")
			if len(rest) == 0 {
				return "", 0
			}
			if rest[0] != d.sep {
				return "text after a closing quote", len(d.fields) - 1
			}
			rec = rest[1:]
			continue
		}
		i := bytes.IndexByte(rec, d.sep)
		f := rec
		if i >= 0 {
			f = rec[:i]
		}
		if bytes.IndexByte(f, '"') >= 0 {
			return `a quote (") inside an unquoted field`, len(d.fields)
		}
		d.fields = append(d.fields, bytes.TrimSpace(f))
		if i < 0 {
			return "", 0
		}
		rec = rec[i+1:]
	}
}

// row converts the fields of data line n into the record rec (every field
// of it written).
func (d *Decoder) row(rec *Record, n int) (bool, error) {
	h := d.hdr
	if len(d.fields) != h.n {
		return d.reject(n, "row", ErrFields, fmt.Sprintf("%d fields, the header has %d", len(d.fields), h.n))
	}
	f := func(c column) []byte { return d.fields[h.idx[c]] }

	*rec = Record{File: d.name, Line: n}
	var v [numColumns]float64
	if h.m != nil {
		if ok, err := d.mappedRow(rec, n, &v); !ok {
			return ok, err
		}
		return d.finish(rec, n, &v)
	}
	tf := f(colTime)
	if len(tf) == 0 {
		return d.reject(n, h.name[colTime], ErrEmpty, "empty")
	}
	t, ok := d.day.time(tf)
	var err error
	if !ok {
		t, err = time.Parse(time.RFC3339, string(tf))
		if _, off := t.Zone(); err == nil && (off <= -24*3600 || off >= 24*3600) {
			err = errors.New("offset of 24 h or more") // RFC 3339 offsets have hours 00–23
		}
	}
	if err != nil {
		return d.reject(n, h.name[colTime], ErrTime, fmt.Sprintf("%s is not an RFC 3339 time such as 2026-03-01T10:22:00Z", quoteField(tf)))
	}
	rec.Time = t.UTC() // UTC inside, whatever offset the file uses
	tail := f(colTail)
	if len(tail) == 0 {
		return d.reject(n, h.name[colTail], ErrEmpty, "empty")
	}
	var why string
	if rec.Tail, why = d.tails.intern(tail); why != "" {
		return d.reject(n, h.name[colTail], ErrID, why)
	}
	if h.idx[colFlight] >= 0 {
		if d.flights.n > 1<<16 { // a file of unique flight ids: memory stays flat
			d.flights.reset()
		}
		if rec.Flight, why = d.flights.intern(f(colFlight)); why != "" {
			return d.reject(n, h.name[colFlight], ErrID, why)
		}
	}

	for c := colWeight; c < numColumns; c++ {
		if h.idx[c] < 0 {
			continue
		}
		x, ok, err := d.value(n, c)
		if !ok {
			return false, err
		}
		v[c] = x
	}
	return d.finish(rec, n, &v)
}

// value reads the number of column c in line n: 0 for an optional one
// left empty, a reject for an empty required one or one that is no
// number.
func (d *Decoder) value(n int, c column) (float64, bool, error) {
	h := d.hdr
	b := d.fields[h.idx[c]]
	if len(b) == 0 {
		if c <= colTemp {
			return 0, false, d.rejectErr(n, h.name[c], ErrEmpty, "empty")
		}
		return 0, true, nil // optional: 0
	}
	x, msg, kind := d.number(b)
	if kind != nil {
		return 0, false, d.rejectErr(n, h.name[c], kind, msg)
	}
	return x, true, nil
}

// finish converts the values of a row, in the units h.unit names, into the
// snapshot, and checks it.
func (d *Decoder) finish(rec *Record, n int, v *[numColumns]float64) (bool, error) {
	h := d.hdr
	s := &rec.Snap
	s.Weight = v[colWeight]
	if h.unit[colWeight] == unitLb {
		s.Weight = KgFromLb(v[colWeight])
	}
	s.Altitude = MetresFromFeet(v[colAlt])
	if h.unit[colAlt] == unitM {
		s.Altitude = v[colAlt]
	}
	s.Mach = v[colMach]
	s.FuelFlow = KgPerSFromKgPerH(v[colFuelFlow])
	if h.unit[colFuelFlow] == unitLbph {
		s.FuelFlow = KgPerSFromLbPerH(v[colFuelFlow])
	}
	s.SAT = KelvinFromCelsius(v[colTemp])
	if h.unit[colTemp] == unitTAT {
		s.SAT = SATFromTAT(s.SAT, s.Mach)
	}
	s.Bank = RadFromDeg(v[colBank])
	s.VS = MPerSFromFtPerMin(v[colVS])
	s.Accel = MPerS2FromKtPerMin(v[colAccel])
	s.N1 = v[colN1] // % stays %; an empty field is 0, "not recorded"
	if v[colSamples] < 0 || v[colSamples] != math.Trunc(v[colSamples]) || v[colSamples] > 1e9 {
		return d.reject(n, h.name[colSamples], ErrRange, fmt.Sprintf("must be a whole number ≥ 0, got %g", v[colSamples]))
	}
	if !(v[colSeconds] >= 0 && v[colSeconds] <= 1e7) {
		return d.reject(n, h.name[colSeconds], ErrRange, fmt.Sprintf("must be 0 … 1e7 s, got %g", v[colSeconds]))
	}
	rec.Samples, rec.Seconds = int(v[colSamples]), v[colSeconds]
	if h.idx[colN1] >= 0 && s.N1 == 0 && h.m == nil && len(d.fields[h.idx[colN1]]) > 0 {
		return d.reject(n, h.name[colN1], ErrRange, fmt.Sprintf("fan speed must be in (0, %g] %%, got 0 %% (leave the field empty when it is not recorded)", MaxN1Pct))
	}
	if e := CheckSnapshot(*s); e != nil {
		col := h.name[fieldColumn[e.Field]]
		switch {
		case e.Field == FieldSAT && h.unit[colTemp] == unitTAT && e.Err == ErrRange:
			e.Reason = fmt.Sprintf("%s (from TAT %g °C at Mach %g)", e.Reason, v[colTemp], v[colMach])
		case e.Field == FieldAltitude && h.unit[colAlt] == unitM && e.Err == ErrRange:
			e.Reason = fmt.Sprintf("%s (from %g m)", e.Reason, v[colAlt])
		}
		return d.reject(n, col, e.Err, e.Reason)
	}
	if d.CheckTail != nil {
		if why := d.CheckTail(rec.Tail, rec.Time); why != "" {
			return d.reject(n, h.name[colTail], ErrNotInFleet, why)
		}
	}
	d.stats.Read++
	d.stats.Accepted++
	return true, nil
}

// fieldColumn maps a validated field to its column.
var fieldColumn = map[Field]column{
	FieldWeight: colWeight, FieldAltitude: colAlt, FieldMach: colMach, FieldFuelFlow: colFuelFlow,
	FieldSAT: colTemp, FieldBank: colBank, FieldVS: colVS, FieldAccel: colAccel, FieldN1: colN1,
}
