// Package store is dragdeck's fleet store (DESIGN.md §3.6): one SQLite file
// that keeps the snapshots imported (each with the file and line it came
// from), the events, the fleet file and its type files, the work list,
// the review marks and the fuel factors (proposals and each tail's
// history, factors.go). It uses modernc.org/sqlite, a pure-Go SQLite: no cgo,
// no server, nothing to install beyond go.mod.
//
// The store is opened in WAL mode, so that a dashboard can read while an
// import writes; an import is one transaction, so that an import that is
// killed leaves the store as it was. The schema carries its version
// (PRAGMA user_version): an older store is upgraded in place, step by step;
// a newer one is refused.
//
// Times are kept as Unix nanoseconds, UTC; snapshot values in SI units,
// exactly as the reader gives them (float64), so that reading a store gives
// the very records that reading the files gave. Snapshots are kept in
// blocks of up to 1,024 of one tail (block.go), for speed: an import of a
// million snapshots writes about a thousand rows.
package store

import (
	"database/sql"
	"errors"
	"fmt"
	"os"
	"time"

	_ "modernc.org/sqlite" // the pure-Go driver, "sqlite"
)

// DefaultFile is the store's file name when none is given.
const DefaultFile = "dragdeck.db"

// migrations are the schema's steps: migrations[i] takes a store from
// version i to i+1. A step is never changed once released; a change of the
// schema is a new step at the end.
var migrations = []string{
	// 1: snapshots (in blocks of one tail, block.go), events and files
	// (the fleet file and its type files).
	`CREATE TABLE blocks (
		id INTEGER PRIMARY KEY, tail TEXT NOT NULL, first INTEGER NOT NULL, last INTEGER NOT NULL,
		n INTEGER NOT NULL, data BLOB NOT NULL, imported INTEGER NOT NULL
	);
	CREATE INDEX blocks_tail ON blocks (tail, first);
	CREATE TABLE events (
		tail TEXT NOT NULL, time INTEGER NOT NULL, kind TEXT NOT NULL, note TEXT NOT NULL,
		file TEXT NOT NULL, imported INTEGER NOT NULL,
		UNIQUE (tail, time, kind)
	);
	CREATE TABLE files (
		role TEXT NOT NULL, name TEXT NOT NULL, content BLOB NOT NULL, imported INTEGER NOT NULL,
		PRIMARY KEY (role, name)
	);`,
	// 2: the work list and the review marks.
	`CREATE TABLE work (
		id INTEGER PRIMARY KEY, tail TEXT NOT NULL, status TEXT NOT NULL, reason TEXT NOT NULL,
		flag TEXT NOT NULL, opened INTEGER NOT NULL, updated INTEGER NOT NULL
	);
	CREATE INDEX work_tail ON work (tail);
	CREATE TABLE work_notes (
		item INTEGER NOT NULL REFERENCES work (id), time INTEGER NOT NULL,
		status TEXT NOT NULL, text TEXT NOT NULL
	);
	CREATE TABLE reviews (
		id INTEGER PRIMARY KEY, time INTEGER NOT NULL, state TEXT NOT NULL
	);`,
	// 3: fuel factors: the proposals with their moves, and each tail's
	// history of the factor in use (factors.go).
	`CREATE TABLE factor_proposals (
		id INTEGER PRIMARY KEY, tail TEXT NOT NULL, type TEXT NOT NULL, period TEXT NOT NULL,
		status TEXT NOT NULL, proposed_pct REAL NOT NULL, in_use_pct REAL NOT NULL, monitored_pct REAL NOT NULL,
		lo_pct REAL, hi_pct REAL, flights INTEGER NOT NULL, plan_fuel REAL,
		needs_note INTEGER NOT NULL, second_look INTEGER NOT NULL, created INTEGER NOT NULL, updated INTEGER NOT NULL
	);
	CREATE INDEX factor_proposals_tail ON factor_proposals (tail, period);
	CREATE TABLE factor_notes (
		proposal INTEGER NOT NULL REFERENCES factor_proposals (id), time INTEGER NOT NULL,
		status TEXT NOT NULL, set_by TEXT NOT NULL, text TEXT NOT NULL
	);
	CREATE TABLE factor_history (
		id INTEGER PRIMARY KEY, tail TEXT NOT NULL, pct REAL NOT NULL, effective INTEGER NOT NULL,
		set_by TEXT NOT NULL, why TEXT NOT NULL, proposal INTEGER REFERENCES factor_proposals (id), recorded INTEGER NOT NULL
	);
	CREATE INDEX factor_history_tail ON factor_history (tail, effective);`,
}

