package demo

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

// Write refuses a folder that holds files, and with Overwrite replaces an
// earlier demo's files (a stale trace of another seed included) but keeps
// the user's; it never writes through a symbolic link.
func TestWriteIntoExistingFolder(t *testing.T) {
	cfg := Config{Tails: 3, Days: 10, Seed: 2}
	t.Run("not empty", func(t *testing.T) {
		dir := t.TempDir()
		mine := filepath.Join(dir, "mine.txt")
		os.WriteFile(mine, []byte("keep"), 0o644)
		if _, err := Write(dir, cfg); !errors.Is(err, ErrNotEmpty) {
			t.Fatalf("error %v, want ErrNotEmpty", err)
		}
		if b, _ := os.ReadFile(mine); string(b) != "keep" {
			t.Error("the user's file was touched")
		}
	})
	t.Run("overwrite an earlier demo", func(t *testing.T) {
		dir := t.TempDir()
		if _, err := Write(dir, Config{Tails: 5, Days: 10, Seed: 9}); err != nil {
			t.Fatal(err)
		}
		mine := filepath.Join(dir, TraceDir, "notes.txt")
		os.WriteFile(mine, []byte("keep"), 0o644)
		before, _ := filepath.Glob(filepath.Join(dir, TraceDir, "*.csv"))
		o := cfg
		o.Overwrite = true
		truth, err := Write(dir, o)
		if err != nil {
			t.Fatal(err)
		}
		after, _ := filepath.Glob(filepath.Join(dir, TraceDir, "*.csv"))
		if len(after) != len(truth.Traces) || len(before) == 0 {
			t.Errorf("traces before %v, after %v, truth lists %d: stale ones left", before, after, len(truth.Traces))
		}
		if b, _ := os.ReadFile(mine); string(b) != "keep" {
			t.Error("the user's file was removed")
		}
	})
	t.Run("links are not written through", func(t *testing.T) {
		outside := t.TempDir()
		target := filepath.Join(outside, "precious.json")
		os.WriteFile(target, []byte("precious"), 0o644)
		for name, link := range map[string]func(dir string) error{
			"a linked file":   func(dir string) error { return os.Symlink(target, filepath.Join(dir, TruthFile)) },
			"a linked folder": func(dir string) error { return os.Symlink(outside, filepath.Join(dir, TraceDir)) },
		} {
			dir := t.TempDir()
			if err := link(dir); err != nil {
				t.Skip("no symbolic links here:", err)
			}
			o := cfg
			o.Overwrite = true
			if _, err := Write(dir, o); err == nil {
				t.Errorf("%s: written through", name)
			}
			if b, _ := os.ReadFile(target); string(b) != "precious" {
				t.Fatalf("%s: the file outside was overwritten", name)
			}
			if m, _ := filepath.Glob(filepath.Join(outside, "*.csv")); len(m) > 0 {
				t.Fatalf("%s: traces written outside: %v", name, m)
			}
		}
	})
}
