package main

import (
	"math"
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"
)

// The soft memory limit is perByte × the input's bytes, 128 MiB at
// least, and a GOMEMLIMIT of the user's is left as it is.
func TestSetMemoryLimit(t *testing.T) {
	defer debug.SetMemoryLimit(math.MaxInt64)
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
			setMemoryLimit(&input{files: []string{c.path}}, c.perByte)
			if got := debug.SetMemoryLimit(-1); got != c.want {
				t.Errorf("limit %d MiB, want %d MiB", got>>20, c.want>>20)
			}
		})
	}
}
