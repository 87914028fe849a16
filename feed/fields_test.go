package feed

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// Rows that once were accepted or misread: control characters in ids (an
// escape sequence set the terminal's title and blanked the Fleet screen),
// hexadecimal and digit-separated numbers, a +24:00 offset; and messages
// that printed a 300-digit field whole.
func TestHostileFields(t *testing.T) {
	row := func(tm, tail, flight, weight string) string {
		return "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n" +
			tm + "," + tail + "," + flight + "," + weight + ",35000,0.78,-54.3,2380\n"
	}
	ok := "2026-03-01T10:22:00Z"
	cases := []struct {
		name, data, column, reason string
	}{
		{"escape in a tail", row(ok, "EV\x1b]0;pwn\x07IL", "F1", "65000"), "tail", "control character"},
		{"C1 control in a tail", row(ok, "EV\u009bIL", "F1", "65000"), "tail", "control character"},
		{"bell in a flight", row(ok, "DD101", "F\x07", "65000"), "flight", "control character"},
		{"invalid UTF-8 tail", row(ok, "DD\xff101", "F1", "65000"), "tail", "UTF-8"},
		{"tail of 65 bytes", row(ok, strings.Repeat("A", 65), "F1", "65000"), "tail", "longer than 64"},
		{"hexadecimal float", row(ok, "DD101", "F1", "0x1p16"), "weight_kg", "not a number"},
		{"digit separators", row(ok, "DD101", "F1", "65_000"), "weight_kg", "not a number"},
		{"offset +24:00", row("2026-03-01T10:22:00+24:00", "DD101", "F1", "65000"), "time", "RFC 3339"},
		{"300-digit field cut in the message", row(ok, "DD101", "F1", strings.Repeat("9", 300)+"x"), "weight_kg", "…"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			recs, rejects, _, err := readAll(t, "x.csv", c.data)
			if err != nil || len(recs) != 0 || len(rejects) != 1 {
				t.Fatalf("accepted %d, rejects %v, err %v; want one reject", len(recs), rejects, err)
			}
			r := rejects[0]
			if r.Column != c.column || !strings.Contains(r.Error(), c.reason) || len(r.Error()) > 200 {
				t.Errorf("reject %q (column %s), want column %s with %q in at most 200 bytes", r.Error(), r.Column, c.column, c.reason)
			}
		})
	}
	for _, good := range []string{"65000", "6.5e4", "+65000.", ".5e5", "6.5E+04"} {
		if recs, rejects, _, _ := readAll(t, "x.csv", row(ok, "DD-101 ü", "F1", good)); len(recs) != 1 {
			t.Errorf("%s: %v", good, rejects)
		}
	}
}

// Two exports joined into one file, kg then lb: the second header starts a
// new layout with a notice, so the lb rows are converted (they were read
// as kg and entered the trends at −21 %). A second header that cannot be
// used ends the file with its line named.
func TestRepeatedHeader(t *testing.T) {
	kg := "time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n2026-03-01T10:00:00Z,DD101,65000,35000,0.78,-54.3,2380\n"
	lb := "time,tail,weight_lb,alt_ft,mach,sat_c,fuel_flow_lbph\n2026-03-01T11:00:00Z,DD101,143300,35000,0.78,-54.3,5247\n"
	dir := t.TempDir()
	p := filepath.Join(dir, "joined.csv")
	os.WriteFile(p, []byte(kg+lb), 0o644)
	var recs []Record
	res := ReadFile(p, func(r Record) { recs = append(recs, r) }, nil)
	if res.Err != nil || len(recs) != 2 || res.Stats.Rejected != 0 {
		t.Fatalf("%+v, %d records", res, len(recs))
	}
	if w := recs[1].Snap.Weight; math.Abs(w-143300*0.45359237) > 0.01 {
		t.Errorf("second block's weight %g kg, want 143300 lb in kg", w)
	}
	if ff := recs[1].Snap.FuelFlow * 3600; math.Abs(ff-5247*0.45359237) > 0.01 {
		t.Errorf("second block's fuel flow %g kg/h, want 5247 lb/h in kg/h", ff)
	}
	if len(res.Notices) != 1 || !strings.Contains(res.Notices[0], "joined.csv:3: a new header line") || !strings.Contains(res.Notices[0], "weight_lb") {
		t.Errorf("notices %q", res.Notices)
	}
	_, _, _, err := readAll(t, "bad.csv", kg+"time,tail,weight_kg\n"+"2026-03-01T11:00:00Z,DD101,65000\n")
	var fe *FileError
	if !errors.As(err, &fe) || fe.Line != 3 || !strings.Contains(err.Error(), "second header") {
		t.Errorf("unusable second header: %v", err)
	}
}

