// Package pipeline is dragdeck's one fleet pipeline: read → analyse →
// trends → flags → cost. Snapshot files are read by package feed, every
// accepted snapshot is analysed against its type's baseline polar
// (model.Analyze), the points are grouped by tail, each tail's trend is
// computed (model.AnalyzeTrend) and the fleet is flagged and priced
// (model.AssessFleet). `report`, the dashboard and every other output call
// Run and present its Result; none of them computes physics or statistics
// of its own.
package pipeline

import (
	"runtime"
	"slices"
	"sort"
	"sync"
	"sync/atomic"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// Input is what the pipeline reads and how it judges it.
type Input struct {
	Paths []string // snapshot files
	// Layout reads the files in an export's own columns (nil: dragdeck's).
	Layout *feed.Layout
	// Source, when set, is read in place of Paths (the fleet store).
	Source Source
	// Roster gives the type in force for each tail at each time (a fleet
	// file, §3.4); nil: every snapshot is analysed with Type.
	Roster *model.Roster
	Type   *model.Type              // the baseline of every snapshot when Roster is nil
	Events map[string][]model.Event // by tail (may be nil)
	Config model.TrendConfig

	// KeepRecords makes the records of a flight available for replay
	// (FlightRecords): read from files (Run), where each point's row is
	// is kept beside the points and the flight's rows are read again on
	// demand; from a store, they are read from it again; given in memory
	// (FromRecords), the records are kept.
	KeepRecords bool
	Progress    *atomic.Int64            // bytes read so far, for a progress bar (may be nil)
	Reject      func(*feed.RowError)     // every rejected row, one at a time (may be nil)
	Filter      func(r feed.Record) bool // keep only the records it accepts (nil: all); may be called concurrently
	// DropPoints lets each tail's points go once its trends are computed:
	// Result.Points is then empty (a report shows trends, not points, and
	// its memory is then most of all the points at the end of the reading).
	// What only the points' screens show is then neither kept nor
	// computed: the points' details (model.PointDetail), the typical cruise
	// and the tail's own polar (TailTrend.Typical and Polar stay unset, as
	// for an engine series).
	DropPoints bool

	// Policy is the fuel-factor policy (nil: model.DefaultFactorPolicy);
	// InUse the factor in use by tail, % (from the store; a tail not in it
	// has none, taken as 0).
	Policy *model.FactorPolicy
	InUse  map[string]float64
}

// Result is the pipeline's answer: the fleet assessed, and what it was made of.
type Result struct {
	Type   *model.Type   // the one type of a single-type run; nil with a fleet file
	Roster *model.Roster // the types in force (a single-type roster without a fleet file)
	Config model.TrendConfig
	Fleet  model.Fleet                   // every tail's airframe series, most severe first
	Points map[string][]model.TrendPoint // analysed snapshots by tail, in time order
	// Engine is the engine series (DevPct is the engine deviation) of the
	// tails whose snapshots had thrust from fan speed, assessed like the
	// airframe's; its points are those of Points with an EngineDevPct
	// (model.EngineSeries).
	Engine model.Fleet
	// Factors is each tail's fuel factor (TailFactor) under Policy.
	Factors map[string]TailFactor
	Policy  model.FactorPolicy
	// Records are the accepted records by tail in time order, when
	// Input.KeepRecords is set and they were given in memory (FromRecords),
	// as read (Roster.Analyze applies the fleet file's fuel-flow correction
	// when they are analysed again).
	Records     map[string][]feed.Record
	Files       []feed.FileResult // one per path, in order
	Stats       feed.Stats        // rows of all files
	First, Last time.Time         // span of the accepted snapshots (zero if none)
	// Duplicates counts the accepted snapshots that repeat a tail and time
	// already read (the same file given twice, overlapping exports): each
	// tail and time is analysed once.
	Duplicates int
	// SourceErr is why Input.Source could not be read to the end (nil
	// when it was, and when files were read).
	SourceErr error

	tailIdx, engineIdx map[string]int                 // place of each tail in Fleet.Tails and Engine.Tails
	names              *model.FlightNames             // the flights of Points
	namesMu            sync.Mutex                     // names, while parts are analysed side by side
	details            map[string][]model.PointDetail // beside Points, unless DropPoints
	// refs: where each point's row is (refsOf, beside Points: the file's
	// index in paths, and the row's offset), for FlightRecords.
	refs    bool
	refsOf  map[string][]int64
	paths   []string
	fileIdx map[string]int
	opt     feed.ReadOptions
	src     Source // where FlightRecords reads a flight again, for a run on a Source

	mu        sync.Mutex                       // merge: the parts of files read side by side
	packs     map[string]*packed               // by tail, the points of each part, till assess joins them
	detChunks map[string][][]model.PointDetail // their details
	refChunks map[string][][]int64             // and where their rows are
}

// refBits is where the file's index starts in a point's ref; below it
// is the row's byte offset + 1 (files up to a terabyte).
const refBits = 40

// Failed returns the files that could not be read (missing, no header, a
// required column missing). Events files found among the paths are not
// failures.
func (r *Result) Failed() []feed.FileResult {
	var out []feed.FileResult
	for _, f := range r.Files {
		if f.Err != nil {
			out = append(out, f)
		}
	}
	return out
}

// EngineTail returns the engine series of one tail; false when none of its
// snapshots had thrust from fan speed.
func (r *Result) EngineTail(name string) (model.TailAssessment, bool) {
	return find(r.Engine.Tails, r.engineIdx, name)
}

// Tail returns the assessment of one tail.
func (r *Result) Tail(name string) (model.TailAssessment, bool) {
	return find(r.Fleet.Tails, r.tailIdx, name)
}

// find looks a tail up through the index made by assess; a tail the index
// does not place (the slice reordered since) is searched for.
func find(tails []model.TailAssessment, idx map[string]int, name string) (model.TailAssessment, bool) {
	if i, ok := idx[name]; ok && i < len(tails) && tails[i].Tail == name {
		return tails[i], true
	}
	for _, a := range tails {
		if a.Tail == name {
			return a, true
		}
	}
	return model.TailAssessment{}, false
}

// index maps each tail's name to its place in tails.
func index(tails []model.TailAssessment) map[string]int {
	m := make(map[string]int, len(tails))
	for i, a := range tails {
		m[a.Tail] = i
	}
	return m
}

// FlightRecords returns the records of flight f of the tail, in time order:
// from the flight's first snapshot while the flight name holds and no gap
// exceeds the configured flight gap. Nil when records were not kept.
func (r *Result) FlightRecords(tail string, f model.FlightPoint) []feed.Record {
	if r.Records == nil && r.refs {
		return r.readFlight(tail, f)
	}
	if r.Records == nil && r.src != nil {
		return r.sourceFlight(tail, f)
	}
	recs, name := r.Records[tail], r.names.Name(f.Flight)
	i := sort.Search(len(recs), func(i int) bool { return recs[i].Time.UnixNano() >= f.UnixNano })
	var out []feed.Record
	for ; i < len(recs); i++ {
		rec := recs[i]
		if rec.Flight != name || (len(out) > 0 && model.NewFlight(name, out[len(out)-1].Time, rec.Flight, rec.Time, r.Config.FlightGap)) {
			break
		}
		out = append(out, rec)
	}
	return out
}

// flightRange returns the points of flight f of the tail, pts[i:j]: from
// the flight's first point while its flight holds and no gap exceeds the
// configured flight gap (i == j: none).
func (r *Result) flightRange(tail string, f model.FlightPoint) (pts []model.TrendPoint, i, j int) {
	pts = r.Points[tail]
	i = sort.Search(len(pts), func(i int) bool { return pts[i].UnixNano >= f.UnixNano })
	for j = i; j < len(pts); j++ {
		if pts[j].Flight != f.Flight || (j > i && model.NextFlight(&pts[j-1], &pts[j], r.Config.FlightGap)) {
			break
		}
	}
	return pts, i, j
}

// readFlight reads the rows of flight f of the tail again from their files
// (the points say where they are), in time order.
func (r *Result) readFlight(tail string, f model.FlightPoint) []feed.Record {
	pts, i, j := r.flightRange(tail, f)
	refs := r.refsOf[tail]
	byFile := map[int][]int64{}
	at := map[int64]int64{} // ref → the point's time, to know the row again
	var order []int
	for k := i; k < j && k < len(refs); k++ {
		ref := refs[k]
		if ref == 0 {
			continue
		}
		fi := int(ref >> refBits)
		if _, ok := byFile[fi]; !ok {
			order = append(order, fi)
		}
		byFile[fi] = append(byFile[fi], ref&(1<<refBits-1)-1)
		at[ref] = pts[k].UnixNano
	}
	var out []feed.Record
	slices.Sort(order)
	for _, fi := range order {
		recs, err := feed.ReadRows(r.paths[fi], byFile[fi], len(r.Files[fi].Notices) == 0, r.opt)
		if err != nil {
			continue // the file went since it was read: its rows are not shown
		}
		for _, rec := range recs {
			// the same tail and time, or the file changed since it was read
			if t, ok := at[int64(fi)<<refBits|(rec.Offset+1)]; ok && rec.Tail == tail && rec.Time.UnixNano() == t {
				out = append(out, rec)
			}
		}
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Time.Before(out[b].Time) })
	out, _ = dedupe(out, func(r *feed.Record) int64 { return r.Time.UnixNano() })
	return out
}

