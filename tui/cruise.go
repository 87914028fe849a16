package tui

import (
	"fmt"
	"math"
	"strings"

	"github.com/charmbracelet/bubbles/key"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/model"
)

type cruiseKeys struct {
	Heavier, Lighter, Up, Down, CIUp, CIDown, Warmer, Colder key.Binding
}

var cruiseKeyMap = cruiseKeys{
	Heavier: key.NewBinding(key.WithKeys("+", "="), key.WithHelp("+", "heavier 1 t")),
	Lighter: key.NewBinding(key.WithKeys("-"), key.WithHelp("-", "lighter 1 t")),
	Up:      key.NewBinding(key.WithKeys("up", "k"), key.WithHelp("↑/k", "1000 ft higher")),
	Down:    key.NewBinding(key.WithKeys("down", "j"), key.WithHelp("↓/j", "1000 ft lower")),
	CIUp:    key.NewBinding(key.WithKeys("]"), key.WithHelp("]", "cost index +5")),
	CIDown:  key.NewBinding(key.WithKeys("["), key.WithHelp("[", "cost index −5")),
	Warmer:  key.NewBinding(key.WithKeys("I"), key.WithHelp("I", "ISA +5 °C")),
	Colder:  key.NewBinding(key.WithKeys("i"), key.WithHelp("i", "ISA −5 °C")),
}

// conditionMsg tells the root that the cruise condition was changed here.
type conditionMsg struct{ c Condition }

// cruiseScreen shows the cruise optimum for a weight, for the baseline and
// for the tail's own polar.
type cruiseScreen struct {
	t          *model.Type
	st         Styles
	w, h       int
	c          Condition
	base, tail model.Optimum
	view       string
}

func newCruiseScreen(st Styles) *cruiseScreen { return &cruiseScreen{st: st} }

func (s *cruiseScreen) Title() string { return "Cruise" }

func (s *cruiseScreen) Init() tea.Cmd { return nil }

func (s *cruiseScreen) ShortHelp() []key.Binding {
	k := cruiseKeyMap
	return []key.Binding{k.Heavier, k.Lighter, k.Up, k.Down}
}

func (s *cruiseScreen) FullHelp() [][]key.Binding {
	k := cruiseKeyMap
	return [][]key.Binding{{k.Heavier, k.Lighter, k.Up, k.Down}, {k.CIUp, k.CIDown, k.Warmer, k.Colder}}
}

func (s *cruiseScreen) SetSize(w, h int) {
	s.w, s.h = w, h
	s.render()
}

// SetCondition recomputes the screen for c.
func (s *cruiseScreen) SetCondition(t *model.Type, c Condition) {
	s.t, s.c = t, c
	s.compute()
}

func (s *cruiseScreen) compute() {
	if s.t == nil {
		return
	}
	c := s.c
	s.base = model.CruiseOptimum(s.t, c.Weight, c.Altitude, c.ISADev, c.CostIndex/model.Minute, 0)
	s.tail = model.CruiseOptimum(s.t, c.Weight, c.Altitude, c.ISADev, c.CostIndex/model.Minute, c.excess(s.t))
	s.render()
}

func (s *cruiseScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok || s.t == nil {
		return s, nil
	}
	c := &s.c
	switch {
	case key.Matches(km, cruiseKeyMap.Heavier):
		c.Weight += 1000
	case key.Matches(km, cruiseKeyMap.Lighter):
		c.Weight = math.Max(1000, c.Weight-1000)
	case key.Matches(km, cruiseKeyMap.Up):
		c.Altitude = math.Min(s.t.MaxAltitude, math.Round(c.Altitude/model.Foot/1000+1)*1000*model.Foot)
	case key.Matches(km, cruiseKeyMap.Down):
		c.Altitude = math.Max(0, math.Round(c.Altitude/model.Foot/1000-1)*1000*model.Foot)
	case key.Matches(km, cruiseKeyMap.CIUp):
		c.CostIndex += 5
	case key.Matches(km, cruiseKeyMap.CIDown):
		c.CostIndex = math.Max(0, c.CostIndex-5)
	case key.Matches(km, cruiseKeyMap.Warmer):
		c.ISADev = math.Min(40, c.ISADev+5)
	case key.Matches(km, cruiseKeyMap.Colder):
		c.ISADev = math.Max(-40, c.ISADev-5)
	default:
		return s, nil
	}
	s.compute()
	cond := s.c
	return s, func() tea.Msg { return conditionMsg{cond} }
}

func (s *cruiseScreen) View() string { return s.view }

