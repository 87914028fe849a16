package pipeline

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"testing"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/model"
)

func input(paths ...string) Input {
	return Input{Paths: paths, Type: feed.DemoType(), Config: model.DefaultTrendConfig()}
}

// Run gives every accepted row to its tail, whatever the number of files,
// counts every row and assesses every tail.
func TestRun(t *testing.T) {
	dir := t.TempDir()
	if _, err := demo.Write(dir, demo.Config{Tails: 6, Days: 60, Seed: 3}); err != nil {
		t.Fatal(err)
	}
	one := Run(input(filepath.Join(dir, demo.SnapshotFile)))
	traces, _ := filepath.Glob(filepath.Join(dir, demo.TraceDir, "*.csv"))
	var rejected int
	in := input(append([]string{filepath.Join(dir, demo.SnapshotFile)}, traces...)...)
	in.Reject = func(*feed.RowError) { rejected++ }
	many := Run(in)
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
	if len(one.Fleet.Tails) != 6 {
		t.Errorf("%d tails assessed, want 6", len(one.Fleet.Tails))
	}
	for tail, pts := range one.Points {
		for i := 1; i < len(pts); i++ {
			if pts[i].UnixNano < pts[i-1].UnixNano {
				t.Fatalf("%s: points not in time order at %d", tail, i)
			}
		}
	}
}

// A file that cannot be read is named in the result and the others are read
// all the same.
func TestRunBrokenFile(t *testing.T) {
	dir := t.TempDir()
	good := filepath.Join(dir, "good.csv")
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(good, []byte("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n2026-03-01T10:22:00Z,DD101,65000,35000,0.78,-54.3,2380\n"), 0o644)
	os.WriteFile(bad, nil, 0o644)
	r := Run(input(bad, good))
	if f := r.Failed(); len(f) != 1 || f[0].Path != bad {
		t.Errorf("failed %+v, want only %s", f, bad)
	}
	if r.Stats.Accepted != 1 || len(r.Fleet.Tails) != 1 {
		t.Errorf("the good file was not read: %+v", r.Stats)
	}
}

// FromRecords on the in-memory demo gives the same assessment as Run on the
// same snapshots written to a file, and keeps records for replay.
func TestFromRecordsMatchesRun(t *testing.T) {
	mem, file := memAndFile(t, demo.Config{Tails: 5, Days: 120, Seed: 4}, false)
	for i, a := range mem.Fleet.Tails {
		b := file.Fleet.Tails[i]
		if a.Tail != b.Tail || a.RecentPct != b.RecentPct || a.Points != b.Points {
			t.Errorf("tail %d: memory %s %g (%d), file %s %g (%d)", i, a.Tail, a.RecentPct, a.Points, b.Tail, b.RecentPct, b.Points)
		}
	}
	a := mem.Fleet.Tails[0]
	recs := mem.FlightRecords(a.Tail, a.Flights[len(a.Flights)-1])
	if len(recs) == 0 || recs[0].Flight != a.FlightName(a.Flights[len(a.Flights)-1]) {
		t.Errorf("flight records %v", recs)
	}
	if pp := mem.PolarPoints(a.Tail, true); len(pp) == 0 || len(pp) > a.Points {
		t.Errorf("%d polar points of %d usable", len(pp), a.Points)
	}
}

// The filter keeps only what it accepts (fit's tails and dates).
func TestRunFilter(t *testing.T) {
	dir := t.TempDir()
	if _, err := demo.Write(dir, demo.Config{Tails: 4, Days: 60, Seed: 3}); err != nil {
		t.Fatal(err)
	}
	in := input(filepath.Join(dir, demo.SnapshotFile))
	cut := demo.DefaultEnd.AddDate(0, 0, -30)
	in.Filter = func(r feed.Record) bool { return r.Tail == "DD101" && r.Time.After(cut) }
	r := Run(in)
	if len(r.Points) != 1 || r.First.Before(cut) {
		t.Errorf("%d tails, first %v", len(r.Points), r.First)
	}
}

func benchFleetFile(b *testing.B) string {
	b.Helper()
	dir := b.TempDir()
	if _, err := demo.Write(dir, demo.Config{Tails: 100, Days: 730, Seed: 1}); err != nil {
		b.Fatal(err)
	}
	return filepath.Join(dir, demo.SnapshotFile)
}

