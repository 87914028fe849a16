package feed

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"syscall"
)

// ErrNotRegular is the error of a path that is not a regular file: a named
// pipe, a device, a socket or a folder where a file is wanted. Reading a
// pipe or a device would wait for ever or without end, so dragdeck refuses.
var ErrNotRegular = errors.New("not a regular file")

// kindOf names what a non-regular file is, for messages.
func kindOf(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&fs.ModeCharDevice != 0, m&fs.ModeDevice != 0:
		return "a device"
	case m&fs.ModeSocket != 0:
		return "a socket"
	}
	return "not a plain file"
}

// checkRegular returns an error wrapping ErrNotRegular unless m is a
// regular file's mode.
func checkRegular(path string, m fs.FileMode) error {
	if m.IsRegular() {
		return nil
	}
	return fmt.Errorf("%s: %w (%s); dragdeck reads regular files only", path, ErrNotRegular, kindOf(m))
}

// OpenRegular opens path for reading when it is a regular file, and refuses
// anything else without waiting on it: the open does not block on a pipe
// (O_NONBLOCK), and the opened file is checked again, so a file swapped
// for a pipe between the two is refused too.
func OpenRegular(path string) (*os.File, error) {
	if fi, err := os.Stat(path); err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			pe.Op = "open" // as os.Open says it: the file could not be opened
		}
		return nil, err
	} else if err := checkRegular(path, fi.Mode()); err != nil {
		return nil, err
	}
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	fi, err := f.Stat()
	if err == nil {
		err = checkRegular(path, fi.Mode())
	}
	if err != nil {
		f.Close()
		return nil, err
	}
	return f, nil
}

// ReadSmall reads a whole regular file of at most limit bytes: a type or
// fleet file, which is never large. A larger file is refused unread.
func ReadSmall(path string, limit int64) ([]byte, error) {
	f, err := OpenRegular(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(data)) > limit {
		return nil, fmt.Errorf("%s: larger than %s, which no such file needs", path, sizeText(limit))
	}
	return data, nil
}

// sizeText writes a byte count as KB or MB.
func sizeText(n int64) string {
	if n >= 1<<20 {
		return fmt.Sprintf("%d MB", n>>20)
	}
	return fmt.Sprintf("%d KB", n>>10)
}

// cappedReader reads at most n more bytes from r and then fails with a
// message naming the file, rather than stopping short as io.LimitReader
// does (a silent cut would lose data).
type cappedReader struct {
	r     io.Reader
	n     int64
	path  string
	limit int64
}

func (c *cappedReader) Read(p []byte) (int, error) {
	if c.n <= 0 {
		return 0, fmt.Errorf("%s: larger than %s, which no such file needs", c.path, sizeText(c.limit))
	}
	if int64(len(p)) > c.n {
		p = p[:c.n]
	}
	k, err := c.r.Read(p)
	c.n -= int64(k)
	return k, err
}

// Limits of the small files dragdeck reads whole.
const (
	MaxTypeFile   = 1 << 20  // a type file
	MaxFleetFile  = 16 << 20 // a fleet file: about 200,000 entries
	MaxEventsFile = 64 << 20 // an events file: about a million events
)
