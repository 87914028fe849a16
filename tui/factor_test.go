package tui

import (
	"math"
	"strings"
	"testing"
	"time"

	"dragdeck/feed/pipeline"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// fakeFactors is a factor book in memory that follows the store's moves
// (proposed → approved or rejected; approved → rejected; a rejection, and
// an approval outside the range, need a note), to drive the factor key.
type fakeFactors struct {
	data  *Data
	props []store.Proposal
	hist  map[string][]store.FactorSetting
	moves []string // "tail id status"
}

func (f *fakeFactors) History() (map[string][]store.FactorSetting, error) { return f.hist, nil }

func (f *fakeFactors) Open() (map[string]store.Proposal, error) {
	out := map[string]store.Proposal{}
	for _, p := range f.props {
		if p.Status == store.FactorProposed || p.Status == store.FactorApproved {
			out[p.Tail] = p
		}
	}
	return out, nil
}

func (f *fakeFactors) Decide(tail string, id int64, status, note string) (string, error) {
	if id == 0 {
		tf, _ := f.data.Factor(tail)
		p := tf.StoreProposal(tail)
		p.ID = int64(len(f.props) + 1)
		f.props = append(f.props, p)
		id = p.ID
	}
	p := &f.props[id-1]
	allowed := map[string][]string{store.FactorProposed: {store.FactorApproved, store.FactorRejected}, store.FactorApproved: {store.FactorRejected}}
	ok := false
	for _, s := range allowed[p.Status] {
		ok = ok || s == status
	}
	switch {
	case !ok:
		return "", store.ErrTransition
	case status == store.FactorRejected && note == "", status == store.FactorApproved && p.NeedsNote && note == "":
		return "", store.ErrNeedsNote
	}
	p.Status = status
	f.moves = append(f.moves, strings.Join([]string{tail, status, note}, " "))
	return "moved", nil
}

// withFactors is the test fleet with a factor book, and the tails with and
// without a proposal of the run (one of each is needed).
func withFactors(t *testing.T) (d *Data, book *fakeFactors, with, without string) {
	t.Helper()
	base := smallData(t, 8, 200)
	c := *base
	book = &fakeFactors{data: &c}
	c.Factors = book
	for _, a := range c.Fleet.Tails {
		f, _ := c.Factor(a.Tail)
		switch {
		case f.Proposal.Proposed && with == "":
			with = a.Tail
		case !f.Proposal.Proposed && without == "":
			without = a.Tail
		}
	}
	if with == "" || without == "" {
		t.Fatalf("the test fleet needs a tail with a proposal (%q) and one without (%q)", with, without)
	}
	return &c, book, with, without
}

// selectTail puts the Fleet screen's cursor on tail.
func selectTail(t *testing.T, m *Model, tail string) {
	t.Helper()
	for i, a := range m.fleet.rows {
		if a.Tail == tail {
			m.fleet.cursor = i
			m.fleet.render()
			return
		}
	}
	t.Fatalf("%s is not on the Fleet screen", tail)
}

// The factor key opens the form on the selected tail's proposal with the
// caution beside it; a rejection without a note is refused and said so,
// an approval is filed and moved at once and the column shows it approved;
// a tail without a proposal says why.
func TestFleetFactorKey(t *testing.T) {
	d, book, with, without := withFactors(t)
	m := sized(d, 120, 30)
	selectTail(t, m, with)
	f, _ := d.Factor(with)
	cell := factorCell(f, f.StoreProposal(with), true, false)
	if v := m.View(); !strings.Contains(v, cell) || !strings.Contains(v, "f fuel factor") {
		t.Fatalf("the column should show %q and the help the factor key:\n%s", cell, v)
	}
	press(m, "f")
	if m.fleet.fform == nil || !m.fleet.Capturing() {
		t.Fatal("f should open the factor form")
	}
	v := m.View()
	for _, want := range []string{"fuel factor " + with, "[approve]", "not approved performance data", fmtSigned(f.Proposal.TargetPct, 1) + " %"} {
		if !strings.Contains(v, want) {
			t.Errorf("the form should show %q:\n%s", want, v)
		}
	}
	press(m, "right", "enter") // reject, no note
	if len(book.moves) != 0 || !strings.Contains(m.fleet.notice, "not saved") {
		t.Fatalf("a rejection without a note must be refused: moves %v, notice %q", book.moves, m.fleet.notice)
	}
	press(m, "f")
	for _, r := range "q ok" { // q is text in the form, not quit
		press(m, string(r))
	}
	press(m, "enter")
	if len(book.moves) != 1 || book.moves[0] != with+" approved q ok" {
		t.Fatalf("moves %v", book.moves)
	}
	if v := m.View(); !strings.Contains(v, cell+"✓") && !strings.Contains(v, strings.TrimSuffix(cell, "!")+"✓") {
		t.Errorf("the column should mark the approval:\n%s", v)
	}
	press(m, "f") // approved: reject is the one move left here
	if ff := m.fleet.fform; ff == nil || len(ff.choices) != 1 || ff.prop.Status != store.FactorApproved || ff.prop.ID == 0 {
		t.Fatal("the form on an approved proposal offers reject alone")
	}
	press(m, "esc")
	selectTail(t, m, without)
	press(m, "f")
	g, _ := d.Factor(without)
	if m.fleet.fform != nil || !strings.Contains(m.fleet.notice, g.Proposal.Reason) {
		t.Errorf("a tail without a proposal should say why (%q): %q", g.Proposal.Reason, m.fleet.notice)
	}
}

// Without a store the factor column is there, the factor key is not.
func TestFleetFactorWithoutStore(t *testing.T) {
	m := sized(smallData(t, 8, 200), 120, 30)
	press(m, "f")
	if m.fleet.fform != nil || strings.Contains(m.View(), "f fuel factor") {
		t.Error("the factor key needs a store")
	}
	if !strings.Contains(m.View(), "use→new %") {
		t.Errorf("the factor column should be there:\n%s", m.View())
	}
}

func TestFactorCell(t *testing.T) {
	none := pipeline.TailFactor{}
	inUse := pipeline.TailFactor{InUse: true, Proposal: model.FactorProposal{InUsePct: 0.5}}
	p := store.Proposal{ProposedPct: 2.4, Status: store.FactorProposed}
	ap := p
	ap.Status = store.FactorApproved
	big := p
	big.SecondLook = true
	cases := []struct {
		name    string
		f       pipeline.TailFactor
		p       store.Proposal
		hasP    bool
		compact bool
		want    string
	}{
		{"nothing set, nothing proposed", none, p, false, false, "-"},
		{"in use, nothing proposed", inUse, p, false, false, "+0.5"},
		{"in use, proposed", inUse, p, true, false, "+0.5→+2.4"},
		{"approved", inUse, ap, true, false, "+0.5→+2.4✓"},
		{"second look", none, big, true, false, "-→+2.4!"},
		{"compact", inUse, ap, true, true, "→+2.4✓"},
		{"compact without proposal", inUse, p, false, true, "+0.5"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := factorCell(c.f, c.p, c.hasP, c.compact)
			if got != c.want {
				t.Errorf("got %q, want %q", got, c.want)
			}
			if len([]rune(got)) > colPlan-1 || (c.compact && len([]rune(got)) > colPlanC-1) {
				t.Errorf("%q is wider than its column", got)
			}
		})
	}
}

