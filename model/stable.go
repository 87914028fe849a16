package model

import (
	"math"
	"time"

	"gonum.org/v1/gonum/stat"
)

// Sample is one row of a continuous recording (DESIGN.md §3.5), SI units:
// kg, m (pressure altitude), K, kg/s, rad; N1 in % (0: not recorded).
type Sample struct {
	Time                time.Time
	Weight, Altitude    float64
	Mach, SAT, FuelFlow float64
	Bank, N1            float64
}

// StableCriteria are the limits of a stable window (DESIGN.md §4.13). The
// defaults (DefaultStableCriteria) are common practice: no single source
// gives them.
type StableCriteria struct {
	MinSeconds, MaxSeconds float64 // window length, s (120, 300)
	MachRange              float64 // max − min Mach (0.006)
	AltRange               float64 // max − min pressure altitude, m (60 ft)
	MaxBank                float64 // |bank| at every sample, rad (3°)
	FuelFlowRangePct       float64 // max − min fuel flow, % of its mean (3)
	SATRange               float64 // max − min SAT, K (1.5)
	N1RangePct             float64 // max − min N1, percentage points (1), when recorded
	MaxGap                 float64 // longest step between samples, s (10)
}

// DefaultStableCriteria returns the limits of DESIGN.md §4.13.
func DefaultStableCriteria() StableCriteria {
	return StableCriteria{MinSeconds: 120, MaxSeconds: 300, MachRange: 0.006, AltRange: 60 * Foot,
		MaxBank: 3 * math.Pi / 180, FuelFlowRangePct: 3, SATRange: 1.5, N1RangePct: 1, MaxGap: 10}
}

// Unstable names the criterion a sample breaks (the one that ends a
// window), for the summary of the time left out.
type Unstable int

// The criteria, in the order they are checked.
const (
	StableOK Unstable = iota
	UnstableGap
	UnstableBank
	UnstableMach
	UnstableAltitude
	UnstableFuelFlow
	UnstableSAT
	UnstableN1
	UnstableShort // the flight's samples ended before a window was long enough
	numUnstable
)

// UnstableNames are the names of the criteria, for messages.
var UnstableNames = [...]string{StableOK: "stable", UnstableGap: "gap", UnstableBank: "bank",
	UnstableMach: "Mach", UnstableAltitude: "altitude", UnstableFuelFlow: "fuel flow", UnstableSAT: "SAT",
	UnstableN1: "N1", UnstableShort: "too short"}

// Window is a stable stretch of samples [From, To] (indexes, both in).
type Window struct{ From, To int }

// minMaxQueue keeps the minimum and maximum of a sliding window of values
// (monotonic deques), each push and pop amortised O(1). While the window
// only grows (no start dropped since the last reset, the usual case in a
// steady cruise) it keeps a plain running minimum and maximum instead,
// and builds the deques from the window at the first drop: the results
// are the same, the branchy deque work is spent only where starts move.
type minMaxQueue struct {
	lo, hi   []int // indexes into vals: increasing values in lo, decreasing in hi
	head     [2]int
	deque    bool    // the deques are in use (a start was dropped)
	min, max float64 // the running extremes while !deque
	count    int     // values pushed while !deque
}

func (q *minMaxQueue) reset() {
	q.lo, q.hi, q.head = q.lo[:0], q.hi[:0], [2]int{}
	q.deque, q.count = false, 0
}

func (q *minMaxQueue) push(vals []float64, i int) {
	if !q.deque {
		v := vals[i]
		if q.count == 0 {
			q.min, q.max = v, v
		} else {
			// plain comparisons: the values are finite (the reader's checks)
			if v < q.min {
				q.min = v
			}
			if v > q.max {
				q.max = v
			}
		}
		q.count++
		return
	}
	q.pushDeque(vals, i)
}

func (q *minMaxQueue) pushDeque(vals []float64, i int) {
	for len(q.lo) > q.head[0] && vals[q.lo[len(q.lo)-1]] >= vals[i] {
		q.lo = q.lo[:len(q.lo)-1]
	}
	q.lo = append(q.lo, i)
	for len(q.hi) > q.head[1] && vals[q.hi[len(q.hi)-1]] <= vals[i] {
		q.hi = q.hi[:len(q.hi)-1]
	}
	q.hi = append(q.hi, i)
}

