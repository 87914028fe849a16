package demo

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"dragdeck/feed"
)

// ErrNotEmpty is Write's refusal of a folder that already holds files.
var ErrNotEmpty = errors.New("folder not empty")

// prepareDir makes dir ready for a demo. It is created when missing. A
// folder that holds anything is refused unless overwrite is set; then the
// files an earlier demo wrote there are removed, so that none is left stale,
// and every other file is kept. The sub-folders the demo writes into must
// be folders of their own, never symbolic links, and no file is written
// through a link.
func prepareDir(dir string, overwrite bool) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return err
	}
	if len(entries) > 0 && !overwrite {
		var names []string
		for _, e := range entries {
			names = append(names, e.Name())
		}
		sort.Strings(names)
		if len(names) > 3 {
			names = append(names[:3], "…")
		}
		return fmt.Errorf("%s: %w (%s): the demo would overwrite its files; give another folder, or --force to replace an earlier demo there (other files are kept)",
			dir, ErrNotEmpty, strings.Join(names, ", "))
	}
	for _, sub := range []string{TraceDir, TypeDir, RecordingDir, filepath.Dir(SnapshotFile)} {
		p := filepath.Join(dir, sub)
		fi, err := os.Lstat(p)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			if err := os.Mkdir(p, 0o755); err != nil {
				return err
			}
			continue
		case err != nil:
			return err
		case !fi.IsDir():
			return fmt.Errorf("%s: not a folder of its own (%s); the demo does not write through it", p, fi.Mode().Type())
		}
	}
	// What an earlier demo wrote: its fixed files, and the type files and
	// traces by their patterns.
	stale := []string{SnapshotFile, FleetFile, EventsFile, TruthFile, "type.toml", feed.LayoutFile}
	for _, pat := range []string{TypeDir + "/*.toml", TraceDir + "/*.csv", RecordingDir + "/*.csv"} {
		m, _ := filepath.Glob(filepath.Join(dir, pat))
		for _, p := range m {
			rel, _ := filepath.Rel(dir, p)
			stale = append(stale, rel)
		}
	}
	for _, rel := range stale {
		p := filepath.Join(dir, rel)
		fi, err := os.Lstat(p)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return err
		}
		if !fi.Mode().IsRegular() {
			return fmt.Errorf("%s: not a plain file (%s); the demo does not write through it", p, fi.Mode().Type())
		}
		if err := os.Remove(p); err != nil {
			return err
		}
	}
	return nil
}

// createNew creates a file that must not exist yet: a link or file in its
// place is an error, never followed.
func createNew(path string) (*os.File, error) {
	return os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
}

// writeNew writes data to a file that must not exist yet (createNew).
func writeNew(path string, data []byte) error {
	f, err := createNew(path)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}
