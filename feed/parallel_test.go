package feed

import (
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"
)

// ReadFileParallel hands on exactly what ReadFileWith does, in the same
// order and with the same lines, and ReadFileParts the same records: on files with broken rows, comments,
// CRLF line ends, a BOM, a too-long line, a last line without its end and
// a second header (which switches to one decoder from its part on).
func TestReadFileParallelSameAsOne(t *testing.T) {
	defer func(p, x, m int64) { partBytes, maxPartBytes, minParallel = p, x, m }(partBytes, maxPartBytes, minParallel)
	partBytes, maxPartBytes, minParallel = 700, 700, 0 // many small parts
	head := "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"
	row := func(i int) string {
		return fmt.Sprintf("2026-03-01T%02d:%02d:00Z,DD%d,F%d,%d,35000,0.78,-54.3,2380\n", i/60%24, i%60, 100+i%7, i%13, 60000+i)
	}
	var plain, messy, joined strings.Builder
	plain.WriteString(head)
	messy.WriteString("\ufeff# export\n" + head)
	joined.WriteString(head)
	for i := 0; i < 400; i++ {
		plain.WriteString(row(i))
		switch {
		case i%37 == 5:
			messy.WriteString("2026-03-01T10:00:00Z,DD1,F1,-5,35000,0.78,-54.3,2380\r\n") // a reject
		case i%53 == 7:
			messy.WriteString("# a comment\n\n")
		case i == 200:
			messy.WriteString("2026-03-01T10:00:00Z,DD1,F1," + strings.Repeat("9", maxLine+10) + "\n") // too long
		}
		messy.WriteString(strings.Replace(row(i), "\n", "\r\n", 1))
		if i == 250 {
			joined.WriteString("time,tail,flight,weight_lb,alt_ft,mach,sat_c,fuel_flow_lbph\n")
		}
		joined.WriteString(row(i))
	}
	messy.WriteString("2026-03-01T23:59:00Z,DD1,F1,65000,35000,0.78,-54.3,2380") // no line end
	for name, data := range map[string]string{"plain": plain.String(), "messy": messy.String(), "second header": joined.String()} {
		t.Run(name, func(t *testing.T) {
			p := filepath.Join(t.TempDir(), "f.csv")
			os.WriteFile(p, []byte(data), 0o644)
			var wantRecs, gotRecs []Record
			var wantRej, gotRej []string
			want := ReadFileWith(p, ReadOptions{}, func(r Record) { wantRecs = append(wantRecs, r) }, func(e *RowError) { wantRej = append(wantRej, e.Error()) })
			got := ReadFileParallel(p, ReadOptions{}, 3, func(r Record) { gotRecs = append(gotRecs, r) }, func(e *RowError) { gotRej = append(gotRej, e.Error()) })
			if got.Stats != want.Stats || !reflect.DeepEqual(got.Unknown, want.Unknown) || (got.Err == nil) != (want.Err == nil) || len(got.Notices) != len(want.Notices) {
				t.Fatalf("result %+v, one decoder %+v", got, want)
			}
			if !reflect.DeepEqual(gotRej, wantRej) {
				t.Errorf("rejects %q, one decoder %q", gotRej, wantRej)
			}
			if len(gotRecs) != len(wantRecs) {
				t.Fatalf("%d records, one decoder %d", len(gotRecs), len(wantRecs))
			}
			for i := range gotRecs {
				if !reflect.DeepEqual(gotRecs[i], wantRecs[i]) {
					t.Fatalf("record %d: %+v, one decoder %+v", i, gotRecs[i], wantRecs[i])
				}
				// Offset is where the row's line starts in the file
				if at := gotRecs[i].Time.Format(time.RFC3339); !strings.HasPrefix(data[gotRecs[i].Offset:], at) {
					t.Fatalf("record %d at offset %d: %.30q, want it to start with %s", i, gotRecs[i].Offset, data[gotRecs[i].Offset:], at)
				}
			}
			// ReadFileParts: the same records (lines aside: within work they
			// count from the part's start) and rejects, in the same order.
			var partRecs []Record
			var partRej []string
			parts := ReadFileParts(p, ReadOptions{}, 3, func() PartSink {
				return &keepSink{out: &partRecs}
			}, func(e *RowError) { partRej = append(partRej, e.Error()) })
			if parts.Stats != want.Stats || len(partRecs) != len(wantRecs) || !reflect.DeepEqual(partRej, wantRej) {
				t.Fatalf("parts: %+v, %d records, rejects %q; one decoder %+v, %d, %q", parts, len(partRecs), partRej, want, len(wantRecs), wantRej)
			}
			for i := range partRecs {
				g, w := partRecs[i], wantRecs[i]
				g.Line, w.Line = 0, 0
				if !reflect.DeepEqual(g, w) {
					t.Fatalf("parts: record %d: %+v, one decoder %+v", i, g, w)
				}
			}
		})
	}
}

// keepSink keeps the records of its part and hands them on to out.
type keepSink struct {
	mine []Record
	out  *[]Record
}

func (k *keepSink) Add(recs []Record) { k.mine = append(k.mine, recs...) }
func (k *keepSink) Done() func()      { return func() { *k.out = append(*k.out, k.mine...) } }

// A large file is cut into partsPerFile parts, within partBytes and
// maxPartBytes.
func TestPartSize(t *testing.T) {
	tests := []struct {
		name string
		size int64
		want int64
	}{
		{"small file: the smallest part", 5 << 20, partBytes},
		{"80 MB (1 M rows)", 80 << 20, partBytes},
		{"800 MB (10 M rows)", 800 << 20, (800 << 20) / partsPerFile},
		{"a terabyte: the largest part", 1 << 40, maxPartBytes},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := partSize(tt.size); got != tt.want {
				t.Errorf("partSize(%d) = %d, want %d", tt.size, got, tt.want)
			}
		})
	}
}