// drop forgets the indexes before from; to is the window's end (exclusive).
func (q *minMaxQueue) drop(vals []float64, from, to int) {
	if !q.deque {
		q.lo, q.hi, q.head, q.deque = q.lo[:0], q.hi[:0], [2]int{}, true
		for k := from; k < to; k++ {
			q.pushDeque(vals, k)
		}
		return
	}
	for q.head[0] < len(q.lo) && q.lo[q.head[0]] < from {
		q.head[0]++
	}
	for q.head[1] < len(q.hi) && q.hi[q.head[1]] < from {
		q.head[1]++
	}
}

// rangeWith is max − min of the window with vals[i] added (not pushed).
func (q *minMaxQueue) rangeWith(vals []float64, i int) (lo, hi float64) {
	lo, hi = vals[i], vals[i]
	if !q.deque {
		if q.count > 0 && q.min < lo {
			lo = q.min
		}
		if q.count > 0 && q.max > hi {
			hi = q.max
		}
		return lo, hi
	}
	if q.head[0] < len(q.lo) && vals[q.lo[q.head[0]]] < lo {
		lo = vals[q.lo[q.head[0]]]
	}
	if q.head[1] < len(q.hi) && vals[q.hi[q.head[1]]] > hi {
		hi = vals[q.hi[q.head[1]]]
	}
	return lo, hi
}

// StableWindows finds the stable windows of one flight's samples, in time
// order, as DESIGN.md §4.13 states them: windows are taken greedily from
// the start, each grown while stable up to MaxSeconds, kept when it lasts
// at least MinSeconds; the next starts after it ends; a failed start moves
// on by one sample. A sample more than MaxGap after the one before ends a
// window: a gap is never bridged. Stability is monotone (a part of a
// stable window is stable), so the end only moves forward and the whole
// search is linear in the samples.
//
// Left, for each criterion, is the time (s) left out of every window that
// the criterion ended (the step from a failed start to the next sample).
func StableWindows(s []Sample, c StableCriteria) (windows []Window, left [numUnstable]float64) {
	return stableWindows(s, c, nil)
}

// StableReasons is StableWindows with, for each sample, why it is in no
// window: the criterion that ended the window that started at it
// (StableOK for the samples inside windows).
func StableReasons(s []Sample, c StableCriteria) ([]Window, []Unstable) {
	why := make([]Unstable, len(s))
	ws, _ := stableWindows(s, c, why)
	for _, w := range ws {
		for i := w.From; i <= w.To; i++ {
			why[i] = StableOK
		}
	}
	return ws, why
}

