package main

import (
	"fmt"
	"math"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
	"dragdeck/tui"
)

func runReplay(e *env, args []string) error {
	fs := newFlagSet("replay", "dragdeck replay [--type FILE | --fleet FILE] [--speed X] [--tail ID] [--flight ID] [--max-wait D] PATH... | --store FILE",
		`Plays the snapshots of one or more files (or folders of *.csv) in time order,
paced at X times real time, and analyses each one. --speed 0 plays without
waiting. Long gaps (between flights, overnight) are shortened to --max-wait.
When stdout is not a terminal, each snapshot is one JSON object per line: time,
tail, flight and the fields of 'dragdeck point --json'. Rejected rows go to
stderr.`,
		"dragdeck replay --tail DD101 --speed 0 fleet/snapshots/ | jq .excess_drag_counts")
	types := fs.typeFlags()
	speed := fs.float("speed", "X", 60, false, "times real time; 0 plays without waiting")
	tail := fs.str("tail", "ID", "", "only this tail")
	flight := fs.str("flight", "ID", "", "only this flight")
	maxWait := fs.Duration("max-wait", 5*time.Second, "longest wait between two snapshots")
	storePath := fs.storeFlag()
	fs.argNames["max-wait"] = "D"
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	if math.IsNaN(*speed) || math.IsInf(*speed, 0) || *speed < 0 {
		return usageErrorf("--speed: must be ≥ 0, got %g", *speed)
	}
	in, err := openInput(e.stderr, fs, types, *storePath, "")
	if err != nil {
		return err
	}
	defer in.close()
	ros := in.roster
	recs, st, err := in.replayRecords(e.stderr, feed.ReplayFilter{Tail: *tail, Flight: *flight}, printReject(e.stderr))
	if err != nil {
		return err
	}
	if len(recs) == 0 {
		fmt.Fprintf(e.stderr, "dragdeck replay: no snapshots to play (%d rows read, %d accepted, none matching --tail %q --flight %q)\n",
			st.Read, st.Accepted, *tail, *flight)
		return nil
	}
	if isTerminal(e.stdout) {
		return runDashboard(e, tui.New(e.ctx, nil, nil, tui.WithReplay(ros, model.DefaultTrendConfig(), recs, *speed)))
	}
	p := feed.NewPlayer(recs, *speed)
	p.MaxWait = *maxWait
	sw := newSnapshotWriter(e.stdout, ros)
	if err := p.Run(e.ctx, feed.RealClock{}, sw.write); err != nil && e.ctx.Err() == nil {
		return err
	}
	fmt.Fprintf(e.stderr, "dragdeck replay: %d snapshots played; %d rows read, %d rejected\n", p.Pos(), st.Read, st.Rejected)
	return nil
}

func runFollow(e *env, args []string) error {
	fs := newFlagSet("follow", "dragdeck follow [--type FILE | --fleet FILE] [--tail ID] FILE",
		`Watches a snapshot file that another system is still writing: reads the rows
already there, then each new row as soon as its line is complete. A truncated
file starts over, a replaced (rotated) file is reopened, a deleted file is
waited for; each such event is noted on stderr. When stdout is not a terminal,
each snapshot is one JSON object per line, as for replay. --tail keeps one
tail's rows. Stop with Ctrl-C.`,
		"dragdeck follow --tail DD101 /data/live/snapshots.csv")
	types := fs.typeFlags()
	tail := fs.str("tail", "ID", "", "only this tail")
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	if fs.NArg() != 1 {
		return usageErrorf("give exactly one FILE to follow (see 'dragdeck follow --help')")
	}
	ros, err := types.roster()
	if err != nil {
		return err
	}
	if isTerminal(e.stdout) {
		return runDashboard(e, tui.New(e.ctx, nil, nil, tui.WithLive(ros, model.DefaultTrendConfig(), fs.Arg(0), *tail)))
	}
	sw := newSnapshotWriter(e.stdout, ros)
	fl := &feed.Follower{Path: fs.Arg(0), CheckTail: feed.RosterCheck(ros),
		Notice: func(s string) { fmt.Fprintf(e.stderr, "dragdeck follow: %s\n", s) }}
	f := feed.ReplayFilter{Tail: *tail}
	emit := func(r feed.Record) error {
		if !f.Match(r) {
			return nil
		}
		return sw.write(r)
	}
	if err := fl.Run(e.ctx, emit, printReject(e.stderr)); err != nil {
		return usageErrorf("%v", err)
	}
	return nil
}
