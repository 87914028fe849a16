package feed

import (
	"os"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"
	"time"

	"dragdeck/model"
)

// FleetData is a fleet's snapshots, analysed and grouped by tail.
type FleetData struct {
	Points      map[string][]model.TrendPoint // in file order; the trend sorts them
	Records     map[string][]Record           // the same snapshots, when kept (LoadOptions)
	Files       []FileResult
	Stats       Stats
	First, Last time.Time
}

// LoadOptions are the extras of LoadFleetWith.
type LoadOptions struct {
	KeepRecords bool          // also keep every accepted record, by tail
	Progress    *atomic.Int64 // bytes read so far, for a progress bar
}

// TotalSize returns the summed size of the files in bytes (0 for those that
// cannot be read), the whole of a progress bar.
func TotalSize(paths []string) int64 {
	var n int64
	for _, p := range paths {
		if fi, err := os.Stat(p); err == nil {
			n += fi.Size()
		}
	}
	return n
}

// add analyses one record and files its point under its tail.
func (fd *FleetData) add(t *model.Type, r Record) {
	p := model.Analyze(t, r.Snap)
	fd.Points[r.Tail] = append(fd.Points[r.Tail], model.TrendPoint{
		Time: r.Time, Flight: r.Flight, DevPct: p.DragDevPct, FuelFlowExpected: p.FuelFlowExpected,
		Bank: r.Snap.Bank, VS: r.Snap.VS, Accel: r.Snap.Accel,
	})
	if fd.Records != nil {
		fd.Records[r.Tail] = append(fd.Records[r.Tail], r)
	}
	if fd.First.IsZero() || r.Time.Before(fd.First) {
		fd.First = r.Time
	}
	if r.Time.After(fd.Last) {
		fd.Last = r.Time
	}
}

// FleetFromRecords analyses records already read (the built-in demo).
func FleetFromRecords(recs []Record, st Stats, t *model.Type, keep bool) *FleetData {
	fd := &FleetData{Points: map[string][]model.TrendPoint{}, Stats: st}
	if keep {
		fd.Records = map[string][]Record{}
	}
	for _, r := range recs {
		fd.add(t, r)
	}
	return fd
}

// batchSize is how many records travel together from reader to analyser.
const batchSize = 4096

// LoadFleet reads the snapshot files, analyses every accepted snapshot with
// the type's baseline polar and groups the points by tail. Files are read
// concurrently and analysed as they are parsed, so that one large file uses
// two cores. reject (may be nil) gets every rejected row, one at a time.
func LoadFleet(paths []string, t *model.Type, reject func(*RowError)) *FleetData {
	return LoadFleetWith(paths, t, reject, LoadOptions{})
}

// LoadFleetWith is LoadFleet with options.
func LoadFleetWith(paths []string, t *model.Type, reject func(*RowError), o LoadOptions) *FleetData {
	fd := &FleetData{Points: map[string][]model.TrendPoint{}, Files: make([]FileResult, len(paths))}
	if o.KeepRecords {
		fd.Records = map[string][]Record{}
	}
	batches := make(chan []Record, 8)
	free := make(chan []Record, 16) // batches to reuse
	getBatch := func() []Record {
		select {
		case b := <-free:
			return b[:0]
		default:
			return make([]Record, 0, batchSize)
		}
	}
	var rejMu sync.Mutex
	onReject := func(r *RowError) {
		if reject != nil {
			rejMu.Lock()
			reject(r)
			rejMu.Unlock()
		}
	}
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < max(1, min(runtime.GOMAXPROCS(0), len(paths))); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				batch := getBatch()
				fd.Files[i] = readFileCounting(paths[i], o.Progress, func(r Record) {
					batch = append(batch, r)
					if len(batch) == batchSize {
						batches <- batch
						batch = getBatch()
					}
				}, onReject)
				batches <- batch
			}
		}()
	}
	go func() {
		for i := range paths {
			jobs <- i
		}
		close(jobs)
		wg.Wait()
		close(batches)
	}()
	for batch := range batches {
		for _, r := range batch {
			fd.add(t, r)
		}
		select {
		case free <- batch:
		default:
		}
	}
	for _, f := range fd.Files {
		fd.Stats.Add(f.Stats)
	}
	return fd
}

// Trends computes every tail's trend, tails in parallel, in tail order.
func (fd *FleetData) Trends(events map[string][]model.Event, c model.TrendConfig) []model.TailTrend {
	tails := make([]string, 0, len(fd.Points))
	for tail := range fd.Points {
		tails = append(tails, tail)
	}
	sort.Strings(tails)
	out := make([]model.TailTrend, len(tails))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				out[i] = model.AnalyzeTrend(tails[i], fd.Points[tails[i]], events[tails[i]], c)
			}
		}()
	}
	for i := range tails {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	return out
}
