package feed

import (
	"bytes"
	"fmt"
	"io"
	"os"
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

func BenchmarkReader(b *testing.B) {
	data := benchCSV(100000)
	b.SetBytes(int64(len(data)))
	b.ResetTimer()
	b.ReportAllocs()
	rows := 0
	for i := 0; i < b.N; i++ {
		r := NewReader(bytes.NewReader(data), "bench.csv")
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
