package main

import (
	"math"
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"
)

// The soft memory limit is 48 MiB plus perByte × the input's bytes, and a
// GOMEMLIMIT of the user's is left as it is.
func TestSetMemoryLimit(t *testing.T) {
	defer debug.SetMemoryLimit(math.MaxInt64)
	path := filepath.Join(t.TempDir(), "s.csv")
	if err := os.WriteFile(path, make([]byte, 10<<20), 0o644); err != nil {
		t.Fatal(err)
	}
	in := &input{files: []string{path}}
	cases := []struct {
		name    string
		env     string
		perByte float64
		want    int64
	}{
		{"report", "", reportBytesPerByte, 48<<20 + 10<<20},
		{"dashboard", "", dashBytesPerByte, 48<<20 + 16<<20},
		{"the user's", "300MiB", reportBytesPerByte, 123 << 20}, // as set before: untouched
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Setenv("GOMEMLIMIT", c.env)
			if c.env == "" {
				os.Unsetenv("GOMEMLIMIT")
			}
			debug.SetMemoryLimit(123 << 20)
			setMemoryLimit(in, c.perByte)
			if got := debug.SetMemoryLimit(-1); got != c.want {
				t.Errorf("limit %d MiB, want %d MiB", got>>20, c.want>>20)
			}
		})
	}
}
