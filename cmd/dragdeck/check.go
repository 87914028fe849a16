package main

import (
	"errors"
	"fmt"
	"io"
	"sort"
	"strings"

	"dragdeck/feed"
	"dragdeck/feed/store"
)

func runCheck(e *env, args []string) error {
	fs := newFlagSet("check", "dragdeck check [--fleet FILE] [--layout FILE] PATH... | --store FILE",
		`Validates snapshot files (or every *.csv in a folder) against the snapshot
format (see the README) and lists every rejected row as file:line: column: reason, then the counts per
reason. Every row is either accepted or rejected: read = accepted + rejected.
Exit status: 0 no rejects, 1 some rows rejected, 2 a file could not be read
(missing, no header, a required column missing). With --fleet, the rows of
tails that the fleet file does not name (or names only from a later date)
are rejected too, as every reading command rejects them. With --store, the
store is checked: its file's integrity, and every stored snapshot against
the store's fleet file (or --fleet) and the snapshot limits. With --layout,
the files are read through the layout (an export in its own columns) and
check prints, for each file, how each dragdeck field is found: the column
or columns, the unit and scale, the time's format and zone.`,
		"dragdeck check exports/2026-03/")
	fleet := fs.str("fleet", "FILE", "", "fleet file (TOML): also reject the rows of tails it does not name")
	storePath := fs.storeFlag()
	layoutPath := fs.layoutFlag()
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	layout, err := loadLayout(layoutPath)
	if err != nil {
		return err
	}
	if *storePath != "" {
		if layout != nil {
			return usageErrorf("--layout reads files; a store holds snapshots already read")
		}
		return checkStore(e, fs, *storePath, *fleet)
	}
	if fs.NArg() == 0 {
		return usageErrorf("give at least one snapshot file or folder (see 'dragdeck check --help')")
	}
	var check feed.TailCheck
	if *fleet != "" {
		r, err := feed.LoadFleet(*fleet)
		if err != nil {
			return usageErrorf("--fleet: %v", err)
		}
		check = feed.RosterCheck(r)
	}
	// Each path on its own, so that a missing one does not stop the others
	// from being checked.
	failed := 0
	var files []string
	for _, p := range fs.Args() {
		found, err := feed.ExpandPaths([]string{p})
		if err != nil {
			fmt.Fprintf(e.stderr, "dragdeck check: %v\n", err)
			failed++
			continue
		}
		files = append(files, found...)
	}
	byReason := map[string]int{}
	var total feed.Stats
	for _, path := range files {
		res := feed.ReadFileWith(path, feed.ReadOptions{CheckTail: check, Layout: layout}, nil, func(r *feed.RowError) {
			fmt.Fprintln(e.stdout, r)
			byReason[r.Column+": "+r.Err.Error()]++
		})
		warnUnknown(e.stderr, res)
		if res.Events {
			fmt.Fprintf(e.stderr, "dragdeck check: %s: an events file, skipped\n", path)
			continue
		}
		if res.Err != nil {
			fmt.Fprintf(e.stderr, "dragdeck check: %v\n", res.Err)
			failed++
		}
		if len(res.Mapping) > 0 {
			fmt.Fprintf(e.stdout, "%s: read through the layout %s:\n", path, layout.Source)
			for _, l := range res.Mapping {
				fmt.Fprintf(e.stdout, "  %s\n", l)
			}
		}
		total.Add(res.Stats)
	}
	writeCheckSummary(e.stdout, len(fs.Args()), len(files), failed, total, byReason)
	switch {
	case failed > 0:
		return &exitErr{code: exitUsage}
	case total.Rejected > 0:
		return &exitErr{code: exitFindings}
	}
	return nil
}

// writeCheckSummary prints the counts: files is the number of files found
// (a path that does not exist is no file), failed those that could not be
// read, including missing paths.
func writeCheckSummary(w io.Writer, paths, files, failed int, st feed.Stats, byReason map[string]int) {
	fmt.Fprintf(w, "\nchecked %d file(s) from %d path(s): %d rows read, %d accepted, %d rejected", files, paths, st.Read, st.Accepted, st.Rejected)
	if failed > 0 {
		fmt.Fprintf(w, "; %d could not be read", failed)
	}
	fmt.Fprintln(w)
	if len(byReason) > 0 {
		writeReasons(w, byReason)
	}
}

