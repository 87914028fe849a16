package main

import (
	"fmt"
	"io"
	"time"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
)

func runReview(e *env, args []string) error {
	fs := newFlagSet("review", "dragdeck review [--store FILE] [--mark] [--json] [trend flags]",
		`What changed in the fleet since the last review mark: the flags raised and
cleared and the new steps, for the airframe and the engine series; the work
items opened and closed; and for each event imported since, its effect: the
step matched to it and the fuel that step saves (negative) or costs a year.
A step found again within 14 days of its date at the last review is the
same step. --mark records this review, so that the next one starts from
here. Before the first mark everything counts as new. The trend flags are
those of 'dragdeck report' and should be the same from week to week.`,
		"dragdeck review --store fleet.db --mark")
	storePath := fs.str("store", "FILE", store.DefaultFile, "the store")
	mark := fs.Bool("mark", false, "record this review")
	asJSON := fs.Bool("json", false, "print JSON")
	types := fs.typeFlags()
	trend := trendFlags(fs)
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	if fs.NArg() > 0 {
		return usageErrorf("review reads the store; it takes no paths")
	}
	c, err := trend()
	if err != nil {
		return err
	}
	in, err := openInput(e.stderr, fs, types, *storePath, "")
	if err != nil {
		return err
	}
	defer in.close()
	r := pipeline.Run(in.pipelineInput(c))
	if err := sourceFailed(r); err != nil {
		return err
	}
	rv, err := newReview(in.store, r)
	if err != nil {
		return err
	}
	if *mark {
		m, err := in.store.MarkReview(r.ReviewState())
		if err != nil {
			return usageErrorf("--mark: %v", err)
		}
		fmt.Fprintf(e.stderr, "dragdeck review: review marked at %s\n", m.Time.Format(time.RFC3339))
	}
	if *asJSON {
		return writeJSON(e.stdout, rv)
	}
	writeReview(e.stdout, rv)
	return nil
}

// reviewJSON is review --json (stable names).
type reviewJSON struct {
	Since        *string          `json:"since"` // the last mark, null before the first
	FlagsRaised  []flagChangeJSON `json:"flags_raised"`
	FlagsCleared []flagChangeJSON `json:"flags_cleared"`
	StepsNew     []stepNewJSON    `json:"steps_new"`
	WorkOpened   []int64          `json:"work_opened"`
	WorkClosed   []int64          `json:"work_closed"`
	Events       []eventJSON      `json:"events"`
}

type flagChangeJSON struct {
	Tail   string `json:"tail"`
	Series string `json:"series"`
	Flag   string `json:"flag"`
}

type stepNewJSON struct {
	Tail    string   `json:"tail"`
	Series  string   `json:"series"`
	Date    string   `json:"date"`
	SizePct *float64 `json:"size_pct"`
}

type eventJSON struct {
	Tail   string `json:"tail"`
	Kind   string `json:"kind"`
	Date   string `json:"date"`
	Series string `json:"series"`
	// StepPct is the step matched to the event, null when none was (not
	// enough flights since, or no change); FuelKgPerYear what it costs a
	// year (negative: saves).
	StepPct       *float64 `json:"step_pct"`
	FuelKgPerYear *float64 `json:"fuel_kg_per_year"`
	FlightsSince  int      `json:"flights_since"`
}

