package store

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// ImportInput is what one import adds to the store.
type ImportInput struct {
	// Files are snapshot files; an events file among them (told by its
	// header) is read as events.
	Files []string
	// Fleet is a fleet file (TOML) to keep, with the type files it names;
	// "" for none. It replaces the one kept before.
	Fleet string
	// Reject is told of every rejected row (may be nil), Conflict of every
	// conflicting one (may be nil).
	Reject   func(*feed.RowError)
	Conflict func(Conflict)
	// Layout reads the files in an export's own columns (nil: dragdeck's);
	// the store keeps it (Layouts), by its file name.
	Layout *feed.Layout
}

// Conflict is an incoming snapshot whose tail and time are already stored
// with other values: the stored one is kept.
type Conflict struct {
	File   string // where the incoming row is
	Line   int
	Tail   string
	Time   time.Time
	Stored string   // where the stored row came from, file:line
	Fields []string // the values that differ (the store's names)
}

func (c Conflict) String() string {
	verb := "differ"
	if len(c.Fields) == 1 {
		verb = "differs"
	}
	return fmt.Sprintf("%s:%d: %s at %s: conflicts with the stored row from %s (%s %s); the stored row is kept",
		c.File, c.Line, c.Tail, c.Time.Format(time.RFC3339), c.Stored, strings.Join(c.Fields, ", "), verb)
}

// ImportResult counts what an import did.
type ImportResult struct {
	Read      int // data rows read from the snapshot files
	New       int // snapshots added
	Duplicate int // same tail, time and values as one stored (or earlier in this import)
	Conflict  int // same tail and time, another value: not added
	Rejected  int // rows the reader rejected
	Events    int // events added (an event already stored is not added again)
	Fleet     string
	Files     []feed.FileResult // the snapshot files, in order
}

// valueColumns is the stored snapshot's value columns, in digest order.
var valueColumns = []string{"flight", "weight", "altitude", "mach", "sat", "fuel_flow", "bank", "vs", "accel", "n1", "samples", "seconds"}

// Import adds in to the store in one transaction: all of it, or nothing
// when it fails (a file that cannot be read as snapshots or events, a bad
// fleet file) or ctx is cancelled. Snapshots already stored (same tail
// and time) are counted as duplicates, or as conflicts when any value
// differs; neither is added.
func (s *Store) Import(ctx context.Context, in ImportInput) (ImportResult, error) {
	var res ImportResult
	tx, err := s.db.BeginTx(ctx, nil)
	if err != nil {
		return res, err
	}
	defer tx.Rollback()
	seen, err := loadKeys(tx)
	if err != nil {
		return res, err
	}
	now := s.now().UnixNano()
	ins, err := newInserter(ctx, tx, now)
	if err != nil {
		return res, err
	}
	defer ins.close()
	var failed error
	for _, path := range in.Files {
		if err := ctx.Err(); err != nil {
			return res, err
		}
		fr := feed.ReadFileParallel(path, feed.ReadOptions{Layout: in.Layout}, 2, func(r feed.Record) {
			if failed != nil {
				return
			}
			res.Read++
			d := digest(r)
			key := r.Time.UnixNano()
			stored, ok, err := seen.lookup(r.Tail, key)
			switch {
			case err != nil:
				failed = err
			case !ok:
				seen.add(r.Tail, key, d)
				res.New++
				failed = ins.add(r)
			case stored == d:
				res.Duplicate++
			default:
				res.Conflict++
				if in.Conflict != nil {
					c, err := ins.conflict(r)
					if err != nil {
						failed = err
						return
					}
					in.Conflict(c)
				}
			}
		}, func(e *feed.RowError) {
			res.Read++
			res.Rejected++
			if in.Reject != nil {
				in.Reject(e)
			}
		})
		if failed != nil {
			return res, failed
		}
		var fe *feed.FileError
		if fr.Events || errors.As(fr.Err, &fe) && fe.Events {
			evs, err := feed.ReadEvents(path)
			if err != nil {
				return res, err
			}
			n, err := addEvents(tx, evs, path, now)
			if err != nil {
				return res, err
			}
			res.Events += n
			fr.Err = nil
		}
		res.Files = append(res.Files, fr)
		if fr.Err != nil { // a file that cannot be read: nothing is imported
			return res, fr.Err
		}
	}
	if err := ins.flush(); err != nil {
		return res, err
	}
	if in.Fleet != "" {
		if err := keepFleet(tx, in.Fleet, now); err != nil {
			return res, err
		}
		res.Fleet = in.Fleet
	}
	if l := in.Layout; l != nil {
		if _, err := tx.Exec("INSERT OR REPLACE INTO files (role, name, content, imported) VALUES ('layout', ?, ?, ?)",
			filepath.Base(l.Source), l.Text, now); err != nil {
			return res, err
		}
	}
	if err := ctx.Err(); err != nil {
		return res, err
	}
	return res, tx.Commit()
}

