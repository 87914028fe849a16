package pipeline

import (
	"runtime"
	"sync"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// Source is snapshots kept elsewhere than in files: the fleet store
// (package store). The pipeline reads it as it reads files, and gives the
// same result for the same snapshots.
type Source interface {
	// Each calls fn for every snapshot, in the order they were first read,
	// and counts them.
	Each(fn func(feed.Record)) (feed.Stats, error)
	// Flight returns a tail's snapshots from..to (inclusive) in time
	// order: the rows of a flight to replay.
	Flight(tail string, from, to time.Time) ([]feed.Record, error)
}

// runSource is Run on in.Source. A snapshot of a tail the roster does not
// name is rejected and counted, as the reader rejects it in a file. The
// source gives its snapshots on one goroutine; they are analysed by
// batches on the others (analysePart) and filed in the order they came
// (merge), as the parts of a file are.
func runSource(in Input) *Result {
	r := newResult(in, 0)
	if in.KeepRecords { // read again on demand, as from files
		r.Records, r.src = nil, in.Source
	}
	type job struct {
		recs []feed.Record
		done chan *partPoints
	}
	workers := max(1, runtime.GOMAXPROCS(0))
	jobs, order := make(chan *job, 2*workers), make(chan *job, 2*workers)
	free := make(chan []feed.Record, 4*workers) // the record buffers of batches filed
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				j.done <- r.analysePart(&in, j.recs, -1)
			}
		}()
	}
	filed := make(chan struct{})
	go func() {
		defer close(filed)
		for j := range order {
			r.merge(<-j.done)
			select {
			case free <- j.recs[:0]:
			default:
			}
		}
	}()
	var batch []feed.Record
	send := func() {
		if len(batch) > 0 {
			j := &job{recs: batch, done: make(chan *partPoints, 1)}
			order <- j
			jobs <- j
		}
		select {
		case batch = <-free:
		default:
			batch = make([]feed.Record, 0, sourceBatch)
		}
	}
	send()
	rejected := 0
	st, err := in.Source.Each(func(rec feed.Record) {
		if _, _, why := r.Roster.At(rec.Tail, rec.Time); why != "" {
			rejected++ // counted here; the source's counts are added below
			if in.Reject != nil {
				in.Reject(&feed.RowError{File: rec.File, Line: rec.Line, Column: "tail", Reason: why, Err: feed.ErrNotInFleet})
			}
			return
		}
		if batch = append(batch, rec); len(batch) == sourceBatch {
			send()
		}
	})
	send()
	close(jobs)
	close(order)
	wg.Wait()
	<-filed
	r.Stats = st
	r.Stats.Accepted -= rejected
	r.Stats.Rejected += rejected
	r.SourceErr = err
	r.assess(in)
	return r
}

// sourceBatch is how many snapshots of a source are analysed together.
const sourceBatch = 4096

// sourceFlight reads flight f of the tail back from the source: the rows
// from its first point to its last, of its flight name.
func (r *Result) sourceFlight(tail string, f model.FlightPoint) []feed.Record {
	pts, i, j := r.flightRange(tail, f)
	if j == i {
		return nil
	}
	recs, err := r.src.Flight(tail, pts[i].At(), pts[j-1].At())
	if err != nil {
		return nil // the store went since it was read: nothing to show
	}
	out, name := recs[:0], r.names.Name(f.Flight)
	for _, rec := range recs {
		if rec.Flight == name {
			out = append(out, rec)
		}
	}
	return out
}
