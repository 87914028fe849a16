package store

import (
	"database/sql"
	"errors"
	"fmt"
	"path"
	"sort"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// querier is a database or a transaction.
type querier interface {
	Query(query string, args ...any) (*sql.Rows, error)
}

// eachBlock calls fn for every snapshot of the blocks of tail ("": every
// tail) that overlap span (nil: all), in the order they were imported;
// the snapshots of a block outside span are given too (callers filter).
// Tail and flight names are interned, as the reader gives them.
func eachBlock(q querier, tail string, span *[2]time.Time, fn func(feed.Record)) error {
	query, args := "SELECT tail, data FROM blocks", []any{}
	switch {
	case tail != "" && span != nil:
		query, args = query+" WHERE tail = ? AND first <= ? AND last >= ?", []any{tail, span[1].UnixNano(), span[0].UnixNano()}
	case tail != "":
		query, args = query+" WHERE tail = ?", []any{tail}
	}
	rows, err := q.Query(query+" ORDER BY id", args...)
	if err != nil {
		return err
	}
	defer rows.Close()
	names := map[string]string{}
	intern := func(v string) string {
		if w, ok := names[v]; ok {
			return w
		}
		names[v] = v
		return v
	}
	for rows.Next() {
		var t string
		var data []byte
		if err := rows.Scan(&t, &data); err != nil {
			return err
		}
		t = intern(t)
		if err := decodeBlock(t, data, func(r feed.Record) {
			r.Flight, r.File = intern(r.Flight), intern(r.File)
			fn(r)
		}); err != nil {
			return fmt.Errorf("%s: %w", t, err)
		}
	}
	return rows.Err()
}

// Each calls fn for every stored snapshot, in the order they were imported
// (by tail within an import), and counts them.
func (s *Store) Each(fn func(feed.Record)) (feed.Stats, error) {
	n := 0
	err := eachBlock(s.db, "", nil, func(r feed.Record) { n++; fn(r) })
	return feed.Stats{Read: n, Accepted: n}, err
}

// Flight returns the tail's snapshots from..to (inclusive), in time order:
// the rows of a flight to replay.
func (s *Store) Flight(tail string, from, to time.Time) ([]feed.Record, error) {
	var out []feed.Record
	err := eachBlock(s.db, tail, &[2]time.Time{from, to}, func(r feed.Record) {
		if !r.Time.Before(from) && !r.Time.After(to) {
			out = append(out, r)
		}
	})
	sort.SliceStable(out, func(a, b int) bool { return out[a].Time.Before(out[b].Time) })
	return out, err
}

// Replay returns the snapshots that f keeps, in time order (then in the
// order they were imported), for replay, and counts the stored ones.
func (s *Store) Replay(f feed.ReplayFilter) ([]feed.Record, feed.Stats, error) {
	var out []feed.Record
	if err := eachBlock(s.db, f.Tail, nil, func(r feed.Record) {
		if f.Match(r) {
			out = append(out, r)
		}
	}); err != nil {
		return nil, feed.Stats{}, err
	}
	sort.SliceStable(out, func(a, b int) bool { return out[a].Time.Before(out[b].Time) })
	var n int
	if err := s.db.QueryRow("SELECT coalesce(sum(n), 0) FROM blocks").Scan(&n); err != nil {
		return nil, feed.Stats{}, err
	}
	return out, feed.Stats{Read: n, Accepted: n}, nil
}

// Events returns the stored events by tail, in time order.
func (s *Store) Events() (map[string][]model.Event, error) {
	rows, err := s.db.Query("SELECT tail, time, kind, note FROM events ORDER BY tail, time, rowid")
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	out := map[string][]model.Event{}
	for rows.Next() {
		var tail, kind, note string
		var t int64
		if err := rows.Scan(&tail, &t, &kind, &note); err != nil {
			return nil, err
		}
		out[tail] = append(out[tail], model.Event{Time: unixTime(t), Kind: kind, Note: note})
	}
	if len(out) == 0 {
		return nil, rows.Err()
	}
	return out, rows.Err()
}

// ErrNoFleet says that no fleet file was imported.
var ErrNoFleet = errors.New("no fleet file in the store")

// Roster returns the stored fleet file's roster, its type files read from
// the store too; ErrNoFleet when none was imported.
func (s *Store) Roster() (*model.Roster, error) {
	rows, err := s.db.Query("SELECT role, name, content FROM files")
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var fleetName string
	var fleet []byte
	types := map[string][]byte{}
	for rows.Next() {
		var role, name string
		var content []byte
		if err := rows.Scan(&role, &name, &content); err != nil {
			return nil, err
		}
		switch role {
		case "fleet":
			fleetName, fleet = name, content
		case "type":
			types[name] = content
		}
	}
	if err := rows.Err(); err != nil {
		return nil, err
	}
	if fleet == nil {
		return nil, ErrNoFleet
	}
	name := s.path + ":" + fleetName
	return feed.ParseFleet(name, fleet, func(rel string) (*model.Type, error) {
		b, ok := types[rel]
		if !ok {
			return nil, fmt.Errorf("type file %s is not in the store", rel)
		}
		return feed.ParseType(path.Join(s.path, rel), b)
	})
}

// Counts is what a store holds.
type Counts struct {
	Snapshots, Tails, Events, Work int
	First, Last                    time.Time // span of the snapshots (zero when none)
	Fleet                          string    // the fleet file's name, "" when none
}

// Counts counts the store's contents.
func (s *Store) Counts() (Counts, error) {
	var c Counts
	var first, last sql.NullInt64
	if err := s.db.QueryRow("SELECT coalesce(sum(n), 0), count(DISTINCT tail), min(first), max(last) FROM blocks").Scan(&c.Snapshots, &c.Tails, &first, &last); err != nil {
		return c, err
	}
	if first.Valid {
		c.First, c.Last = unixTime(first.Int64), unixTime(last.Int64)
	}
	if err := s.db.QueryRow("SELECT count(*) FROM events").Scan(&c.Events); err != nil {
		return c, err
	}
	if err := s.db.QueryRow("SELECT count(*) FROM work").Scan(&c.Work); err != nil {
		return c, err
	}
	err := s.db.QueryRow("SELECT name FROM files WHERE role = 'fleet'").Scan(&c.Fleet)
	if errors.Is(err, sql.ErrNoRows) {
		err = nil
	}
	return c, err
}
