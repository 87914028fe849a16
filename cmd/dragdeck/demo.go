package main

import (
	"fmt"
	"math"
	"path/filepath"

	"dragdeck/feed"
	"dragdeck/feed/demo"
	"dragdeck/model"
)

func runDemo(e *env, args []string) error {
	fs := newFlagSet("demo", "dragdeck demo --out DIR [--tails N] [--days D] [--seed S] [--type FILE] [--clean] [--force]",
		`Writes the invented demo fleet into DIR: snapshots/fleet.csv (cruise
snapshots of every tail, with a few broken rows on purpose), fleet.toml (the
fleet file: each tail's type, use it with --fleet), types/ (one type file per
type), events.csv (repairs, washes, shop visits, engine changes), traces/
(per-minute records of a few whole flights, for replay), recordings/ (1 Hz
recordings of two whole flights, for extract) and truth.json (what
was injected per tail: drift, steps, offsets, engines, retrofits, expected
flags, and the broken rows). The data ends on a fixed date in the past
(2026-06-30) and runs back --days from it. The same seed gives the same bytes.
About 4 snapshots per tail per day: --tails 400 --days 730 gives about 1.1
million rows.

The fleet flies three invented types: the DD-200 twin (half the tails), its
wingtip-device variant DD-200W (a fifth, and one DD-200 retrofitted half-way)
and the DW-300 long-range twin (the rest). All three have thrust tables; three
tails in four record fan speed (n1_pct), the others are older recorders.
--type FILE flies every tail on that one type instead: weights scale with its
wing area and buffet limit, speeds with its maximum-range Mach. The recorded
snapshots carry the errors of real recorders (weight per flight 0.3 %, Mach
0.001, SAT 0.3 K, fuel flow 0.4 % per flight, the seasonal temperature);
truth.json lists them, and --clean leaves them all out.

DIR must be new or empty: a folder that holds files is refused, unless
--force, which replaces the files of an earlier demo there (stale traces and
type files included) and keeps every other file. Nothing is written through
a symbolic link.`,
		"dragdeck demo --out /tmp/fleet --tails 24 --days 730 --seed 1")
	typ := fs.str("type", "FILE", "", "fly every tail on this one type (TOML); default: the built-in mixed fleet of three types")
	out := fs.str("out", "DIR", "", "folder to write into, created if needed (required)")
	tails := fs.Int("tails", 24, "number of aircraft")
	days := fs.Int("days", 730, "days of data")
	seed := fs.Uint64("seed", 1, "random seed")
	clean := fs.Bool("clean", false, "leave out the sensor effects (weight, Mach, SAT and fuel-flow errors, seasons)")
	force := fs.Bool("force", false, "write into a folder that holds files: an earlier demo's files are replaced, others kept")
	fs.argNames["tails"], fs.argNames["days"], fs.argNames["seed"] = "N", "D", "S"
	fs.required = append(fs.required, "out")
	if err := fs.noArgs(fs.parse(args, e.stdout)); err != nil {
		return helpOK(err)
	}
	switch {
	case *out == "":
		return usageErrorf("--out: give a folder")
	case *tails < 1 || *tails > 10000:
		return usageErrorf("--tails: must be 1 … 10000, got %d", *tails)
	case *days < 1 || *days > 3650:
		return usageErrorf("--days: must be 1 … 3650, got %d", *days)
	case *seed == 0:
		return usageErrorf("--seed: must be > 0")
	}
	var t *model.Type // nil: the built-in mixed fleet
	if *typ != "" {
		var err error
		if t, err = loadType(*typ); err != nil {
			return err
		}
	}
	truth, err := demo.Write(*out, demo.Config{Tails: *tails, Days: *days, Seed: *seed, Type: t, Clean: *clean, Overwrite: *force})
	if err != nil {
		return usageErrorf("--out: %v", err)
	}
	flagged := 0
	for _, t := range truth.Tails {
		if len(t.ExpectedFlags) > 0 {
			flagged++
		}
	}
	fmt.Fprintf(e.stdout, "wrote the demo fleet of %s to %s\n", demo.Airline, *out)
	fmt.Fprintf(e.stdout, "  %s  %d rows (%d broken on purpose), %d tails, %s … %s\n",
		filepath.Join(*out, demo.SnapshotFile), truth.Rows, truth.Rejected, len(truth.Tails), truth.Start, truth.End)
	fmt.Fprintf(e.stdout, "  %s  %d events\n", filepath.Join(*out, demo.EventsFile), len(truth.Events))
	fmt.Fprintf(e.stdout, "  %s  %d whole-flight traces\n", filepath.Join(*out, demo.TraceDir), len(truth.Traces))
	fmt.Fprintf(e.stdout, "  %s  %d 1 Hz recordings of whole flights (for extract)\n", filepath.Join(*out, demo.RecordingDir), len(truth.Recordings))
	fmt.Fprintf(e.stdout, "  %s  the truth: %d tails should be flagged (fleet median %.2f %%)\n",
		filepath.Join(*out, demo.TruthFile), flagged, math.Round(truth.FleetMedianPct*100)/100)
	for _, ty := range truth.Types {
		fmt.Fprintf(e.stdout, "  %s  %s, %d tails\n", filepath.Join(*out, ty.File), ty.TypeName, ty.Tails)
	}
	fmt.Fprintf(e.stdout, "  %s  the fleet file (the type of each tail; use it with --fleet)\n", filepath.Join(*out, demo.FleetFile))
	fmt.Fprintf(e.stdout, "  %s  dragdeck's own columns as a layout file (an example to copy for --layout)\n", filepath.Join(*out, feed.LayoutFile))
	fmt.Fprintln(e.stdout, "All of it is invented data.")
	return nil
}
