package tui

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/feed/store"
	"dragdeck/model"
)

// openTailMsg asks the root to open the Tail screen on a tail.
type openTailMsg struct{ tail string }

type fleetKeys struct {
	Up, Down, PgUp, PgDn, Home, End, Open, Sort, Filter, Keep, Clear key.Binding
}

var fleetKeyMap = fleetKeys{
	Up: keyUp, Down: keyDown, PgUp: keyPgUp, PgDn: keyPgDn, Home: keyHome, End: keyEnd, Open: keyEnter,
	Sort: keySort, Filter: keyFilter, Keep: keyFilterKeep, Clear: keyFilterDrop,
}

// The Fleet screen's orders, cycled by the sort key. Severity is the
// pipeline's own order (model.AssessFleet); the numeric ones put the
// largest first and tails without a value last.
var fleetOrders = []struct {
	name string
	less func(a, b model.TailAssessment) int
}{
	{"severity", nil},
	{"tail", func(a, b model.TailAssessment) int { return cmp.Compare(a.Tail, b.Tail) }},
	{"deviation", func(a, b model.TailAssessment) int { return descending(a.RecentPct, b.RecentPct) }},
	{"drift", func(a, b model.TailAssessment) int { return descending(a.Drift.Slope, b.Drift.Slope) }},
	{"fuel", func(a, b model.TailAssessment) int { return descending(a.ExcessFuel, b.ExcessFuel) }},
	// grouped by type, most severe first within each (severity is the
	// pipeline's order, and the sort is stable)
	{"type", func(a, b model.TailAssessment) int { return cmp.Compare(a.Type, b.Type) }},
}

// descending orders larger values first and NaN last.
func descending(a, b float64) int {
	switch an, bn := math.IsNaN(a), math.IsNaN(b); {
	case an && bn:
		return 0
	case an:
		return 1
	case bn:
		return -1
	}
	return cmp.Compare(b, a)
}

// fleetScreen lists every tail, most severe first.
type fleetScreen struct {
	data      *Data
	st        Styles
	w, h      int
	cursor    int
	offset    int
	order     int // index in fleetOrders
	filter    textinput.Model
	filtering bool
	rows      []model.TailAssessment // after the filter, in the chosen order
	sparkLo   float64
	sparkHi   float64
	sparks    map[string]string // per tail, drawn for width sparkW
	sparkW    int
	empty     string // what the screen says without data
	view      string
	// the work list (a store's data): the items in progress by tail, the
	// form of the work key while it is open, and what the last save did
	work   map[string][]store.WorkItem
	form   *workForm
	notice string
	// the fuel factors (a store's data): the open proposals by tail and
	// the factor key's form while it is open
	props map[string]store.Proposal
	fform *factorForm
}

func newFleetScreen(st Styles) *fleetScreen {
	ti := textinput.New()
	ti.Prompt = "filter: "
	ti.Placeholder = "tail or flag"
	ti.CharLimit = 32
	ti.Cursor.SetMode(cursor.CursorStatic) // no blink timer
	return &fleetScreen{st: st, filter: ti, empty: "no data"}
}

func (s *fleetScreen) Title() string { return "Fleet" }

func (s *fleetScreen) Init() tea.Cmd { return nil }

func (s *fleetScreen) Capturing() bool { return s.filtering || s.form != nil || s.fform != nil }

func (s *fleetScreen) ShortHelp() []key.Binding {
	k := fleetKeyMap
	if s.form != nil || s.fform != nil {
		return []key.Binding{keyWorkSave, keyWorkCancel, keyWorkNext}
	}
	if s.filtering {
		return []key.Binding{k.Keep, k.Clear}
	}
	keys := []key.Binding{k.Up, k.Down, k.Open, k.Sort, k.Filter}
	if s.data != nil && s.data.Work != nil {
		keys = append(keys, keyWork)
	}
	if s.data != nil && s.data.Factors != nil {
		keys = append(keys, keyFactor)
	}
	return keys
}

