package feed

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"dragdeck/model"
)

const fixtures = "../testdata/snapshots"

// readAll reads a whole stream, returning accepted records, rejects and the
// final error (nil at a clean end).
func readAll(t testing.TB, name, data string) ([]Record, []*RowError, Stats, error) {
	t.Helper()
	r := NewReader(strings.NewReader(data), name)
	var recs []Record
	var rejects []*RowError
	for {
		rec, err := r.Next()
		if err == nil {
			recs = append(recs, rec)
			continue
		}
		var re *RowError
		if errors.As(err, &re) {
			rejects = append(rejects, re)
			continue
		}
		if err == io.EOF {
			err = nil
		}
		return recs, rejects, r.Stats(), err
	}
}

func readFixture(t *testing.T, name string) ([]Record, []*RowError, Stats) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(fixtures, name))
	if err != nil {
		t.Fatal(err)
	}
	recs, rejects, st, err := readAll(t, name, string(data))
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	if st.Read != st.Accepted+st.Rejected || st.Accepted != len(recs) || st.Rejected != len(rejects) {
		t.Fatalf("%s: stats %+v for %d accepted, %d rejected", name, st, len(recs), len(rejects))
	}
	return recs, rejects, st
}

// A file in pounds, metres and TAT (with a BOM, CRLF, quoting, columns in
// another order and an unknown column) gives the same deviations as its
// kilogram/SAT twin: the unit conversions are exact definitions and
// SAT = TAT/(1 + 0.2 M²).
func TestUnitTwinsAgree(t *testing.T) {
	kg, rej1, _ := readFixture(t, "good_kg_sat.csv")
	lb, rej2, _ := readFixture(t, "good_lb_tat.csv")
	if len(rej1)+len(rej2) > 0 || len(kg) != 5 || len(lb) != 5 {
		t.Fatalf("accepted %d and %d, rejected %v %v", len(kg), len(lb), rej1, rej2)
	}
	ty := DemoType()
	for i := range kg {
		a, b := model.Analyze(ty, kg[i].Snap), model.Analyze(ty, lb[i].Snap)
		if math.Abs(a.DragDevPct-b.DragDevPct) > 1e-9 || math.Abs(a.FuelFlowDevPct-b.FuelFlowDevPct) > 1e-9 {
			t.Errorf("row %d: deviation %.12f vs %.12f %%", i, a.DragDevPct, b.DragDevPct)
		}
		if !kg[i].Time.Equal(lb[i].Time) || kg[i].Tail != lb[i].Tail || kg[i].Flight != lb[i].Flight {
			t.Errorf("row %d: identity differs: %+v vs %+v", i, kg[i], lb[i])
		}
	}
	if lb[0].Line != 4 {
		t.Errorf("first data row of the twin on line %d, want 4 (after comment, blank line, header)", lb[0].Line)
	}
}

// Every reject reason of DESIGN.md §3.1, each on its own line of the fixture.
func TestRejectReasons(t *testing.T) {
	recs, rejects, st := readFixture(t, "rejects.csv")
	want := []struct {
		line int
		col  string
		kind error
	}{
		{4, "row", ErrFields},
		{5, "time", ErrTime},
		{6, "time", ErrEmpty},
		{7, "tail", ErrEmpty},
		{8, "weight_kg", ErrNumber},
		{9, "weight_kg", ErrRange},
		{10, "alt_ft", ErrRange},
		{11, "mach", ErrRange},
		{12, "mach", ErrRange},
		{13, "sat_c", ErrRange},
		{14, "fuel_flow_kgph", ErrRange},
		{15, "fuel_flow_kgph", ErrEmpty},
		{16, "bank_deg", ErrRange},
		{17, "mach", ErrNotFinite},
		{18, "bank_deg", ErrNotFinite},
		{19, "flight", ErrQuote},
		{20, "flight", ErrQuote},
	}
	if len(rejects) != len(want) {
		for _, r := range rejects {
			t.Log(r)
		}
		t.Fatalf("%d rejects, want %d", len(rejects), len(want))
	}
	for i, w := range want {
		r := rejects[i]
		if r.Line != w.line || r.Column != w.col || !errors.Is(r, w.kind) || r.File != "rejects.csv" {
			t.Errorf("reject %d = %v (%v), want line %d column %s kind %v", i, r, r.Err, w.line, w.col, w.kind)
		}
	}
	if len(recs) != 3 || recs[1].Flight != `flight, "quoted"` || recs[1].Line != 21 || recs[2].Line != 23 {
		t.Errorf("accepted %+v", recs)
	}
	if st.Read != 20 {
		t.Errorf("read %d rows, want 20", st.Read)
	}
	if got := rejects[0].Error(); got != "rejects.csv:4: row: 8 fields, the header has 9" {
		t.Errorf("message %q", got)
	}
}

