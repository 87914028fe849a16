package main

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"dragdeck/feed"
	"dragdeck/feed/store"
)

func runImport(e *env, args []string) error {
	fs := newFlagSet("import", "dragdeck import [--store FILE] [--layout FILE] [--json] PATH...",
		`Adds snapshot files, events files and a fleet file to the fleet store (one
SQLite file, created when missing). A folder gives its *.csv files and a
fleet.toml directly inside it; a .toml path is a fleet file, kept with the
type files it names (it replaces the one kept before). --layout reads the
files through a layout file (an export in its own columns); the store keeps
the layout with the import. The whole run is one
transaction: an import that fails or is interrupted leaves the store as it
was. A snapshot whose tail and time are stored already is a duplicate when
every value is the same (counted, not added again) and a conflict when one
differs (counted and listed on stderr; the stored row is kept). Rejected rows
are listed as 'dragdeck check' lists them. Exit status: 0 done, 2 a file
could not be read (then nothing is added).`,
		"dragdeck import --store fleet.db exports/2026-w48/ fleet/fleet.toml")
	storePath := fs.str("store", "FILE", store.DefaultFile, "the store")
	layoutPath := fs.layoutFlag()
	asJSON := fs.Bool("json", false, "print the counts as JSON")
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	layout, err := loadLayout(layoutPath)
	if err != nil {
		return err
	}
	if fs.NArg() == 0 {
		return usageErrorf("give at least one snapshot file, folder or fleet file (see 'dragdeck import --help')")
	}
	var csvs []string
	fleet := ""
	setFleet := func(p string) error {
		if fleet != "" && !sameFile(fleet, p) {
			return usageErrorf("two fleet files given (%s and %s): import one", fleet, p)
		}
		fleet = p
		return nil
	}
	for _, p := range fs.Args() {
		fi, err := os.Stat(p)
		if err != nil {
			return usageErrorf("%v", err)
		}
		switch {
		case !fi.IsDir() && strings.EqualFold(filepath.Ext(p), ".toml"):
			if err := setFleet(p); err != nil {
				return err
			}
		case fi.IsDir():
			if f := filepath.Join(p, "fleet.toml"); isRegular(f) {
				if err := setFleet(f); err != nil {
					return err
				}
			}
			found, err := feed.ExpandPaths([]string{p})
			if err != nil {
				return usageErrorf("%v", err)
			}
			csvs = append(csvs, found...)
		default:
			csvs = append(csvs, p)
		}
	}
	for _, f := range csvs {
		if sameFile(f, *storePath) {
			return usageErrorf("%s is the store itself", f)
		}
	}
	_, statErr := os.Stat(*storePath)
	isNew := errors.Is(statErr, os.ErrNotExist)
	st, err := store.Open(*storePath, true)
	if err != nil {
		return usageErrorf("--store: %v", err)
	}
	defer st.Close()
	var conflicts []string
	res, err := st.Import(e.ctx, store.ImportInput{Files: csvs, Fleet: fleet, Layout: layout,
		Reject:   func(r *feed.RowError) { fmt.Fprintln(e.stderr, r) },
		Conflict: func(c store.Conflict) { conflicts = append(conflicts, c.String()) },
	})
	for _, c := range conflicts {
		fmt.Fprintln(e.stderr, c)
	}
	for _, f := range res.Files {
		warnUnknown(e.stderr, f)
	}
	if err != nil {
		if isNew { // a store this run made, and left empty: not left behind
			st.Close()
			for _, suffix := range []string{"", "-wal", "-shm"} {
				os.Remove(*storePath + suffix)
			}
		}
		if e.ctx.Err() != nil {
			return usageErrorf("interrupted; nothing was imported, the store is as it was")
		}
		return usageErrorf("%v; nothing was imported, the store is as it was", err)
	}
	if *asJSON {
		return writeJSON(e.stdout, importJSON{New: res.New, Duplicate: res.Duplicate, Conflict: res.Conflict,
			Rejected: res.Rejected, Events: res.Events, Store: st.Path(), Fleet: res.Fleet})
	}
	fmt.Fprintf(e.stdout, "%s: %d new, %d duplicate, %d conflicting, %d rejected snapshot(s) of %d row(s) in %d file(s); %d new event(s)",
		st.Path(), res.New, res.Duplicate, res.Conflict, res.Rejected, res.Read, len(csvs), res.Events)
	if res.Fleet != "" {
		fmt.Fprintf(e.stdout, "; fleet file %s kept", res.Fleet)
	}
	if layout != nil {
		fmt.Fprintf(e.stdout, "; read through the layout %s, kept", layout.Source)
	}
	fmt.Fprintln(e.stdout)
	return nil
}

// importJSON is import --json (field names are stable).
type importJSON struct {
	New       int    `json:"new"`
	Duplicate int    `json:"duplicate"`
	Conflict  int    `json:"conflict"`
	Rejected  int    `json:"rejected"`
	Events    int    `json:"events"`
	Store     string `json:"store"`
	Fleet     string `json:"fleet,omitempty"`
}

// isRegular reports whether p is a regular file.
func isRegular(p string) bool {
	fi, err := os.Stat(p)
	return err == nil && fi.Mode().IsRegular()
}