// newReview compares the pipeline's result with the last mark.
func newReview(st *store.Store, r *pipeline.Result) (reviewJSON, error) {
	rv := reviewJSON{FlagsRaised: []flagChangeJSON{}, FlagsCleared: []flagChangeJSON{}, StepsNew: []stepNewJSON{}, Events: []eventJSON{}}
	last, err := st.LastMark()
	if err != nil {
		return rv, usageErrorf("--store: %v", err)
	}
	var since time.Time
	var prev *store.State
	if last != nil {
		since, prev = last.Time, &last.State
		s := since.Format(time.RFC3339)
		rv.Since = &s
	}
	ch := store.Compare(prev, r.ReviewState())
	for _, f := range ch.FlagsRaised {
		rv.FlagsRaised = append(rv.FlagsRaised, flagChangeJSON(f))
	}
	for _, f := range ch.FlagsCleared {
		rv.FlagsCleared = append(rv.FlagsCleared, flagChangeJSON(f))
	}
	for _, s := range ch.StepsNew {
		rv.StepsNew = append(rv.StepsNew, stepNewJSON{Tail: s.Tail, Series: s.Series, Date: s.Date.Format(time.DateOnly), SizePct: num(s.SizePct)})
	}
	items, err := st.Work()
	if err != nil {
		return rv, usageErrorf("--store: %v", err)
	}
	rv.WorkOpened, rv.WorkClosed = store.WorkSince(items, since)
	evs, err := st.EventsSince(since)
	if err != nil {
		return rv, usageErrorf("--store: %v", err)
	}
	for _, ev := range evs {
		eff := r.EffectOf(ev.Tail, ev.Event())
		j := eventJSON{Tail: ev.Tail, Kind: ev.Kind, Date: ev.Time.Format(time.DateOnly), Series: eff.Series, FlightsSince: eff.Flights}
		if eff.Found {
			j.StepPct, j.FuelKgPerYear = num(eff.Step.SizePct), num(eff.FuelKg)
		}
		rv.Events = append(rv.Events, j)
	}
	return rv, nil
}

// writeReview prints the review for a reader.
func writeReview(w io.Writer, rv reviewJSON) {
	if rv.Since == nil {
		fmt.Fprintln(w, "Review: no review marked yet; everything counts as new ('--mark' records one).")
	} else {
		fmt.Fprintf(w, "Review: changes since the mark of %s\n", *rv.Since)
	}
	section := func(title string, n int) bool {
		if n == 0 {
			fmt.Fprintf(w, "\n%s: none\n", title)
			return false
		}
		fmt.Fprintf(w, "\n%s (%d):\n", title, n)
		return true
	}
	if section("Flags raised", len(rv.FlagsRaised)) {
		for _, f := range rv.FlagsRaised {
			fmt.Fprintf(w, "  %-10s %-8s %s\n", f.Tail, f.Series, f.Flag)
		}
	}
	if section("Flags cleared", len(rv.FlagsCleared)) {
		for _, f := range rv.FlagsCleared {
			fmt.Fprintf(w, "  %-10s %-8s %s\n", f.Tail, f.Series, f.Flag)
		}
	}
	if section("New steps", len(rv.StepsNew)) {
		for _, s := range rv.StepsNew {
			fmt.Fprintf(w, "  %-10s %-8s %s  %s pp\n", s.Tail, s.Series, s.Date, signedPtr(s.SizePct, 2))
		}
	}
	fmt.Fprintf(w, "\nWork items opened: %s; closed or dismissed: %s\n", idList(rv.WorkOpened), idList(rv.WorkClosed))
	if section("Events", len(rv.Events)) {
		for _, ev := range rv.Events {
			effect := fmt.Sprintf("no step matched yet (%d flights since)", ev.FlightsSince)
			if ev.StepPct != nil {
				effect = fmt.Sprintf("step %s pp, %s t fuel a year", signedPtr(ev.StepPct, 2), signedPtr(scaled(ev.FuelKgPerYear, 1e-3), 1))
			}
			fmt.Fprintf(w, "  %-10s %s %-20s %s\n", ev.Tail, ev.Date, ev.Kind, effect)
		}
	}
	fmt.Fprintf(w, "\n%s\n", caution)
}

func idList(ids []int64) string {
	if len(ids) == 0 {
		return "none"
	}
	s := ""
	for i, id := range ids {
		if i > 0 {
			s += ", "
		}
		s += fmt.Sprintf("#%d", id)
	}
	return s
}

func signedPtr(v *float64, prec int) string {
	if v == nil {
		return "-"
	}
	return signed(*v, prec)
}

func scaled(v *float64, k float64) *float64 {
	if v == nil {
		return nil
	}
	x := *v * k
	return &x
}
