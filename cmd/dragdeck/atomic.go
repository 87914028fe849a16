package main

import (
	"bufio"
	"os"
	"path/filepath"
)

// atomicFile is an output written whole or not at all: into a temporary
// file beside it, renamed over it by Commit. A run that fails or is killed
// leaves the old file as it was (and at most a stray temporary file).
type atomicFile struct {
	path string
	f    *os.File
	*bufio.Writer
}

// createAtomic starts writing path.
func createAtomic(path string) (*atomicFile, error) {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return nil, err
	}
	return &atomicFile{path: path, f: f, Writer: bufio.NewWriter(f)}, nil
}

// Commit puts the written file in place of path.
func (a *atomicFile) Commit() error {
	if a.f == nil {
		return nil
	}
	err := a.Flush()
	if err == nil {
		err = a.f.Chmod(0o644) // as os.Create would leave it, not the temporary file's 0600
	}
	if err == nil {
		err = a.f.Sync()
	}
	if cerr := a.f.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Rename(a.f.Name(), a.path)
	}
	if err != nil {
		os.Remove(a.f.Name())
	}
	a.f = nil
	return err
}

// Abort drops what was written, unless Commit came first.
func (a *atomicFile) Abort() {
	if a.f != nil {
		a.f.Close()
		os.Remove(a.f.Name())
		a.f = nil
	}
}
