package feed

import (
	"bufio"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync/atomic"
)

// Reader reads snapshot records from a CSV stream. Memory stays flat
// whatever the size of the input.
type Reader struct {
	d    *Decoder
	br   *bufio.Reader
	line int // lines read, plus base: the line number of the last line
	base int // lines before the part of the file this reader reads
	// pos is the bytes read, offBase the offset of the part this reader
	// reads in its file, start where the last line began (for Offset).
	pos, offBase, start int64
	long                []byte
	done                error // sticky final error (io.EOF, *FileError or an I/O error)
}

// NewReader returns a reader of r; name is used in errors.
func NewReader(r io.Reader, name string) *Reader {
	return &Reader{d: NewDecoder(name), br: bufio.NewReaderSize(r, 64<<10)}
}

// SetTailCheck rejects the rows of the tails that check gives a reason for.
func (r *Reader) SetTailCheck(check TailCheck) { r.d.CheckTail = check }

// Next returns the next accepted record, or a *RowError for a rejected row
// (call Next again to go on). At the end it returns io.EOF; a *FileError or
// an I/O error is final.
func (r *Reader) Next() (Record, error) {
	var rec Record
	if err := r.nextInto(&rec); err != nil {
		return Record{}, err
	}
	return rec, nil
}

// nextInto is Next writing the record into rec (a slot of the caller's);
// rec is unspecified unless the error is nil.
func (r *Reader) nextInto(rec *Record) error {
	for r.done == nil {
		line, err := r.readLine()
		switch {
		case err == io.EOF:
			r.done = io.EOF
			if e := r.d.End(); e != nil {
				return r.keep(e)
			}
		case err != nil:
			r.done = err
		case line == nil: // longer than maxLine, skipped
			return r.keep(r.d.TooLong(r.line + r.base))
		default:
			ok, err := r.d.lineInto(rec, line, r.line+r.base)
			if ok {
				rec.Offset = r.offBase + r.start
				return nil
			}
			if err != nil {
				return r.keep(err)
			}
		}
	}
	return r.done
}

// keep makes a *FileError final and returns err.
func (r *Reader) keep(err error) error {
	var fe *FileError
	if errors.As(err, &fe) {
		r.done = err
	}
	return err
}

// readLine returns the next physical line without its '\n', or nil for a
// line longer than maxLine (skipped whole), or io.EOF.
func (r *Reader) readLine() ([]byte, error) {
	r.start = r.pos
	line, err := r.br.ReadSlice('\n')
	r.pos += int64(len(line))
	if err == nil || (err == io.EOF && len(line) > 0) {
		r.line++
		return trimNL(line), nil
	}
	if err != bufio.ErrBufferFull {
		if err == io.EOF {
			return nil, io.EOF
		}
		return nil, fmt.Errorf("%s: %w", r.d.name, err)
	}
	r.long = append(r.long[:0], line...)
	tooLong := false
	for {
		line, err = r.br.ReadSlice('\n')
		r.pos += int64(len(line))
		if !tooLong {
			r.long = append(r.long, line...)
			if len(r.long) > maxLine {
				tooLong, r.long = true, r.long[:0]
			}
		}
		if err == bufio.ErrBufferFull {
			continue
		}
		if err != nil && err != io.EOF {
			return nil, fmt.Errorf("%s: %w", r.d.name, err)
		}
		r.line++
		if tooLong {
			return nil, nil
		}
		return trimNL(r.long), nil
	}
}

func trimNL(b []byte) []byte {
	if n := len(b); n > 0 && b[n-1] == '\n' {
		return b[:n-1]
	}
	return b
}

// Stats returns the rows counted so far.
func (r *Reader) Stats() Stats { return r.d.Stats() }

// Unknown returns the header's ignored columns.
func (r *Reader) Unknown() []string { return r.d.Unknown() }

// maxNotices is how many notices a file's result keeps.
const maxNotices = 20

// FileResult is what reading one file gave.
type FileResult struct {
	Path    string
	Stats   Stats
	Unknown []string // ignored columns (one warning per file)
	Notices []string // new header lines inside the file, at most maxNotices
	Err     error    // a *FileError or I/O error: the file could not be read
	Events  bool     // an events file, skipped (not an error)
	Mapping []string // under a layout: how each field is found, a line each
}

