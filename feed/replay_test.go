package feed

import (
	"context"
	"os"
	"path/filepath"
	"testing"
	"time"
)

// fakeClock records the waits asked of it and returns at once.
type fakeClock struct {
	now   time.Time
	waits []time.Duration
}

func (c *fakeClock) Now() time.Time { return c.now }

func (c *fakeClock) After(d time.Duration) <-chan time.Time {
	c.waits = append(c.waits, d)
	c.now = c.now.Add(d)
	ch := make(chan time.Time, 1)
	ch <- c.now
	return ch
}

func writeFile(t testing.TB, dir, name, data string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const replayHeader = "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"

func TestLoadReplayMergesAndFilters(t *testing.T) {
	dir := t.TempDir()
	a := writeFile(t, dir, "a.csv", replayHeader+
		"2026-03-01T10:02:00Z,DD101,F1,65000,35000,0.78,-54,2400\n"+
		"2026-03-01T10:00:00Z,DD101,F1,65000,35000,0.78,-54,2400\n"+
		"2026-03-01T10:05:00Z,DD102,F7,65000,35000,0.78,-54,2400\n")
	b := writeFile(t, dir, "b.csv", replayHeader+
		"2026-03-01T10:01:00Z,DD101,F1,65000,35000,0.78,-54,2400\n"+
		"2026-03-01T10:03:00Z,DD101,F2,65000,35000,0.78,-54,bad\n")
	var rejected int
	recs, results := LoadReplay([]string{a, b}, ReplayFilter{Tail: "DD101"}, ReadOptions{}, func(*RowError) { rejected++ })
	if len(recs) != 3 || rejected != 1 || len(results) != 2 {
		t.Fatalf("%d records, %d rejected, %d results", len(recs), rejected, len(results))
	}
	for i, want := range []string{"10:00", "10:01", "10:02"} {
		if got := recs[i].Time.Format("15:04"); got != want {
			t.Errorf("record %d at %s, want %s", i, got, want)
		}
	}
	recs, _ = LoadReplay([]string{a, b}, ReplayFilter{Flight: "F7"}, ReadOptions{}, nil)
	if len(recs) != 1 || recs[0].Tail != "DD102" {
		t.Errorf("flight filter: %+v", recs)
	}
}

func TestPlayerPacing(t *testing.T) {
	t0 := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	recs := []Record{{Time: t0}, {Time: t0.Add(time.Minute)}, {Time: t0.Add(3 * time.Minute)}, {Time: t0.Add(3 * time.Hour)}}
	tests := []struct {
		name    string
		speed   float64
		maxWait time.Duration
		want    []time.Duration
	}{
		{"60 times real time", 60, 0, []time.Duration{time.Second, 2 * time.Second, 177 * time.Second}},
		{"capped waits", 60, 5 * time.Second, []time.Duration{time.Second, 2 * time.Second, 5 * time.Second}},
		{"speed 0: no waiting", 0, 0, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			clk := &fakeClock{}
			p := NewPlayer(recs, tc.speed)
			p.MaxWait = tc.maxWait
			n := 0
			if err := p.Run(context.Background(), clk, func(Record) error { n++; return nil }); err != nil {
				t.Fatal(err)
			}
			if n != len(recs) || len(clk.waits) != len(tc.want) {
				t.Fatalf("emitted %d, waits %v, want %v", n, clk.waits, tc.want)
			}
			for i := range tc.want {
				if clk.waits[i] != tc.want[i] {
					t.Errorf("wait %d = %v, want %v", i, clk.waits[i], tc.want[i])
				}
			}
		})
	}
}

func TestPlayerSeekAndCancel(t *testing.T) {
	t0 := time.Date(2026, 3, 1, 10, 0, 0, 0, time.UTC)
	recs := []Record{{Time: t0, Line: 1}, {Time: t0.Add(time.Minute), Line: 2}, {Time: t0.Add(2 * time.Minute), Line: 3}}
	p := NewPlayer(recs, 1)
	p.Seek(2)
	if r, _, ok := p.Next(); !ok || r.Line != 3 {
		t.Errorf("after Seek(2): %+v %v", r, ok)
	}
	if _, _, ok := p.Next(); ok {
		t.Error("past the end should not be ok")
	}
	p.Seek(-5)
	if p.Pos() != 0 {
		t.Errorf("Seek clamps: pos %d", p.Pos())
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if err := p.Run(ctx, &fakeClock{}, func(Record) error { return nil }); err == nil {
		t.Error("a cancelled context should stop the run")
	}
}