// Version is the schema version this dragdeck writes.
var Version = len(migrations)

// ErrNewer is the refusal of a store written by a newer dragdeck.
var ErrNewer = errors.New("written by a newer dragdeck")

// Store is an open fleet store.
type Store struct {
	db   *sql.DB
	path string
	// Now is the clock of the marks, imports and work items (time.Now
	// by default; tests set it).
	Now func() time.Time
}

// Open opens the store at path, creating it when create is set and it
// does not exist, and upgrades an older schema in place. Without create, a
// missing file is an error (a reading command never makes an empty store
// by a typing error).
func Open(path string, create bool) (*Store, error) {
	fi, err := os.Stat(path)
	switch {
	case err != nil && (!create || !errors.Is(err, os.ErrNotExist)):
		return nil, fmt.Errorf("store %s: %w", path, err)
	case err == nil && !fi.Mode().IsRegular():
		return nil, fmt.Errorf("store %s: not a regular file (a folder or a device)", path)
	}
	db, err := sql.Open("sqlite", "file:"+path+"?_pragma=busy_timeout(10000)&_pragma=journal_mode(WAL)&_pragma=synchronous(NORMAL)&_pragma=foreign_keys(1)")
	if err != nil {
		return nil, fmt.Errorf("store %s: %w", path, err)
	}
	s := &Store{db: db, path: path, Now: time.Now}
	if err := s.upgrade(); err != nil {
		db.Close()
		return nil, fmt.Errorf("store %s: %w", path, err)
	}
	return s, nil
}

// Path is the store's file.
func (s *Store) Path() string { return s.path }

// Close closes the store.
func (s *Store) Close() error { return s.db.Close() }

// upgrade brings the schema to Version, one transaction per step, and
// refuses a newer store.
func (s *Store) upgrade() error {
	v, err := s.version()
	if err != nil {
		return notStore(err)
	}
	if v > Version {
		return fmt.Errorf("schema version %d, %w (this one knows up to %d): use that version", v, ErrNewer, Version)
	}
	for ; v < Version; v++ {
		if err := s.step(v); err != nil {
			return fmt.Errorf("upgrading the schema from version %d: %w", v, err)
		}
	}
	return nil
}

func (s *Store) version() (int, error) {
	var v int
	err := s.db.QueryRow("PRAGMA user_version").Scan(&v)
	return v, err
}

// step applies migrations[v] in one transaction.
func (s *Store) step(v int) error {
	tx, err := s.db.Begin()
	if err != nil {
		return err
	}
	defer tx.Rollback()
	if _, err := tx.Exec(migrations[v]); err != nil {
		return err
	}
	if _, err := tx.Exec(fmt.Sprintf("PRAGMA user_version = %d", v+1)); err != nil {
		return err
	}
	return tx.Commit()
}

// notStore says plainly when a file is not a SQLite database at all.
func notStore(err error) error {
	return fmt.Errorf("not a dragdeck store (%v)", err)
}

// now is the store's clock in UTC.
func (s *Store) now() time.Time { return s.Now().UTC() }

// unixTime turns a stored time back into a UTC time.
func unixTime(ns int64) time.Time { return time.Unix(0, ns).UTC() }

// Integrity runs SQLite's integrity check; nil when the file is sound.
func (s *Store) Integrity() error {
	var msg string
	if err := s.db.QueryRow("PRAGMA integrity_check").Scan(&msg); err != nil {
		return fmt.Errorf("store %s: %w", s.path, err)
	}
	if msg != "ok" {
		return fmt.Errorf("store %s: damaged: %s", s.path, msg)
	}
	return nil
}
