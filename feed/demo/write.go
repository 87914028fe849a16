package demo

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"sort"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// Names of the files Write writes inside its folder.
const (
	SnapshotFile = "snapshots/fleet.csv"
	TypeDir      = "types" // one type file per type, named as in the fleet file
	FleetFile    = "fleet.toml"
	EventsFile   = "events.csv"
	TruthFile    = "truth.json"
	TraceDir     = "traces"
)

// writeSnapshots writes the fleet's snapshot CSV to w, with broken rows
// inserted among the good ones, and fills in the truth's counts.
func (g *demoGen) writeSnapshots(w io.Writer, truth *Truth) error {
	bw := bufio.NewWriterSize(w, 256<<10)
	fmt.Fprintf(bw, "# dragdeck demo fleet of %s: %s\n", Airline, g.typeNames())
	fmt.Fprintf(bw, "# invented data made by 'dragdeck demo' (seed %d); not flight data of any real aircraft\n", g.cfg.Seed)
	bw.WriteString(g.header())
	line := 3
	expected := float64(g.cfg.Tails*g.cfg.Days) * 3.8
	nBroken := max(8, int(expected/20000))
	interval := max(1, int(expected)/(nBroken+1))
	var buf []byte
	good, broken := 0, 0
	g.days(func(rows []demoRow) {
		for _, r := range rows {
			buf = g.appendRow(buf[:0], r)
			bw.Write(buf)
			line++
			good++
			if good%interval == 0 && broken < nBroken {
				k := brokenKinds[broken%len(brokenKinds)]
				bw.Write(k.spoil(append([]byte(nil), buf...)))
				line++
				broken++
				truth.BrokenRows = append(truth.BrokenRows, BrokenRow{File: SnapshotFile, Line: line, Column: k.column, Defect: k.defect})
			}
		}
	})
	truth.Rows, truth.Accepted, truth.Rejected = good+broken, good, broken
	return bw.Flush()
}

// events returns the maintenance events of the demo fleet: each repair, and
// some washes that change nothing.
func (g *demoGen) events() []Event {
	var ev []Event
	for i := range g.tails {
		tt := &g.tails[i]
		for _, s := range tt.Steps {
			if s.Cause == "repair" {
				ev = append(ev, Event{Time: s.at.Add(-6 * time.Hour).Format(time.RFC3339), Tail: tt.Tail,
					Kind: "repair", Note: "door seal replaced, spoiler rigging checked"})
			}
		}
		if e := tt.Engine; e != nil {
			for _, s := range e.Steps {
				note := "both engines, performance restoration"
				if s.Cause == EngineChange {
					note = "engine 2 replaced by a spare"
				}
				ev = append(ev, Event{Time: s.at.Add(-6 * time.Hour).Format(time.RFC3339), Tail: tt.Tail, Kind: s.Cause, Note: note})
			}
		}
		if tt.Role == RoleSteady && i%4 == 0 {
			at := g.day(0.5 + 0.1*float64(i%3)).Add(-4 * time.Hour)
			ev = append(ev, Event{Time: at.Format(time.RFC3339), Tail: tt.Tail, Kind: "wash", Note: "exterior wash"})
		}
	}
	sort.SliceStable(ev, func(a, b int) bool { return ev[a].Time < ev[b].Time })
	return ev
}

// fleetFile is the fleet file (DESIGN.md §3.4) of the demo: each tail's
// type, a retrofit's new type from its date on, a group's cruise hours.
func (g *demoGen) fleetFile() []byte {
	var b bytes.Buffer
	fmt.Fprintf(&b, "# fleet file of the invented demo fleet: the type of each tail\nname = %q\n\n[types]\n", Airline)
	for _, c := range g.types {
		fmt.Fprintf(&b, "%q = %q\n", c.group.Name, TypeFilePath(c.group.Name))
	}
	entry := func(tail, typ string, since time.Time, hours float64) {
		fmt.Fprintf(&b, "\n[[tail]]\nid = %q\ntype = %q\n", tail, typ)
		if !since.IsZero() {
			fmt.Fprintf(&b, "since = %s\n", since.Format(time.RFC3339))
		}
		if hours > 0 {
			fmt.Fprintf(&b, "cruise_hours_per_year = %g\n", hours)
		}
	}
	for _, tt := range g.tails {
		entry(tt.Tail, tt.Type, time.Time{}, tt.ctx.group.CruiseHours)
		if r := tt.Retrofit; r != nil {
			entry(tt.Tail, r.Type, r.at, r.ctx.group.CruiseHours)
		}
	}
	return b.Bytes()
}

func writeEvents(w io.Writer, ev []Event) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("# maintenance events of the invented demo fleet\ntime,tail,kind,note\n")
	for _, e := range ev {
		fmt.Fprintf(bw, "%s,%s,%s,%q\n", e.Time, e.Tail, e.Kind, e.Note)
	}
	return bw.Flush()
}