// Layouts returns the layout files imports used, by name (the text as it
// was read), the latest import's for a name.
func (s *Store) Layouts() (map[string][]byte, error) {
	rows, err := s.db.Query("SELECT name, content FROM files WHERE role = 'layout'")
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	out := map[string][]byte{}
	for rows.Next() {
		var name string
		var content []byte
		if err := rows.Scan(&name, &content); err != nil {
			return nil, err
		}
		out[name] = content
	}
	return out, rows.Err()
}

// keys knows the digest of every snapshot stored or added so far, by tail
// and time. It reads a stored block only when an incoming snapshot falls
// in the block's time span, so that a weekly import reads the recent
// blocks of each tail, not the store's whole history.
type keys struct {
	tx      *sql.Tx
	unread  map[string][]blockSpan // by tail: the blocks not read yet
	digests map[string]map[int64]uint64
}

type blockSpan struct{ id, first, last int64 }

// loadKeys reads the blocks' spans (a row per 1,024 snapshots).
func loadKeys(tx *sql.Tx) (*keys, error) {
	rows, err := tx.Query("SELECT id, tail, first, last FROM blocks")
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	k := &keys{tx: tx, unread: map[string][]blockSpan{}, digests: map[string]map[int64]uint64{}}
	for rows.Next() {
		var b blockSpan
		var tail string
		if err := rows.Scan(&b.id, &tail, &b.first, &b.last); err != nil {
			return nil, err
		}
		k.unread[tail] = append(k.unread[tail], b)
	}
	return k, rows.Err()
}

// lookup returns the digest of the tail's snapshot at t (Unix ns), if one
// is stored or was added.
func (k *keys) lookup(tail string, t int64) (uint64, bool, error) {
	spans := k.unread[tail]
	for i := 0; i < len(spans); {
		if b := spans[i]; b.first <= t && t <= b.last {
			if err := k.read(tail, b.id); err != nil {
				return 0, false, err
			}
			spans[i] = spans[len(spans)-1]
			spans = spans[:len(spans)-1]
			k.unread[tail] = spans
			continue
		}
		i++
	}
	d, ok := k.digests[tail][t]
	return d, ok, nil
}

// read adds the digests of one stored block.
func (k *keys) read(tail string, id int64) error {
	var data []byte
	if err := k.tx.QueryRow("SELECT data FROM blocks WHERE id = ?", id).Scan(&data); err != nil {
		return err
	}
	return decodeBlock(tail, data, func(r feed.Record) { k.add(tail, r.Time.UnixNano(), digest(r)) })
}

func (k *keys) add(tail string, t int64, d uint64) {
	m := k.digests[tail]
	if m == nil {
		m = map[int64]uint64{}
		k.digests[tail] = m
	}
	m[t] = d
}

// digest is a 64-bit FNV-1a hash of a snapshot's values (flight, the SI
// values bit for bit, samples, seconds): two rows of one tail and time with
// equal digests are taken as duplicates. A different row with the same
// digest is a chance of 2⁻⁶⁴.
func digest(r feed.Record) uint64 {
	const prime = 1099511628211
	h := uint64(14695981039346656037)
	for i := 0; i < len(r.Flight); i++ {
		h = (h ^ uint64(r.Flight[i])) * prime
	}
	h = (h ^ 0xff) * prime // ends the flight
	s := r.Snap
	for _, v := range [...]float64{s.Weight, s.Altitude, s.Mach, s.SAT, s.FuelFlow, s.Bank, s.VS, s.Accel, s.N1, float64(r.Samples), r.Seconds} {
		b := math.Float64bits(v)
		for k := 0; k < 8; k++ {
			h = (h ^ (b & 0xff)) * prime
			b >>= 8
		}
	}
	return h
}

// inserter gathers the new snapshots of each tail into blocks.
type inserter struct {
	ctx     context.Context
	tx      *sql.Tx
	st      *sql.Stmt
	pending map[string][]feed.Record
	now     int64
}

func newInserter(ctx context.Context, tx *sql.Tx, now int64) (*inserter, error) {
	st, err := tx.PrepareContext(ctx, "INSERT INTO blocks (tail, first, last, n, data, imported) VALUES (?,?,?,?,?,?)")
	if err != nil {
		return nil, err
	}
	return &inserter{ctx: ctx, tx: tx, st: st, pending: map[string][]feed.Record{}, now: now}, nil
}

func (in *inserter) close() { in.st.Close() }