// BenchmarkRun reads, analyses and assesses about 280,000 snapshots
// (rows/s): the load and the analysis, with the trends.
func BenchmarkRun(b *testing.B) {
	path := benchFleetFile(b)
	fi, _ := os.Stat(path)
	b.SetBytes(fi.Size())
	b.ResetTimer()
	var rows int
	for i := 0; i < b.N; i++ {
		rows += Run(input(path)).Stats.Read
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
}

// BenchmarkAssess is the trend stage alone, on the points of about
// 280,000 snapshots already read: every tail's airframe and engine trends,
// the flags and the cost (points/s).
func BenchmarkAssess(b *testing.B) {
	in := input(benchFleetFile(b))
	r := Run(in)
	points := 0
	for _, pts := range r.Points {
		points += len(pts)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		r.assess(in) // the points are kept, sorted: each run does the same work
	}
	b.ReportMetric(float64(points*b.N)/b.Elapsed().Seconds(), "points/s")
}

// Tail finds every tail through its index, and still after the caller
// reorders Fleet.Tails; a name not in the fleet is not found.
func TestTailLookup(t *testing.T) {
	dir := t.TempDir()
	if _, err := demo.Write(dir, demo.Config{Tails: 5, Days: 30, Seed: 2}); err != nil {
		t.Fatal(err)
	}
	r := Run(input(filepath.Join(dir, demo.SnapshotFile)))
	check := func(when string) {
		for _, a := range r.Fleet.Tails {
			if got, ok := r.Tail(a.Tail); !ok || got.Tail != a.Tail {
				t.Errorf("%s: Tail(%s) = %s, %v", when, a.Tail, got.Tail, ok)
			}
		}
	}
	check("as assessed")
	slices.Reverse(r.Fleet.Tails)
	check("reordered")
	if _, ok := r.Tail("NOSUCH"); ok {
		t.Error("found a tail that is not in the fleet")
	}
}

// Read from files with KeepRecords, a flight's records are read back on
// demand from where its points say their rows are, and are the records the
// in-memory run keeps: the same rows, lines and offsets, in the same order.
// A file of more than 4 MB is read in parts analysed side by side
// (feed.ReadFileParts); its trends are still those of the in-memory run,
// tail by tail (NaN and all: the drifts are compared as printed).
func TestFlightRecordsReadBack(t *testing.T) {
	cases := []struct {
		name  string
		cfg   demo.Config
		every int // flights compared: every n-th of each tail
	}{
		{"one decoder", demo.Config{Tails: 4, Days: 60, Seed: 6}, 1},
		{"in parts", demo.Config{Tails: 44, Days: 365, Seed: 8}, 37},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			mem, file := memAndFile(t, c.cfg, true)
			if file.Records != nil {
				t.Fatal("a run on files keeps every record in memory")
			}
			if fi, err := os.Stat(file.Files[0].Path); c.name == "in parts" && (err != nil || fi.Size() <= 4<<20) {
				t.Fatalf("the file is not large enough to be read in parts: %v %v", fi, err)
			}
			flights := 0
			for i, a := range mem.Fleet.Tails {
				b := file.Fleet.Tails[i]
				if a.Tail != b.Tail || a.RecentPct != b.RecentPct || a.Points != b.Points || fmt.Sprint(a.Drift) != fmt.Sprint(b.Drift) || len(a.Steps) != len(b.Steps) {
					t.Errorf("tail %d: memory %s %g (%d points, drift %v, %d steps), file %s %g (%d, %v, %d)",
						i, a.Tail, a.RecentPct, a.Points, a.Drift, len(a.Steps), b.Tail, b.RecentPct, b.Points, b.Drift, len(b.Steps))
				}
				for k := 0; k < len(a.Flights); k += c.every {
					// Each result numbers the flights its own way: the same
					// flight of each, by place, time and name.
					f, fb := a.Flights[k], b.Flights[k]
					if f.UnixNano != fb.UnixNano || a.FlightName(f) != b.FlightName(fb) {
						t.Fatalf("%s flight %d: %s at %v in memory, %s at %v from the file", a.Tail, k, a.FlightName(f), f.At(), b.FlightName(fb), fb.At())
					}
					want, got := mem.FlightRecords(a.Tail, f), file.FlightRecords(b.Tail, fb)
					if len(want) == 0 || len(got) != len(want) {
						t.Fatalf("%s %s: %d records read back, %d kept", a.Tail, a.FlightName(f), len(got), len(want))
					}
					for k := range got {
						w := want[k]
						w.File = got[k].File
						if !reflect.DeepEqual(got[k], w) {
							t.Fatalf("%s %s record %d: %+v, kept %+v", a.Tail, a.FlightName(f), k, got[k], w)
						}
					}
					flights++
				}
			}
			if flights < 50 {
				t.Errorf("only %d flights compared", flights)
			}
		})
	}
}