// trace returns the per-minute rows of one whole flight of tail tt leaving
// at dep: climb from FL100 to cruise, a step climb, two turns, until top of
// descent.
func (g *demoGen) trace(tt *TailTruth, flight string, dep time.Time) []demoRow {
	c := tt.ctxAt(dep)
	w := 1.11 * c.wMid
	cruise := c.cruiseLevel(w) - 2000
	dev := g.isaDev(dep)
	cruiseMach := math.Round((c.machLo+0.015)*1000) / 1000
	alt, m := 10000.0, 0.60
	var rows []demoRow
	t := dep.Add(8 * time.Minute)
	tasOf := func(altFt, mach float64) float64 {
		return model.AirISA(altFt*model.Foot, dev).TAS(mach) / model.Knot
	}
	step := func(vs, bank, nextMach float64) {
		acc := tasOf(alt+vs, nextMach) - tasOf(alt, m) // kt per minute
		r := g.snapshot(tt, t, flight, w, math.Round(alt), m, dev, bank, vs, acc, g.rng.NormFloat64()*0.004)
		rows = append(rows, r)
		w -= r.ffKgph / 60
		alt += vs
		m = nextMach
		t = t.Add(time.Minute)
	}
	for alt < cruise { // climb: 2,500 ft/min falling to 1,000 ft/min
		vs := math.Round(2500 - 1500*(alt-10000)/(cruise-10000))
		vs = min(vs, cruise-alt)
		step(vs, 0, math.Min(cruiseMach, m+0.008))
	}
	for i := 0; i < 95; i++ {
		vs, bank := 0.0, 0.0
		switch {
		case i >= 20 && i < 23:
			bank = 20
		case i >= 45 && i < 47:
			vs = 1000 // step climb to the next level
		case i >= 70 && i < 72:
			bank = -25
		}
		step(vs, bank, cruiseMach)
	}
	return rows
}

// writeTrace writes one trace file.
func (g *demoGen) writeTrace(path string, rows []demoRow) error {
	var b bytes.Buffer
	b.WriteString("# per-minute trace of one whole flight of the invented demo fleet\n")
	b.WriteString(g.header())
	var buf []byte
	for _, r := range rows {
		buf = g.appendRow(buf[:0], r)
		b.Write(buf)
	}
	return writeNew(path, b.Bytes())
}

// newTruth starts the truth record of a generation.
func (g *demoGen) newTruth() Truth {
	return Truth{
		Generator:      "dragdeck demo",
		Airline:        Airline,
		Types:          g.typeTruths(),
		Seed:           g.cfg.Seed,
		Days:           g.cfg.Days,
		Start:          g.cfg.Start.Format(time.DateOnly),
		End:            g.end.Format(time.DateOnly),
		SnapshotFile:   SnapshotFile,
		Thresholds:     truthLimits{LevelPP: truthLevelPP, GrowthPPin180: truthGrowthPP, StepPP: truthStepPP},
		FleetMedianPct: g.fleetMedian(),
		ReferenceCD:    g.referenceCDs(),
		Effects:        *g.cfg.Effects,
		Tails:          g.tails,
		BrokenRows:     []BrokenRow{},
		Traces:         []TraceTruth{},
		Recordings:     []RecordingTruth{},
		Note: "Invented data. Deviations are drag deviation % from the baseline polar at the reference cruise: an excess " +
			"ΔCD = deviation/100 × reference_cd_baseline, the same at every lift coefficient; expected_flags follow " +
			"the flag rules (level, growth, step; see the README's method) with the thresholds above and the median recent level of the tail's own type (types).",
	}
}

// Write writes the demo fleet into dir (created if needed): the snapshot
// CSV, the fleet file, the type files, the events file, per-minute traces
// of a few flights and truth.json. The same config gives the same bytes. A
// folder that holds anything is refused (ErrNotEmpty) unless
// cfg.Overwrite; no file is written through a symbolic link.
func Write(dir string, cfg Config) (Truth, error) {
	g := newDemoGen(cfg)
	truth := g.newTruth()
	if err := prepareDir(dir, cfg.Overwrite); err != nil {
		return truth, err
	}
	f, err := createNew(filepath.Join(dir, SnapshotFile))
	if err != nil {
		return truth, err
	}
	if err := g.writeSnapshots(f, &truth); err != nil {
		f.Close()
		return truth, err
	}
	if err := f.Close(); err != nil {
		return truth, err
	}
	for _, c := range g.types {
		if err := writeNew(filepath.Join(dir, TypeFilePath(c.group.Name)), feed.FormatType(c.ty)); err != nil {
			return truth, err
		}
	}
	if err := writeNew(filepath.Join(dir, FleetFile), g.fleetFile()); err != nil {
		return truth, err
	}
	// dragdeck's own columns as a layout file: the example to copy for an
	// export of another layout
	if err := writeNew(filepath.Join(dir, feed.LayoutFile), []byte(feed.BuiltinLayout)); err != nil {
		return truth, err
	}
	truth.Events = g.events()
	var ev bytes.Buffer
	writeEvents(&ev, truth.Events)
	if err := writeNew(filepath.Join(dir, EventsFile), ev.Bytes()); err != nil {
		return truth, err
	}
	for _, tr := range g.traceTails() {
		rows := g.trace(tr.tt, tr.flight, tr.dep)
		name := fmt.Sprintf("%s-%s-%s.csv", tr.tt.Tail, tr.flight, tr.dep.Format("20060102"))
		if err := g.writeTrace(filepath.Join(dir, TraceDir, name), rows); err != nil {
			return truth, err
		}
		truth.Traces = append(truth.Traces, TraceTruth{File: TraceDir + "/" + name, Tail: tr.tt.Tail, Flight: tr.flight, Rows: len(rows)})
	}
	for _, rec := range g.recordings() {
		rec.File = RecordingDir + "/" + fmt.Sprintf("%s-%s-%s.csv", rec.Tail, rec.Flight, rec.rows[0].t.Format("20060102"))
		if err := writeNew(filepath.Join(dir, rec.File), g.recordingBytes(rec)); err != nil {
			return truth, err
		}
		truth.Recordings = append(truth.Recordings, rec)
	}
	js, err := json.MarshalIndent(truth, "", "  ")
	if err != nil {
		return truth, err
	}
	return truth, writeNew(filepath.Join(dir, TruthFile), append(js, '\n'))
}