func TestFileErrors(t *testing.T) {
	tests := []struct {
		name, data, want string
	}{
		{"empty file", "", "x.csv: no header line"},
		{"only comments", "# nothing\n\n", "x.csv: no header line"},
		{"missing column", "time,tail,weight_kg,alt_ft,mach,sat_c\n", "x.csv:1: missing required column(s) fuel_flow_kgph (or fuel_flow_lbph); the accepted columns are time, tail,"},
		{"missing temperature", "time,tail,weight_kg,alt_ft,mach,fuel_flow_kgph\n", "missing required column(s) sat_c (or tat_c)"},
		{"every missing column named", "time,tail,mach\n", "missing required column(s) weight_kg (or weight_lb), alt_ft (or alt_m), fuel_flow_kgph (or fuel_flow_lbph), sat_c (or tat_c);"},
		{"semicolons", "time;tail;weight_kg;alt_ft;mach;sat_c;fuel_flow_kgph\n2026-03-01T10:22:00Z;DD101;65000;35000;0,78;-54,3;2380\n", "x.csv:1: the header is separated by semicolons, not commas"},
		{"two units", "time,tail,weight_kg,weight_lb,alt_ft,mach,sat_c,fuel_flow_kgph\n", "columns weight_kg and weight_lb both given"},
		{"duplicate", "# c\ntime,tail,weight_kg,alt_ft,mach,mach,sat_c,fuel_flow_kgph\n", "x.csv:2: column mach appears twice"},
		{"bad header quoting", "time,\"tail\"x\n", "x.csv:1: header: text after a closing quote"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, _, _, err := readAll(t, "x.csv", tc.data)
			var fe *FileError
			if !errors.As(err, &fe) || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("error %v, want a FileError containing %q", err, tc.want)
			}
		})
	}
}

const minHeader = "time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"
const goodRow = "2026-03-01T10:22:00Z,DD101,65000,35000,0.78,-54.3,2380\n"

func TestReaderEdges(t *testing.T) {
	long := "2026-03-01T10:22:00Z,DD101,65000,35000,0.78,-54.3,2380" + strings.Repeat(" ", maxLine+10) + "\n"
	tests := []struct {
		name             string
		data             string
		accepted, reject int
		rejectLine       int
	}{
		{"last line without newline", minHeader + strings.TrimSuffix(goodRow, "\n"), 1, 0, 0},
		{"line over 1 MiB is rejected and reading goes on", minHeader + long + goodRow, 1, 1, 2},
		{"open quote at the end", minHeader + goodRow + "2026-03-01T10:22:00Z,\"DD1", 1, 1, 3},
		// A quoted field may not span lines: a stray quote rejects its own row
		// and the rows after it are read as usual.
		{"stray quote rejects one row only", minHeader + "2026-03-01T10:22:00Z,\"DD101,65000,35000,0.78,-54.3,2380\n" + goodRow + goodRow + goodRow, 3, 1, 2},
		// a control character in an id is rejected, not shown raw
		{"CR only inside a field", minHeader + "2026-03-01T10:22:00Z,\"DD\r101\",65000,35000,0.78,-54.3,2380\r\n", 0, 1, 2},
		{"spaces around fields", minHeader + " 2026-03-01T10:22:00Z , DD101 ,65000, 35000,0.78,-54.3, 2380 \n", 1, 0, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			recs, rejects, st, err := readAll(t, "x.csv", tc.data)
			if err != nil {
				t.Fatal(err)
			}
			if len(recs) != tc.accepted || len(rejects) != tc.reject || st.Read != st.Accepted+st.Rejected {
				t.Fatalf("accepted %d rejected %d (%v), stats %+v", len(recs), len(rejects), rejects, st)
			}
			if tc.reject > 0 && rejects[0].Line != tc.rejectLine {
				t.Errorf("reject on line %d, want %d: %v", rejects[0].Line, tc.rejectLine, rejects[0])
			}
		})
	}
}

