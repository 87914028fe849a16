package main

import (
	"errors"
	"fmt"
	"math"
	"os"
	"os/user"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

const factorUsage = "dragdeck factor [--store FILE] propose | list [--period P] [--status S] | approve ID...|all [--note T] | " +
	"reject ID...|all --note T | apply ID...|all [--effective DATE] | history [TAIL] | set TAIL PCT --note T | " +
	"export --out FILE [--format csv|json] | backtest [PATH...]"

// factorCaution stands beside every proposal and export.
const factorCaution = model.FactorCaution

func runFactor(e *env, args []string) error {
	fs := newFlagSet("factor", factorUsage,
		`The fuel factor: the percentage flight planning adds to the book fuel flow of
each tail, set month by month from what the tail really burns. The monitored
factor is the median per-flight fuel-flow deviation (measured against the
fuel the baseline polar and the engine model need: the airframe's drag and
the engine's consumption together) over the trailing --factor-window-days,
with a 95 % rank interval; the window starts after a step of either series
or an event inside it, and no factor rests on fewer than --factor-min-flights
flights. The policy (the fleet file's [fuel_factor] table, or the --factor-*
flags) rounds it, adds the type's basic factor, and proposes a change only
when it differs from the factor in use by the dead band in each of the last
--factor-periods months; a factor outside --factor-min-pct … --factor-max-pct
needs a note to approve, a change beyond --factor-max-change-pct is marked
for a second look.
  propose        file this month's proposals from the store's snapshots
  list           the proposals (--period 2026-11, --status proposed, ...)
  approve IDS    approve proposals (all: every one still proposed)
  reject IDS     reject, with --note why
  apply IDS      put approved proposals in use from --effective (default
                 now), writing each tail's history (all: every approved)
  history [TAIL] the factor in use over time, who set it and why
  set TAIL PCT   set a factor by hand, with --note why
  export         the factors in use for the planning system, --out FILE
                 (CSV or JSON, written whole or not at all)
  backtest       plan every flight of the history with no factor, one fleet
                 factor and per-tail factors, against the fuel burnt
                 (files or --store)
Each move is one transaction; a move the states do not allow is refused
(proposed → approved → applied, or rejected from proposed or approved).`,
		`dragdeck factor --store fleet.db propose && dragdeck factor --store fleet.db approve all
  dragdeck factor --store fleet.db apply all --effective 2026-12-01
  dragdeck factor --store fleet.db export --out factors.csv`)
	types := fs.typeFlags()
	events := fs.str("events", "FILE", "", "propose, backtest: events file (time,tail,kind,note) besides the store's")
	storePath := fs.str("store", "FILE", store.DefaultFile, "the store (backtest: read from it when no PATH is given)")
	asJSON := fs.jsonFlag()
	period := fs.str("period", "P", "", "list: the month, e.g. 2026-11")
	status := fs.str("status", "S", "", "list: proposed, approved, applied or rejected")
	note := fs.str("note", "TEXT", "", "approve, reject, set: why")
	by := fs.str("by", "NAME", defaultUser(), "who makes the move, for the history")
	effective := fs.str("effective", "DATE", "", "apply, set: the date the factor is in use from (default now), e.g. 2026-12-01")
	out := fs.str("out", "FILE", "", "export: the file to write")
	format := fs.str("format", "F", "csv", "export: csv or json")
	trend := trendFlags(fs)
	policyOf := factorFlags(fs)
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	if fs.NArg() == 0 {
		return usageErrorf("give propose, list, approve, reject, apply, history, set, export or backtest (see 'dragdeck factor --help')")
	}
	verb, rest := fs.Arg(0), fs.Args()[1:]
	only := map[string]string{"period": "list", "status": "list", "out": "export", "format": "export", "events": "propose backtest",
		"effective": "apply set", "note": "approve reject set"}
	for name, verbs := range only {
		if fs.isSet(name) && !strings.Contains(" "+verbs+" ", " "+verb+" ") {
			return usageErrorf("--%s goes with %s, not %s", name, strings.ReplaceAll(verbs, " ", " or "), verb)
		}
	}
	c, err := trend()
	if err != nil {
		return err
	}
	eff := time.Now().UTC()
	if *effective != "" {
		if eff, err = time.Parse(time.DateOnly, *effective); err != nil {
			return usageErrorf("--effective: %q is not a date such as 2026-12-01", *effective)
		}
	}
	who := strings.TrimSpace(*by)
	if who == "" {
		return usageErrorf("--by: give a name (who makes the move)")
	}
	switch verb {
	case "backtest":
		return factorBacktest(e, fs, types, c, policyOf, *storePath, *events, rest, *asJSON)
	case "propose", "list", "approve", "reject", "apply", "history", "set", "export":
	default:
		return usageErrorf("%q: give propose, list, approve, reject, apply, history, set, export or backtest (see 'dragdeck factor --help')", verb)
	}
	st, err := store.Open(*storePath, false)
	if err != nil {
		return usageErrorf("--store: %v", err)
	}
	defer st.Close()
	switch verb {
	case "propose":
		if len(rest) > 0 {
			return usageErrorf("propose takes no arguments (it reads the store)")
		}
		r, err := factorRun(e, fs, types, c, policyOf, *storePath, *events)
		if err != nil {
			return err
		}
		return factorPropose(e, st, r, who, *asJSON)
	case "list":
		if len(rest) > 0 {
			return usageErrorf("list takes no arguments")
		}
		if *period != "" {
			if _, err := model.PeriodEnd(*period); err != nil {
				return usageErrorf("--period: %v", err)
			}
		}
		if *status != "" && !containsStr(store.FactorStatuses, *status) {
			return usageErrorf("--status: %q is not one of %s", *status, strings.Join(store.FactorStatuses, ", "))
		}
		ps, err := st.Proposals(*period, *status)
		if err != nil {
			return err
		}
		if *asJSON {
			return writeJSON(e.stdout, proposalsJSON(ps))
		}
		writeProposals(e, ps)
		return nil
	case "approve", "reject":
		to := store.FactorApproved
		if verb == "reject" {
			to = store.FactorRejected
		}
		ids, err := proposalIDs(st, rest, verb, store.FactorProposed)
		if err != nil {
			return err
		}
		if err := st.MoveProposals(ids, to, who, *note); err != nil {
			return usageErrorf("%s: %v (%snothing was moved)", verb, err, noteHint(err))
		}
		return factorMoved(e, ids, to, *asJSON)
	case "apply":
		ids, err := proposalIDs(st, rest, verb, store.FactorApproved)
		if err != nil {
			return err
		}
		if err := st.ApplyProposals(ids, who, eff); err != nil {
			return usageErrorf("apply: %v (nothing was applied)", err)
		}
		return factorMoved(e, ids, store.FactorApplied, *asJSON)
	case "history":
		if len(rest) > 1 {
			return usageErrorf("history takes at most one TAIL")
		}
		tail := ""
		if len(rest) == 1 {
			tail = rest[0]
		}
		h, err := st.FactorHistory(tail)
		if err != nil {
			return err
		}
		if *asJSON {
			return writeJSON(e.stdout, historyJSON(h))
		}
		writeFactorHistory(e, h, tail)
		return nil
	case "set":
		if len(rest) != 2 {
			return usageErrorf("set takes TAIL and PCT (the factor, %%, e.g. 1.5)")
		}
		pct, err := strconv.ParseFloat(rest[1], 64)
		if err != nil {
			return usageErrorf("set: %q is not a factor in %% such as 1.5", rest[1])
		}
		id, err := st.SetFactor(rest[0], pct, eff, who, *note)
		if err != nil {
			return usageErrorf("set: %v (%snothing was set)", err, noteHint(err))
		}
		if *asJSON {
			return writeJSON(e.stdout, map[string]any{"id": id, "tail": rest[0], "factor_pct": pct, "effective": eff.Format(time.RFC3339)})
		}
		fmt.Fprintf(e.stdout, "%s: factor %+.1f %% in use from %s (history entry %d)\n", rest[0], pct, eff.Format(time.DateOnly), id)
		return nil
	default: // export
		if len(rest) > 0 {
			return usageErrorf("export takes no arguments (--out FILE)")
		}
		if *out == "" {
			return usageErrorf("export: give --out FILE")
		}
		if *format != "csv" && *format != "json" {
			return usageErrorf("--format: %q is not csv or json", *format)
		}
		if sameFile(*out, *storePath) {
			return usageErrorf("--out: %s is the store; writing it would destroy it", *out)
		}
		r, err := factorRun(e, fs, types, c, policyOf, *storePath, "")
		if err != nil {
			return err
		}
		h, err := st.FactorHistory("")
		if err != nil {
			return err
		}
		rows := exportRows(store.InUse(h, st.Now()), r)
		if err := writeExport(*out, *format, rows, st.Now().UTC()); err != nil {
			return usageErrorf("--out: %v", err)
		}
		fmt.Fprintf(e.stderr, "dragdeck factor: %d factor(s) in use written to %s\n", len(rows), *out)
		if *format == "csv" { // the JSON holds the caution; a CSV has no place for it
			fmt.Fprintf(e.stderr, "dragdeck factor: %s\n", oneLine(factorCaution))
		}
		if n := len(r.Fleet.Tails) - len(rows); n > 0 {
			fmt.Fprintf(e.stderr, "dragdeck factor: %d tail(s) with data have no factor in use and are not in the file ('dragdeck factor set' or apply a proposal)\n", n)
		}
		return nil
	}
}

// defaultUser is who makes a move when --by is not given.
func defaultUser() string {
	for _, v := range []string{"USER", "LOGNAME", "USERNAME"} {
		if u := strings.TrimSpace(os.Getenv(v)); u != "" {
			return u
		}
	}
	if u, err := user.Current(); err == nil && u.Username != "" {
		return u.Username
	}
	return "unknown"
}

func containsStr(list []string, s string) bool {
	for _, v := range list {
		if v == s {
			return true
		}
	}
	return false
}

// factorRun runs the pipeline on the store (or, for backtest, the PATHs)
// with the policy and the factors in use, keeping the points when keep is
// set.
func factorRun(e *env, fs *flagSet, types typeChoice, c model.TrendConfig, policyOf func(*model.Roster) (*model.FactorPolicy, error), storePath, events string) (*pipeline.Result, error) {
	return factorPipeline(e, fs, types, c, policyOf, storePath, events, nil, false)
}

// factorPipeline runs the pipeline for a verb: on the paths given, or
// (none) on the store; with the points when keep is set.
func factorPipeline(e *env, fs *flagSet, types typeChoice, c model.TrendConfig, policyOf func(*model.Roster) (*model.FactorPolicy, error),
	storePath, events string, paths []string, keep bool) (*pipeline.Result, error) {
	sub := *fs // the verb's own arguments are its paths
	sub.args = paths
	if len(paths) > 0 {
		storePath = ""
	}
	in, err := openInput(e.stderr, &sub, types, storePath, events)
	if err != nil {
		return nil, err
	}
	defer in.close()
	if in.policy, err = policyOf(in.roster); err != nil {
		return nil, err
	}
	pin := in.pipelineInput(c)
	pin.DropPoints = !keep
	r := pipeline.Run(pin)
	if err := sourceFailed(r); err != nil {
		return nil, err
	}
	if failed := reportFiles(e.stderr, "factor", r); failed > 0 && failed == len(in.files) {
		return nil, usageErrorf("no file could be read")
	}
	return r, nil
}

// factorPropose files the run's proposals and shows them.
func factorPropose(e *env, st *store.Store, r *pipeline.Result, by string, asJSON bool) error {
	var ps []store.Proposal
	tails := make([]string, 0, len(r.Factors))
	for t := range r.Factors {
		tails = append(tails, t)
	}
	sort.Strings(tails)
	for _, t := range tails {
		if f := r.Factors[t]; f.Proposal.Proposed {
			ps = append(ps, f.StoreProposal(t))
		}
	}
	filed, kept, err := st.FileProposals(ps, by)
	if err != nil {
		return err
	}
	all, err := st.Proposals("", store.FactorProposed)
	if err != nil {
		return err
	}
	if asJSON {
		return writeJSON(e.stdout, map[string]any{"filed": filed, "kept": kept, "proposals": proposalsJSON(all), "caution": oneLine(factorCaution)})
	}
	fmt.Fprintf(e.stdout, "%d proposal(s) filed (%d already moved on and kept as they are); %d tail(s) without one:\n",
		filed, kept, len(tails)-len(ps))
	for _, t := range tails {
		if pr := r.Factors[t].Proposal; !pr.Proposed {
			fmt.Fprintf(e.stdout, "  %s: %s\n", t, pr.Reason)
		}
	}
	fmt.Fprintln(e.stdout)
	writeProposals(e, all)
	return nil
}

// noteHint tells how to give the note a refused move lacked.
func noteHint(err error) string {
	if errors.Is(err, store.ErrNeedsNote) {
		return "--note: why; "
	}
	return ""
}

func oneLine(s string) string { return strings.ReplaceAll(s, "\n", " ") }

// proposalIDs reads the ids of approve, reject or apply: numbers, or all
// (every proposal in the status from).
func proposalIDs(st *store.Store, args []string, verb, from string) ([]int64, error) {
	if len(args) == 0 {
		return nil, usageErrorf("%s: give proposal ids or all (see 'dragdeck factor list')", verb)
	}
	if len(args) == 1 && args[0] == "all" {
		ps, err := st.Proposals("", from)
		if err != nil {
			return nil, err
		}
		if len(ps) == 0 {
			return nil, usageErrorf("%s all: no proposal is %s", verb, from)
		}
		ids := make([]int64, len(ps))
		for i, p := range ps {
			ids[i] = p.ID
		}
		return ids, nil
	}
	var ids []int64
	for _, a := range args {
		id, err := strconv.ParseInt(a, 10, 64)
		if err != nil || id <= 0 {
			return nil, usageErrorf("%s: %q is not a proposal id (see 'dragdeck factor list')", verb, a)
		}
		ids = append(ids, id)
	}
	return ids, nil
}

func factorMoved(e *env, ids []int64, status string, asJSON bool) error {
	if asJSON {
		return writeJSON(e.stdout, map[string]any{"ids": ids, "status": status})
	}
	list := make([]string, len(ids))
	for i, id := range ids {
		list[i] = strconv.FormatInt(id, 10)
	}
	noun := "proposal"
	if len(ids) > 1 {
		noun = "proposals"
	}
	for i, l := range wrapWords(fmt.Sprintf("%s %s %s", noun, strings.Join(list, ", "), status), 80-17, 0) {
		if i == 0 {
			fmt.Fprintf(e.stderr, "dragdeck factor: %s\n", l)
		} else {
			fmt.Fprintf(e.stderr, "  %s\n", l)
		}
	}
	return nil
}

// proposalJSON is a proposal of factor list --json (stable names).
type proposalJSON struct {
	ID                int64      `json:"id"`
	Tail              string     `json:"tail"`
	Type              string     `json:"type"`
	Period            string     `json:"period"`
	Status            string     `json:"status"`
	FactorPct         float64    `json:"factor_pct"`
	InUsePct          float64    `json:"in_use_pct"`
	ChangePct         float64    `json:"change_pct"`
	MonitoredPct      float64    `json:"monitored_pct"`
	MonitoredCI95Pct  []*float64 `json:"monitored_ci95_pct"`
	Flights           int        `json:"flights"`
	PlanFuelKgPerYear *float64   `json:"plan_fuel_kg_per_year"`
	NeedsNote         bool       `json:"needs_note"`
	SecondLook        bool       `json:"second_look"`
	Created           string     `json:"created"`
	Updated           string     `json:"updated"`
	Notes             []struct {
		Time   string `json:"time"`
		Status string `json:"status"`
		By     string `json:"by"`
		Text   string `json:"text"`
	} `json:"notes"`
}

func proposalsJSON(ps []store.Proposal) []proposalJSON {
	out := []proposalJSON{}
	for _, p := range ps {
		j := proposalJSON{ID: p.ID, Tail: p.Tail, Type: p.Type, Period: p.Period, Status: p.Status, FactorPct: p.ProposedPct,
			InUsePct: p.InUsePct, ChangePct: math.Round((p.ProposedPct-p.InUsePct)*1e9) / 1e9, MonitoredPct: p.MonitoredPct,
			MonitoredCI95Pct: []*float64{num(p.LoPct), num(p.HiPct)}, Flights: p.Flights, PlanFuelKgPerYear: num(p.PlanFuel),
			NeedsNote: p.NeedsNote, SecondLook: p.SecondLook, Created: p.Created.Format(time.RFC3339), Updated: p.Updated.Format(time.RFC3339)}
		j.Notes = make([]struct {
			Time   string `json:"time"`
			Status string `json:"status"`
			By     string `json:"by"`
			Text   string `json:"text"`
		}, len(p.Notes))
		for i, n := range p.Notes {
			j.Notes[i].Time, j.Notes[i].Status, j.Notes[i].By, j.Notes[i].Text = n.Time.Format(time.RFC3339), n.Status, n.By, n.Text
		}
		out = append(out, j)
	}
	return out
}

// writeProposals prints proposals as a table, with the caution.
func writeProposals(e *env, ps []store.Proposal) {
	if len(ps) == 0 {
		fmt.Fprintf(e.stdout, "No proposals ('dragdeck factor propose' files this month's).\n\n%s\n", factorCaution)
		return
	}
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "id\ttail\tperiod\tstatus\tin use\tproposed\tmonitored (95 %)\tflights\tplan")
	fmt.Fprintln(tw, "\t\t\t\t%\t%\t%\t\tt/yr")
	marks := false
	for _, p := range ps {
		mark := ""
		if p.NeedsNote {
			mark += " N"
		}
		if p.SecondLook {
			mark += " !"
		}
		marks = marks || mark != ""
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s%s\t%s (%s…%s)\t%d\t%s\n", p.ID, p.Tail, p.Period, p.Status, signed(p.InUsePct, 1),
			signed(p.ProposedPct, 1), mark, signed(p.MonitoredPct, 2), signed(p.LoPct, 2), signed(p.HiPct, 2), p.Flights, signed(p.PlanFuel/1000, 1))
	}
	tw.Flush()
	if marks {
		fmt.Fprintln(e.stdout, "N: outside the policy's range, approved only with a note; !: a change beyond the\npolicy's limit in one step, for a second look.")
	}
	fmt.Fprintf(e.stdout, "plan: the fuel the change puts into (+) or takes out of (−) the plan a year.\n\n%s\n", factorCaution)
}