func (s *fleetScreen) FullHelp() [][]key.Binding {
	k := fleetKeyMap
	all := [][]key.Binding{{k.Up, k.Down, k.PgUp, k.PgDn, k.Home, k.End}, {k.Open, k.Sort, k.Filter, k.Keep, k.Clear}}
	if s.data != nil && s.data.Work != nil {
		all = append(all, []key.Binding{keyWork, keyWorkNext, keyWorkPrev, keyWorkSave, keyWorkCancel})
	}
	if s.data != nil && s.data.Factors != nil {
		all = append(all, []key.Binding{keyFactor})
	}
	return all
}

// SetData gives the screen its fleet.
func (s *fleetScreen) SetData(d *Data) {
	s.data = d
	s.sparkLo, s.sparkHi = d.Fleet.DeviationRange()
	s.sparks, s.sparkW = nil, -1
	s.loadWork()
	s.loadFactors()
	s.applyFilter()
}

// loadWork reads the items in progress from the work list.
func (s *fleetScreen) loadWork() {
	s.work = nil
	if s.data == nil || s.data.Work == nil {
		return
	}
	w, err := s.data.Work.InProgress()
	if err != nil {
		s.notice = "work list: " + err.Error()
		return
	}
	s.work = w
}

// loadFactors reads the open proposals from the store's fuel factors.
func (s *fleetScreen) loadFactors() {
	s.props = nil
	if s.data == nil || s.data.Factors == nil {
		return
	}
	p, err := s.data.Factors.Open()
	if err != nil {
		s.notice = "fuel factors: " + err.Error()
		return
	}
	s.props = p
}

// openFactorForm opens the factor key's form on the selected tail's
// proposal, or says why the tail has none.
func (s *fleetScreen) openFactorForm() {
	tail, ok := s.selected()
	if !ok || s.data.Factors == nil {
		return
	}
	f, _ := s.data.Factor(tail)
	p, ok := shownProposal(f, s.props, tail)
	if !ok {
		why := f.Proposal.Reason
		if why == "" {
			why = "nothing to propose"
		}
		s.notice = fmt.Sprintf("%s: no fuel-factor proposal (%s)", tail, why)
		return
	}
	s.fform = newFactorForm(tail, p)
}

// openForm opens the work key's form on the selected tail: a new item
// with the flag that raises it, or the next status of its item.
func (s *fleetScreen) openForm() {
	tail, ok := s.selected()
	if !ok || s.data.Work == nil {
		return
	}
	if items := s.work[tail]; len(items) > 0 {
		it := items[len(items)-1]
		s.form = newWorkForm(tail, &it, "", "")
		return
	}
	a, _ := s.data.Tail(tail)
	flag, reason := "", ""
	if len(a.Flags) > 0 {
		flag = a.Flags[0]
		reason = fmt.Sprintf("%s: recent level %s %%, drift %s pp/100 d", flag, fmtSigned(a.RecentPct, 2), fmtSigned(a.Drift.Slope, 2))
	} else if e, ok := s.data.EngineTail(tail); ok && len(e.Flags) > 0 {
		flag = "e-" + e.Flags[0]
		reason = fmt.Sprintf("%s: engine level %s %%, drift %s pp/100 d", flag, fmtSigned(e.RecentPct, 2), fmtSigned(e.Drift.Slope, 2))
	}
	s.form = newWorkForm(tail, nil, flag, reason)
}

// SetEmpty sets what the screen says while it has no fleet.
func (s *fleetScreen) SetEmpty(msg string) {
	s.empty = msg
	s.render()
}

func (s *fleetScreen) SetSize(w, h int) {
	s.w, s.h = w, h
	s.render()
}

// selected returns the tail under the cursor.
func (s *fleetScreen) selected() (string, bool) {
	if s.cursor < 0 || s.cursor >= len(s.rows) {
		return "", false
	}
	return s.rows[s.cursor].Tail, true
}

