package main

import (
	"os"
	"runtime/debug"

	"dragdeck/feed"
)

// The live heap of the pipeline per byte of input (CSV or store): its 64-byte
// points of 80-byte rows and their flights, at the end of the reading; more
// for the dashboard, which keeps them and the replay's row offsets.
// Measured on 1 M and 10 M snapshots.
const (
	reportBytesPerByte = 1.0
	dashBytesPerByte   = 1.6
)

// setMemoryLimit gives the garbage collector a soft memory limit in
// proportion to the input: 48 MiB + perByte × its size, a little above the
// live heap, so that the process stays near what it holds rather than at
// twice that (the collector's default headroom). The limit is soft: should
// the heap outgrow it, Go caps the collector's share of the CPU and goes
// over, so a larger fleet is slower, never refused. GOMEMLIMIT, when set,
// is the user's and is left alone.
func setMemoryLimit(in *input, perByte float64) {
	if os.Getenv("GOMEMLIMIT") != "" {
		return
	}
	size := feed.TotalSize(in.files)
	if in.store != nil {
		if fi, err := os.Stat(in.store.Path()); err == nil {
			size = fi.Size()
		}
	}
	debug.SetMemoryLimit(48<<20 + int64(perByte*float64(size)))
}
