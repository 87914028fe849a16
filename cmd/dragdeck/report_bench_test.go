package main

import (
	"context"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/model"
)

// benchSnapshots returns a snapshot file of about 1 million rows shaped like
// an airline's export (300 tails of about 3,300 snapshots each), made once
// with the demo in a temporary folder, or the file DRAGDECK_BENCH_CSV names
// (for 10 million: dragdeck demo --out DIR --tails 3000 --days 870 --type
// feed/demo_type.toml).
func benchSnapshots(b *testing.B) string {
	b.Helper()
	if p := os.Getenv("DRAGDECK_BENCH_CSV"); p != "" {
		return p
	}
	dir := b.TempDir()
	if _, err := demo.Write(dir, demo.Config{Tails: 300, Days: 870, Seed: 13}); err != nil {
		b.Fatal(err)
	}
	return filepath.Join(dir, demo.SnapshotFile)
}

// BenchmarkReport1M is the whole 'report --format json' on about 1 million
// snapshots: rows/s and the heap in use at its peak (MB, from the runtime;
// the process's resident size is about that plus the GC's headroom).
func BenchmarkReport1M(b *testing.B) {
	path := benchSnapshots(b)
	fi, _ := os.Stat(path)
	b.SetBytes(fi.Size())
	rows := float64(fi.Size()) / 80
	var peak uint64
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		done := make(chan struct{})
		go func() { // sample the heap while the report runs
			// runtime/metrics, which does not stop the world as
			// ReadMemStats does (a pause every 20 ms slowed 10 M rows by
			// a second): the heap's spans in use, as MemStats.HeapInuse.
			sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}, {Name: "/memory/classes/heap/unused:bytes"}}
			for {
				select {
				case <-done:
					return
				default:
				}
				metrics.Read(sample)
				peak = max(peak, sample[0].Value.Uint64()+sample[1].Value.Uint64())
				time.Sleep(20 * time.Millisecond)
			}
		}()
		code := run(context.Background(), []string{"report", "--format", "json", path}, strings.NewReader(""), io.Discard, io.Discard)
		close(done)
		if code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
	b.ReportMetric(rows*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
	b.ReportMetric(float64(peak)/(1<<20), "heap-MB")
}

// BenchmarkImport1M imports about 1 million snapshots into a new store
// (one transaction), and reports rows/s; budget: 1 M in 5 s or less.
func BenchmarkImport1M(b *testing.B) {
	path := benchSnapshots(b)
	fi, _ := os.Stat(path)
	b.SetBytes(fi.Size())
	dir := b.TempDir()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		db := filepath.Join(dir, "bench.db")
		b.StopTimer()
		for _, suffix := range []string{"", "-wal", "-shm"} {
			os.Remove(db + suffix)
		}
		b.StartTimer()
		code := run(context.Background(), []string{"import", "--store", db, path}, strings.NewReader(""), io.Discard, io.Discard)
		if code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
	b.ReportMetric(float64(fi.Size())/80*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
}

// BenchmarkDashboardLoad1M is the dashboard's load on about 1 million
// snapshots: the time until the Fleet screen has its data (the first frame
// follows at once: BenchmarkFirstFrame in tui) and the heap the data keep
// afterwards, with the dashboard's soft memory limit; the process's
// resident size is about that plus 30-40 MB of runtime and code (measured
// with the real dashboard: 135 MB resident, 141 MB at its peak), and the
// test process's resident size with the data loaded.
func BenchmarkDashboardLoad1M(b *testing.B) {
	path := benchSnapshots(b)
	in := &input{roster: model.SingleType(feed.DemoType()), files: []string{path}}
	defer setMemoryLimit(in, dashBytesPerByte)()
	var heap uint64
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d, err := dashData(in, model.DefaultTrendConfig(), &atomic.Int64{})
		if err != nil {
			b.Fatal(err)
		}
		b.StopTimer()
		runtime.GC()
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		heap = max(heap, ms.HeapInuse)
		runtime.KeepAlive(d)
		b.StartTimer()
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N), "s-to-fleet")
	b.ReportMetric(float64(heap)/(1<<20), "heap-MB")
	if kb, ok := residentKB(); ok { // the test process's, with the data loaded: an upper bound
		b.ReportMetric(float64(kb)/1024, "rss-MB")
	}
}

// residentKB is the process's resident set (VmRSS of /proc/self/status,
// Linux); false where it cannot be read.
func residentKB() (int64, bool) {
	b, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0, false
	}
	for _, line := range strings.Split(string(b), "\n") {
		if v, ok := strings.CutPrefix(line, "VmRSS:"); ok {
			kb, err := strconv.ParseInt(strings.TrimSuffix(strings.TrimSpace(v), " kB"), 10, 64)
			return kb, err == nil
		}
	}
	return 0, false
}