// parseDecimal gives exactly strconv.ParseFloat's value wherever it takes
// its fast path, and says when it does not (the caller then asks strconv).
func TestParseDecimalMatchesStrconv(t *testing.T) {
	cases := []string{"0", "-0", "65000", "0.78", "-54.3", "2380", "6.5e4", "+65000.", ".5e5", "6.5E+04",
		"0.000123", "123456789012345678", "1234567890123456789012", "9007199254740993", "1e22", "1e23", "1e-22", "1e-23",
		"3.141592653589793238", "0.1", "0.30000000000000004", "100000000000000000000000", "000123.4500", "1e400", "4.9e-324",
		"-.5", "5.", "+0.0", "-0.000", "9007199254740992", "0.0000000000000000001", "00000000000000000.1"}
	rng := rand.New(rand.NewPCG(5, 6))
	for i := 0; i < 20000; i++ {
		cases = append(cases, strconv.FormatFloat((rng.Float64()-0.5)*math.Pow(10, float64(rng.IntN(12)-4)), 'f', rng.IntN(8), 64))
	}
	for _, c := range cases {
		v, plain, fast := parseDecimal([]byte(c))
		want, err := strconv.ParseFloat(c, 64)
		if !plain {
			t.Errorf("%q: not plain", c)
			continue
		}
		if fast && (err != nil || math.Float64bits(v) != math.Float64bits(want)) {
			t.Errorf("%q: fast %v, strconv %v (%v)", c, v, want, err)
		}
	}
	for _, bad := range []string{"", ".", "-", "1e", "1e+", "0x1p16", "1_000", "1.2.3", "inf", "NaN", " 1", "1 "} {
		if _, plain, _ := parseDecimal([]byte(bad)); plain {
			t.Errorf("%q taken as a plain decimal", bad)
		}
	}
}

// dayCache gives the very Time value fastTime gives, row after row, for
// runs of rows on one day, a new day, and rows it must decline.
func TestDayCacheMatchesFastTime(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	var c dayCache
	day := "2026-03-01T"
	for i := 0; i < 20000; i++ {
		if rng.IntN(500) == 0 {
			day = fmt.Sprintf("%04d-%02d-%02dT", 1990+rng.IntN(60), 1+rng.IntN(12), 1+rng.IntN(31))
		}
		row := fmt.Sprintf("%s%02d:%02d:%02dZ", day, rng.IntN(25), rng.IntN(61), rng.IntN(61))
		switch rng.IntN(50) {
		case 0:
			row = row[:19] + "+00:00"
		case 1:
			row = row[:12] + "x" + row[13:]
		}
		got, ok := c.time([]byte(row))
		want, wok := fastTime([]byte(row))
		if ok != wok || got != want {
			t.Fatalf("%q: cached %v %v, fastTime %v %v", row, got, ok, want, wok)
		}
	}
}

// FuzzParseDecimal: wherever parseDecimal takes a value as its own, it is
// strconv.ParseFloat's, bit for bit.
func FuzzParseDecimal(f *testing.F) {
	for _, c := range []string{"65000", "-54.3", "0.78", "6.5e4", "-.5", "123456789012345678"} {
		f.Add(c)
	}
	f.Fuzz(func(t *testing.T, c string) {
		v, _, fast := parseDecimal([]byte(c))
		if !fast {
			return
		}
		want, err := strconv.ParseFloat(c, 64)
		if err != nil || math.Float64bits(v) != math.Float64bits(want) {
			t.Errorf("%q: fast %v, strconv %v (%v)", c, v, want, err)
		}
	})
}

// fastTime gives the instant time.Parse gives, and declines all it cannot
// read exactly (time.Parse then judges those).
func TestFastTimeMatchesParse(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	cases := []string{"2026-03-01T10:22:00Z", "2024-02-29T23:59:59Z", "2023-02-29T00:00:00Z", "2026-13-01T00:00:00Z",
		"2026-04-31T00:00:00Z", "2026-03-01T24:00:00Z", "2026-03-01T10:60:00Z", "2026-03-01T10:22:60Z", "2026-03-01T10:22:00+00:00",
		"2026-03-01t10:22:00Z", "2026-03-01T10:22:00.5Z", "0000-01-01T00:00:00Z", "2026-03-01T10:22:0xZ"}
	for i := 0; i < 5000; i++ {
		cases = append(cases, fmt.Sprintf("%04d-%02d-%02dT%02d:%02d:%02dZ", 1900+rng.IntN(300), rng.IntN(14), rng.IntN(33), rng.IntN(26), rng.IntN(62), rng.IntN(62)))
	}
	for _, c := range cases {
		got, ok := fastTime([]byte(c))
		want, err := time.Parse(time.RFC3339, c)
		if ok && (err != nil || !got.Equal(want) || got.Location() != want.Location()) {
			t.Errorf("%q: fast %v, time.Parse %v (%v)", c, got, want, err)
		}
		if !ok && err == nil && len(c) == 20 && c[19] == 'Z' {
			t.Errorf("%q: declined a time that time.Parse reads", c)
		}
	}
}