type traceChoice struct {
	tt     *TailTruth
	flight string
	dep    time.Time
}

// traceTails picks up to three tails for whole-flight traces: one that
// drifts, one that manoeuvres, one that stepped, on recent days.
func (g *demoGen) traceTails() []traceChoice {
	var out []traceChoice
	for _, role := range []string{RoleDrift, RoleManoeuvres, RoleStep} {
		for i := range g.tails {
			if g.tails[i].Role == role {
				dep := g.end.AddDate(0, 0, -1-len(out)).Add(14 * time.Hour)
				out = append(out, traceChoice{&g.tails[i], fmt.Sprintf("DDF%04d", 900+len(out)), dep})
				break
			}
		}
	}
	return out
}

// Fleet is the demo fleet in memory, as the dashboard shows it.
type Fleet struct {
	Roster  *model.Roster // the fleet file: each tail's type
	Type    *model.Type   // the one type flown; nil when the fleet has several
	Records []feed.Record
	// Recordings are the records of the 1 Hz recordings (Truth.Recordings),
	// apart from the snapshots, read through the CSV reader as Write writes
	// them; RecordingStats counts their rows.
	Recordings     []feed.Record
	RecordingStats feed.Stats
	Rejects        []*feed.RowError
	Stats          feed.Stats
	Truth          Truth
}

// Events returns the truth's events by tail, as an events file gives them.
func (d *Fleet) Events() map[string][]model.Event {
	out := map[string][]model.Event{}
	for _, e := range d.Truth.Events {
		at, err := time.Parse(time.RFC3339, e.Time)
		if err != nil {
			continue // written by this package in RFC 3339; cannot happen
		}
		out[e.Tail] = append(out[e.Tail], model.Event{Time: at.UTC(), Kind: e.Kind, Note: e.Note})
	}
	return out
}

// NewFleet makes the demo fleet in memory: the same snapshot bytes that
// Write writes, read back through the CSV reader so that the rejects are
// the same too.
func NewFleet(cfg Config) (*Fleet, error) {
	g := newDemoGen(cfg)
	roster, err := g.roster()
	if err != nil {
		return nil, err
	}
	d := &Fleet{Roster: roster, Truth: g.newTruth()}
	if len(g.types) == 1 {
		d.Type = g.types[0].ty
	}
	var buf bytes.Buffer
	if err := g.writeSnapshots(&buf, &d.Truth); err != nil {
		return nil, err
	}
	d.Truth.Events = g.events()
	r := feed.NewReader(&buf, "demo:"+SnapshotFile)
	d.Records = make([]feed.Record, 0, d.Truth.Accepted)
	for {
		rec, err := r.Next()
		if err == nil {
			d.Records = append(d.Records, rec)
			continue
		}
		if re, ok := err.(*feed.RowError); ok {
			d.Rejects = append(d.Rejects, re)
			continue
		}
		if err != io.EOF {
			return nil, err
		}
		break
	}
	d.Stats = r.Stats()
	for _, rec := range g.recordings() {
		name := RecordingDir + "/" + rec.Tail + "-" + rec.Flight + ".csv"
		res := feed.NewReader(bytes.NewReader(g.recordingBytes(rec)), "demo:"+name)
		for {
			r, err := res.Next()
			if err == nil {
				d.Recordings = append(d.Recordings, r)
				continue
			}
			if err != io.EOF {
				return nil, fmt.Errorf("%s: %w", name, err) // written by this package: cannot happen
			}
			break
		}
		d.RecordingStats.Add(res.Stats())
		d.Truth.Recordings = append(d.Truth.Recordings, rec)
	}
	return d, nil
}
