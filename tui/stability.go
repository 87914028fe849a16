package tui

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// stability is what the Flight screen shows of a continuous recording (a
// flight sampled every few seconds): its stable windows (DESIGN.md §4.13,
// the model's StableReasons with the default criteria), why each sample
// outside them is not stable, and each window's snapshot analysed, as
// extract would write it. Computed for the current flight, kept until it
// or its records change.
type stability struct {
	first     *feed.Record // &recs[0] when made
	n         int          // len(recs) when made
	idx       []int        // indexes into recs of the flight's samples
	recording bool         // samples close enough for windows (median step ≤ the longest gap)
	windows   []model.Window
	why       []model.Unstable // per sample of idx
	win       []int            // per sample of idx: its window, −1 outside
	dev       []float64        // per window: its snapshot's drag deviation, %
	mid       []time.Time      // per window: its snapshot's time
	t0, tEnd  time.Time
}

// stableOf returns the stability of the current flight, made anew when the
// flight or its records changed.
func (s *flightScreen) stableOf() *stability {
	if s.pos == 0 || len(s.recs) == 0 {
		return nil
	}
	played, _ := s.flightSpan()
	c := &s.stab
	if c.first == &s.recs[0] && c.n == len(s.recs) && len(c.idx) > 0 && c.idx[0] == played[0] {
		return c
	}
	idx := append([]int(nil), played...)
	cur := s.recs[idx[len(idx)-1]]
	prev := cur
	for j := idx[len(idx)-1] + 1; j < len(s.recs); j++ { // the rest of the flight, in a replay
		r := s.recs[j]
		if r.Tail != cur.Tail {
			continue
		}
		if model.NewFlight(prev.Flight, prev.Time, r.Flight, r.Time, s.cfg.FlightGap) {
			break
		}
		idx, prev = append(idx, j), r
	}
	*c = stability{first: &s.recs[0], n: len(s.recs), idx: idx,
		t0: s.recs[idx[0]].Time, tEnd: s.recs[idx[len(idx)-1]].Time}
	crit := model.DefaultStableCriteria()
	if len(idx) < 3 {
		return c
	}
	steps := make([]float64, 0, len(idx)-1)
	for k := 1; k < len(idx); k++ {
		steps = append(steps, s.recs[idx[k]].Time.Sub(s.recs[idx[k-1]].Time).Seconds())
	}
	if model.Median(steps) > crit.MaxGap {
		return c // snapshots, not a recording
	}
	c.recording = true
	samples := make([]model.Sample, len(idx))
	for k, i := range idx {
		r := s.recs[i]
		samples[k] = model.Sample{Time: r.Time, Weight: r.Snap.Weight, Altitude: r.Snap.Altitude, Mach: r.Snap.Mach,
			SAT: r.Snap.SAT, FuelFlow: r.Snap.FuelFlow, Bank: r.Snap.Bank, N1: r.Snap.N1}
	}
	c.windows, c.why = model.StableReasons(samples, crit)
	c.win = slices.Repeat([]int{-1}, len(idx))
	for w, win := range c.windows {
		for k := win.From; k <= win.To; k++ {
			c.win[k] = w
		}
		ws := model.SnapshotOf(samples, win)
		p, _, _, _ := s.roster.Analyze(cur.Tail, ws.Time, ws.Snap)
		c.dev, c.mid = append(c.dev, p.DragDevPct), append(c.mid, ws.Time)
	}
	return c
}

// stableLine says whether the current sample is in a stable window, and
// what the window's snapshot gives, or which criterion it breaks.
func (s *flightScreen) stableLine(c *stability) string {
	k := slices.Index(c.idx, s.pos-1)
	if k < 0 {
		return ""
	}
	if w := c.win[k]; w >= 0 {
		win := c.windows[w]
		secs := s.recs[c.idx[win.To]].Time.Sub(s.recs[c.idx[win.From]].Time).Seconds()
		return s.st.Accent.Render(fmt.Sprintf("stable window %d of %d (%.0f s): its snapshot gives drag %s %%", w+1, len(c.windows), secs, fmtSigned(c.dev[w], 2)))
	}
	return s.st.Muted.Render("not stable here: " + model.UnstableNames[c.why[k]] + " · this sample alone: drag " + fmtSigned(s.points[s.pos-1].DragDevPct, 2) + " %")
}

// stableStrip is one line along the flight's time, under the deviation
// chart: '█' where a stable window lies, '·' elsewhere, '|' at the current
// sample (the glyphs tell them apart without colour).
func (s *flightScreen) stableStrip(c *stability, w int) string {
	const label = "stable "
	cols := w - len(label)
	span := c.tEnd.Sub(c.t0).Seconds()
	if cols < 10 || !(span > 0) {
		return ""
	}
	stable := make([]bool, cols)
	for _, win := range c.windows {
		a := s.recs[c.idx[win.From]].Time.Sub(c.t0).Seconds()
		b := s.recs[c.idx[win.To]].Time.Sub(c.t0).Seconds()
		for x := int(a / span * float64(cols-1)); x <= min(cols-1, int(math.Ceil(b/span*float64(cols-1)))); x++ {
			stable[x] = true
		}
	}
	cur := int(s.recs[s.pos-1].Time.Sub(c.t0).Seconds() / span * float64(cols-1))
	var b strings.Builder
	b.WriteString(s.st.Muted.Render(label))
	for x := 0; x < cols; x++ {
		switch {
		case x == cur:
			b.WriteString(s.st.Flag.Render("|"))
		case stable[x]:
			b.WriteString(s.st.Accent.Render("█"))
		default:
			b.WriteString(s.st.Muted.Render("·"))
		}
	}
	return b.String()
}

// windowPoints are the window snapshots played so far, for the deviation
// chart: minutes after t0, deviation.
func (c *stability) windowPoints(t0, upTo time.Time) [][2]float64 {
	var out [][2]float64
	for w, at := range c.mid {
		if !at.After(upTo) && !math.IsNaN(c.dev[w]) {
			out = append(out, [2]float64{at.Sub(t0).Minutes(), c.dev[w]})
		}
	}
	return out
}
