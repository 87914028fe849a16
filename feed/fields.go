package feed

import (
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

// MaxIDBytes is the longest tail or flight id accepted, in bytes: far more
// than any registration or flight number needs.
const MaxIDBytes = 64

// badID says why a tail or flight id cannot be used, or "" when it can: a
// control character (an escape sequence could drive the terminal that
// shows it), invalid UTF-8, or more than MaxIDBytes bytes.
func badID(b []byte) string {
	if len(b) > MaxIDBytes {
		return "longer than " + strconv.Itoa(MaxIDBytes) + " bytes"
	}
	return badText(b)
}

// BadID is badID for a tail or flight id given as text (on the command
// line, say): "" when it can be used.
func BadID(s string) string { return badID([]byte(s)) }

// badText says why b cannot be shown as text, or "" when it can: a control
// character or invalid UTF-8.
func badText(b []byte) string {
	for i := 0; i < len(b); {
		r, size := utf8.DecodeRune(b[i:])
		switch {
		case r == utf8.RuneError && size <= 1:
			return "not valid UTF-8 text"
		case r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0:
			return "holds a control character (" + strconv.QuoteRune(r) + ")"
		}
		i += size
	}
	return ""
}

// pow10 holds the powers of ten that float64 represents exactly.
var pow10 = [...]float64{1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
	1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22}

// parseDecimal reads b as a number as the snapshot format writes one: an
// optional sign, digits with an optional point, an optional exponent.
// strconv also takes hexadecimal floats (0x1p16) and digit separators
// (1_000), which no export writes and which hide typing errors; plain is
// false for those and for anything else. When the digits fit 2^53 and the
// power of ten is within ±22, the value is the exact mantissa times or over
// an exact power of ten, one correctly rounded operation (Clinger 1990),
// the same value strconv.ParseFloat gives; fast is false otherwise, and the
// caller asks strconv.
func parseDecimal(b []byte) (v float64, plain, fast bool) {
	if len(b) <= 18 { // the usual field: no digit can overflow m
		if v, ok := parseShort(b); ok {
			return v, true, true
		}
	}
	i := 0
	neg := false
	if i < len(b) && (b[i] == '+' || b[i] == '-') {
		neg = b[i] == '-'
		i++
	}
	var m uint64
	digits, sig, exp := 0, 0, 0 // all digits, digits kept in m, power of ten of m's last
	overflow := false           // more significant digits than m holds
	for ; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
		digits++
		switch {
		case m == 0 && b[i] == '0': // a leading zero
		case sig < 19:
			m, sig = m*10+uint64(b[i]-'0'), sig+1
		default:
			overflow, exp = true, exp+1
		}
	}
	if i < len(b) && b[i] == '.' {
		for i++; i < len(b) && b[i] >= '0' && b[i] <= '9'; i++ {
			digits++
			switch {
			case m == 0 && b[i] == '0': // a leading zero after the point
				exp--
			case sig < 19:
				m, sig, exp = m*10+uint64(b[i]-'0'), sig+1, exp-1
			default:
				overflow = true
			}
		}
	}
	if digits == 0 {
		return 0, false, false
	}
	if i < len(b) && (b[i] == 'e' || b[i] == 'E') {
		i++
		eneg := false
		if i < len(b) && (b[i] == '+' || b[i] == '-') {
			eneg = b[i] == '-'
			i++
		}
		e, n := 0, 0
		for i < len(b) && b[i] >= '0' && b[i] <= '9' {
			if e < 10000 {
				e = e*10 + int(b[i]-'0')
			}
			i, n = i+1, n+1
		}
		if n == 0 {
			return 0, false, false
		}
		if eneg {
			e = -e
		}
		exp += e
	}
	if i != len(b) {
		return 0, false, false
	}
	if overflow || m > 1<<53 || exp < -22 || exp > 22 {
		return 0, true, false
	}
	v = float64(m)
	if exp >= 0 {
		v *= pow10[exp]
	} else {
		v /= pow10[-exp]
	}
	if neg {
		v = -v
	}
	return v, true, true
}

