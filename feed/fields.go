package feed

import (
	"strconv"
	"strings"
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

// plainDecimal reports whether b is a number as the snapshot format writes
// one: an optional sign, digits with an optional point, an optional
// exponent. strconv also takes hexadecimal floats (0x1p16) and digit
// separators (1_000), which no export writes and which hide typing errors.
func plainDecimal(b []byte) bool {
	i := 0
	if i < len(b) && (b[i] == '+' || b[i] == '-') {
		i++
	}
	digits := 0
	for i < len(b) && b[i] >= '0' && b[i] <= '9' {
		i, digits = i+1, digits+1
	}
	if i < len(b) && b[i] == '.' {
		i++
		for i < len(b) && b[i] >= '0' && b[i] <= '9' {
			i, digits = i+1, digits+1
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(b) && (b[i] == 'e' || b[i] == 'E') {
		i++
		if i < len(b) && (b[i] == '+' || b[i] == '-') {
			i++
		}
		exp := 0
		for i < len(b) && b[i] >= '0' && b[i] <= '9' {
			i, exp = i+1, exp+1
		}
		if exp == 0 {
			return false
		}
	}
	return i == len(b)
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

// plainText is free text (an event's kind or note) with each control
// character made a space and invalid UTF-8 made U+FFFD, so that it can be
// printed to a terminal or into a table as it is.
func plainText(s string) string {
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