// PolarPoints returns the tail's usable snapshots as polar-fit points, from
// its current segment on (the period of its own polar) or all of them.
func (r *Result) PolarPoints(tail string, currentSegment bool) []model.PolarPoint {
	var from time.Time
	if a, ok := r.Tail(tail); ok && currentSegment {
		from = a.PolarFrom
	}
	return model.PolarPoints(r.Points[tail], r.details[tail], r.Config, from)
}

// Run reads in.Paths and assesses the fleet. Files are read concurrently and
// analysed as they are parsed, so that one large file uses two cores. A file
// that cannot be read is in Result.Files with its error; the others are
// read all the same.
func Run(in Input) *Result {
	if in.Source != nil {
		return runSource(in)
	}
	r := newResult(in, len(in.Paths))
	if in.KeepRecords { // rows are read again on demand: the points keep where they are
		r.Records, r.refs, r.paths = nil, true, in.Paths
		r.fileIdx = make(map[string]int, len(in.Paths))
		for i, p := range in.Paths {
			if _, ok := r.fileIdx[p]; !ok {
				r.fileIdx[p] = i
			}
		}
		r.opt = feed.ReadOptions{CheckTail: feed.RosterCheck(r.Roster), Layout: in.Layout}
	}
	var rejMu sync.Mutex
	onReject := func(e *feed.RowError) {
		if in.Reject != nil {
			rejMu.Lock()
			in.Reject(e)
			rejMu.Unlock()
		}
	}
	jobs := make(chan int)
	var wg sync.WaitGroup
	// Files are read side by side; a file is cut into parts for the
	// cores that no other file uses (one big export on its own). Each part
	// is analysed where it is decoded (partSink) and its points are
	// filed under their tails in file order (merge).
	perFile := max(1, runtime.GOMAXPROCS(0)/max(1, len(in.Paths)))
	for w := 0; w < max(1, min(runtime.GOMAXPROCS(0), len(in.Paths))); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				opt := feed.ReadOptions{Progress: in.Progress, CheckTail: feed.RosterCheck(r.Roster), Layout: in.Layout}
				ref := int64(-1)
				if r.refs {
					ref = int64(r.fileIdx[in.Paths[i]])
				}
				r.Files[i] = feed.ReadFileParts(in.Paths[i], opt, perFile, func() feed.PartSink {
					return &partSink{r: r, in: &in, ref: ref, pp: newPartPoints()}
				}, onReject)
			}
		}()
	}
	for i := range in.Paths {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	for _, f := range r.Files {
		r.Stats.Add(f.Stats)
	}
	r.assess(in)
	return r
}

