//go:build unix

package feed

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// What is not a regular file is refused at once, never waited on: a named
// pipe (reading one waits for a writer for ever), a device (/dev/zero never
// ends) and, for follow, a folder. Files read whole are capped.
func TestNotRegularRefused(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "pipe.csv")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Skip("no named pipes here:", err)
	}
	big := filepath.Join(dir, "big.toml")
	if err := os.WriteFile(big, []byte(strings.Repeat("#", MaxTypeFile+1)), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		run  func() error
		want string
	}{
		{"snapshot file that is a pipe", func() error { return ReadFile(fifo, nil, nil).Err }, "named pipe"},
		{"type file from a device", func() error { _, err := LoadType("/dev/zero"); return err }, "a device"},
		{"events file from a device", func() error { _, err := ReadEvents("/dev/zero"); return err }, "a device"},
		{"fleet file that is a pipe", func() error { _, err := LoadFleet(fifo); return err }, "named pipe"},
		{"type file over 1 MB", func() error { _, err := LoadType(big); return err }, "larger than 1 MB"},
		{"follow a pipe", func() error { return followOnce(fifo) }, "named pipe"},
		{"follow a folder", func() error { return followOnce(dir) }, "a folder"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			done := make(chan error, 1)
			go func() { done <- c.run() }()
			select {
			case err := <-done:
				if err == nil || !strings.Contains(err.Error(), c.want) {
					t.Fatalf("error %v, want one saying %q", err, c.want)
				}
				if c.want != "larger than 1 MB" && !errors.Is(err, ErrNotRegular) {
					t.Errorf("%v is not ErrNotRegular", err)
				}
			case <-time.After(10 * time.Second):
				t.Fatal("still waiting after 10 s")
			}
		})
	}
}

// followOnce follows path until the first error (or 2 s).
func followOnce(path string) error {
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Second)
	defer cancel()
	fl := &Follower{Path: path, Poll: 5 * time.Millisecond}
	return fl.Run(ctx, func(Record) error { return nil }, nil)
}

// The events reader's cap fails loudly at the limit rather than cutting
// the file short.
func TestCappedReader(t *testing.T) {
	c := &cappedReader{r: strings.NewReader("0123456789"), n: 5, path: "e.csv", limit: 5}
	buf := make([]byte, 64)
	k, err := c.Read(buf)
	if k != 5 || err != nil {
		t.Fatalf("first read %d %v, want 5 bytes", k, err)
	}
	if _, err := c.Read(buf); err == nil || !strings.Contains(err.Error(), "e.csv: larger than") {
		t.Fatalf("read past the cap: %v", err)
	}
}
