package main

import (
	"os"
	"runtime/debug"

	"dragdeck/feed"
)

// The memory limit per byte of input (CSV or store): a report's live heap
// at its peak, the end of the reading, is about 0.42 bytes per byte (its
// points packed in about 29 bytes, of rows of about 80) and the collector
// needs about a quarter more to run seldom (10 M rows, before the fuel
// factor's 4 bytes a point: 5.6 s under 0.43, 5.3 s under 0.45, 5.15 s
// under 0.5; with them 4.6-5.2 s under 0.52, 11 s under 0.46, where the
// collector ran all the time); the dashboard keeps the points
// unpacked, with their details and where their rows are for the replay,
// about 1.2 bytes per byte once loaded (1 M rows: 140 MB resident, the
// fleet in 0.7 s; 10 M: 1.24 GB, 7.6 s). Measured on 1 M and 10 M
// snapshots.
const (
	reportBytesPerByte = 0.52
	dashBytesPerByte   = 1.6
)

// minLimit is the smallest memory limit: below it the collector paces
// itself by gcPercent, which a small input affords.
const minLimit = 128 << 20

// gcPercent is the collector's own pacing under the limit (GOGC): the
// heap may grow to four times what it holds before a collection, rather
// than twice, as a fleet's points grow steadily and the limit is the real
// bound (10 M rows: 4.9 s, were 5.0-5.2 s under GOGC 100).
const gcPercent = 300

// setMemoryLimit gives the garbage collector a soft memory limit in
// proportion to the input, perByte × its size (minLimit at least): a
// little above the live heap, so that a large input keeps the process near
// what it holds rather than at twice that (the collector's default
// headroom). The limit is soft: should the heap outgrow it, Go caps the
// collector's share of the CPU and goes over, so a larger fleet is slower,
// never refused. GOMEMLIMIT, when set, is the user's and is left alone,
// and so is GOGC. The function it returns puts back what was set before
// (for the next command of a test).
func setMemoryLimit(in *input, perByte float64) (restore func()) {
	if os.Getenv("GOMEMLIMIT") != "" {
		return func() {}
	}
	pace := os.Getenv("GOGC") == "" // else the user's, left alone
	percent := 0
	if pace {
		percent = debug.SetGCPercent(gcPercent)
	}
	size := feed.TotalSize(in.files)
	if in.store != nil {
		if fi, err := os.Stat(in.store.Path()); err == nil {
			size = fi.Size()
		}
	}
	limit := debug.SetMemoryLimit(max(minLimit, int64(perByte*float64(size))))
	return func() {
		debug.SetMemoryLimit(limit)
		if pace {
			debug.SetGCPercent(percent)
		}
	}
}