func (s *cruiseScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	if s.t == nil {
		s.view = placeholder(s.w, s.h, "no aircraft type")
		return
	}
	c, b, tl := s.c, s.base, s.tail
	nmT := func(sr float64) float64 { return sr / model.NauticalMile * 1000 }
	who := "baseline polar"
	if c.Tail != "" && !math.IsNaN(c.ExcessPct) {
		who = fmt.Sprintf("%s's own polar: %s, drag %+.2f %% (%+.1f counts here)", clean(c.Tail), c.ExcessFrom, c.ExcessPct, c.excess(s.t)/model.DragCount)
	}
	title := truncate(s.st.Title.Render("Cruise")+s.st.Muted.Render(fmt.Sprintf("  %.1f t · FL%03.0f · ISA %+.0f °C · cost index %g kg/min",
		c.Weight/1000, c.Altitude/model.Foot/100, c.ISADev, c.CostIndex)), s.w) + "\n" + s.st.Muted.Render(truncate(who, s.w))
	lines := []string{
		fmt.Sprintf("%-16s %9s %9s", "", "baseline", "own"),
	}
	row := func(name string, v1, v2 string) string { return fmt.Sprintf("%-16s %9s %9s", name, v1, v2) }
	m := func(l model.Level) string { return fmt.Sprintf("%.3f", l.Mach) }
	lines = append(lines,
		row("minimum drag M", m(b.MinDrag), m(tl.MinDrag)),
		s.st.Accent.Render(row("max range M", m(b.MaxRange), m(tl.MaxRange))),
		s.st.Text.Render(row("long range M", m(b.LongRange), m(tl.LongRange))),
		s.st.Header.Render(row(fmt.Sprintf("economy M CI%g", c.CostIndex), m(b.Econ), m(tl.Econ))),
		row("best SR NM/t", fmt.Sprintf("%.1f", nmT(b.MaxRange.SR)), fmt.Sprintf("%.1f", nmT(tl.MaxRange.SR))),
		row("fuel kg/h at MR", fmt.Sprintf("%.0f", b.MaxRange.FuelFlow*model.Hour), fmt.Sprintf("%.0f", tl.MaxRange.FuelFlow*model.Hour)),
		row("optimum FL", fmt.Sprintf("%03.0f", b.OptimumAltitude/model.Foot/100), fmt.Sprintf("%03.0f", tl.OptimumAltitude/model.Foot/100)),
		row("maximum FL", fmt.Sprintf("%03.0f", b.MaxAltitude/model.Foot/100), fmt.Sprintf("%03.0f", tl.MaxAltitude/model.Foot/100)),
		s.st.Muted.Render(row("  limited by", string(b.MaxAltLimit), string(tl.MaxAltLimit))),
	)
	if tl.MaxRange.SR < b.MaxRange.SR {
		lines = append(lines, s.st.Flag.Render(fmt.Sprintf("excess costs %.1f %% of range", 100*(1-tl.MaxRange.SR/b.MaxRange.SR))))
	}
	lines = append(lines, "", s.levels(max(42, lipgloss.Width(lines[0])+2), s.h-len(lines)-3))
	left := strings.Join(lines, "\n")
	rightW := s.w - lipgloss.Width(left) - 2
	if rightW < 24 {
		s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(title + "\n" + left)
		return
	}
	right := s.srChart(rightW, s.h-2)
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(title + "\n" + lipgloss.JoinHorizontal(lipgloss.Top, left, "  ", right))
}

func (s *cruiseScreen) srChart(w, h int) string {
	c := s.c
	air := model.AirISA(c.Altitude, c.ISADev)
	ex := c.excess(s.t)
	lo := math.Max(0.3, s.base.MinDrag.Mach-0.08)
	hi := s.t.MMO
	var b, t [][2]float64
	var ys []float64
	for m := lo; m <= hi+1e-9; m += (hi - lo) / 80 {
		sb := model.LevelFlight(s.t, c.Weight, air, m, 0).SR / model.NauticalMile * 1000
		st := model.LevelFlight(s.t, c.Weight, air, m, ex).SR / model.NauticalMile * 1000
		b, t = append(b, [2]float64{m, sb}), append(t, [2]float64{m, st})
		ys = append(ys, sb, st)
	}
	y0, y1 := span(ys, 0.05, 1)
	spec := chartSpec{w: w, h: h - 1, minX: lo, maxX: hi, minY: y0, maxY: y1, axis: s.st.Muted,
		xFmt:   func(_ int, v float64) string { return fmt.Sprintf("M%.2f", v) },
		yFmt:   func(_ int, v float64) string { return fmt.Sprintf("%.0f", v) },
		series: []series{{points: b, line: true, style: s.st.Base}, {points: t, line: true, style: s.st.Flag}},
		xTicks: niceTicks(lo, hi, max(1, w/9), func(v float64) string { return fmt.Sprintf("M%.2f", v) }),
		marks:  []vmark{{x: s.tail.MaxRange.Mach, style: s.st.Accent}}}
	legend := s.st.Muted.Render("SR NM/t vs Mach: ") + s.st.Base.Render("baseline") + " " + s.st.Flag.Render("own") +
		s.st.Muted.Render(" · ") + s.st.Accent.Render("│ own max range")
	return truncate(legend, w) + "\n" + spec.render("no range")
}

// levels lists specific range at each flight level for both polars.
func (s *cruiseScreen) levels(w, h int) string {
	if h < 2 {
		return ""
	}
	c := s.c
	ex := c.excess(s.t)
	lines := []string{s.st.Header.Render(truncate(fmt.Sprintf("%-6s %8s %7s %6s  %s", "level", "SR base", "SR own", "M own", "note"), w))}
	top := math.Floor(s.t.MaxAltitude/model.Foot/1000) * 1000
	for ft := top; ft >= 0 && len(lines) < h; ft -= 2000 {
		air := model.AirISA(ft*model.Foot, c.ISADev)
		mb := model.MaxRangeMach(s.t, c.Weight, air, 0)
		mt := model.MaxRangeMach(s.t, c.Weight, air, ex)
		note := ""
		style := s.st.Text
		switch {
		case ft*model.Foot > s.tail.MaxAltitude+1:
			note, style = "above max", s.st.Muted
		case math.Abs(ft*model.Foot-s.tail.OptimumAltitude) <= 1000*model.Foot:
			note, style = "optimum", s.st.Accent
		}
		lines = append(lines, style.Render(truncate(fmt.Sprintf("FL%03.0f %8.1f %7.1f %6.3f  %s", ft/100,
			mb.SR/model.NauticalMile*1000, mt.SR/model.NauticalMile*1000, mt.Mach, note), w)))
	}
	return strings.Join(lines, "\n")
}