// The store's proposal is shown unless the run's is of a later month.
func TestShownProposal(t *testing.T) {
	run := pipeline.TailFactor{Proposal: model.FactorProposal{Proposed: true, Period: "2026-11", TargetPct: 2}}
	cases := []struct {
		name   string
		f      pipeline.TailFactor
		open   map[string]store.Proposal
		wantID int64
		wantOK bool
	}{
		{"neither", pipeline.TailFactor{}, nil, 0, false},
		{"run only", run, nil, 0, true},
		{"store only", pipeline.TailFactor{}, map[string]store.Proposal{"A": {ID: 3, Period: "2026-10"}}, 3, true},
		{"same month: the store's", run, map[string]store.Proposal{"A": {ID: 4, Period: "2026-11"}}, 4, true},
		{"run later: the run's", run, map[string]store.Proposal{"A": {ID: 5, Period: "2026-10"}}, 0, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			p, ok := shownProposal(c.f, c.open, "A")
			if ok != c.wantOK || p.ID != c.wantID {
				t.Errorf("got id %d ok %v, want %d %v", p.ID, ok, c.wantID, c.wantOK)
			}
		})
	}
}

// The factor in use as a step line: its value at the window's start, a
// vertical at each change inside, flat to the end.
func TestInUseSteps(t *testing.T) {
	day := func(d int) time.Time { return time.Date(2026, 1, d, 0, 0, 0, 0, time.UTC) }
	x := func(t time.Time) float64 { return float64(t.Day()) }
	hist := []store.FactorSetting{{Pct: 1, Effective: day(2)}, {Pct: 2.5, Effective: day(10)}, {Pct: 3, Effective: day(28)}}
	cases := []struct {
		name       string
		start, end time.Time
		want       [][2]float64
	}{
		{"none set yet", day(1), day(1), [][2]float64{{1, 0}, {1, 0}}},
		{"one change inside", day(5), day(20), [][2]float64{{5, 1}, {10, 1}, {10, 2.5}, {20, 2.5}}},
		{"from before the first", day(1), day(12), [][2]float64{{1, 0}, {2, 0}, {2, 1}, {10, 1}, {10, 2.5}, {12, 2.5}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := inUseSteps(hist, c.start, c.end, x)
			if len(got) != len(c.want) {
				t.Fatalf("got %v, want %v", got, c.want)
			}
			for i := range got {
				if math.Abs(got[i][0]-c.want[i][0]) > 1e-9 || math.Abs(got[i][1]-c.want[i][1]) > 1e-9 {
					t.Errorf("point %d: got %v, want %v", i, got[i], c.want[i])
				}
			}
		})
	}
}

