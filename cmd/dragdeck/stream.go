package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"os"
	"time"

	"github.com/charmbracelet/x/term"

	"dragdeck/feed"
	"dragdeck/model"
)

// snapshotLine is one analysed snapshot as a JSON Lines object: time, tail,
// flight and the fields of 'point --json'.
type snapshotLine struct {
	Time   string `json:"time"`
	Tail   string `json:"tail"`
	Flight string `json:"flight"`
	pointJSON
}

// snapshotWriter writes analysed snapshots as JSON Lines, or as one readable
// line each when the output is a terminal.
type snapshotWriter struct {
	w    io.Writer
	r    *model.Roster
	json bool
	enc  *json.Encoder
}

func newSnapshotWriter(w io.Writer, r *model.Roster) *snapshotWriter {
	sw := &snapshotWriter{w: w, r: r, json: !isTerminal(w)}
	sw.enc = json.NewEncoder(w)
	if !sw.json {
		fmt.Fprintf(w, "%s\n%s\n", r.Label(), caution)
	}
	return sw
}

// write analyses r with the type in force for its tail (readers reject the
// tails that have none) and writes it.
func (sw *snapshotWriter) write(r feed.Record) error {
	p, snap, _, _ := sw.r.Analyze(r.Tail, r.Time, r.Snap)
	r.Snap = snap
	if sw.json {
		return sw.enc.Encode(snapshotLine{Time: r.Time.Format(time.RFC3339), Tail: r.Tail, Flight: r.Flight, pointJSON: newPointJSON(p)})
	}
	_, err := fmt.Fprintf(sw.w, "%s  %-6s %-8s %6.0f ft  M%.3f  %5.1f t  bank %3.0f°  CL %.3f  excess %+6.1f counts (%+5.1f %%)  fuel %5.0f kg/h (%+5.1f %%)\n",
		r.Time.UTC().Format("2006-01-02 15:04Z"), r.Tail, r.Flight, r.Snap.Altitude/model.Foot, r.Snap.Mach,
		r.Snap.Weight/1000, r.Snap.Bank*180/math.Pi, p.CL, p.ExcessCounts, p.DragDevPct, r.Snap.FuelFlow*model.Hour, p.FuelFlowDevPct)
	return err
}

// isTerminal reports whether w is a terminal. A character device is not
// enough: /dev/null is one too, and the dashboard cannot run on it. The
// test asks the terminal driver (charmbracelet/x/term, an ioctl).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	return ok && term.IsTerminal(f.Fd())
}

// printReject writes a rejected row on stderr.
func printReject(w io.Writer) func(*feed.RowError) {
	return func(r *feed.RowError) { fmt.Fprintf(w, "dragdeck: rejected %v\n", r) }
}
