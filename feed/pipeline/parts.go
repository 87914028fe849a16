package pipeline

import (
	"math"
	"sync"
	"time"
	"unsafe"

	"dragdeck/feed"
	"dragdeck/model"
)

// partPoints is the analysis of one part of a file (a few thousand rows):
// its points by tail, each tail's in file order, with their flights
// numbered in the result's table, and the span of their times.
type partPoints struct {
	tails       []tailPoints
	at          map[string]int            // tail → its place in tails
	flightAt    map[string]model.FlightID // the part's flights and their ids in the result's table
	levels      model.Levels              // the air at the part's flight levels
	first, last int64                     // ns; first > last: no point
}

// tailPoints is one tail's points of a part.
type tailPoints struct {
	tail       string
	seg        segment             // its points, packed
	det        []model.PointDetail // their details, unless DropPoints
	refs       []int64             // where each point's row is, when they are kept (Result.refsOf)
	lastFlight string              // the last point's flight and its id: most rows
	lastID     model.FlightID
	roster     model.TailRoster
}

// parts keeps the partPoints that were merged, for the parts after them.
var parts = sync.Pool{New: func() any {
	return &partPoints{at: map[string]int{}, flightAt: map[string]model.FlightID{}}
}}

// analysePart analyses the records of one part (analyse) into a
// partPoints of its own.
func (r *Result) analysePart(in *Input, recs []feed.Record, ref int64) *partPoints {
	pp := newPartPoints()
	r.analyse(pp, in, recs, ref)
	return pp
}

// newPartPoints returns an empty partPoints from the pool.
func newPartPoints() *partPoints {
	pp := parts.Get().(*partPoints)
	pp.first, pp.last = math.MaxInt64, math.MinInt64
	return pp
}

// partSink analyses the records of one part of a file as they are
// decoded (a feed.PartSink), on the goroutine that decodes them, and
// merges its points in file order.
type partSink struct {
	r   *Result
	in  *Input
	ref int64
	pp  *partPoints
}

func (s *partSink) Add(recs []feed.Record) { s.r.analyse(s.pp, s.in, recs, s.ref) }
func (s *partSink) Done() func()           { return func() { s.r.merge(s.pp) } }

// analyse analyses records of a part into pp, as add does one record: the
// type in force for its tail at its time, the fuel flow corrected by the
// fleet file's meter bias. ref is the file's index, for where each point's
// row is (−1: not kept).
func (r *Result) analyse(pp *partPoints, in *Input, recs []feed.Record, ref int64) {
	var p model.Point
	for i := range recs {
		rec := &recs[i]
		if in.Filter != nil && !in.Filter(*rec) {
			continue
		}
		tp := pp.tail(r.Roster, rec.Tail)
		snap := rec.Snap
		typ, _ := tp.roster.AnalyzeInto(&p, rec.Time, &snap, &pp.levels)
		if typ == nil {
			continue // rejected by the reader's tail check
		}
		if tp.seg.n == 0 || rec.Flight != tp.lastFlight {
			tp.lastFlight, tp.lastID = rec.Flight, pp.flight(r, rec.Flight)
		}
		pt := r.Config.NewPoint(rec.Time, tp.lastID, &snap, &p)
		tp.seg.add(&pt)
		if !in.DropPoints {
			tp.det = append(tp.det, model.NewDetail(&snap, &p))
		}
		if ref >= 0 {
			tp.refs = append(tp.refs, ref<<refBits|(rec.Offset+1))
		}
		pp.first, pp.last = min(pp.first, pt.UnixNano), max(pp.last, pt.UnixNano)
	}
}

// tail returns the part's points of a tail, reusing the slices of a part
// merged before.
func (pp *partPoints) tail(r *model.Roster, name string) *tailPoints {
	if i, ok := pp.at[name]; ok {
		return &pp.tails[i]
	}
	i := len(pp.tails)
	pp.at[name] = i
	if i < cap(pp.tails) {
		pp.tails = pp.tails[:i+1]
		pp.tails[i].tail, pp.tails[i].det, pp.tails[i].refs = name, pp.tails[i].det[:0], pp.tails[i].refs[:0]
		pp.tails[i].seg.reset()
	} else {
		pp.tails = append(pp.tails, tailPoints{tail: name})
	}
	pp.tails[i].roster = r.Tail(name)
	return &pp.tails[i]
}

