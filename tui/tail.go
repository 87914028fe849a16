package tui

import (
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/feed"
	"dragdeck/feed/store"
	"dragdeck/model"
)

// openFlightMsg asks the root to replay a flight on the Flight screen.
type openFlightMsg struct {
	tail, flight string
	recs         []feed.Record
}

type tailKeys struct {
	Up, Down, Open, ZoomIn, ZoomOut, Left, Right, Factor key.Binding
}

var tailKeyMap = tailKeys{
	Up: keyUp, Down: keyDown,
	Open:    key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "replay flight")),
	ZoomIn:  key.NewBinding(key.WithKeys("+", "="), key.WithHelp("+", "zoom in")),
	ZoomOut: key.NewBinding(key.WithKeys("-"), key.WithHelp("-", "zoom out")),
	Left:    key.NewBinding(key.WithKeys("left", "h"), key.WithHelp("←/h", "earlier")),
	Right:   key.NewBinding(key.WithKeys("right", "l"), key.WithHelp("→/l", "later")),
	Factor:  keyFactorChart,
}

// tailScreen shows one tail: when its drag rose, why it is flagged, what it
// costs, and its flights.
type tailScreen struct {
	data    *Data
	st      Styles
	w, h    int
	a       model.TailAssessment
	ok      bool
	polar   []model.PolarPoint // the current segment's usable snapshots
	cursor  int                // in the flights list, newest first
	listOff int                // first flight shown in the list
	empty   string             // what the screen says without a tail
	// the chart's time window: the last `window` days ending `back` days
	// before the last flight
	window, back float64
	// the top chart shows the fuel factor instead of the drag deviation;
	// the store's factor history of the tail and its open proposals (nil
	// without a store)
	factorView bool
	factorHist []store.FactorSetting
	factorOpen map[string]store.Proposal
	factorErr  error
	view       string
}

func newTailScreen(st Styles) *tailScreen {
	return &tailScreen{st: st, empty: "no tail chosen: pick one on the Fleet screen (enter)"}
}

// SetEmpty sets what the screen says while no tail is shown.
func (s *tailScreen) SetEmpty(msg string) {
	s.empty = msg
	s.render()
}

func (s *tailScreen) Title() string { return "Tail" }

func (s *tailScreen) Init() tea.Cmd { return nil }

func (s *tailScreen) ShortHelp() []key.Binding {
	return []key.Binding{tailKeyMap.Up, tailKeyMap.Down, tailKeyMap.Open, tailKeyMap.ZoomIn, tailKeyMap.ZoomOut, tailKeyMap.Factor}
}

func (s *tailScreen) FullHelp() [][]key.Binding {
	return [][]key.Binding{{tailKeyMap.Up, tailKeyMap.Down, tailKeyMap.Open}, {tailKeyMap.ZoomIn, tailKeyMap.ZoomOut, tailKeyMap.Left, tailKeyMap.Right, tailKeyMap.Factor}}
}

func (s *tailScreen) SetData(d *Data) { s.data = d }

// SetTail shows tail name. Its polar points are the usable snapshots of its
// current segment (the period its own polar is fitted over, from the
// pipeline).
func (s *tailScreen) SetTail(name string) {
	s.a, s.ok = s.data.Tail(name)
	s.cursor, s.listOff, s.back, s.polar = 0, 0, 0, nil
	s.window = 0
	if s.ok && len(s.a.Flights) > 0 {
		s.window = math.Max(1, s.a.Last.Sub(s.a.First).Hours()/24)
	}
	if s.ok {
		s.polar = s.data.PolarPoints(name, true)
	}
	s.loadFactors()
	s.render()
}

func (s *tailScreen) SetSize(w, h int) {
	s.w, s.h = w, h
	s.render()
}

// loadFactors reads the tail's factor history and the open proposals from
// the store (an error leaves them empty and is shown in the facts).
func (s *tailScreen) loadFactors() {
	s.factorHist, s.factorOpen, s.factorErr = nil, nil, nil
	if !s.ok || s.data.Factors == nil {
		return
	}
	h, err := s.data.Factors.History()
	if err != nil {
		s.factorErr = err
		return
	}
	o, err := s.data.Factors.Open()
	if err != nil {
		s.factorErr = err
		return
	}
	s.factorHist, s.factorOpen = h[s.a.Tail], o
}

// flightAt returns the i-th flight, newest first.
func (s *tailScreen) flightAt(i int) (model.FlightPoint, bool) {
	n := len(s.a.Flights)
	if i < 0 || i >= n {
		return model.FlightPoint{}, false
	}
	return s.a.Flights[n-1-i], true
}

