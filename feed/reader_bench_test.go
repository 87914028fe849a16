package feed

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"testing"
)

// benchCSV builds n typical rows (11 columns, about 90 bytes each).
func benchCSV(n int) []byte {
	var b bytes.Buffer
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg,vs_fpm,accel_kt_per_min\n")
	for i := 0; i < n; i++ {
		fmt.Fprintf(&b, "2026-%02d-%02dT%02d:%02d:00Z,DD%03d,DDF%04d,%d,%d,%.3f,%.1f,%d,%.1f,%d,%.2f\n",
			1+i%12, 1+i%28, i%24, i%60, 101+i%24, i%5000, 55000+i%20000, 31000+2000*(i%5), 0.76+0.001*float64(i%30),
			-50-float64(i%80)/10, 2000+i%900, float64(i%3), 0, 0.0)
	}
	return b.Bytes()
}

func BenchmarkReader(b *testing.B) { benchReader(b, benchCSV(100000), nil) }

// BenchmarkReaderLayout is BenchmarkReader through layouts: dragdeck's
// own columns as a layout file (the mapped path on the same bytes), and an
// export of per-engine fuel flow and fan speed in lb/h with a date and a
// time column in a named zone (the same rows rewritten).
func BenchmarkReaderLayout(b *testing.B) {
	b.Run("builtin", func(b *testing.B) {
		var lines []string // the benchmark rows have no fan speed column
		for _, ln := range strings.Split(BuiltinLayout, "\n") {
			if !strings.HasPrefix(ln, "n1 ") {
				lines = append(lines, ln)
			}
		}
		l, err := ParseLayout(LayoutFile, []byte(strings.Join(lines, "\n")))
		if err != nil {
			b.Fatal(err)
		}
		benchReader(b, benchCSV(100000), l)
	})
	b.Run("engines-date-zone", func(b *testing.B) {
		l, err := LoadLayout("../testdata/layouts/recorder_lbh.toml")
		if err != nil {
			b.Fatal(err)
		}
		benchReader(b, benchEngines(benchCSV(100000)), l)
	})
}

// benchEngines rewrites benchmark rows as recorder_lbh.toml reads them:
// the time in a date and a time column (UTC written as New York time is
// not needed for speed: the zone's rules apply either way), weight in lb,
// fuel flow split over two engines in lb/h.
func benchEngines(data []byte) []byte {
	var out bytes.Buffer
	out.WriteString("DATE,TIME,ACID,FLT_NO,GW_LB,ALT_STD,MACH,SAT,FF1,FF2,N1_1,N1_2\n")
	lines := bytes.Split(data, []byte("\n"))
	for _, ln := range lines[1:] {
		f := bytes.Split(ln, []byte(","))
		if len(f) < 8 {
			continue
		}
		t := string(f[0]) // 2026-03-01T10:22:00Z
		w, _ := strconv.ParseFloat(string(f[3]), 64)
		ff, _ := strconv.ParseFloat(string(f[7]), 64)
		fmt.Fprintf(&out, "%s/%s/%s,%s,%s,%s,%.1f,%s,%s,%s,%.1f,%.1f,86.1,86.3\n", t[5:7], t[8:10], t[0:4], t[11:19],
			f[1], f[2], w/0.45359237, f[4], f[5], f[6], ff/0.45359237*0.49, ff/0.45359237*0.51)
	}
	return out.Bytes()
}

func benchReader(b *testing.B, data []byte, l *Layout) {
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	b.ReportAllocs()
	rows := 0
	for i := 0; i < b.N; i++ {
		r := NewReader(bytes.NewReader(data), "bench.csv")
		r.d.SetLayout(l)
		for {
			_, err := r.Next()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			rows++
		}
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
}

// BenchmarkReaderHugeFile reads a file named by DRAGDECK_BIG_CSV (e.g. the
// 10 M rows of 'dragdeck demo --tails 3000 --days 870') with one decoder,
// rows/s and MB/s; its memory stays flat (run with -benchmem and watch the
// process's peak RSS). Skipped without it.
func BenchmarkReaderHugeFile(b *testing.B) {
	path := os.Getenv("DRAGDECK_BIG_CSV")
	if path == "" {
		b.Skip("set DRAGDECK_BIG_CSV to a large snapshot file")
	}
	if fi, err := os.Stat(path); err == nil {
		b.SetBytes(fi.Size())
	}
	rows := 0
	for i := 0; i < b.N; i++ {
		res := ReadFile(path, nil, nil)
		if res.Err != nil {
			b.Fatal(res.Err)
		}
		rows += res.Stats.Read
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
}
