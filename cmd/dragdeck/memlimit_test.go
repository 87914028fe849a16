package main

import (
	"math"
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"
)

// The soft memory limit is perByte × the input's bytes, 128 MiB at
// least, with GOGC 300 under it; a GOMEMLIMIT of the user's is left as it
// is, and the function returned puts back what was set before.
func TestSetMemoryLimit(t *testing.T) {
	defer debug.SetMemoryLimit(math.MaxInt64)
	defer debug.SetGCPercent(100)
	dir := t.TempDir()
	small, large := filepath.Join(dir, "s.csv"), filepath.Join(dir, "l.csv")
	for path, size := range map[string]int64{small: 10 << 20, large: 1 << 30} {
		f, err := os.Create(path)
		if err == nil {
			err = f.Truncate(size) // sparse: no gigabyte written
		}
		if err == nil {
			err = f.Close()
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	gib := float64(1 << 30)
	cases := []struct {
		name    string
		path    string
		env     string
		perByte float64
		want    int64
	}{
		{"report, small input: the collector's own pacing", small, "", reportBytesPerByte, 128 << 20},
		{"report, 1 GiB", large, "", reportBytesPerByte, int64(reportBytesPerByte * gib)},
		{"dashboard, 1 GiB", large, "", dashBytesPerByte, int64(dashBytesPerByte * gib)},
		{"the user's", large, "300MiB", reportBytesPerByte, 123 << 20}, // as set before: untouched
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Setenv("GOMEMLIMIT", c.env)
			if c.env == "" {
				os.Unsetenv("GOMEMLIMIT")
			}
			debug.SetMemoryLimit(123 << 20)
			debug.SetGCPercent(100)
			restore := setMemoryLimit(&input{files: []string{c.path}}, c.perByte)
			if got := debug.SetMemoryLimit(-1); got != c.want {
				t.Errorf("limit %d MiB, want %d MiB", got>>20, c.want>>20)
			}
			wantPercent := gcPercent
			if c.env != "" || os.Getenv("GOGC") != "" {
				wantPercent = 100 // the user's limit: the pacing left as it is
			}
			if got := debug.SetGCPercent(-1); got != wantPercent {
				t.Errorf("GOGC %d, want %d", got, wantPercent)
			}
			debug.SetGCPercent(wantPercent)
			restore()
			if limit, percent := debug.SetMemoryLimit(-1), debug.SetGCPercent(100); limit != 123<<20 || percent != 100 {
				t.Errorf("restored: limit %d MiB, GOGC %d; want 123 MiB, 100", limit>>20, percent)
			}
		})
	}
}
