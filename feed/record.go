package feed

import (
	"errors"
	"fmt"
	"time"

	"dragdeck/model"
)

// Record is one accepted snapshot row, converted to SI.
type Record struct {
	Time   time.Time
	Tail   string
	Flight string
	Snap   model.Snapshot
	File   string // the file it came from
	Line   int    // 1-based line where the row starts
	Offset int64  // byte offset in the file where the row's line starts
	// Samples and Seconds are the window a snapshot of extract stands for
	// (0 when the file has no such columns).
	Samples int
	Seconds float64
}

// The kinds of reject. A *RowError or *SnapshotError wraps one of them, so
// that callers can count or test rejects with errors.Is, as with the
// encoding/csv and strconv errors.
var (
	ErrNotFinite  = errors.New("not finite")
	ErrRange      = errors.New("out of range")
	ErrNumber     = errors.New("not a number")
	ErrEmpty      = errors.New("empty")
	ErrTime       = errors.New("bad time")
	ErrFields     = errors.New("wrong number of fields")
	ErrQuote      = errors.New("bad quoting")
	ErrTooLong    = errors.New("line too long")
	ErrNotInFleet = errors.New("tail not in the fleet file")
	ErrID         = errors.New("bad id")
	ErrEngineOut  = errors.New("engine out")
)

// RowError is a rejected row: "file:line: column: reason". Reading goes on
// after it.
type RowError struct {
	File   string
	Line   int
	Column string // the file's own column name, or "row" for the whole row
	Reason string
	Err    error // the kind: one of the Err* values above
}

func (e *RowError) Error() string {
	return fmt.Sprintf("%s:%d: %s: %s", e.File, e.Line, e.Column, e.Reason)
}

// Unwrap returns the kind of reject.
func (e *RowError) Unwrap() error { return e.Err }

// FileError is a file that cannot be read as snapshots at all: no header, a
// required column missing, a column given twice. Reading stops.
type FileError struct {
	File   string
	Line   int // 0 when the error is not on one line
	Reason string
	Events bool // the file is an events file: skip it, it is not broken
}

func (e *FileError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("%s:%d: %s", e.File, e.Line, e.Reason)
	}
	return fmt.Sprintf("%s: %s", e.File, e.Reason)
}

// Stats counts the data rows of a file: Read = Accepted + Rejected, always.
type Stats struct {
	Read, Accepted, Rejected int
}

// Add adds o to s.
func (s *Stats) Add(o Stats) {
	s.Read += o.Read
	s.Accepted += o.Accepted
	s.Rejected += o.Rejected
}
