package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// Every file that 'demo --help' names is one that demo writes.
func TestDemoHelpNamesItsFiles(t *testing.T) {
	_, help, _ := runArgs("demo", "--help")
	dir := t.TempDir()
	if code, _, errs := runArgs("demo", "--out", dir, "--tails", "2", "--days", "20"); code != 0 {
		t.Fatalf("demo: exit %d %s", code, errs)
	}
	names := regexp.MustCompile(`[a-z/]+\.(?:csv|toml|json)|[a-z]+/`).FindAllString(strings.SplitN(help, "flags:", 2)[0], -1)
	if len(names) < 5 {
		t.Fatalf("help names %v", names)
	}
	for _, n := range names {
		if _, err := os.Stat(filepath.Join(dir, n)); err != nil {
			t.Errorf("help names %s, which demo does not write: %v", n, err)
		}
	}
}