// memAndFile runs the pipeline on the in-memory demo of cfg (keeping its
// records) and on the same demo written to a file (keeping records for
// replay when keep).
func memAndFile(t *testing.T, cfg demo.Config, keep bool) (mem, file *Result) {
	t.Helper()
	d, err := demo.NewFleet(cfg)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if _, err := demo.Write(dir, cfg); err != nil {
		t.Fatal(err)
	}
	in := input()
	in.KeepRecords, in.Roster = true, d.Roster
	fin := input(filepath.Join(dir, demo.SnapshotFile))
	fin.KeepRecords, fin.Roster = keep, d.Roster
	return FromRecords(d.Records, d.Stats, in), Run(fin)
}

// With DropPoints the points go once the trends are made, in the workers'
// buffers, and the typical cruise and own polar are not computed; the
// trends, flags, levels and engine series are those of a run that keeps
// the points, on a file read by parts (over 4 MB) and on a small one.
func TestRunDropPoints(t *testing.T) {
	for _, tc := range []struct {
		name string
		cfg  demo.Config
	}{
		{"small file, one decoder", demo.Config{Tails: 5, Days: 90, Seed: 21}},
		{"file read by parts", demo.Config{Tails: 40, Days: 400, Seed: 22}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			if _, err := demo.Write(dir, tc.cfg); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join(dir, demo.SnapshotFile)
			keep := Run(input(path))
			in := input(path)
			in.DropPoints = true
			drop := Run(in)
			if len(drop.Points) != 0 {
				t.Errorf("%d tails' points kept", len(drop.Points))
			}
			if len(keep.Fleet.Tails) != len(drop.Fleet.Tails) || len(keep.Engine.Tails) != len(drop.Engine.Tails) || len(keep.Fleet.Tails) != tc.cfg.Tails {
				t.Fatalf("tails %d/%d, engine %d/%d", len(keep.Fleet.Tails), len(drop.Fleet.Tails), len(keep.Engine.Tails), len(drop.Engine.Tails))
			}
			for i, k := range keep.Fleet.Tails {
				d := drop.Fleet.Tails[i]
				if !math.IsNaN(d.Typical.Weight) || d.PolarErr == nil {
					t.Errorf("%s: typical cruise %+v, polar error %v: computed", d.Tail, d.Typical, d.PolarErr)
				}
				if math.IsNaN(k.Typical.Weight) && k.Points > 0 {
					t.Errorf("%s: no typical cruise when the points are kept", k.Tail)
				}
				// Apart from what is not computed, the same assessment.
				d.Typical, d.Polar, d.PolarErr, d.PolarFrom = k.Typical, k.Polar, k.PolarErr, k.PolarFrom
				named(&d.TailTrend)
				named(&k.TailTrend)
				if g, w := fmt.Sprintf("%+v", d), fmt.Sprintf("%+v", k); g != w {
					t.Errorf("tail %d differs:\n%s\n%s", i, g, w)
				}
			}
			for i, k := range keep.Engine.Tails {
				d := drop.Engine.Tails[i]
				named(&d.TailTrend)
				named(&k.TailTrend)
				if g, w := fmt.Sprintf("%+v", d), fmt.Sprintf("%+v", k); g != w {
					t.Errorf("engine tail %d differs:\n%s\n%s", i, g, w)
				}
			}
			dlo, dhi := drop.Fleet.DeviationRange()
			klo, khi := keep.Fleet.DeviationRange()
			if dlo != klo || dhi != khi || drop.Fleet.Flagged != keep.Fleet.Flagged {
				t.Errorf("fleet range [%g, %g], %d flagged; want [%g, %g], %d", dlo, dhi, drop.Fleet.Flagged, klo, khi, keep.Fleet.Flagged)
			}
		})
	}
}

// named puts a trend's flights in terms any result shares: each result
// numbers flight names its own way (the parts ask for ids as they are
// decoded), so the ids become the flights' places in the sorted names and
// the table is dropped.
func named(tr *model.TailTrend) {
	var names []string
	for _, f := range tr.Flights {
		names = append(names, tr.FlightName(f))
	}
	sorted := slices.Clone(names)
	slices.Sort(sorted)
	sorted = slices.Compact(sorted)
	fl := slices.Clone(tr.Flights)
	for i := range fl {
		k, _ := slices.BinarySearch(sorted, names[i])
		fl[i].Flight = model.FlightID(k)
	}
	tr.Flights, tr.Names = fl, nil
}
