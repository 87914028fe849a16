package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// input is where a reading command's snapshots come from: the files of its
// PATH arguments, or a store (--store), with the roster and the events.
type input struct {
	roster *model.Roster
	files  []string
	store  *store.Store // nil when reading files
	events map[string][]model.Event
	work   map[string][]store.WorkItem // the items in progress by tail (store only)
	// inUse is each tail's fuel factor in use now (store only); policy
	// the fuel-factor policy (nil: the defaults).
	inUse  map[string]store.FactorSetting
	policy *model.FactorPolicy
	layout *feed.Layout // the --layout the files are read through (nil: dragdeck's columns)
}

// storeFlag declares --store on a command that reads snapshots.
func (f *flagSet) storeFlag() *string {
	return f.str("store", "FILE", "", "read the snapshots, events and fleet file from a store (see 'dragdeck import') in place of PATH...")
}

// openInput is the preamble of every command that reads snapshots: with
// --store, the store (its fleet file unless --fleet or --type is given,
// its events and those of --events, its work list); else the PATH
// arguments, --type or --fleet and --events.
func openInput(stderr io.Writer, fs *flagSet, types typeChoice, storePath, eventsPath string) (*input, error) {
	in := &input{}
	var err error
	if in.layout, err = loadLayout(types.layout); err != nil {
		return nil, err
	}
	if storePath == "" {
		if in.roster, in.files, err = typeAndFiles(stderr, fs, types); err != nil {
			return nil, err
		}
		in.events, err = readEvents(eventsPath)
		return in, err
	}
	if fs.NArg() > 0 {
		return nil, usageErrorf("give --store or snapshot paths, not both")
	}
	if in.layout != nil {
		return nil, usageErrorf("--layout reads files; a store holds snapshots already read (give it to 'dragdeck import')")
	}
	if in.store, err = store.Open(storePath, false); err != nil {
		return nil, usageErrorf("--store: %v", err)
	}
	fail := func(err error) (*input, error) { in.close(); return nil, err }
	if *types.typ != "" || *types.fleet != "" {
		in.roster, err = types.roster()
	} else if in.roster, err = in.store.Roster(); errors.Is(err, store.ErrNoFleet) {
		in.roster, err = types.roster() // the built-in type, as without a fleet file
	} else if err != nil {
		err = usageErrorf("--store: its fleet file: %v", err)
	}
	if err != nil {
		return fail(err)
	}
	if in.events, err = in.store.Events(); err != nil {
		return fail(usageErrorf("--store: %v", err))
	}
	more, err := readEvents(eventsPath)
	if err != nil {
		return fail(err)
	}
	for tail, evs := range more {
		in.events[tail] = append(in.events[tail], evs...)
	}
	items, err := in.store.Work()
	if err != nil {
		return fail(usageErrorf("--store: %v", err))
	}
	in.work = store.OpenWork(items)
	hist, err := in.store.FactorHistory("")
	if err != nil {
		return fail(usageErrorf("--store: %v", err))
	}
	in.inUse = store.InUse(hist, in.store.Now())
	return in, nil
}

// pipelineInput is the pipeline's input for these snapshots.
func (in *input) pipelineInput(c model.TrendConfig) pipeline.Input {
	p := pipeline.Input{Paths: in.files, Layout: in.layout, Roster: in.roster, Events: in.events, Config: c, Policy: in.policy}
	if in.store != nil {
		p.Source = in.store
		p.InUse = make(map[string]float64, len(in.inUse))
		for tail, f := range in.inUse {
			p.InUse[tail] = f.Pct
		}
	}
	return p
}

// source names where the snapshots come from, for headers.
func (in *input) source() string {
	switch {
	case in.store != nil:
		return "store " + in.store.Path()
	case len(in.files) == 1:
		return in.files[0]
	case len(in.files) > 1:
		return fmt.Sprintf("%s and %d more", in.files[0], len(in.files)-1)
	}
	return "no files"
}

// close closes the store, if one is open.
func (in *input) close() {
	if in.store != nil {
		in.store.Close()
	}
}

// sourceFailed is the error of a store that could not be read to the end.
func sourceFailed(r *pipeline.Result) error {
	if r.SourceErr != nil {
		return usageErrorf("--store: %v", r.SourceErr)
	}
	return nil
}

// replayRecords are the snapshots that replay plays, from the store or the
// files, with their counts; rejected rows go to reject.
func (in *input) replayRecords(stderr io.Writer, f feed.ReplayFilter, reject func(*feed.RowError)) ([]feed.Record, feed.Stats, error) {
	if in.store == nil {
		recs, results := feed.LoadReplay(in.files, f, feed.ReadOptions{CheckTail: feed.RosterCheck(in.roster), Layout: in.layout}, reject)
		var st feed.Stats
		for _, res := range results {
			warnUnknown(stderr, res)
			if res.Err != nil {
				return nil, st, usageErrorf("%v", res.Err)
			}
			st.Add(res.Stats)
		}
		return recs, st, nil
	}
	recs, st, err := in.store.Replay(f)
	if err != nil {
		return nil, st, usageErrorf("--store: %v", err)
	}
	check := feed.RosterCheck(in.roster)
	kept := recs[:0]
	for _, r := range recs {
		if check != nil {
			if why := check(r.Tail, r.Time); why != "" {
				st.Accepted--
				st.Rejected++
				reject(&feed.RowError{File: r.File, Line: r.Line, Column: "tail", Reason: why, Err: feed.ErrNotInFleet})
				continue
			}
		}
		kept = append(kept, r)
	}
	return kept, st, nil
}

// sameFile reports whether two paths name one existing file.
func sameFile(a, b string) bool {
	ai, err := os.Stat(a)
	if err != nil {
		return false
	}
	bi, err := os.Stat(b)
	return err == nil && os.SameFile(ai, bi)
}