// The n1_pct column: a value is kept in %, an empty field means "not
// recorded" (0), an explicit 0 and values beyond 130 % are rejected naming
// the column.
func TestN1Column(t *testing.T) {
	data := "time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,n1_pct\n" +
		"2026-03-01T10:22:00Z,DD101,65000,35000,0.78,-54.3,2380,86.5\n" +
		"2026-03-01T10:42:00Z,DD101,65000,35000,0.78,-54.3,2380,\n" +
		"2026-03-01T11:02:00Z,DD101,65000,35000,0.78,-54.3,2380,0\n" +
		"2026-03-01T11:22:00Z,DD101,65000,35000,0.78,-54.3,2380,131\n"
	recs, rejects, st, err := readAll(t, "n1.csv", data)
	if err != nil {
		t.Fatal(err)
	}
	if len(recs) != 2 || recs[0].Snap.N1 != 86.5 || recs[1].Snap.N1 != 0 || st.Read != st.Accepted+st.Rejected {
		t.Fatalf("records %+v, stats %+v", recs, st)
	}
	if len(rejects) != 2 {
		t.Fatalf("rejects %v", rejects)
	}
	for i, want := range []struct {
		line int
		text string
	}{{4, "got 0 %"}, {5, "got 131 %"}} {
		r := rejects[i]
		if r.Line != want.line || r.Column != "n1_pct" || !errors.Is(r, ErrRange) || !strings.Contains(r.Error(), want.text) {
			t.Errorf("reject %d: %v (line %d, column %q), want line %d with %q", i, r, r.Line, r.Column, want.line, want.text)
		}
	}
}

func TestUnknownColumns(t *testing.T) {
	r := NewReader(strings.NewReader("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,Remarks,gear\n"+goodRow[:len(goodRow)-1]+",a,b\n"), "x.csv")
	if _, err := r.Next(); err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(r.Unknown(), ","); got != "remarks,gear" {
		t.Errorf("unknown columns %q", got)
	}
}

func TestExpandPaths(t *testing.T) {
	got, err := ExpandPaths([]string{fixtures})
	if err != nil || len(got) < 3 || !strings.HasSuffix(got[0], "good_kg_sat.csv") {
		t.Fatalf("ExpandPaths = %v, %v", got, err)
	}
	if _, err := ExpandPaths([]string{"no/such/dir"}); err == nil {
		t.Error("a missing path should be an error")
	}
	if _, err := ExpandPaths([]string{t.TempDir()}); err == nil || !strings.Contains(err.Error(), "no *.csv") {
		t.Errorf("empty folder: %v", err)
	}
}

