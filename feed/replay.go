package feed

import (
	"context"
	"sort"
	"time"
)

// ReplayFilter selects the snapshots to replay; empty fields match all.
type ReplayFilter struct {
	Tail   string
	Flight string
}

// Match reports whether r passes the filter.
func (f ReplayFilter) Match(r Record) bool {
	return (f.Tail == "" || r.Tail == f.Tail) && (f.Flight == "" || r.Flight == f.Flight)
}

// LoadReplay reads the files, keeps the accepted records that match the
// filter and returns them merged in time order (ties keep file and line
// order), read with opt (its tail check and layout). Rows of refused tails are rejected;
// rejected rows go to reject; files that cannot be read are in the results
// with their error.
func LoadReplay(paths []string, f ReplayFilter, opt ReadOptions, reject func(*RowError)) ([]Record, []FileResult) {
	var recs []Record
	results := make([]FileResult, 0, len(paths))
	for _, p := range paths {
		results = append(results, ReadFileWith(p, opt, func(r Record) {
			if f.Match(r) {
				recs = append(recs, r)
			}
		}, reject))
	}
	sort.SliceStable(recs, func(i, j int) bool { return recs[i].Time.Before(recs[j].Time) })
	return recs, results
}

// Player plays records in time order at Speed times real time: the wait
// before each record is its time gap to the one before, divided by Speed,
// and at most MaxWait when that is set. Speed 0 means no waiting. The
// dashboard drives a Player step by step; Run plays it through.
type Player struct {
	recs    []Record
	pos     int
	Speed   float64
	MaxWait time.Duration // 0: no cap
}

// NewPlayer returns a player of recs (in time order) at speed.
func NewPlayer(recs []Record, speed float64) *Player {
	return &Player{recs: recs, Speed: speed}
}

// Pos is the index of the next record to play.
func (p *Player) Pos() int { return p.pos }

// Seek moves to record i (clamped to 0 … Len).
func (p *Player) Seek(i int) { p.pos = max(0, min(i, len(p.recs))) }

// Wait is the wait before the next record: the gap between it and the
// previous one divided by Speed, capped at MaxWait; 0 for the first
// record, at the end or at Speed 0.
func (p *Player) Wait() time.Duration {
	if p.pos <= 0 || p.pos >= len(p.recs) || p.Speed <= 0 {
		return 0
	}
	gap := p.recs[p.pos].Time.Sub(p.recs[p.pos-1].Time)
	wait := time.Duration(float64(gap) / p.Speed)
	if p.MaxWait > 0 && wait > p.MaxWait {
		wait = p.MaxWait
	}
	return max(wait, 0)
}

// Next returns the next record and the wait before it; ok is false at the
// end.
func (p *Player) Next() (rec Record, wait time.Duration, ok bool) {
	if p.pos >= len(p.recs) {
		return Record{}, 0, false
	}
	wait = p.Wait()
	rec = p.recs[p.pos]
	p.pos++
	return rec, wait, true
}

// Run plays the remaining records, waiting on clk, and calls emit for each.
// It stops at the end, at ctx's end (returning ctx.Err()) or at emit's
// first error.
func (p *Player) Run(ctx context.Context, clk Clock, emit func(Record) error) error {
	for {
		rec, wait, ok := p.Next()
		if !ok {
			return nil
		}
		if wait > 0 {
			select {
			case <-ctx.Done():
				return ctx.Err()
			case <-clk.After(wait):
			}
		} else if err := ctx.Err(); err != nil {
			return err
		}
		if err := emit(rec); err != nil {
			return err
		}
	}
}
