package main

import (
	"fmt"
	"os"
	"sync/atomic"
	"time"

	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"github.com/muesli/termenv"

	"dragdeck/feed"
	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
	"dragdeck/tui"
)

// runDashboard runs the dashboard full screen until the user quits.
func runDashboard(e *env, m *tui.Model) error {
	if os.Getenv("NO_COLOR") != "" {
		lipgloss.SetColorProfile(termenv.Ascii)
	}
	opts := []tea.ProgramOption{tea.WithAltScreen(), tea.WithContext(e.ctx), tea.WithOutput(e.stdout)}
	if f, ok := e.stdin.(*os.File); ok {
		opts = append(opts, tea.WithInput(f))
	}
	if _, err := tea.NewProgram(m, opts...).Run(); err != nil && e.ctx.Err() == nil {
		return &exitErr{code: exitUsage, err: fmt.Errorf("dashboard: %w", err)}
	}
	if err := m.Err(); err != nil {
		return usageErrorf("%v", err)
	}
	return nil
}

// demoDashboard opens the dashboard on the built-in demo fleet.
func demoDashboard(e *env) error {
	return runDashboard(e, tui.New(e.ctx, nil, &tui.Loader{Load: tui.DemoData}))
}

func runDash(e *env, args []string) error {
	fs := newFlagSet("dash", "dragdeck dash [--type FILE | --fleet FILE] [--events FILE] PATH... | --store FILE",
		`Opens the dashboard on snapshot files or folders (every *.csv inside): the
Fleet screen lists every tail, most severe first; enter opens a tail, where
enter on a flight replays it; tab moves between the Fleet, Tail, Flight,
Cruise, Turns and About screens; ? lists every key; q quits. The files load in
the background. The trend settings and limits are those of 'dragdeck report'.`,
		"dragdeck dash --events fleet/events.csv fleet/snapshots/")
	types := fs.typeFlags()
	events := fs.str("events", "FILE", "", "events file (time,tail,kind,note)")
	storePath := fs.storeFlag()
	trend := trendFlags(fs)
	policyOf := factorFlags(fs)
	if err := fs.parse(args, e.stdout); err != nil && err != errPositional {
		return helpOK(err)
	}
	c, err := trend()
	if err != nil {
		return err
	}
	if !isTerminal(e.stdout) {
		return usageErrorf("the dashboard needs a terminal; for plain output use 'dragdeck report'")
	}
	in, err := openInput(e.stderr, fs, types, *storePath, *events)
	if err != nil {
		return err
	}
	defer in.close()
	if in.policy, err = policyOf(in.roster); err != nil {
		return err
	}
	setMemoryLimit(in, dashBytesPerByte)
	progress := &atomic.Int64{}
	load := func() (*tui.Data, error) { return dashData(in, c, progress) }
	return runDashboard(e, tui.New(e.ctx, nil, &tui.Loader{Total: feed.TotalSize(in.files), Progress: progress, Load: load}))
}

// dashData is what the dashboard loads in the background: the pipeline's
// result on the input, with the work list and the review marks of a store.
func dashData(in *input, c model.TrendConfig, progress *atomic.Int64) (*tui.Data, error) {
	pin := in.pipelineInput(c)
	pin.KeepRecords, pin.Progress = true, progress
	r := pipeline.Run(pin)
	if r.SourceErr != nil {
		return nil, r.SourceErr
	}
	failed := r.Failed()
	if len(failed) > 0 && len(failed) == len(in.files) {
		return nil, failed[0].Err
	}
	src := in.source()
	if len(failed) > 0 {
		src = fmt.Sprintf("%s (%d could not be read: %v)", src, len(failed), failed[0].Err)
	}
	d := tui.NewData(src, r)
	if in.store != nil {
		rv, err := newReview(in.store, r)
		if err != nil {
			return nil, err
		}
		d.Work, d.Review = storeWork{in.store}, reviewMarks(rv)
		d.Factors = storeFactors{st: in.store, r: r, by: defaultUser()}
	}
	return d, nil
}

// storeWork is the dashboard's work list: the store's, written at once.
type storeWork struct{ st *store.Store }

func (w storeWork) InProgress() (map[string][]store.WorkItem, error) {
	items, err := w.st.Work()
	return store.OpenWork(items), err
}

func (w storeWork) Open(tail, reason, flag string) (int64, error) {
	return w.st.AddWork(tail, reason, flag)
}

func (w storeWork) Set(id int64, status, note string) error { return w.st.SetWork(id, status, note) }

// storeFactors is the dashboard's fuel factors: the store's, with the
// run's proposals, filed when a move is made on one.
type storeFactors struct {
	st *store.Store
	r  *pipeline.Result
	by string
}

func (b storeFactors) History() (map[string][]store.FactorSetting, error) {
	h, err := b.st.FactorHistory("")
	out := map[string][]store.FactorSetting{}
	for _, f := range h {
		out[f.Tail] = append(out[f.Tail], f)
	}
	return out, err
}

func (b storeFactors) Open() (map[string]store.Proposal, error) {
	ps, err := b.st.Proposals("", "")
	out := map[string]store.Proposal{}
	for _, p := range ps { // oldest first: the latest open one stays
		if p.Status == store.FactorProposed || p.Status == store.FactorApproved {
			out[p.Tail] = p
		}
	}
	return out, err
}

// Decide files the run's proposal when id is 0, then moves it.
func (b storeFactors) Decide(tail string, id int64, status, note string) (string, error) {
	if id == 0 {
		f, ok := b.r.Factor(tail)
		if !ok || !f.Proposal.Proposed {
			return "", fmt.Errorf("%s has no proposal in this run", tail)
		}
		p := f.StoreProposal(tail)
		if _, _, err := b.st.FileProposals([]store.Proposal{p}, b.by); err != nil {
			return "", err
		}
		ps, err := b.st.Proposals(p.Period, "")
		if err != nil {
			return "", err
		}
		for _, q := range ps {
			if q.Tail == tail {
				id = q.ID
			}
		}
		if id == 0 {
			return "", fmt.Errorf("%s: the proposal was not filed", tail)
		}
	}
	if err := b.st.MoveProposal(id, status, b.by, note); err != nil {
		return "", err
	}
	msg := fmt.Sprintf("proposal #%d of %s %s", id, tail, status)
	if status == store.FactorApproved {
		msg += "; put it in use with 'dragdeck factor apply'"
	}
	return msg, nil
}

// reviewMarks is the review's changes as the Fleet screen marks them.
func reviewMarks(rv reviewJSON) *tui.ReviewMarks {
	m := &tui.ReviewMarks{Raised: map[string]map[string]bool{}, Steps: map[string]int{}}
	if rv.Since != nil {
		m.Since, _ = time.Parse(time.RFC3339, *rv.Since)
	}
	for _, f := range rv.FlagsRaised {
		name := f.Flag
		if f.Series == store.SeriesEngine {
			name = "e-" + f.Flag
		}
		if m.Raised[f.Tail] == nil {
			m.Raised[f.Tail] = map[string]bool{}
		}
		m.Raised[f.Tail][name] = true
	}
	for _, s := range rv.StepsNew {
		m.Steps[s.Tail]++
	}
	return m
}