// FuzzReader: on any input the reader does not panic, and every row it
// counts is either accepted or rejected (read = accepted + rejected). The
// seed corpus is the fixture files in testdata/snapshots.
func FuzzReader(f *testing.F) {
	files, _ := filepath.Glob(filepath.Join(fixtures, "*.csv"))
	for _, p := range files {
		data, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Add([]byte(minHeader + goodRow))
	f.Add([]byte("\xef\xbb\xbf" + minHeader + "\"\n\"\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		r := NewReader(bytes.NewReader(data), "fuzz.csv")
		accepted, rejected := 0, 0
		for {
			_, err := r.Next()
			if err == nil {
				accepted++
				continue
			}
			var re *RowError
			if errors.As(err, &re) {
				rejected++
				if re.Line < 1 || re.Column == "" || re.Reason == "" {
					t.Fatalf("reject without context: %+v", re)
				}
				continue
			}
			break
		}
		st := r.Stats()
		if st.Read != st.Accepted+st.Rejected || st.Accepted != accepted || st.Rejected != rejected {
			t.Fatalf("stats %+v, saw %d accepted %d rejected", st, accepted, rejected)
		}
		if lines := bytes.Count(data, []byte{'\n'}) + 1; st.Read > lines {
			t.Fatalf("%d rows from %d lines", st.Read, lines)
		}
	})
}

// An events file (DESIGN.md §3.3) beside the snapshots is recognised and
// skipped, not reported as a broken snapshot file.
func TestEventsFileIsSkipped(t *testing.T) {
	p := filepath.Join(t.TempDir(), "events.csv")
	os.WriteFile(p, []byte("# events\ntime,tail,kind,note\n2026-01-01T00:00:00Z,DD101,wash,\"exterior wash\"\n"), 0o644)
	res := ReadFile(p, nil, nil)
	if !res.Events || res.Err != nil || res.Stats.Read != 0 {
		t.Errorf("events file: %+v", res)
	}
}

// A range reject in other units names the file's own value beside the
// converted one, rounded.
func TestRejectReasonsInFileUnits(t *testing.T) {
	tests := []struct{ name, data, want string }{
		{"metres", "time,tail,weight_kg,alt_m,mach,sat_c,fuel_flow_kgph\n2026-03-01T10:22:00Z,DD101,65000,99999,0.78,-54.3,2380\n",
			"x.csv:2: alt_m: pressure altitude 328081 ft outside -1000 … 65000 ft (from 99999 m)"},
		{"total air temperature", "time,tail,weight_kg,alt_ft,mach,tat_c,fuel_flow_kgph\n2026-03-01T10:22:00Z,DD101,65000,35000,0.78,110,2380\n",
			"x.csv:2: tat_c: static air temperature 68.44 °C outside -100 … +60 °C (from TAT 110 °C at Mach 0.78)"},
	}
	for _, tc := range tests {
		_, rejects, _, err := readAll(t, "x.csv", tc.data)
		if err != nil || len(rejects) != 1 || rejects[0].Error() != tc.want {
			t.Errorf("%s: %v %v, want %q", tc.name, rejects, err, tc.want)
		}
	}
}

// Times are UTC inside, whatever offset the file uses.
func TestTimesAreUTC(t *testing.T) {
	recs, _, _, err := readAll(t, "x.csv", minHeader+"2026-03-01T05:22:00-05:00,DD101,65000,35000,0.78,-54.3,2380\n")
	if err != nil || len(recs) != 1 {
		t.Fatal(err, recs)
	}
	if got := recs[0].Time; got.Location() != time.UTC || got.Format(time.RFC3339) != "2026-03-01T10:22:00Z" {
		t.Errorf("time %v, want 2026-03-01T10:22:00Z in UTC", got)
	}
}

// splitPlain (eight bytes at a time) splits as bytes.Split and
// bytes.TrimSpace do, for commas at every place in a word, spaces, tabs,
// non-ASCII text and empty fields, and stops at a quote wherever it is.
func TestSplitPlainMatchesSplit(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	alphabet := []byte("0123456789.-, , \t,é,,ab\u00a0")
	d := Decoder{sep: ','}
	for i := 0; i < 20000; i++ {
		line := make([]byte, rng.IntN(40))
		for k := range line {
			line[k] = alphabet[rng.IntN(len(alphabet))]
		}
		quoted := rng.IntN(10) == 0 && len(line) > 0
		if quoted {
			line[rng.IntN(len(line))] = '"'
		}
		d.fields = d.fields[:0]
		ok := d.splitPlain(line)
		if ok == quoted {
			t.Fatalf("%q: splitPlain said %v with a quote %v", line, ok, quoted)
		}
		if !ok {
			continue
		}
		want := bytes.Split(line, []byte(","))
		if len(want) != len(d.fields) {
			t.Fatalf("%q: %d fields, want %d", line, len(d.fields), len(want))
		}
		for k := range want {
			if !bytes.Equal(d.fields[k], bytes.TrimSpace(want[k])) {
				t.Fatalf("%q: field %d %q, want %q", line, k, d.fields[k], bytes.TrimSpace(want[k]))
			}
		}
	}
}
