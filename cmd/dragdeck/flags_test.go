package main

import (
	"io"
	"strings"
	"testing"
	"time"
)

// The parser takes --name value, --name=value and -name, flags and PATHs in
// any order, and "--" before a PATH that starts with a dash; its errors name
// the flag and the kind of value it wants.
func TestFlagParser(t *testing.T) {
	tests := []struct {
		name  string
		args  []string
		paths []string
		err   string // substring; "" for no error
	}{
		{"flags then paths", []string{"--mach", "0.8", "a.csv", "b.csv"}, []string{"a.csv", "b.csv"}, ""},
		{"interspersed", []string{"a.csv", "--mach=0.8", "b.csv", "--json"}, []string{"a.csv", "b.csv"}, ""},
		{"one dash", []string{"-mach", "0.8"}, nil, ""},
		{"double dash ends flags", []string{"--", "--odd.csv"}, []string{"--odd.csv"}, ""},
		{"a lone dash is a path", []string{"-"}, []string{"-"}, ""},
		{"not a number", []string{"--mach", "fast"}, nil, `--mach: "fast" is not a number`},
		{"not a whole number", []string{"--tails", "2.5"}, nil, `--tails: "2.5" is not a whole number`},
		{"not a boolean", []string{"--json=maybe"}, nil, `--json: "maybe" is not true or false`},
		{"not a duration", []string{"--wait", "soon"}, nil, `--wait: "soon" is not a duration`},
		// right form, too big: not "not a number" (it said so of 9999999h)
		{"duration too long", []string{"--wait", "9999999h"}, nil, `--wait: "9999999h" is too long`},
		{"number out of range", []string{"--mach", "1e999"}, nil, `--mach: "1e999" is out of range`},
		{"whole number out of range", []string{"--tails", "99999999999999999999"}, nil, `--tails: "99999999999999999999" is out of range`},
		{"300 digits cut in the message", []string{"--mach", strings.Repeat("9", 300) + "x"}, nil, `"…`},
		{"value missing", []string{"--mach"}, nil, "--mach: needs a value"},
		{"unknown", []string{"--wing", "3"}, nil, "not defined: --wing"},
		{"required missing", []string{}, nil, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			fs := newFlagSet("x", "dragdeck x", "", "")
			mach := fs.float("mach", "M", 0.78, false, "Mach")
			fs.Int("tails", 1, "tails")
			fs.jsonFlag()
			fs.Duration("wait", time.Second, "wait")
			err := fs.parse(tc.args, io.Discard)
			if tc.err != "" {
				if err == nil || !strings.Contains(err.Error(), tc.err) {
					t.Fatalf("error %v, want %q", err, tc.err)
				}
				return
			}
			if err != nil && err != errPositional {
				t.Fatal(err)
			}
			if strings.Join(fs.Args(), " ") != strings.Join(tc.paths, " ") || fs.NArg() != len(tc.paths) {
				t.Errorf("paths %q, want %q", fs.Args(), tc.paths)
			}
			if strings.Contains(strings.Join(tc.args, " "), "0.8") && *mach != 0.8 {
				t.Errorf("mach %g", *mach)
			}
		})
	}
	fs := newFlagSet("x", "dragdeck x", "", "")
	fs.float("mach", "M", 0, true, "Mach")
	if err := fs.parse(nil, io.Discard); err == nil || !strings.Contains(err.Error(), "--mach: missing") {
		t.Errorf("required: %v", err)
	}
	if err := fs.parse([]string{"--help"}, io.Discard); err != errHelp {
		t.Errorf("--help: %v", err)
	}
}