// parseShort is parseDecimal's path for a field of at most 18 bytes with
// no exponent, in one loop without the overflow bookkeeping (18 digits fit
// a uint64); ok is false where it does not apply, and the full path
// decides.
func parseShort(b []byte) (v float64, ok bool) {
	i, neg := 0, false
	if len(b) > 0 && (b[0] == '-' || b[0] == '+') {
		neg, i = b[0] == '-', 1
	}
	var m uint64
	digits, exp := 0, 0
	for ; i < len(b); i++ {
		c := b[i] - '0'
		if c > 9 {
			break
		}
		m, digits = m*10+uint64(c), digits+1
	}
	if i < len(b) && b[i] == '.' {
		for i++; i < len(b); i++ {
			c := b[i] - '0'
			if c > 9 {
				break
			}
			m, digits, exp = m*10+uint64(c), digits+1, exp-1
		}
	}
	if digits == 0 || i != len(b) || m > 1<<53 || exp < -22 {
		return 0, false
	}
	v = float64(m) // exact: m ≤ 2^53
	if exp != 0 && m != 0 {
		v /= pow10[-exp] // one correctly rounded division; none for a whole number or a zero
	}
	if neg {
		v = -v
	}
	return v, true
}

// quoteField quotes a field for a message, cut to 40 bytes: a hostile file
// can hold a 300-digit number or a field of megabytes.
func quoteField(b []byte) string {
	if len(b) > 40 {
		cut := 40
		for cut > 0 && !utf8.RuneStart(b[cut]) {
			cut--
		}
		return strconv.Quote(string(b[:cut])) + "…"
	}
	return strconv.Quote(string(b))
}

// PlainText is free text (an event's kind or note) with each control
// character made a space and invalid UTF-8 made U+FFFD, so that it can be
// printed to a terminal or into a table as it is.
func PlainText(s string) string {
	if badText([]byte(s)) == "" {
		return s
	}
	return strings.Map(func(r rune) rune {
		if r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0 {
			return ' '
		}
		return r
	}, strings.ToValidUTF8(s, "\uFFFD"))
}

// fastTime reads the commonest time of an export, "2026-03-01T10:22:00Z"
// (exactly that form, UTC, whole seconds), without time.Parse; ok is false
// for anything else, which time.Parse then reads (and judges). The fields
// are checked as time.Parse checks them, so both give the same instant.
func fastTime(b []byte) (time.Time, bool) {
	if len(b) != 20 || b[4] != '-' || b[7] != '-' || b[10] != 'T' || b[13] != ':' || b[16] != ':' || b[19] != 'Z' {
		return time.Time{}, false
	}
	num := func(i, n int) int {
		v := 0
		for _, c := range b[i : i+n] {
			if c < '0' || c > '9' {
				return -1
			}
			v = v*10 + int(c-'0')
		}
		return v
	}
	y, mo, d, h, mi, s := num(0, 4), num(5, 2), num(8, 2), num(11, 2), num(14, 2), num(17, 2)
	if y < 0 || mo < 1 || mo > 12 || d < 1 || h < 0 || h > 23 || mi < 0 || mi > 59 || s < 0 || s > 59 {
		return time.Time{}, false
	}
	if d > daysIn(time.Month(mo), y) {
		return time.Time{}, false
	}
	return time.Date(y, time.Month(mo), d, h, mi, s, 0, time.UTC), true
}

// dayCache is fastTime for a run of rows on one day: the rows of a
// recording (and most of an export) share their date, so the date is read
// and checked once, and each row adds its time of day to the day's
// midnight. It gives the same instant as fastTime (the same Time value).
type dayCache struct {
	key [11]byte // "2026-03-01T" of the day held
	day time.Time
	set bool
}

func (c *dayCache) time(b []byte) (time.Time, bool) {
	if c.set && len(b) == 20 && string(b[:11]) == string(c.key[:]) && b[13] == ':' && b[16] == ':' && b[19] == 'Z' {
		h, mi, s := twoDigits(b[11], b[12]), twoDigits(b[14], b[15]), twoDigits(b[17], b[18])
		if h >= 0 && h <= 23 && mi >= 0 && mi <= 59 && s >= 0 && s <= 59 {
			return c.day.Add(time.Duration(h*3600+mi*60+s) * time.Second), true
		}
		return time.Time{}, false
	}
	t, ok := fastTime(b)
	if ok {
		copy(c.key[:], b[:11])
		c.day, c.set = time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC), true
	}
	return t, ok
}

// twoDigits is the number written by two ASCII digits, or −1.
func twoDigits(a, b byte) int {
	if a-'0' > 9 || b-'0' > 9 {
		return -1
	}
	return int(a-'0')*10 + int(b-'0')
}

// daysIn is the number of days of month m in year y (Gregorian).
func daysIn(m time.Month, y int) int {
	if m == time.February {
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	}
	return 31 - int(m-1)%7%2
}