// writeReasons prints the rejected rows' counts by reason, most first.
func writeReasons(w io.Writer, byReason map[string]int) {
	keys := make([]string, 0, len(byReason))
	for k := range byReason {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if byReason[keys[i]] != byReason[keys[j]] {
			return byReason[keys[i]] > byReason[keys[j]]
		}
		return keys[i] < keys[j]
	})
	fmt.Fprintln(w, "rejected rows by reason:")
	for _, k := range keys {
		fmt.Fprintf(w, "  %7d  %s\n", byReason[k], k)
	}
}

// warnUnknown prints one warning per file that has ignored columns (the
// first ten named), and the file's notices (a new header line inside it).
func warnUnknown(w io.Writer, res feed.FileResult) {
	if n := len(res.Unknown); n > 0 {
		names := res.Unknown
		more := ""
		if n > 10 {
			names, more = names[:10], fmt.Sprintf(" and %d more", n-10)
		}
		fmt.Fprintf(w, "dragdeck: %s: ignoring unknown column(s) %s%s\n", res.Path, strings.Join(names, ", "), more)
	}
	for _, s := range res.Notices {
		fmt.Fprintf(w, "dragdeck: note: %s\n", s)
	}
}

// inputFiles expands the positional PATH arguments; at least one is needed.
func inputFiles(fs *flagSet) ([]string, error) {
	if fs.NArg() == 0 {
		return nil, usageErrorf("give at least one snapshot file or folder (see 'dragdeck %s --help')", fs.Name())
	}
	files, err := feed.ExpandPaths(fs.Args())
	if err != nil {
		return nil, usageErrorf("%v", err)
	}
	return files, nil
}

// checkStore checks a store as check checks files: the SQLite file's
// integrity, then each stored snapshot against the snapshot limits and the
// fleet file (--fleet, else the store's own), listing the rows that fail.
func checkStore(e *env, fs *flagSet, path, fleet string) error {
	if fs.NArg() > 0 {
		return usageErrorf("give --store or snapshot paths, not both")
	}
	st, err := store.Open(path, false)
	if err != nil {
		return usageErrorf("--store: %v", err)
	}
	defer st.Close()
	if err := st.Integrity(); err != nil {
		fmt.Fprintf(e.stderr, "dragdeck check: %v\n", err)
		return &exitErr{code: exitUsage}
	}
	var check feed.TailCheck
	if fleet != "" {
		r, err := feed.LoadFleet(fleet)
		if err != nil {
			return usageErrorf("--fleet: %v", err)
		}
		check = feed.RosterCheck(r)
	} else if r, err := st.Roster(); err == nil {
		check = feed.RosterCheck(r)
	} else if !errors.Is(err, store.ErrNoFleet) {
		return usageErrorf("--store: its fleet file: %v", err)
	}
	byReason := map[string]int{}
	var total feed.Stats
	reject := func(r feed.Record, column, reason string, kind error) {
		fmt.Fprintln(e.stdout, &feed.RowError{File: r.File, Line: r.Line, Column: column, Reason: reason, Err: kind})
		byReason[column+": "+kind.Error()]++
		total.Rejected++
	}
	_, err = st.Each(func(r feed.Record) {
		total.Read++
		if e := feed.CheckSnapshot(r.Snap); e != nil {
			reject(r, string(e.Field), e.Reason, e.Err)
			return
		}
		if check != nil {
			if why := check(r.Tail, r.Time); why != "" {
				reject(r, "tail", why, feed.ErrNotInFleet)
				return
			}
		}
		total.Accepted++
	})
	if err != nil {
		return usageErrorf("--store: %v", err)
	}
	fmt.Fprintf(e.stdout, "\nchecked store %s: %d snapshots, %d accepted, %d rejected\n", path, total.Read, total.Accepted, total.Rejected)
	if len(byReason) > 0 {
		writeReasons(e.stdout, byReason)
	}
	if total.Rejected > 0 {
		return &exitErr{code: exitFindings}
	}
	return nil
}