// FromRecords runs the pipeline on records already read (the built-in
// demo); st counts their rows. A record of a tail that the roster does not
// name is rejected (in.Reject) and counted as the reader would.
func FromRecords(recs []feed.Record, st feed.Stats, in Input) *Result {
	r := newResult(in, 0)
	r.Stats = st
	for _, rec := range recs {
		if _, _, why := r.Roster.At(rec.Tail, rec.Time); why != "" {
			r.Stats.Accepted--
			r.Stats.Rejected++
			if in.Reject != nil {
				in.Reject(&feed.RowError{File: rec.File, Line: rec.Line, Column: "tail", Reason: why, Err: feed.ErrNotInFleet})
			}
			continue
		}
		r.add(in, rec)
	}
	r.assess(in)
	return r
}

func newResult(in Input, files int) *Result {
	roster, typ := in.Roster, in.Type
	if roster == nil {
		roster = model.SingleType(in.Type)
	} else {
		typ = roster.Single()
	}
	r := &Result{Type: typ, Roster: roster, Config: in.Config, Points: map[string][]model.TrendPoint{}, Files: make([]feed.FileResult, files), names: model.NewFlightNames(),
		packs: map[string]*packed{}, detChunks: map[string][][]model.PointDetail{}, refChunks: map[string][][]int64{},
		refsOf: map[string][]int64{}, details: map[string][]model.PointDetail{}}
	if in.KeepRecords {
		r.Records = map[string][]feed.Record{}
	}
	return r
}

