package main

import (
	"bufio"
	"fmt"
	"math"
	"runtime"
	"strconv"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// flightBreak is the pause after which a tail's samples without a flight
// id (or with the same one) are taken as a new flight.
const flightBreak = 30 * time.Minute

func runExtract(e *env, args []string) error {
	fs := newFlagSet("extract", "dragdeck extract [criteria] PATH...",
		`Finds the stable windows of continuous flight recordings (about one row a
second; the snapshot columns without vs_fpm and accel_kt_per_min) and writes
one snapshot per window to stdout, as a snapshot CSV that check, report and
dash read. Per tail and flight, in time order, a window is stable when it
lasts at least --min-seconds and, over it, Mach, pressure altitude, fuel flow,
SAT and N1 (when recorded) stay within their ranges, |bank| stays within
--max-bank-deg at every sample, and no step between samples is longer than
--max-gap-seconds (a gap ends a window, never bridges it). Windows are taken
greedily from the start, each grown while stable up to --max-seconds; a
failed start moves on by one sample. The snapshot: time at the window's
middle; weight, altitude, Mach, SAT, fuel flow, bank and N1 their means;
vs_fpm the geometric climb rate (the least-squares slope of pressure
altitude, times the mean T/T_ISA); accel_kt_per_min the least-squares slope
of TAS; samples and seconds the window's size. The defaults are common
practice; no single source gives them. Rows that cannot be used are rejected
as check rejects them, on stderr; a summary (flights, samples, windows, the
time each criterion left out) follows there. Memory stays flat: each file is
read as a stream, one flight per tail at a time.`,
		"dragdeck extract recordings/2026-03/ > snapshots/2026-03-extracted.csv")
	def := model.DefaultStableCriteria()
	minS := fs.float("min-seconds", "S", def.MinSeconds, false, "shortest window, s")
	maxS := fs.float("max-seconds", "S", def.MaxSeconds, false, "longest window, s")
	mach := fs.float("max-mach-range", "M", def.MachRange, false, "largest max − min Mach over a window")
	alt := fs.float("max-alt-range-ft", "FT", def.AltRange/model.Foot, false, "largest max − min pressure altitude, ft")
	bank := fs.float("max-bank-deg", "DEG", def.MaxBank*180/math.Pi, false, "largest |bank| at any sample, degrees")
	ff := fs.float("max-fuel-flow-range-pct", "PCT", def.FuelFlowRangePct, false, "largest max − min fuel flow, % of its mean")
	sat := fs.float("max-sat-range-c", "C", def.SATRange, false, "largest max − min SAT, °C")
	n1 := fs.float("max-n1-range-pct", "PCT", def.N1RangePct, false, "largest max − min N1, percentage points (when recorded)")
	gap := fs.float("max-gap-seconds", "S", def.MaxGap, false, "longest step between two samples, s")
	layoutPath := fs.layoutFlag()
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	layout, err := loadLayout(layoutPath)
	if err != nil {
		return err
	}
	c := model.StableCriteria{MinSeconds: *minS, MaxSeconds: *maxS, MachRange: *mach, AltRange: *alt * model.Foot,
		MaxBank: *bank * math.Pi / 180, FuelFlowRangePct: *ff, SATRange: *sat, N1RangePct: *n1, MaxGap: *gap}
	for _, v := range []struct {
		name string
		v    float64
	}{{"min-seconds", c.MinSeconds}, {"max-seconds", c.MaxSeconds}, {"max-mach-range", c.MachRange}, {"max-alt-range-ft", *alt},
		{"max-bank-deg", *bank}, {"max-fuel-flow-range-pct", c.FuelFlowRangePct}, {"max-sat-range-c", c.SATRange},
		{"max-n1-range-pct", c.N1RangePct}, {"max-gap-seconds", c.MaxGap}} {
		if !(v.v > 0) || math.IsInf(v.v, 0) {
			return usageErrorf("--%s: must be a number > 0, got %g", v.name, v.v)
		}
	}
	if c.MaxSeconds < c.MinSeconds {
		return usageErrorf("--max-seconds: must be at least --min-seconds (%g s), got %g", c.MinSeconds, c.MaxSeconds)
	}
	files, err := inputFiles(fs)
	if err != nil {
		return err
	}
	x := newExtractor(e, c)
	failed := 0
	for _, path := range files {
		res := feed.ReadFileParallel(path, feed.ReadOptions{Layout: layout}, runtime.GOMAXPROCS(0), x.add, func(r *feed.RowError) {
			fmt.Fprintf(e.stderr, "dragdeck extract: rejected %v\n", r)
		})
		x.flushAll()
		warnUnknown(e.stderr, res)
		x.stats.Add(res.Stats)
		if res.Err != nil {
			failed++
			fmt.Fprintf(e.stderr, "dragdeck extract: %v (skipped; the other files are read)\n", res.Err)
		}
		if x.err != nil {
			return x.err
		}
	}
	if err := x.close(); err != nil {
		return err
	}
	x.summary()
	if failed > 0 {
		return &exitErr{code: exitUsage, err: fmt.Errorf("%d of %d file(s) could not be read", failed, len(files))}
	}
	return nil
}

// extractor gathers each tail's current flight and writes its windows.
type extractor struct {
	e       *env
	c       model.StableCriteria
	w       *bufio.Writer
	flights map[string]*flightBuf
	last    *flightBuf // the flight of the row before, most often this row's too
	order   []string   // tails in the order they first came, for a stable output
	header  bool
	n1      bool // the output has an n1_pct column
	err     error

	stats            feed.Stats
	nFlights, nWins  int
	steps, gapSteps  int // steps between samples, and those longer than MaxGap
	samples          int
	left             [model.UnstableShort + 1]float64
	row              []byte
	sawN1BeforeFirst bool
}

type flightBuf struct {
	tail, flight string
	samples      []model.Sample
}

func newExtractor(e *env, c model.StableCriteria) *extractor {
	return &extractor{e: e, c: c, w: bufio.NewWriterSize(e.stdout, 64<<10), flights: map[string]*flightBuf{}}
}

// add takes one accepted row of a recording.
func (x *extractor) add(r feed.Record) {
	f := x.last
	if f == nil || f.tail != r.Tail {
		f = x.flights[r.Tail]
	}
	if f == nil {
		f = &flightBuf{tail: r.Tail, flight: r.Flight}
		x.flights[r.Tail] = f
		x.order = append(x.order, r.Tail)
	}
	if n := len(f.samples); n > 0 {
		last := f.samples[n-1].Time
		if r.Flight != f.flight || r.Time.Sub(last) > flightBreak || r.Time.Before(last) {
			x.flush(f)
			f.flight = r.Flight
		}
	} else {
		f.flight = r.Flight
	}
	x.last = f
	s := r.Snap
	x.sawN1BeforeFirst = x.sawN1BeforeFirst || s.N1 > 0
	f.samples = append(f.samples, model.Sample{Time: r.Time, Weight: s.Weight, Altitude: s.Altitude, Mach: s.Mach,
		SAT: s.SAT, FuelFlow: s.FuelFlow, Bank: s.Bank, N1: s.N1})
}

// flushAll writes the windows of every tail's current flight (at the end
// of a file: memory stays with one file's flights).
func (x *extractor) flushAll() {
	for _, tail := range x.order {
		x.flush(x.flights[tail])
	}
	clear(x.flights)
	x.order, x.last = x.order[:0], nil
}

// flush finds and writes the windows of one flight and forgets it.
func (x *extractor) flush(f *flightBuf) {
	if f == nil || len(f.samples) == 0 {
		return
	}
	x.nFlights++
	x.samples += len(f.samples)
	for i := 1; i < len(f.samples); i++ {
		x.steps++
		if f.samples[i].Time.Sub(f.samples[i-1].Time).Seconds() > x.c.MaxGap {
			x.gapSteps++
		}
	}
	ws, left := model.StableWindows(f.samples, x.c)
	for k := range x.left {
		x.left[k] += left[k]
	}
	for _, w := range ws {
		x.write(f, model.SnapshotOf(f.samples, w))
	}
	x.nWins += len(ws)
	f.samples = f.samples[:0]
}

func (x *extractor) write(f *flightBuf, w model.WindowSnapshot) {
	if x.err != nil {
		return
	}
	if !x.header {
		x.n1 = x.sawN1BeforeFirst
		fmt.Fprintf(x.w, "# stable windows extracted by dragdeck extract (min %g s, max %g s)\n", x.c.MinSeconds, x.c.MaxSeconds)
		h := "time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg,vs_fpm,accel_kt_per_min"
		if x.n1 {
			h += ",n1_pct"
		}
		fmt.Fprintln(x.w, h+",samples,seconds")
		x.header = true
	}
	s := w.Snap
	b := w.Time.UTC().AppendFormat(x.row[:0], time.RFC3339)
	b = append(b, ',')
	b = appendCSVField(b, f.tail)
	b = append(b, ',')
	b = appendCSVField(b, f.flight)
	for _, v := range []struct {
		v    float64
		prec int
	}{{s.Weight, 0}, {s.Altitude / model.Foot, 0}, {s.Mach, 4}, {s.SAT - model.CelsiusZero, 2}, {s.FuelFlow * model.Hour, 1},
		{s.Bank * 180 / math.Pi, 2}, {feed.FtPerMinFromMPerS(s.VS), 1}, {feed.KtPerMinFromMPerS2(s.Accel), 3}} {
		b = append(b, ',')
		b = strconv.AppendFloat(b, v.v, 'f', v.prec, 64)
	}
	if x.n1 {
		b = append(b, ',')
		if s.N1 > 0 {
			b = strconv.AppendFloat(b, s.N1, 'f', 2, 64)
		}
	}
	b = append(b, ',')
	b = strconv.AppendInt(b, int64(w.Samples), 10)
	b = append(b, ',')
	b = strconv.AppendFloat(b, w.Seconds, 'f', 0, 64)
	b = append(b, '\n')
	x.row = b
	_, x.err = x.w.Write(b)
}

func (x *extractor) close() error {
	if x.err != nil {
		return x.err
	}
	return x.w.Flush()
}

// summary tells stderr what was read and found, and the time each
// criterion left out of the windows.
func (x *extractor) summary() {
	var parts []string
	for k := model.UnstableGap; k <= model.UnstableShort; k++ {
		if x.left[k] > 0 {
			parts = append(parts, fmt.Sprintf("%s %s", model.UnstableNames[k], durationText(x.left[k])))
		}
	}
	left := "none"
	if len(parts) > 0 {
		left = strings.Join(parts, ", ")
	}
	fmt.Fprintf(x.e.stderr, "dragdeck extract: %d flight(s), %d samples (%d rows read, %d rejected), %d window(s); time left out: %s\n",
		x.nFlights, x.samples, x.stats.Read, x.stats.Rejected, x.nWins, left)
	if x.steps > 0 && 2*x.gapSteps > x.steps {
		fmt.Fprintf(x.e.stderr, "dragdeck extract: note: most rows are more than %g s apart: snapshots rather than a recording? extract needs a row every few seconds\n", x.c.MaxGap)
	}
}

// durationText writes seconds as h/min/s.
func durationText(s float64) string {
	d := time.Duration(math.Round(s)) * time.Second
	switch {
	case d >= time.Hour:
		return fmt.Sprintf("%dh%02dm", int(d.Hours()), int(d.Minutes())%60)
	case d >= time.Minute:
		return fmt.Sprintf("%dm%02ds", int(d.Minutes()), int(d.Seconds())%60)
	}
	return fmt.Sprintf("%ds", int(d.Seconds()))
}

// appendCSVField appends s as a CSV field (RFC 4180): quoted, with each
// quote doubled, when it holds a comma, a quote or a space at an end.
func appendCSVField(b []byte, s string) []byte {
	if !strings.ContainsAny(s, ",\"") && strings.TrimSpace(s) == s {
		return append(b, s...)
	}
	b = append(b, '"')
	b = append(b, strings.ReplaceAll(s, `"`, `""`)...)
	return append(b, '"')
}