// flight returns the id of a flight name in the result's table, which the
// parts decoded side by side share (under r.namesMu): each part asks it
// once per flight name, so that the points need no renumbering when they
// are merged. An id says which flight a point is of, nothing more, so the
// order in which the parts number them does not matter.
func (pp *partPoints) flight(r *Result, name string) model.FlightID {
	if id, ok := pp.flightAt[name]; ok {
		return id
	}
	r.namesMu.Lock()
	id := r.names.ID(name)
	r.namesMu.Unlock()
	pp.flightAt[name] = id
	return id
}

// merge files a part's packed points (and their details and rows, when
// kept) under their tails, after those of the parts before it, and gives
// the part back to the pool.
func (r *Result) merge(pp *partPoints) {
	r.mu.Lock()
	defer r.mu.Unlock()
	for i := range pp.tails {
		tp := &pp.tails[i]
		if tp.seg.n == 0 { // its rows were all left out: no tail of the result
			continue
		}
		pk := r.packs[tp.tail]
		if pk == nil {
			pk = new(packed)
			r.packs[tp.tail] = pk
		}
		pk.add(&tp.seg)
		if len(tp.det) > 0 {
			r.detChunks[tp.tail] = addChunked(r.detChunks[tp.tail], tp.det)
		}
		if len(tp.refs) > 0 {
			r.refChunks[tp.tail] = addChunked(r.refChunks[tp.tail], tp.refs)
		}
	}
	if pp.first <= pp.last {
		if first := time.Unix(0, pp.first).UTC(); r.First.IsZero() || first.Before(r.First) {
			r.First = first
		}
		if last := time.Unix(0, pp.last).UTC(); last.After(r.Last) {
			r.Last = last
		}
	}
	pp.tails = pp.tails[:0]
	clear(pp.at)
	clear(pp.flightAt)
	parts.Put(pp)
}

// addChunked appends pts to a tail's chunks: the last chunk takes what it
// has room for, and a new chunk, of an eighth of the tail's points so far
// (4 KB at least), the rest. A tail's points then never move while it is
// read, and the room to spare is at most an eighth of them or one small
// chunk (a slice grown by append moves them at each growth and keeps up to
// a quarter spare); join puts them in one slice when the tail is assessed.
// The chunks are few (a dozen for a tail's year), as each is one more
// object for the garbage collector to mark while a fleet is held.
func addChunked[T any](cs [][]T, pts []T) [][]T {
	for len(pts) > 0 {
		if k := len(cs) - 1; k >= 0 && len(cs[k]) < cap(cs[k]) {
			n := min(cap(cs[k])-len(cs[k]), len(pts))
			cs[k], pts = append(cs[k], pts[:n]...), pts[n:]
			continue
		}
		total := 0
		for _, c := range cs {
			total += len(c)
		}
		cs = append(cs, make([]T, 0, max(minChunk/int(unsafe.Sizeof(pts[0])), total/8, len(pts))))
	}
	return cs
}

// minChunk is the size of a tail's first chunk, in bytes.
const minChunk = 4 << 10

// join returns a tail's points, their details and where their rows are
// (nil when not kept): those added one at a time (add) and those packed
// by merge, in the order they came, each in one slice of its size. The
// packed points and the chunks are let go.
func (r *Result) join(tail string) ([]model.TrendPoint, []model.PointDetail, []int64) {
	pts := r.Points[tail]
	if pk := r.packs[tail]; pk != nil && pk.n > 0 {
		pts = pk.unpack(append(make([]model.TrendPoint, 0, len(pts)+pk.n), pts...))
	}
	return pts, joinChunks(r.details[tail], r.detChunks[tail]), joinChunks(nil, r.refChunks[tail])
}

// joinChunks returns first and then the chunks cs in one slice, and lets
// the chunks go; first itself when there are none.
func joinChunks[T any](first []T, cs [][]T) []T {
	if len(cs) == 0 {
		return first
	}
	n := len(first)
	for _, c := range cs {
		n += len(c)
	}
	dst := append(make([]T, 0, n), first...)
	for k, c := range cs {
		dst = append(dst, c...)
		cs[k] = nil
	}
	return dst
}