// applyFilter rebuilds the rows from the filter and the order, keeping the
// selected tail selected when it is still shown.
func (s *fleetScreen) applyFilter() {
	sel, had := s.selected()
	s.rows = s.rows[:0]
	if s.data != nil {
		q := strings.ToLower(strings.TrimSpace(s.filter.Value()))
		for _, a := range s.data.Fleet.Tails {
			if q == "" || strings.Contains(strings.ToLower(a.Tail), q) || strings.Contains(strings.Join(a.Flags, " "), q) ||
				strings.Contains(strings.ToLower(a.Type), q) {
				s.rows = append(s.rows, a)
			}
		}
		if less := fleetOrders[s.order].less; less != nil {
			slices.SortStableFunc(s.rows, less)
		}
	}
	if had {
		for i, a := range s.rows {
			if a.Tail == sel {
				s.cursor = i
			}
		}
	}
	s.cursor = max(0, min(s.cursor, len(s.rows)-1))
	s.render()
}

func (s *fleetScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok {
		return s, nil
	}
	k := fleetKeyMap
	if s.form != nil {
		done, save, cmd := s.form.update(km)
		if done {
			if save {
				msg, err := s.form.save(s.data.Work)
				if err != nil {
					s.notice = "not saved: " + err.Error()
				} else {
					s.notice = msg
					s.loadWork()
				}
			}
			s.form = nil
		}
		s.render()
		return s, cmd
	}
	if s.fform != nil {
		done, save, cmd := s.fform.update(km)
		if done {
			if save {
				msg, err := s.fform.save(s.data.Factors)
				if err != nil {
					s.notice = "not saved: " + err.Error()
				} else {
					s.notice = msg
					s.loadFactors()
				}
			}
			s.fform = nil
		}
		s.render()
		return s, cmd
	}
	if s.filtering {
		switch {
		case key.Matches(km, k.Keep):
			s.filtering = false
			s.filter.Blur()
		case key.Matches(km, k.Clear):
			s.filtering = false
			s.filter.Blur()
			s.filter.SetValue("")
		default:
			var cmd tea.Cmd
			s.filter, cmd = s.filter.Update(msg)
			s.applyFilter()
			return s, cmd
		}
		s.applyFilter()
		return s, nil
	}
	page := max(1, s.listHeight()-1)
	switch {
	case key.Matches(km, k.Up):
		s.cursor--
	case key.Matches(km, k.Down):
		s.cursor++
	case key.Matches(km, k.PgUp):
		s.cursor -= page
	case key.Matches(km, k.PgDn):
		s.cursor += page
	case key.Matches(km, k.Home):
		s.cursor = 0
	case key.Matches(km, k.End):
		s.cursor = len(s.rows) - 1
	case key.Matches(km, k.Sort):
		s.order = (s.order + 1) % len(fleetOrders)
		s.applyFilter()
		return s, nil
	case key.Matches(km, k.Filter):
		s.filtering = true
		s.render()
		return s, s.filter.Focus()
	case key.Matches(km, k.Clear) && s.filter.Value() != "":
		s.filter.SetValue("")
		s.applyFilter()
		return s, nil
	case key.Matches(km, keyWork) && s.data != nil && s.data.Work != nil:
		s.notice = ""
		s.openForm()
		s.render()
		if s.form == nil {
			return s, nil
		}
		return s, s.form.text.Focus()
	case key.Matches(km, keyFactor) && s.data != nil && s.data.Factors != nil:
		s.notice = ""
		s.openFactorForm()
		s.render()
		if s.fform == nil {
			return s, nil
		}
		return s, s.fform.text.Focus()
	case key.Matches(km, k.Open):
		if t, ok := s.selected(); ok {
			return s, func() tea.Msg { return openTailMsg{t} }
		}
		return s, nil
	default:
		return s, nil
	}
	s.cursor = max(0, min(s.cursor, len(s.rows)-1))
	s.render()
	return s, nil
}

// fleetHeadLines is the number of lines above the table's rows: the
// source, the counts, the summary and the two-line column header.
const fleetHeadLines = 5

// listHeight is the number of table rows that fit.
func (s *fleetScreen) listHeight() int { return max(1, s.h-fleetHeadLines-s.footLines()) }

