package feed

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

func TestReadEvents(t *testing.T) {
	tests := []struct {
		name, data, wantErr string
		events              int
	}{
		{"good", "time,tail,kind,note\n2026-03-01T05:00:00-05:00,DD101,wash,exterior\n", "", 1},
		// A quoting error in the first record used to panic (FieldPos before
		// the error check).
		{"quoting error first", `"0`, "e.csv:1: row:", 0},
		{"no header", "# only a comment\n", "no header line", 0},
		{"missing kind", "time,tail,note\n", "missing required column kind", 0},
		{"bad time", "time,tail,kind\nyesterday,DD101,wash\n", "e.csv:2: time:", 0},
		{"escape in a tail", "time,tail,kind\n2026-03-01T05:00:00Z,DD\x1b[2J,wash\n", "e.csv:2: tail: holds a control character", 0},
		{"escape in a note, made plain", "time,tail,kind,note\n2026-03-01T05:00:00-05:00,DD101,wash\x07,\"seal\x1b[2J \xff\"\n", "", 1},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(t.TempDir(), "e.csv")
			if err := os.WriteFile(p, []byte(tc.data), 0o644); err != nil {
				t.Fatal(err)
			}
			evs, err := ReadEvents(p)
			if tc.wantErr != "" {
				if err == nil || !strings.Contains(err.Error(), tc.wantErr) {
					t.Fatalf("error %v, want %q", err, tc.wantErr)
				}
				return
			}
			if err != nil || len(evs["DD101"]) != tc.events {
				t.Fatalf("events %v, error %v", evs, err)
			}
			if got := evs["DD101"][0].Time; got.Location() != time.UTC || got.Hour() != 10 {
				t.Errorf("event time %v, want 10:00 UTC", got)
			}
			if e := evs["DD101"][0]; badText([]byte(e.Kind+e.Note)) != "" {
				t.Errorf("event text not plain: %q %q", e.Kind, e.Note)
			}
		})
	}
}

// FuzzReadEvents: any bytes give events or an error naming the file, never
// a panic; every event kept has a tail and a UTC time.
func FuzzReadEvents(f *testing.F) {
	for _, s := range []string{
		"time,tail,kind,note\n2026-03-01T05:00:00-05:00,DD101,wash,exterior\n",
		`"0`, "# c\n", "time,tail,kind\n\"a\"\"b,DD1,x\n", "time,tail,kind\n2026-03-01T05:00:00Z,,wash\n",
	} {
		f.Add([]byte(s))
	}
	dir := f.TempDir()
	f.Fuzz(func(t *testing.T, data []byte) {
		p := filepath.Join(dir, "e.csv")
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		evs, err := ReadEvents(p)
		if err != nil {
			if !strings.Contains(err.Error(), p) {
				t.Errorf("error %q does not name the file", err)
			}
			return
		}
		for tail, es := range evs {
			if tail == "" {
				t.Errorf("events kept without a tail: %v", es)
			}
			for _, e := range es {
				if e.Time.Location() != time.UTC {
					t.Errorf("%s: event time %v not UTC", tail, e.Time)
				}
			}
		}
	})
}