func (s *tailScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok || !s.ok {
		return s, nil
	}
	total := math.Max(1, s.a.Last.Sub(s.a.First).Hours()/24)
	switch {
	case key.Matches(km, tailKeyMap.Up):
		s.cursor = max(0, s.cursor-1)
	case key.Matches(km, tailKeyMap.Down):
		s.cursor = min(len(s.a.Flights)-1, s.cursor+1)
	case key.Matches(km, tailKeyMap.ZoomIn):
		s.window = math.Max(7, s.window/2)
	case key.Matches(km, tailKeyMap.ZoomOut):
		s.window = math.Min(total, s.window*2)
	case key.Matches(km, tailKeyMap.Left):
		s.back = math.Min(total-s.window, s.back+s.window/4)
	case key.Matches(km, tailKeyMap.Right):
		s.back = math.Max(0, s.back-s.window/4)
	case key.Matches(km, tailKeyMap.Factor):
		s.factorView = !s.factorView
	case key.Matches(km, tailKeyMap.Open):
		f, ok := s.flightAt(s.cursor)
		if !ok {
			return s, nil
		}
		recs := s.data.FlightRecords(s.a.Tail, f)
		return s, func() tea.Msg { return openFlightMsg{tail: s.a.Tail, flight: s.a.FlightName(f), recs: recs} }
	default:
		return s, nil
	}
	s.back = math.Max(0, s.back)
	s.render()
	return s, nil
}

func (s *tailScreen) View() string { return s.view }

func (s *tailScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	if s.data == nil || !s.ok {
		s.view = placeholder(s.w, s.h, s.empty)
		return
	}
	a := s.a
	title := s.st.Title.Render(clean(a.Tail))
	if s.data.Roster.Mixed() {
		title += s.st.Muted.Render("  " + clean(a.Type))
	}
	flags := append([]string(nil), a.Flags...)
	if e, ok := s.data.EngineTail(a.Tail); ok {
		for _, f := range e.Flags {
			flags = append(flags, "e-"+f)
		}
	}
	if len(flags) > 0 {
		title += "  " + s.st.Flag.Render("flags: "+strings.Join(flags, " "))
	} else {
		title += "  " + s.st.Improve.Render("no flags")
	}
	title += s.st.Muted.Render(fmt.Sprintf("  %d flights, %d snapshots, %s … %s", len(a.Flights), a.Points,
		a.First.Format("2006-01-02"), a.Last.Format("2006-01-02")))
	title = truncate(title, s.w)
	if len(a.Flights) == 0 {
		why := "no usable snapshots for this tail"
		if w := a.Why(); w != "" {
			why += ": " + w
		}
		s.view = title + "\n" + placeholder(s.w, s.h-1, why)
		return
	}
	// Rows: the title, the deviation block (legend and chart), the polar
	// and facts block, the flights block (header and rows); they add up to
	// the screen's height exactly, so that nothing is cut at the bottom.
	rows := s.listRows()
	avail := max(2, s.h-1-(rows+1))
	devH := avail * 55 / 100
	lowH := avail - devH
	var dev string
	if s.factorView {
		dev = s.factorChart(s.w, devH)
	} else {
		dev = s.deviationChart(s.w, devH)
	}
	leftW := s.w * 45 / 100
	polar := s.polarChart(leftW, lowH)
	facts := s.facts(s.w-leftW-1, lowH)
	low := lipgloss.JoinHorizontal(lipgloss.Top, polar, " ", facts)
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(
		lipgloss.JoinVertical(lipgloss.Left, title, dev, low, s.flightList(rows)))
}

// listRows is the number of flights the list shows.
func (s *tailScreen) listRows() int { return max(2, min(6, s.h/6)) }