// TypeAt returns the type in force for the tail at t (nil when none is).
func (r *Result) TypeAt(tail string, t time.Time) *model.Type {
	_, typ, _ := r.Roster.At(tail, t)
	return typ
}

// TypeOf returns the type in force at the tail's last snapshot, the one
// its Cruise and Turns screens and its level flag use (nil for a tail
// without snapshots in a fleet file).
func (r *Result) TypeOf(tail string) *model.Type {
	if t := r.Roster.Single(); t != nil {
		return t
	}
	pts := r.Points[tail]
	if len(pts) == 0 { // none, or let go (DropPoints): the type its trend was grouped with
		if a, ok := r.Tail(tail); ok {
			return r.Roster.Types[a.Type]
		}
		return nil
	}
	return r.TypeAt(tail, pts[len(pts)-1].At())
}

// add analyses one record with the type in force for its tail at its time
// (its fuel flow corrected by the fleet file's known meter bias) and files
// its point under its tail.
func (r *Result) add(in Input, rec feed.Record) {
	if in.Filter != nil && !in.Filter(rec) {
		return
	}
	p, snap, typ, _ := r.Roster.Analyze(rec.Tail, rec.Time, rec.Snap)
	if typ == nil {
		return // rejected by the reader's tail check
	}
	tp := r.Config.NewPoint(rec.Time, r.names.ID(rec.Flight), &snap, &p)
	r.Points[rec.Tail] = append(r.Points[rec.Tail], tp)
	if !in.DropPoints {
		r.details[rec.Tail] = append(r.details[rec.Tail], model.NewDetail(&snap, &p))
	}
	if r.Records != nil {
		r.Records[rec.Tail] = append(r.Records[rec.Tail], rec)
	}
	if r.First.IsZero() || rec.Time.Before(r.First) {
		r.First = rec.Time
	}
	if rec.Time.After(r.Last) {
		r.Last = rec.Time
	}
}