// On the Tail screen the factor key turns the top chart to the fuel
// factor (legend, the factor in use from the store, the proposal) and
// back; the facts carry the factor's line either way.
func TestTailFactorChart(t *testing.T) {
	d, book, with, _ := withFactors(t)
	book.hist = map[string][]store.FactorSetting{with: {{Tail: with, Pct: 0.7, Effective: d.First.Add(24 * time.Hour)}}}
	m := sized(d, 120, 40)
	selectTail(t, m, with)
	press(m, "enter")
	if !strings.Contains(m.View(), "drag deviation per flight") || !strings.Contains(m.View(), "factor ") {
		t.Fatalf("the Tail screen starts on the drag chart with the factor in the facts:\n%s", m.View())
	}
	press(m, "f")
	v := m.View()
	f, _ := d.Factor(with)
	for _, want := range []string{"fuel factor %", "monitored", "proposed " + fmtSigned(f.Proposal.TargetPct, 1), "restart"} {
		if !strings.Contains(v, want) {
			t.Errorf("the factor chart should show %q:\n%s", want, v)
		}
	}
	if strings.Contains(v, "drag deviation per flight") {
		t.Error("f should replace the drag chart")
	}
	press(m, "f")
	if !strings.Contains(m.View(), "drag deviation per flight") {
		t.Error("f again should bring the drag chart back")
	}
}

// Narrow, the Fleet screen gives up the last step's date, then the step
// column, before it squeezes the flags below their width; the factor
// column stays.
func TestFleetNarrowKeepsFlags(t *testing.T) {
	d, _, _, _ := withFactors(t)
	d.Work = &fakeWork{}
	cases := []struct {
		name     string
		w        int
		wantStep bool
	}{
		{"wide", 140, true},
		{"80 columns with a store", 80, false},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			m := sized(d, c.w, 30)
			cols := m.fleet.cols()
			if cols.flags < minFlags || cols.plan == 0 {
				t.Errorf("flags %d wide (want ≥ %d), factor %d", cols.flags, minFlags, cols.plan)
			}
			if got := strings.Contains(m.View(), "last step"); got != c.wantStep {
				t.Errorf("last step shown %v, want %v:\n%s", got, c.wantStep, m.View())
			}
		})
	}
}