// footLines is the number of lines below the rows: the work form, or
// what its last save did.
func (s *fleetScreen) footLines() int {
	switch {
	case s.form != nil:
		return 2
	case s.fform != nil:
		return strings.Count(s.fform.view(s.st, s.w), "\n") + 1
	case s.notice != "":
		return 1
	}
	return 0
}

func (s *fleetScreen) View() string { return s.view }

// Column widths of the table; the sparkline takes what is left.
const (
	colMark  = markW
	colTail  = 8
	colDev   = 7
	colDrift = 8
	colStep  = 16 // "2026-03-01 +3.5"
	colStepC = 13 // compact: the month, "2026-03 +3.5"
	colFuel  = 7
	colFlags = 14
	colEng   = 7  // the engine series' level, when any tail has one
	colType  = 10 // at most, for the tail's type with a fleet file of several types
	colWork  = 8  // the work item's status, with a store
	colPlan  = 11 // the fuel factor in use → proposed, "+0.5→+2.4✓"
	colPlanC = 8  // compact: the proposed factor, "→+2.4✓", or the one in use
	minSpark = 6  // a narrower sparkline is left out
	minFlags = 10 // narrower flags leave out the last step's column
)

// fleetCols are the widths of the columns that depend on the data and the
// screen: the type (0 with one type, named in the header), the engine
// level (0 when no tail has an engine series), the flags and the
// sparkline (0 when it does not fit: the flags then take what is left).
// When the flags would not get their width, the screen is compact: the
// last step shows its month and the factor column the proposal alone;
// narrower still, the last step is left out.
type fleetCols struct {
	typ, eng, work, flags, spark, step, plan int
	compact                                  bool
}

func (s *fleetScreen) cols() fleetCols {
	c := fleetCols{eng: s.engineCol(), flags: colFlags, step: colStep, plan: colPlan}
	if s.data != nil && s.data.Work != nil {
		c.work = colWork
	}
	if s.data != nil && s.data.Roster.Mixed() {
		for _, n := range s.data.Roster.TypeNames() {
			c.typ = max(c.typ, min(colType, len([]rune(n))+1))
		}
	}
	fixedOf := func() int {
		return colMark + colTail + c.typ + colDev + colDrift + 1 + c.step + colFuel + c.eng + c.plan + 1 + c.work
	}
	fixed := fixedOf()
	if s.w-fixed < colFlags {
		c.compact, c.step, c.plan = true, colStepC, colPlanC
		fixed = fixedOf()
	}
	if s.w-fixed < minFlags {
		// the flags matter more than the step's month, which the step
		// flag and the Tail screen tell
		c.step = 0
		fixed = fixedOf()
	}
	c.spark = s.w - fixed - colFlags - 1
	if c.spark < minSpark {
		c.spark, c.flags = 0, max(5, s.w-fixed)
	}
	return c
}

// sparkCell is the sparkline cell with its leading space, empty when the
// sparkline is left out.
func (c fleetCols) sparkCell(v string) string {
	if c.spark == 0 {
		return ""
	}
	return " " + pad(v, c.spark)
}

// engineCol is the width of the engine column: colEng when some tail has
// an engine series (thrust from fan speed), else 0.
func (s *fleetScreen) engineCol() int {
	if s.data != nil && len(s.data.Engine.Tails) > 0 {
		return colEng
	}
	return 0
}

