package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// An output is replaced whole on Commit, and left as it was on Abort.
func TestAtomicFile(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "out.txt")
	os.WriteFile(p, []byte("old"), 0o644)
	a, err := createAtomic(p)
	if err != nil {
		t.Fatal(err)
	}
	a.WriteString("half a run")
	a.Abort()
	if b, _ := os.ReadFile(p); string(b) != "old" {
		t.Errorf("after Abort: %q", b)
	}
	a, _ = createAtomic(p)
	a.WriteString("new")
	if err := a.Commit(); err != nil {
		t.Fatal(err)
	}
	a.Abort() // after Commit: nothing to drop
	if b, _ := os.ReadFile(p); string(b) != "new" {
		t.Errorf("after Commit: %q", b)
	}
	if m, _ := filepath.Glob(filepath.Join(dir, ".*tmp")); len(m) != 0 {
		t.Errorf("temporary files left: %v", m)
	}
	if fi, _ := os.Stat(p); fi.Mode().Perm() != 0o644 {
		t.Errorf("mode %v", fi.Mode())
	}
}

// The rejects file of an earlier run, written inside the input folder, is
// left out of the inputs with a note (it was read back as input); named as
// an input itself, it is refused.
func TestRejectsInsideInputFolder(t *testing.T) {
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "a.csv"), []byte("time,tail,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph\n"+
		"2026-03-01T10:00:00Z,DD101,65000,35000,0.78,-54.3,2380\n2026-03-01T11:00:00Z,DD101,65000,35000,1.78,-54.3,2380\n"), 0o644)
	rj := filepath.Join(dir, "rejects.csv")
	for run := 1; run <= 2; run++ {
		code, _, errs := runArgs("report", "--rejects", rj, dir)
		b, _ := os.ReadFile(rj)
		if code != 0 || strings.Count(string(b), "\n") != 1 || !strings.Contains(string(b), "a.csv:3") {
			t.Fatalf("run %d: exit %d, rejects file %q\n%s", run, code, b, errs)
		}
		if run == 2 && !strings.Contains(errs, "leaving out "+rj) {
			t.Errorf("run 2 says nothing of the rejects file in the folder:\n%s", errs)
		}
	}
	if code, _, errs := runArgs("report", "--rejects", rj, rj, dir); code != 2 || !strings.Contains(errs, "would destroy it") {
		t.Errorf("rejects named as input: exit %d\n%s", code, errs)
	}
}