// assess sorts each tail's points and records by time and computes the
// trends (tails in parallel), the flags and the cost, of the airframe
// series and, for the tails with thrust from fan speed, of the engine
// series. An engine or fuel-flow meter event restarts the engine series,
// any other the airframe series (model.SplitEvents), as does a change of
// type in the roster (a retrofit). Each tail is grouped with the type in
// force at its last snapshot, for its level flag, and priced with that
// entry's cruise hours.
func (r *Result) assess(in Input) {
	tails := make([]string, 0, len(r.Points)+len(r.packs))
	for tail := range r.Points {
		tails = append(tails, tail)
	}
	for tail := range r.packs {
		if _, ok := r.Points[tail]; !ok {
			tails = append(tails, tail)
		}
	}
	sort.Strings(tails)
	trends := make([]model.TailTrend, len(tails))
	engine := make([]model.TailTrend, len(tails))
	factors := make([]TailFactor, len(tails))
	// Per tail, the points, engine points and records without repeats, and
	// how many were dropped: put back into the maps after the workers.
	pointsOf, hasEngine := make([][]model.TrendPoint, len(tails)), make([]bool, len(tails))
	recordsOf, dups := make([][]feed.Record, len(tails)), make([]int, len(tails))
	refsOf, detOf := make([][]int64, len(tails)), make([][]model.PointDetail, len(tails))
	jobs := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < runtime.GOMAXPROCS(0); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			// With DropPoints, a tail's points and its engine series are
			// put in buffers of the worker's, reused from one tail to the
			// next: no fresh memory for them.
			var buf, ebuf []model.TrendPoint
			var fbuf []model.FlightPoint
			for i := range jobs {
				tail := tails[i]
				var pts []model.TrendPoint
				var det []model.PointDetail
				var refs []int64
				if in.DropPoints {
					buf = r.packs[tail].unpack(append(buf[:0], r.Points[tail]...))
					pts = buf
				} else {
					pts, det, refs = r.join(tail)
				}
				pts, det, refs, dups[i] = inTime(pts, det, refs)
				pointsOf[i], detOf[i], refsOf[i] = pts, det, refs
				if recs := r.Records[tail]; recs != nil {
					sort.SliceStable(recs, func(a, b int) bool { return recs[a].Time.Before(recs[b].Time) })
					recordsOf[i], _ = dedupe(recs, func(r *feed.Record) int64 { return r.Time.UnixNano() })
				}
				af, en := model.SplitEvents(in.Events[tail])
				af = append(af, r.Roster.Changes(tail)...)
				var last model.RosterEntry
				if len(pts) > 0 {
					last, _, _ = r.Roster.At(tail, pts[len(pts)-1].At())
				}
				trends[i] = model.AnalyzeTrend(tail, pts, det, r.names, af, in.Config)
				trends[i].Type, trends[i].CruiseHours = last.Type, last.CruiseHours
				var ep []model.TrendPoint
				if in.DropPoints {
					ebuf = model.AppendEngineSeries(ebuf[:0], pts)
					ep = ebuf
				} else {
					ep = model.EngineSeries(pts)
				}
				if len(ep) > 0 {
					hasEngine[i] = true
					engine[i] = model.AnalyzeTrend(tail, ep, nil, r.names, en, in.Config.EngineSeries())
					engine[i].Type, engine[i].CruiseHours = last.Type, last.CruiseHours
				}
				var enTr *model.TailTrend
				if len(ep) > 0 {
					enTr = &engine[i]
				}
				factors[i] = tailFactor(pts, &trends[i], enTr, append(slices.Clip(af), en...), &in, &fbuf)
				if in.DropPoints {
					pointsOf[i], detOf[i], refsOf[i] = nil, nil, nil
				}
			}
		}()
	}
	for i := range tails {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	for i, tail := range tails {
		if pointsOf[i] == nil {
			delete(r.Points, tail)
		} else {
			r.Points[tail] = pointsOf[i]
		}
		if refsOf[i] != nil {
			r.refsOf[tail] = refsOf[i]
		}
		if detOf[i] != nil {
			r.details[tail] = detOf[i]
		} else {
			delete(r.details, tail)
		}
		if recordsOf[i] != nil {
			r.Records[tail] = recordsOf[i]
		}
		r.Duplicates += dups[i]
	}
	r.packs, r.detChunks, r.refChunks = nil, nil, nil
	r.Policy, r.Factors = in.policy(), make(map[string]TailFactor, len(tails))
	for i, tail := range tails {
		r.Factors[tail] = factors[i]
	}
	r.Fleet = model.AssessFleet(trends, in.Config)
	var withEngine []model.TailTrend
	for i, tr := range engine {
		if hasEngine[i] {
			withEngine = append(withEngine, tr)
		}
	}
	r.Engine = model.AssessFleet(withEngine, in.Config.EngineSeries())
	r.tailIdx, r.engineIdx = index(r.Fleet.Tails), index(r.Engine.Tails)
}

// inTime sorts a tail's points by time, with their details and where
// their rows are (det and refs, nil when not kept), and drops the repeats
// of a time as dedupe does; it returns them and how many were dropped. A
// file in time order gives them sorted: they are then only checked.
func inTime(pts []model.TrendPoint, det []model.PointDetail, refs []int64) ([]model.TrendPoint, []model.PointDetail, []int64, int) {
	if order := model.TimeOrder(pts); order != nil {
		model.Reorder(pts, order)
		if det != nil {
			model.Reorder(det, order)
		}
		if refs != nil {
			model.Reorder(refs, order)
		}
	}
	if len(pts) < 2 {
		return pts, det, refs, 0
	}
	k := 1
	for i := 1; i < len(pts); i++ {
		if pts[i].UnixNano != pts[k-1].UnixNano {
			pts[k] = pts[i]
			if det != nil {
				det[k] = det[i]
			}
			if refs != nil {
				refs[k] = refs[i]
			}
			k++
		}
	}
	if det != nil {
		det = det[:k]
	}
	if refs != nil {
		refs = refs[:k]
	}
	return pts[:k], det, refs, len(pts) - k
}

// dedupe drops from s, in time order, each element whose time equals the
// one before it (one tail's snapshots: a repeat of a tail and time), and
// returns what is left and how many were dropped.
func dedupe[T any](s []T, at func(*T) int64) ([]T, int) {
	if len(s) < 2 {
		return s, 0
	}
	k := 1
	for i := 1; i < len(s); i++ {
		if at(&s[i]) != at(&s[k-1]) {
			s[k] = s[i]
			k++
		}
	}
	return s[:k], len(s) - k
}