func (s *fleetScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	if s.data == nil {
		s.view = placeholder(s.w, s.h, s.empty)
		return
	}
	d, c := s.data, s.data.Config
	var b strings.Builder
	span := "no snapshots"
	if !d.First.IsZero() {
		span = d.First.Format("2006-01-02") + " … " + d.Last.Format("2006-01-02") + " UTC"
	}
	b.WriteString(s.st.Muted.Render(truncate(clean(d.Source)+" · "+d.Roster.Label(), s.w)) + "\n")
	counts := fmt.Sprintf("%d tails · %d snapshots", len(d.Fleet.Tails), d.Stats.Accepted-d.Recorded)
	if d.Recorded > 0 {
		counts += fmt.Sprintf(" + %d recorded", d.Recorded)
	}
	counts += fmt.Sprintf(" · %d rejected · ", d.Stats.Rejected)
	if !d.First.IsZero() && lipgloss.Width(counts+span) > s.w { // the span without spaces or zone
		span = d.First.Format("2006-01-02") + "…" + d.Last.Format("2006-01-02")
	}
	counts += span
	b.WriteString(s.st.Muted.Render(truncate(counts, s.w)) + "\n")
	summary := fmt.Sprintf("fleet median %s %% · ", fmtSigned(d.Fleet.MedianRecentPct, 2))
	flagged := fmt.Sprintf("%d flagged", d.Fleet.Flagged)
	if d.Fleet.Flagged > 0 {
		flagged = s.st.Flag.Render(flagged)
	}
	if e := d.Engine; len(e.Tails) > 0 {
		eng := fmt.Sprintf(" · engines %d flagged", e.Flagged)
		if e.Flagged > 0 {
			eng = s.st.Flag.Render(eng)
		}
		flagged += eng
	}
	line2 := summary + flagged + s.st.Muted.Render(" · by "+fleetOrders[s.order].name)
	if r := d.Review; r != nil {
		since := "no review yet"
		if !r.Since.IsZero() {
			since = "since review " + r.Since.Format("2006-01-02")
		}
		line2 += s.st.Muted.Render(" · + new " + since)
	}
	if s.filtering || s.filter.Value() != "" {
		line2 += "   " + s.filter.View()
	}
	b.WriteString(truncate(line2, s.w) + "\n")
	cols := s.cols()
	// Two header lines: what each column is, then its unit and period;
	// a narrow sparkline gets short words rather than cut ones.
	sparkHead1, sparkHead2 := "per flight", "dev %, all"
	if cols.spark < len(sparkHead1) {
		sparkHead1, sparkHead2 = "trend", "dev %"
	}
	stepUnit, planUnit := "date       pp", "use→new %"
	if cols.compact {
		stepUnit, planUnit = "month    pp", "%"
	}
	h1 := pad("", colMark) + pad("tail", colTail) + pad("type", cols.typ) + padL("level", colDev) + padL("drift", colDrift) + " " + pad("last step", cols.step) +
		padL("fuel", colFuel) + padL("engine", cols.eng) + padL("factor", cols.plan) + " " + pad("work", cols.work) + pad("flags", cols.flags) + cols.sparkCell(sparkHead1)
	h2 := pad("", colMark) + pad("", colTail) + pad("", cols.typ) + padL(fmt.Sprintf("%% %gd", c.RecentDays), colDev) + padL("pp/100d", colDrift) + " " + pad(stepUnit, cols.step) +
		padL("t/yr", colFuel) + padL("%", cols.eng) + padL(planUnit, cols.plan) + " " + pad("", cols.work) + pad("", cols.flags) + cols.sparkCell(sparkHead2)
	b.WriteString(s.st.Header.Render(truncate(h1, s.w)) + "\n")
	b.WriteString(s.st.Muted.Render(truncate(h2, s.w)) + "\n")
	if len(s.rows) == 0 {
		msg := "no tails"
		if s.filter.Value() != "" {
			msg = "no tail matches the filter"
		}
		b.WriteString(s.st.Muted.Render(msg) + "\n")
		s.view = strings.TrimSuffix(b.String(), "\n")
		return
	}
	lh := s.listHeight()
	if s.cursor < s.offset {
		s.offset = s.cursor
	}
	if s.cursor >= s.offset+lh {
		s.offset = s.cursor - lh + 1
	}
	s.offset = max(0, min(s.offset, max(0, len(s.rows)-lh)))
	for i := s.offset; i < min(len(s.rows), s.offset+lh); i++ {
		b.WriteString(s.row(s.rows[i], i == s.cursor, cols) + "\n")
	}
	switch {
	case s.form != nil:
		b.WriteString(s.form.view(s.st, s.w) + "\n")
	case s.fform != nil:
		b.WriteString(s.fform.view(s.st, s.w) + "\n")
	case s.notice != "":
		b.WriteString(s.st.Accent.Render(truncate(s.notice, s.w)) + "\n")
	}
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(strings.TrimSuffix(b.String(), "\n"))
}

