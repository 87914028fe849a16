package feed

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"time"
)

// Follower reads a snapshot file that another system is still writing, like
// tail -f from the first line: the rows already there, then each row as it
// is completed by its newline. A truncated file starts over, a replaced
// (rotated) file is reopened from its start, a deleted file is waited for.
type Follower struct {
	Path   string
	Poll   time.Duration // how often to look for new data (default 50 ms)
	Clock  Clock         // default RealClock
	Notice func(string)  // what happened to the file (default: nothing)
	// CheckTail rejects the rows of the tails it refuses (may be nil).
	CheckTail TailCheck

	f       *os.File
	info    os.FileInfo
	off     int64
	partial []byte
	skip    bool // discarding the rest of a line longer than maxLine
	dec     *Decoder
	line    int
	waiting bool
	buf     []byte
	// head and mark are the first bytes of the file and the bytes just
	// before off, as read: a file rewritten in place (truncated and grown
	// again within one poll, or rewritten at the same size) no longer
	// holds them, though its size says nothing.
	head, mark []byte
	scratch    []byte
}

// Sizes of the fingerprint and of one step's reading: a backlog is read in
// batches of maxBatch, so that a cancel is seen between them.
const (
	headBytes = 512
	markBytes = 64
	maxBatch  = 4 << 20
)

// Stats returns the rows counted in the file now being read.
func (fl *Follower) Stats() Stats {
	if fl.dec == nil {
		return Stats{}
	}
	return fl.dec.Stats()
}

// Run follows the file until ctx ends (then it returns nil), calling emit
// for each accepted record and reject for each rejected row. A file whose
// header cannot be used (*FileError) or an I/O error ends it.
func (fl *Follower) Run(ctx context.Context, emit func(Record) error, reject func(*RowError)) error {
	if fl.Poll <= 0 {
		fl.Poll = 50 * time.Millisecond
	}
	if fl.Clock == nil {
		fl.Clock = RealClock{}
	}
	if fl.Notice == nil {
		fl.Notice = func(string) {}
	}
	if fl.buf == nil {
		fl.buf = make([]byte, 64<<10)
	}
	defer fl.close()
	for {
		progressed, err := fl.step(emit, reject)
		if err != nil {
			return err
		}
		if progressed {
			if ctx.Err() != nil {
				return nil
			}
			continue
		}
		select {
		case <-ctx.Done():
			return nil
		case <-fl.Clock.After(fl.Poll):
		}
	}
}

func (fl *Follower) close() {
	if fl.f != nil {
		fl.f.Close()
		fl.f = nil
	}
}

// restart forgets what was read: the file is read again from its start.
func (fl *Follower) restart() {
	fl.off, fl.partial, fl.skip, fl.line = 0, fl.partial[:0], false, 0
	fl.head, fl.mark = fl.head[:0], fl.mark[:0]
	fl.dec = NewDecoder(fl.Path)
	fl.dec.CheckTail = fl.CheckTail
	fl.dec.Notice = fl.Notice
}

// step does one round of work and reports whether it read anything.
func (fl *Follower) step(emit func(Record) error, reject func(*RowError)) (bool, error) {
	if fl.f == nil {
		f, err := OpenRegular(fl.Path) // a pipe, device or folder is an error: following it would never end
		if errors.Is(err, fs.ErrNotExist) {
			if !fl.waiting {
				fl.Notice(fmt.Sprintf("%s: waiting for the file to appear", fl.Path))
				fl.waiting = true
			}
			return false, nil
		}
		if err != nil {
			return false, err
		}
		info, err := f.Stat()
		if err != nil {
			f.Close()
			return false, err
		}
		fl.f, fl.info, fl.waiting = f, info, false
		fl.restart()
	}
	st, err := os.Stat(fl.Path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		if err := fl.drain(emit, reject); err != nil {
			return false, err
		}
		fl.Notice(fmt.Sprintf("%s: the file was removed; waiting for it to come back", fl.Path))
		fl.close()
		fl.waiting = true
		return true, nil
	case err != nil:
		return false, err
	case !os.SameFile(st, fl.info):
		if err := fl.drain(emit, reject); err != nil {
			return false, err
		}
		fl.Notice(fmt.Sprintf("%s: the file was replaced; reading the new one from its first line", fl.Path))
		fl.close()
		return true, nil
	case st.Size() < fl.off:
		fl.Notice(fmt.Sprintf("%s: the file was truncated; starting over from its first line", fl.Path))
		fl.restart()
	case !fl.unchanged():
		fl.Notice(fmt.Sprintf("%s: the file was rewritten in place; starting over from its first line", fl.Path))
		fl.restart()
	}
	return fl.read(emit, reject, false)
}