type settingJSON struct {
	ID        int64   `json:"id"`
	Tail      string  `json:"tail"`
	FactorPct float64 `json:"factor_pct"`
	Effective string  `json:"effective"`
	By        string  `json:"by"`
	Why       string  `json:"why"`
	Proposal  *int64  `json:"proposal"`
	Recorded  string  `json:"recorded"`
}

func historyJSON(h []store.FactorSetting) []settingJSON {
	out := []settingJSON{}
	for _, f := range h {
		j := settingJSON{ID: f.ID, Tail: f.Tail, FactorPct: f.Pct, Effective: f.Effective.Format(time.RFC3339), By: f.By, Why: f.Why,
			Recorded: f.Recorded.Format(time.RFC3339)}
		if f.Proposal > 0 {
			p := f.Proposal
			j.Proposal = &p
		}
		out = append(out, j)
	}
	return out
}

func writeFactorHistory(e *env, h []store.FactorSetting, tail string) {
	if len(h) == 0 {
		what := "No factor has been set"
		if tail != "" {
			what += " for " + tail
		}
		fmt.Fprintf(e.stdout, "%s ('dragdeck factor apply' or 'dragdeck factor set').\n", what)
		return
	}
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "tail\tfactor %\tfrom (UTC)\tset by\twhy")
	for _, f := range h {
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", f.Tail, signed(f.Pct, 1), f.Effective.Format(time.DateOnly), f.By, f.Why)
	}
	tw.Flush()
}