// row draws one tail; the selected row starts with the selection marker
// (visible without colour) and is drawn reversed.
func (s *fleetScreen) row(a model.TailAssessment, selected bool, cols fleetCols) string {
	step := "-"
	stepStyle := s.st.Text
	if k := len(a.Steps); k > 0 {
		st := a.Steps[k-1]
		layout := "2006-01-02"
		if cols.compact {
			layout = "2006-01"
		}
		step = st.Time.Format(layout) + " " + fmtSigned(st.SizePct, 1)
		if s.data.Review != nil && s.data.Review.Steps[a.Tail] > 0 {
			step = "+" + step // a step new since the last review mark
		}
		if st.SizePct < 0 {
			stepStyle = s.st.Improve
		} else {
			stepStyle = s.st.Flag
		}
	}
	all := a.Flags
	var raised map[string]bool
	if s.data.Review != nil {
		raised = s.data.Review.Raised[a.Tail]
		if len(raised) > 0 {
			all = slices.Clone(all)
			for i, f := range all {
				if raised[f] {
					all[i] = "+" + f
				}
			}
		}
	}
	engine := ""
	if eng := cols.eng; eng > 0 {
		engine = padL("n/a", eng) // thrust from fuel flow
		if e, ok := s.data.EngineTail(a.Tail); ok {
			engine = padL(fmtSigned(e.RecentPct, 2), eng)
			for _, f := range e.Flags {
				mark := ""
				if raised["e-"+f] {
					mark = "+"
				}
				all = append(all[:len(all):len(all)], mark+"e-"+f)
			}
		}
	}
	flags := strings.Join(all, " ")
	if flags == "" {
		flags = "-"
	}
	spk := ""
	if cols.spark > 0 {
		spk = " " + s.sparkFor(a, cols.spark)
	}
	num := pad(clean(a.Tail), colTail) + pad(truncate(clean(a.Type), max(0, cols.typ-1)), cols.typ) + padL(fmtSigned(a.RecentPct, 2), colDev) + padL(fmtSigned(a.Drift.Slope, 2), colDrift) + " "
	f, _ := s.data.Factor(a.Tail)
	p, hasP := shownProposal(f, s.props, a.Tail)
	fuel := padL(fmtSigned(a.ExcessFuel/1000, 0), colFuel) + engine + padL(factorCell(f, p, hasP, cols.compact), cols.plan) + " "
	if cols.work > 0 {
		w := "-"
		if items := s.work[a.Tail]; len(items) > 0 {
			w = workStatusShort(items[len(items)-1].Status)
		}
		fuel += pad(w, cols.work)
	}
	flagText := pad(truncate(flags, cols.flags), cols.flags)
	if selected {
		return s.st.Accent.Render(selMark) + s.st.Selected.Render(truncate(num+pad(step, cols.step)+fuel+flagText+spk, s.w-colMark))
	}
	flagCell := flagText
	if len(all) > 0 {
		flagCell = s.st.Flag.Render(flagCell)
	}
	return truncate(noMark+num+stepStyle.Render(pad(step, cols.step))+fuel+flagCell+s.st.Accent.Render(spk), s.w)
}

// sparkFor returns the tail's sparkline of width w, drawn once per data and
// width rather than on every keypress.
func (s *fleetScreen) sparkFor(a model.TailAssessment, w int) string {
	if s.sparkW != w || s.sparks == nil {
		s.sparks, s.sparkW = map[string]string{}, w
	}
	if sp, ok := s.sparks[a.Tail]; ok {
		return sp
	}
	devs := make([]float64, len(a.Flights))
	for j, f := range a.Flights {
		devs[j] = f.DevPct
	}
	sp := sparkline(devs, w, s.sparkLo, s.sparkHi)
	s.sparks[a.Tail] = sp
	return sp
}

func fmtSigned(v float64, prec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return fmt.Sprintf("%+.*f", prec, v)
}