// unchanged reports whether the bytes already read still stand where they
// were: the file's first bytes and those just before the offset.
func (fl *Follower) unchanged() bool {
	same := func(want []byte, at int64) bool {
		if len(want) == 0 {
			return true
		}
		if cap(fl.scratch) < len(want) {
			fl.scratch = make([]byte, headBytes)
		}
		got := fl.scratch[:len(want)]
		n, err := fl.f.ReadAt(got, at)
		return n == len(want) && (err == nil || err == io.EOF) && bytes.Equal(got, want)
	}
	return same(fl.head, 0) && same(fl.mark, fl.off-int64(len(fl.mark)))
}

// remember keeps the fingerprint of what has been read: data was read
// from the file at offset from, and off is now past it.
func (fl *Follower) remember(data []byte, from int64) {
	if k := int64(len(fl.head)); k < headBytes && from <= k {
		end := min(int64(len(data)), headBytes-from)
		fl.head = append(fl.head[:from], data[:end]...)
	}
	if len(data) >= markBytes {
		fl.mark = append(fl.mark[:0], data[len(data)-markBytes:]...)
	} else {
		keep := min(len(fl.mark), markBytes-len(data))
		fl.mark = append(fl.mark[:0], fl.mark[len(fl.mark)-keep:]...)
		fl.mark = append(fl.mark, data...)
	}
}

// drain reads what is left of the open file, its last line even without a
// newline, before the file is let go.
func (fl *Follower) drain(emit func(Record) error, reject func(*RowError)) error {
	if _, err := fl.read(emit, reject, true); err != nil {
		return err
	}
	return nil
}

// read reads the new bytes of the open file and hands each complete line to
// the decoder; at final, the unterminated rest is a line too.
func (fl *Follower) read(emit func(Record) error, reject func(*RowError), final bool) (bool, error) {
	progressed := false
	for batch := 0; final || batch < maxBatch; {
		n, err := fl.f.ReadAt(fl.buf, fl.off)
		if n > 0 {
			progressed = true
			fl.remember(fl.buf[:n], fl.off)
			fl.off += int64(n)
			batch += n
			if err := fl.lines(fl.buf[:n], emit, reject); err != nil {
				return progressed, err
			}
		}
		if err == io.EOF || n == 0 {
			break
		}
		if err != nil {
			return progressed, err
		}
	}
	if final && (len(fl.partial) > 0 || fl.skip) {
		fl.line++
		if err := fl.feed(fl.partial, emit, reject); err != nil {
			return progressed, err
		}
		fl.partial = fl.partial[:0]
	}
	return progressed, nil
}

// lines splits data into lines, keeping an unterminated tail for later.
func (fl *Follower) lines(data []byte, emit func(Record) error, reject func(*RowError)) error {
	for len(data) > 0 {
		i := bytes.IndexByte(data, '\n')
		if i < 0 {
			if !fl.skip {
				fl.partial = append(fl.partial, data...)
				if len(fl.partial) > maxLine {
					fl.partial, fl.skip = fl.partial[:0], true
				}
			}
			return nil
		}
		fl.line++
		var line []byte
		if len(fl.partial) > 0 {
			fl.partial = append(fl.partial, data[:i]...)
			line = fl.partial
		} else {
			line = data[:i]
		}
		if err := fl.feed(line, emit, reject); err != nil {
			return err
		}
		fl.partial = fl.partial[:0]
		data = data[i+1:]
	}
	return nil
}

// feed hands one complete line to the decoder.
func (fl *Follower) feed(line []byte, emit func(Record) error, reject func(*RowError)) error {
	var err error
	var rec Record
	var ok bool
	if fl.skip {
		fl.skip = false
		err = fl.dec.TooLong(fl.line)
	} else {
		rec, ok, err = fl.dec.Line(line, fl.line)
	}
	if ok {
		return emit(rec)
	}
	var re *RowError
	if errors.As(err, &re) {
		if reject != nil {
			reject(re)
		}
		return nil
	}
	return err
}