// deviationChart is the legend and the chart of the tail's deviation per
// flight, h lines in all. The rolling median, the drift line and the steps
// are the pipeline's; the x axis has a label at each month's start.
func (s *tailScreen) deviationChart(w, h int) string {
	a := s.a
	end := a.Last.Add(-time.Duration(s.back * 24 * float64(time.Hour)))
	start := end.Add(-time.Duration(s.window * 24 * float64(time.Hour)))
	x := func(t time.Time) float64 { return float64(t.Unix()) / 86400 }
	var pts, med [][2]float64
	var ys []float64
	rolling := a.Rolling()
	for i, f := range a.Flights {
		t := f.At()
		if t.Before(start) || t.After(end) {
			continue
		}
		pts = append(pts, [2]float64{x(t), f.DevPct})
		med = append(med, [2]float64{x(t), rolling[i]})
		ys = append(ys, f.DevPct)
	}
	// The engine series' rolling median shares the axis, so the range
	// holds it too (a meter reading 4 % high sits above the airframe's).
	e, hasEngine := s.data.EngineTail(a.Tail)
	var em [][2]float64
	engineRolling := e.Rolling()
	for i, f := range e.Flights {
		if t := f.At(); hasEngine && !t.Before(start) && !t.After(end) && !math.IsNaN(engineRolling[i]) {
			em = append(em, [2]float64{x(t), engineRolling[i]})
			ys = append(ys, engineRolling[i])
		}
	}
	lo, hi := span(ys, 0.05, 0.5)
	spec := s.timeChart(w, h-1, start, end, lo, hi, x,
		series{points: pts, style: s.st.Muted},
		series{points: med, line: true, style: s.st.Accent})
	if !math.IsNaN(a.Drift.Slope) {
		spec.series = append(spec.series, series{line: true, style: s.st.Drift, points: [][2]float64{
			{x(a.DriftFrom), a.DriftAt(a.DriftFrom)}, {x(a.DriftTo), a.DriftAt(a.DriftTo)}}})
	}
	for _, st := range a.Steps {
		style := s.st.Flag
		if st.SizePct < 0 {
			style = s.st.Improve
		}
		spec.marks = append(spec.marks, vmark{x: x(st.Time), style: style})
	}
	for _, e := range a.Events {
		spec.marks = append(spec.marks, vmark{x: x(e.Time), style: s.st.Event})
	}
	engine := ""
	if hasEngine {
		spec.series = append(spec.series, series{points: em, line: true, style: s.st.Engine})
		for _, st := range e.Steps {
			spec.marks = append(spec.marks, vmark{x: x(st.Time), style: s.st.Engine})
		}
		engine = s.st.Engine.Render("engine") + " · "
	}
	legend := s.st.Muted.Render("drag deviation per flight, % · ") + s.st.Accent.Render("rolling median") + " · " + engine +
		s.st.Drift.Render("drift") + " · " + s.st.Flag.Render("step up") + " · " + s.st.Improve.Render("step down") + " · " +
		s.st.Event.Render("event") + s.st.Muted.Render(fmt.Sprintf(" · %.0f days (+/-, ←/→) · f: fuel factor", s.window))
	return truncate(legend, w) + "\n" + spec.render("no flights in this window")
}

// timeChart is a chart of per cent against time over start … end, with
// month ticks: the Tail screen's top charts.
func (s *tailScreen) timeChart(w, h int, start, end time.Time, lo, hi float64, x func(time.Time) float64, ser ...series) chartSpec {
	return chartSpec{w: w, h: h, minX: x(start), maxX: x(end), minY: lo, maxY: hi,
		xTicks: dateTicks(start, end, max(1, w/8), x),
		yFmt: func(_ int, v float64) string {
			if math.Abs(v) < 0.05 {
				v = 0 // not "-0.0%"
			}
			return fmt.Sprintf("%+.1f%%", v)
		},
		axis: s.st.Muted, series: ser}
}

// polarChart is the tail's usable snapshots of its current segment as CD −
// wave against CL², with the baseline polar and the tail's own fit over the
// same period (from the pipeline), h lines in all.
func (s *tailScreen) polarChart(w, h int) string {
	if len(s.polar) == 0 {
		return placeholder(w, h, "no usable snapshots since "+s.a.PolarFrom.Format("2006-01-02"))
	}
	t := s.data.TypeOf(s.a.Tail)
	pts := make([][2]float64, len(s.polar))
	xs, ys := make([]float64, len(s.polar)), make([]float64, len(s.polar))
	for i, p := range s.polar {
		pts[i] = [2]float64{p.CL * p.CL, p.CDMeasured - p.CDWave}
		xs[i], ys[i] = pts[i][0], pts[i][1]
	}
	x0, x1 := span(xs, 0.05, 0.01)
	y0, y1 := span(ys, 0.05, 0.0005)
	line := func(cd0, k float64) [][2]float64 { return [][2]float64{{x0, cd0 + k*x0}, {x1, cd0 + k*x1}} }
	spec := chartSpec{w: w, h: h - 1, minX: x0, maxX: x1, minY: y0, maxY: y1, axis: s.st.Muted,
		xFmt:   func(_ int, v float64) string { return fmt.Sprintf("%.2f", v) },
		yFmt:   func(_ int, v float64) string { return fmt.Sprintf("%.4f", v) },
		series: []series{{points: pts, style: s.st.Muted}, {points: line(t.CD0, t.K()), line: true, style: s.st.Base}}}
	legend := s.st.Muted.Render("CD−wave vs CL² since "+s.a.PolarFrom.Format("2006-01-02")+": ") + s.st.Base.Render("baseline")
	if s.a.PolarErr == nil {
		spec.series = append(spec.series, series{points: line(s.a.Polar.CD0, s.a.Polar.K), line: true, style: s.st.Flag})
		legend += " " + s.st.Flag.Render("this tail")
	}
	return truncate(legend, w) + "\n" + spec.render("no points")
}

