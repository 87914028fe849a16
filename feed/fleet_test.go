package feed

import (
	"os"
	"path/filepath"
	"testing"

	"dragdeck/model"
)

// LoadFleet gives every accepted row to its tail, whatever the number of
// files, and counts every row.
func TestLoadFleet(t *testing.T) {
	dir := t.TempDir()
	if _, err := WriteDemo(dir, DemoConfig{Tails: 6, Days: 60, Seed: 3}); err != nil {
		t.Fatal(err)
	}
	one := LoadFleet([]string{filepath.Join(dir, DemoSnapshotFile)}, DemoType(), nil)
	traces, _ := filepath.Glob(filepath.Join(dir, DemoTraceDir, "*.csv"))
	var rejected int
	many := LoadFleet(append([]string{filepath.Join(dir, DemoSnapshotFile)}, traces...), DemoType(), func(*RowError) { rejected++ })
	total := 0
	for _, p := range one.Points {
		total += len(p)
	}
	if total != one.Stats.Accepted || one.Stats.Read != one.Stats.Accepted+one.Stats.Rejected || len(one.Points) != 6 {
		t.Errorf("one file: %d points, stats %+v, %d tails", total, one.Stats, len(one.Points))
	}
	if many.Stats.Accepted <= one.Stats.Accepted || rejected != many.Stats.Rejected {
		t.Errorf("with traces: %+v, %d rejects seen", many.Stats, rejected)
	}
	trends := one.Trends(nil, model.DefaultTrendConfig())
	if len(trends) != 6 || trends[0].Tail > trends[1].Tail {
		t.Errorf("trends not one per tail in order: %d", len(trends))
	}
}

func benchFleetFile(b *testing.B) string {
	b.Helper()
	dir := b.TempDir()
	if _, err := WriteDemo(dir, DemoConfig{Tails: 100, Days: 730, Seed: 1}); err != nil {
		b.Fatal(err)
	}
	return filepath.Join(dir, DemoSnapshotFile)
}

// BenchmarkLoadFleet reads and analyses about 280,000 snapshots (read and
// analyse in a pipeline).
func BenchmarkLoadFleet(b *testing.B) {
	path := benchFleetFile(b)
	fi, _ := os.Stat(path)
	b.SetBytes(fi.Size())
	b.ResetTimer()
	var rows int
	for i := 0; i < b.N; i++ {
		rows += LoadFleet([]string{path}, DemoType(), nil).Stats.Read
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
}

// BenchmarkTrends computes the trends of 100 tails of two years, tails in
// parallel.
func BenchmarkTrends(b *testing.B) {
	fd := LoadFleet([]string{benchFleetFile(b)}, DemoType(), nil)
	c := model.DefaultTrendConfig()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		fd.Trends(nil, c)
	}
	b.ReportMetric(float64(b.N*len(fd.Points))/b.Elapsed().Seconds(), "tails/s")
}