func (in *inserter) add(r feed.Record) error {
	p := append(in.pending[r.Tail], r)
	in.pending[r.Tail] = p
	if len(p) == blockSize {
		return in.write(r.Tail)
	}
	return nil
}

// write stores the tail's pending snapshots as one block.
func (in *inserter) write(tail string) error {
	p := in.pending[tail]
	if len(p) == 0 {
		return nil
	}
	first, last := p[0].Time, p[0].Time
	for _, r := range p {
		if r.Time.Before(first) {
			first = r.Time
		}
		if r.Time.After(last) {
			last = r.Time
		}
	}
	_, err := in.st.ExecContext(in.ctx, tail, first.UnixNano(), last.UnixNano(), len(p), encodeBlock(p), in.now)
	in.pending[tail] = p[:0]
	return err
}

// flush writes every tail's pending snapshots.
func (in *inserter) flush() error {
	for tail := range in.pending {
		if err := in.write(tail); err != nil {
			return err
		}
	}
	return nil
}

// conflict describes r against the stored row of its tail and time (one
// pending in this import, or one in the store).
func (in *inserter) conflict(r feed.Record) (Conflict, error) {
	var got *feed.Record
	for i, p := range in.pending[r.Tail] {
		if p.Time.Equal(r.Time) {
			got = &in.pending[r.Tail][i]
			break
		}
	}
	if got == nil {
		err := eachBlock(in.tx, r.Tail, &[2]time.Time{r.Time, r.Time}, func(s feed.Record) {
			if got == nil && s.Time.Equal(r.Time) {
				got = &s
			}
		})
		if err != nil {
			return Conflict{}, err
		}
		if got == nil {
			return Conflict{}, fmt.Errorf("%s at %s: stored row not found", r.Tail, r.Time.Format(time.RFC3339))
		}
	}
	c := Conflict{File: r.File, Line: r.Line, Tail: r.Tail, Time: r.Time, Stored: fmt.Sprintf("%s:%d", got.File, got.Line)}
	a, b := r.Snap, got.Snap
	for i, same := range []bool{r.Flight == got.Flight, a.Weight == b.Weight, a.Altitude == b.Altitude, a.Mach == b.Mach,
		a.SAT == b.SAT, a.FuelFlow == b.FuelFlow, a.Bank == b.Bank, a.VS == b.VS, a.Accel == b.Accel, a.N1 == b.N1,
		r.Samples == got.Samples, r.Seconds == got.Seconds} {
		if !same {
			c.Fields = append(c.Fields, valueColumns[i])
		}
	}
	return c, nil
}

// addEvents keeps the events not yet stored (same tail, time and kind).
func addEvents(tx *sql.Tx, evs map[string][]model.Event, file string, now int64) (int, error) {
	st, err := tx.Prepare("INSERT INTO events (tail, time, kind, note, file, imported) VALUES (?,?,?,?,?,?) ON CONFLICT DO NOTHING")
	if err != nil {
		return 0, err
	}
	defer st.Close()
	n := 0
	for tail, list := range evs {
		for _, e := range list {
			r, err := st.Exec(tail, e.Time.UnixNano(), e.Kind, e.Note, file, now)
			if err != nil {
				return n, err
			}
			k, _ := r.RowsAffected()
			n += int(k)
		}
	}
	return n, nil
}

// keepFleet checks a fleet file (it must load, with its type files) and
// keeps it and the type files it names, in place of those kept before.
func keepFleet(tx *sql.Tx, path string, now int64) error {
	data, err := feed.ReadSmall(path, feed.MaxFleetFile)
	if err != nil {
		return fmt.Errorf("fleet file: %w", err)
	}
	types := map[string][]byte{}
	dir := filepath.Dir(path)
	if _, err := feed.ParseFleet(path, data, func(rel string) (*model.Type, error) {
		p := rel
		if !filepath.IsAbs(p) {
			p = filepath.Join(dir, rel)
		}
		b, err := feed.ReadSmall(p, feed.MaxTypeFile)
		if err != nil {
			return nil, err
		}
		t, err := feed.ParseType(p, b)
		if err == nil {
			types[rel] = b
		}
		return t, err
	}); err != nil {
		return err
	}
	if _, err := tx.Exec("DELETE FROM files WHERE role IN ('fleet', 'type')"); err != nil {
		return err
	}
	if _, err := tx.Exec("INSERT INTO files (role, name, content, imported) VALUES ('fleet', ?, ?, ?)", filepath.Base(path), data, now); err != nil {
		return err
	}
	for rel, b := range types {
		if _, err := tx.Exec("INSERT INTO files (role, name, content, imported) VALUES ('type', ?, ?, ?)", rel, b, now); err != nil {
			return err
		}
	}
	return nil
}