// facts are the numbers behind the flags and the cost.
func (s *tailScreen) facts(w, h int) string {
	a, c, f := s.a, s.data.Config, s.data.Fleet
	var lines []string
	add := func(style lipgloss.Style, format string, args ...any) {
		lines = append(lines, style.Render(truncate(fmt.Sprintf(format, args...), w)))
	}
	mark := func(flag string) lipgloss.Style {
		for _, x := range a.Flags {
			if x == flag {
				return s.st.Flag
			}
		}
		return s.st.Text
	}
	add(mark(model.FlagLevel), "level  %s %% last %g d · flag ≥ %s", fmtSigned(a.RecentPct, 2), c.RecentDays, fmtSigned(f.MedianRecentPct+c.LevelPP, 2))
	if math.IsNaN(a.Drift.Slope) {
		add(s.st.Muted, "growth none: too little data since the last step")
	} else {
		add(mark(model.FlagGrowth), "growth %s pp/100 d [%s, %s] · flag ≥ %g pp/%g d",
			fmtSigned(a.Drift.Slope, 2), fmtSigned(a.Drift.Lo, 2), fmtSigned(a.Drift.Hi, 2), c.GrowthPP, c.DriftDays)
	}
	if len(a.Steps) == 0 {
		add(s.st.Text, "step   none · flag ≥ %+g pp", c.StepPP)
	}
	for _, st := range a.Steps {
		style := mark(model.FlagStep)
		if st.SizePct < 0 {
			style = s.st.Improve
		}
		ev := ""
		if st.Event != nil {
			ev = " · " + st.Event.Kind
		}
		add(style, "step   %s %s ± %.2f pp%s", st.Time.Format("2006-01-02"), fmtSigned(st.SizePct, 2), st.SE, ev)
	}
	add(s.st.Text, "cost   %s t fuel · %s t CO2 a year", fmtSigned(a.ExcessFuel/1000, 0), fmtSigned(a.CO2/1000, 0))
	add(s.st.Plan, "%s", s.factorFact())
	if e, ok := s.data.EngineTail(a.Tail); ok {
		flags := strings.Join(e.Flags, " ")
		if flags == "" {
			flags = "no flags"
		}
		step := "no step"
		if k := len(e.Steps); k > 0 {
			step = "step " + e.Steps[k-1].Time.Format("2006-01-02") + " " + fmtSigned(e.Steps[k-1].SizePct, 2)
		}
		add(s.st.Engine, "engine %s %% · %s pp/100 d · %s · %s t fuel · %s", fmtSigned(e.RecentPct, 2), fmtSigned(e.Drift.Slope, 2), step,
			fmtSigned(e.ExcessFuel/1000, 0), flags)
	} else {
		add(s.st.Muted, "engine unknown (thrust from fuel flow)")
	}
	if c.FuelPrice > 0 {
		add(s.st.Text, "       %s a year at %g per kg", fmtSigned(a.Money, 0), c.FuelPrice)
	}
	if p, ty := a.Polar, s.data.TypeOf(a.Tail); a.PolarErr == nil && ty != nil {
		add(s.st.Muted, "polar  since %s: CD0 %.5f (base %.5f) · k %.4f (%.4f)", a.PolarFrom.Format("2006-01-02"), p.CD0, ty.CD0, p.K, ty.K())
	} else if a.PolarErr != nil {
		add(s.st.Muted, "polar  since %s: no fit (%v)", a.PolarFrom.Format("2006-01-02"), a.PolarErr)
	}
	for len(lines) < h {
		lines = append(lines, "")
	}
	return strings.Join(lines[:h], "\n")
}

// flightList is the header and the rows flights around the cursor; the
// selected one starts with the selection marker and is always among them.
func (s *tailScreen) flightList(rows int) string {
	if s.cursor < s.listOff {
		s.listOff = s.cursor
	}
	if s.cursor >= s.listOff+rows {
		s.listOff = s.cursor - rows + 1
	}
	lines := []string{s.st.Header.Render(truncate("flights, newest first (enter replays)", s.w))}
	for i := s.listOff; i < s.listOff+rows; i++ {
		f, ok := s.flightAt(i)
		if !ok {
			break
		}
		line := fmt.Sprintf("%s  %-8s  %s %%  (%d snapshot%s)", f.At().Format("2006-01-02 15:04"), clean(s.a.FlightName(f)), fmtSigned(f.DevPct, 2), f.N, plural(int(f.N)))
		if i == s.cursor {
			line = s.st.Accent.Render(selMark) + s.st.Selected.Render(truncate(line, s.w-markW))
		} else {
			line = truncate(noMark+line, s.w)
		}
		lines = append(lines, line)
	}
	return strings.Join(lines, "\n")
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}