// ReadFile reads the snapshot file at path, calling accept for each accepted
// record and reject for each rejected row (either may be nil).
func ReadFile(path string, accept func(Record), reject func(*RowError)) FileResult {
	return ReadFileWith(path, ReadOptions{}, accept, reject)
}

// ReadOptions are the optional parts of reading a file.
type ReadOptions struct {
	Progress  *atomic.Int64 // bytes read so far are added to it (may be nil)
	CheckTail TailCheck     // rows of the tails it refuses are rejected (may be nil)
	Layout    *Layout       // an export's own columns (nil: dragdeck's)
}

// TotalSize returns the summed size of the files in bytes (0 for those that
// cannot be read), the whole of a progress bar.
func TotalSize(paths []string) int64 {
	var n int64
	for _, p := range paths {
		if fi, err := os.Stat(p); err == nil {
			n += fi.Size()
		}
	}
	return n
}

// countingReader adds the bytes it reads to n.
type countingReader struct {
	r io.Reader
	n *atomic.Int64
}

func (c countingReader) Read(p []byte) (int, error) {
	k, err := c.r.Read(p)
	c.n.Add(int64(k))
	return k, err
}

// each hands every accepted record to accept and every rejected row to
// reject (either may be nil), and returns what ended the input: nil at its
// end, else a *FileError or an I/O error.
func (r *Reader) each(accept func(Record), reject func(*RowError)) error {
	var rec Record
	return r.eachInto(func() *Record { return &rec }, func() {
		if accept != nil {
			accept(rec)
		}
	}, reject)
}

// eachInto is each for a caller that gives the slot each record is
// decoded into (slot) and is told when it holds an accepted one (accept).
func (r *Reader) eachInto(slot func() *Record, accept func(), reject func(*RowError)) error {
	for {
		err := r.nextInto(slot())
		if err == nil {
			accept()
			continue
		}
		var re *RowError
		if errors.As(err, &re) {
			if reject != nil {
				reject(re)
			}
			continue
		}
		if err == io.EOF {
			return nil
		}
		return err
	}
}

// ReadFileWith is ReadFile with options: a progress count and a tail check.
func ReadFileWith(path string, opt ReadOptions, accept func(Record), reject func(*RowError)) FileResult {
	res := FileResult{Path: path}
	f, err := OpenRegular(path)
	if err != nil {
		res.Err = err
		return res
	}
	defer f.Close()
	var src io.Reader = f
	if opt.Progress != nil {
		src = countingReader{f, opt.Progress}
	}
	r := NewReader(src, path)
	r.SetTailCheck(opt.CheckTail)
	r.d.SetLayout(opt.Layout)
	r.d.Notice = func(s string) {
		if len(res.Notices) < maxNotices {
			res.Notices = append(res.Notices, s)
		} else if len(res.Notices) == maxNotices {
			res.Notices = append(res.Notices, path+": more new header lines follow; not all are listed")
		}
	}
	err = r.each(accept, reject)
	var fe *FileError
	if errors.As(err, &fe) && fe.Events {
		res.Events = true
	} else if err != nil {
		res.Err = err
	}
	res.Stats, res.Unknown = r.Stats(), r.Unknown()
	if r.d.hdr != nil {
		res.Mapping = r.d.Mapping()
	}
	return res
}

// ExpandPaths turns files and folders into a sorted list of files: a folder
// gives every *.csv file inside it, at any depth. A path that does not exist
// is an error.
func ExpandPaths(paths []string) ([]string, error) {
	var out []string
	for _, p := range paths {
		info, err := os.Stat(p)
		if err != nil {
			return nil, err
		}
		if !info.IsDir() {
			out = append(out, p) // a pipe or device is refused when it is read, on its own
			continue
		}
		var found []string
		err = filepath.WalkDir(p, func(q string, de fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if !de.IsDir() && strings.EqualFold(filepath.Ext(q), ".csv") {
				found = append(found, q)
			}
			return nil
		})
		if err != nil {
			return nil, err
		}
		if len(found) == 0 {
			return nil, fmt.Errorf("%s: no *.csv files in this folder", p)
		}
		sort.Strings(found)
		out = append(out, found...)
	}
	return out, nil
}
