package main

import (
	"bytes"
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/model"
)

// listFlag is a repeatable string flag.
type listFlag []string

func (l *listFlag) String() string { return strings.Join(*l, ",") }

func (l *listFlag) Set(v string) error {
	for _, s := range strings.Split(v, ",") {
		if s = strings.TrimSpace(s); s != "" {
			*l = append(*l, s)
		}
	}
	return nil
}

// parseDay reads YYYY-MM-DD or an RFC 3339 time; end moves a bare date to
// the end of that day.
func parseDay(s string, end bool) (time.Time, error) {
	if t, err := time.Parse(time.RFC3339, s); err == nil {
		return t, nil
	}
	t, err := time.Parse(time.DateOnly, s)
	if err != nil {
		return t, fmt.Errorf("%q is not a date like 2026-03-01", s)
	}
	if end {
		t = t.Add(24*time.Hour - time.Nanosecond)
	}
	return t, nil
}

func runFit(e *env, args []string) error {
	fs := newFlagSet("fit", "dragdeck fit [--type FILE | --fleet FILE] [--tail ID]... [--from DATE] [--to DATE] PATH... | --store FILE > fitted.toml",
		`Fits a baseline drag polar CD = CD0 + k CL^2 by least squares to the measured
drag of the chosen tails and dates (the type's wave drag is removed first, and
points beyond the usual limits of bank, vertical speed, acceleration and
deviation are left out). Writes a type file: the --type file with the fitted
cd0 and oswald (from k = 1/(pi e AR)), the fit's standard errors, residual
spread and CL^2 span in comments. Refuses when the points do not span enough
CL. Choose tails and dates known to be clean (after a wash, before damage).`,
		"dragdeck fit --tail DD104 --tail DD108 --from 2026-01-01 fleet/snapshots/ > dd200-fitted.toml")
	types := fs.typeFlags()
	var tails listFlag
	fs.Var(&tails, "tail", "a tail to include (repeat, or separate with commas); default all")
	fs.argNames["tail"] = "ID"
	from := fs.str("from", "DATE", "", "first day (YYYY-MM-DD)")
	to := fs.str("to", "DATE", "", "last day (YYYY-MM-DD)")
	storePath := fs.storeFlag()
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	var t0, t1 time.Time
	var err error
	if *from != "" {
		if t0, err = parseDay(*from, false); err != nil {
			return usageErrorf("--from: %v", err)
		}
	}
	if *to != "" {
		if t1, err = parseDay(*to, true); err != nil {
			return usageErrorf("--to: %v", err)
		}
	}
	in, err := openInput(e.stderr, fs, types, *storePath, "")
	if err != nil {
		return err
	}
	defer in.close()
	want := map[string]bool{}
	for _, tl := range tails {
		want[tl] = true
	}
	// The pipeline reads and analyses the chosen snapshots; the polar
	// points are its usable ones (model.PolarPoints), as on the Tail screen.
	c := model.DefaultTrendConfig()
	pin := in.pipelineInput(c)
	pin.Events = nil // a fit takes the snapshots as they are
	pin.Filter = func(r feed.Record) bool {
		return (len(want) == 0 || want[r.Tail]) && (t0.IsZero() || !r.Time.Before(t0)) && (t1.IsZero() || !r.Time.After(t1))
	}
	r := pipeline.Run(pin)
	if err := sourceFailed(r); err != nil {
		return err
	}
	if failed := r.Failed(); len(failed) > 0 {
		return usageErrorf("%v", failed[0].Err)
	}
	var pts []model.PolarPoint
	seen := map[string]bool{}
	excluded := 0
	names := make([]string, 0, len(r.Points))
	for tail := range r.Points {
		names = append(names, tail)
	}
	sort.Strings(names) // the sums of the fit in one order: the same digits every run
	for _, tail := range names {
		usable := r.PolarPoints(tail, false)
		excluded += len(r.Points[tail]) - len(usable)
		if len(usable) > 0 {
			seen[tail] = true
		}
		pts = append(pts, usable...)
	}
	for tl := range want {
		if !seen[tl] {
			fmt.Fprintf(e.stderr, "dragdeck fit: no usable snapshots of tail %s in the chosen dates\n", tl)
		}
	}
	t, err := fitType(r)
	if err != nil {
		return err
	}
	f, err := model.FitPolar(pts)
	if err != nil {
		return usageErrorf("cannot fit: %v", err)
	}
	fitted := *t
	fitted.Name = t.Name + " (fitted)"
	fitted.CD0 = f.CD0
	fitted.Oswald = f.Oswald(t)
	if err := fitted.Validate(); err != nil {
		return usageErrorf("the fitted polar is not a usable type (%v): check the tails and dates", err)
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, "# Drag polar fitted by 'dragdeck fit' to %d snapshots of %d tail(s)", f.N, len(seen))
	if *from != "" || *to != "" {
		fmt.Fprintf(&b, ", %s … %s", orDash(*from), orDash(*to))
	}
	fmt.Fprintf(&b, ".\n# CD0 = %.6f ± %.6f (1 SE); k = %.5f ± %.5f, so oswald = %.4f ± %.4f\n",
		f.CD0, f.SECD0, f.K, f.SEK, fitted.Oswald, fitted.Oswald*f.SEK/f.K)
	fmt.Fprintf(&b, "# residual spread %.6f (%.1f drag counts); CL² spans %.3f … %.3f\n",
		f.ResidualSD, f.ResidualSD/model.DragCount, f.CL2Min, f.CL2Max)
	fmt.Fprintf(&b, "# baseline of %s: CD0 %.6f, k %.5f. Engineering monitoring aid, not approved performance data.\n\n",
		t.Name, t.CD0, t.K())
	b.Write(feed.FormatType(&fitted))
	e.stdout.Write(b.Bytes())
	fmt.Fprintf(e.stderr, "dragdeck fit: CD0 %.6f ± %.6f, k %.5f ± %.5f from %d points (%d left out); residual %.1f counts\n",
		f.CD0, f.SECD0, f.K, f.SEK, f.N, excluded, f.ResidualSD/model.DragCount)
	if math.Abs(f.CD0-t.CD0) > 3*f.SECD0 {
		fmt.Fprintf(e.stderr, "dragdeck fit: note: CD0 differs from the --type baseline by %+.1f counts\n", (f.CD0-t.CD0)/model.DragCount)
	}
	return nil
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// fitType returns the one type that the chosen snapshots fly: a fit is of
// one type at a time, so snapshots of several types (with --fleet: tails of
// different types, or a retrofit inside the dates) are refused, naming them.
func fitType(r *pipeline.Result) (*model.Type, error) {
	tails := map[string][]string{} // the roster's type name -> tails
	var only *model.Type
	for tail, pts := range r.Points {
		seen := map[string]bool{}
		for _, p := range pts {
			e, t, _ := r.Roster.At(tail, p.At())
			if t == nil || seen[e.Type] {
				continue
			}
			seen[e.Type] = true
			only = t
			tails[e.Type] = append(tails[e.Type], tail)
		}
	}
	if len(tails) <= 1 {
		if only == nil {
			only = r.Type
		}
		if only == nil {
			return nil, usageErrorf("cannot fit: no snapshots chosen")
		}
		return only, nil
	}
	names := make([]string, 0, len(tails))
	for n, ts := range tails {
		sort.Strings(ts)
		names = append(names, fmt.Sprintf("%s: %s", n, strings.Join(ts, " ")))
	}
	sort.Strings(names)
	return nil, usageErrorf("the chosen snapshots fly %d types (%s); fit one type at a time: choose its tails with --tail and, around a retrofit, the dates with --from and --to",
		len(tails), strings.Join(names, "; "))
}