func stableWindows(s []Sample, c StableCriteria, reasons []Unstable) (windows []Window, left [numUnstable]float64) {
	n := len(s)
	if n == 0 {
		return nil, left
	}
	cols := [5][]float64{make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n), make([]float64, n)}
	hasN1 := true
	for i, x := range s {
		cols[0][i], cols[1][i], cols[2][i], cols[3][i], cols[4][i] = x.Mach, x.Altitude, x.FuelFlow, x.SAT, x.N1
		hasN1 = hasN1 && x.N1 > 0
	}
	var qs [5]minMaxQueue
	at := make([]float64, n) // seconds since the first sample
	for i := range s {
		at[i] = s[i].Time.Sub(s[0].Time).Seconds()
	}
	secs := func(a, b int) float64 { return at[b] - at[a] }
	var ffSum float64
	// fits says whether sample j can join the window [i, j−1], and which
	// criterion it breaks if not.
	fits := func(i, j int) Unstable {
		if j > i && secs(j-1, j) > c.MaxGap {
			return UnstableGap
		}
		if math.Abs(s[j].Bank) > c.MaxBank {
			return UnstableBank
		}
		if lo, hi := qs[0].rangeWith(cols[0], j); hi-lo > c.MachRange {
			return UnstableMach
		}
		if lo, hi := qs[1].rangeWith(cols[1], j); hi-lo > c.AltRange {
			return UnstableAltitude
		}
		if lo, hi := qs[2].rangeWith(cols[2], j); hi-lo > c.FuelFlowRangePct/100*(ffSum+s[j].FuelFlow)/float64(j-i+1) {
			return UnstableFuelFlow
		}
		if lo, hi := qs[3].rangeWith(cols[3], j); hi-lo > c.SATRange {
			return UnstableSAT
		}
		if hasN1 {
			if lo, hi := qs[4].rangeWith(cols[4], j); hi-lo > c.N1RangePct {
				return UnstableN1
			}
		}
		return StableOK
	}
	nq := len(qs) // the queues in use: N1's only when recorded
	if !hasN1 {
		nq--
	}
	reset := func() {
		for k := range qs {
			qs[k].reset()
		}
		ffSum = 0
	}
	i, j := 0, 0 // the window is [i, j); j only moves forward while i does
	var why Unstable
	for i < n {
		if j < i {
			j = i
		}
		for j < n {
			// the criteria first: a sample beyond a gap is beyond the
			// longest window too, and the gap is what ended it
			if why = fits(i, j); why != StableOK || secs(i, j) > c.MaxSeconds {
				break
			}
			for k := 0; k < nq; k++ {
				qs[k].push(cols[k], j)
			}
			ffSum += s[j].FuelFlow
			j++
		}
		if j == n {
			why = UnstableShort
		}
		if j > i && secs(i, j-1) >= c.MinSeconds {
			windows = append(windows, Window{i, j - 1})
			i = j
			reset()
			continue
		}
		// A failed start: move on by one sample. The step to it is left
		// out for the criterion that ended the window.
		if i+1 < n {
			left[why] += secs(i, i+1)
		}
		if reasons != nil {
			reasons[i] = why
		}
		if j > i {
			ffSum -= s[i].FuelFlow
		}
		i++
		if j < i { // the window is empty: start afresh
			reset()
			continue
		}
		for k := 0; k < nq; k++ {
			qs[k].drop(cols[k], i, j)
		}
		// The fuel-flow range is judged against the window's mean, which
		// moves with the start: should [i, j) no longer pass, it is grown
		// afresh from i, so that every window kept meets every criterion.
		if j > i {
			if lo, hi := qs[2].rangeWith(cols[2], i); hi-lo > c.FuelFlowRangePct/100*ffSum/float64(j-i) {
				reset()
				j = i
			}
		}
		// A gap or a bank out of limits at the end cannot be passed by
		// moving the start: the window restarts beyond it.
		if why == UnstableGap || why == UnstableBank {
			for ; i < j; i++ {
				if i+1 < n {
					left[why] += secs(i, i+1)
				}
				if reasons != nil {
					reasons[i] = why
				}
			}
			reset()
		}
	}
	return windows, left
}

// WindowSnapshot is the snapshot of a stable window: at the window's
// middle, the means of weight, altitude, Mach, SAT, fuel flow, bank and N1;
// the vertical speed as the geometric rate, the least-squares slope of the
// pressure altitude times the mean of T/T_ISA (a geometric height step is
// the pressure step scaled by T/T_ISA, §4.1), in m/s; the acceleration as
// the least-squares slope of TAS, m/s² (gonum stat.LinearRegression).
type WindowSnapshot struct {
	Time    time.Time
	Snap    Snapshot
	Samples int
	Seconds float64
}

// SnapshotOf makes the snapshot of window w of the samples s.
func SnapshotOf(s []Sample, w Window) WindowSnapshot {
	part := s[w.From : w.To+1]
	n := float64(len(part))
	t0 := part[0].Time
	x, alt, tas := make([]float64, len(part)), make([]float64, len(part)), make([]float64, len(part))
	ratio := 0.0 // mean T/T_ISA
	var snap Snapshot
	n1 := 0.0
	for i, p := range part {
		x[i] = p.Time.Sub(t0).Seconds()
		alt[i] = p.Altitude
		ratio += p.SAT / StandardTemperature(p.Altitude) / n
		tas[i] = TrueAirspeed(p.Mach, p.SAT)
		snap.Weight += p.Weight / n
		snap.Altitude += p.Altitude / n
		snap.Mach += p.Mach / n
		snap.SAT += p.SAT / n
		snap.FuelFlow += p.FuelFlow / n
		snap.Bank += p.Bank / n
		n1 += p.N1 / n
	}
	if hasAll := func() bool {
		for _, p := range part {
			if p.N1 <= 0 {
				return false
			}
		}
		return true
	}(); hasAll {
		snap.N1 = n1
	}
	if len(part) > 1 {
		_, slope := stat.LinearRegression(x, alt, nil, false)
		snap.VS = slope * ratio
		_, snap.Accel = stat.LinearRegression(x, tas, nil, false)
	}
	last := part[len(part)-1].Time
	return WindowSnapshot{Time: t0.Add(last.Sub(t0) / 2), Snap: snap, Samples: len(part), Seconds: last.Sub(t0).Seconds()}
}
