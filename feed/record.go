package feed

import (
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
}

// RowError is a rejected row: "file:line: column: reason". Reading goes on
// after it.
type RowError struct {
	File   string
	Line   int
	Column string // the file's own column name, or "row" for the whole row
	Reason string
	Kind   string // a short class of reason, for counting (Kind* constants)
}

func (e *RowError) Error() string {
	return fmt.Sprintf("%s:%d: %s: %s", e.File, e.Line, e.Column, e.Reason)
}

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
