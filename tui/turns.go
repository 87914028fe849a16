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

type turnsKeys struct{ Faster, Slower key.Binding }

var turnsKeyMap = turnsKeys{
	Faster: key.NewBinding(key.WithKeys("+", "="), key.WithHelp("+", "Mach +0.01")),
	Slower: key.NewBinding(key.WithKeys("-"), key.WithHelp("-", "Mach −0.01")),
}

// turnsScreen shows what a level turn costs at the current condition.
type turnsScreen struct {
	t    *model.Type
	st   Styles
	w, h int
	c    Condition
	rows []model.BankRow
	view string
}

func newTurnsScreen(st Styles) *turnsScreen { return &turnsScreen{st: st} }

func (s *turnsScreen) Title() string { return "Turns" }

func (s *turnsScreen) Init() tea.Cmd { return nil }

func (s *turnsScreen) ShortHelp() []key.Binding {
	return []key.Binding{turnsKeyMap.Faster, turnsKeyMap.Slower}
}

func (s *turnsScreen) FullHelp() [][]key.Binding {
	return [][]key.Binding{{turnsKeyMap.Faster, turnsKeyMap.Slower}}
}

func (s *turnsScreen) SetSize(w, h int) {
	s.w, s.h = w, h
	s.render()
}

// SetCondition recomputes the table for c.
func (s *turnsScreen) SetCondition(t *model.Type, c Condition) {
	s.t, s.c = t, c
	s.rows = model.BankTable(t, c.Weight, model.AirISA(c.Altitude, c.ISADev), c.Mach, c.excess(t))
	s.render()
}

func (s *turnsScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	km, ok := msg.(tea.KeyMsg)
	if !ok || s.t == nil {
		return s, nil
	}
	switch {
	case key.Matches(km, turnsKeyMap.Faster):
		s.c.Mach = math.Min(s.t.MMO, math.Round(s.c.Mach*100+1)/100)
	case key.Matches(km, turnsKeyMap.Slower):
		// Not below the Mach that keeps the buffet margin wings level:
		// below it every row of the table is beyond buffet.
		s.c.Mach = math.Max(s.minMach(), math.Round(s.c.Mach*100-1)/100)
	default:
		return s, nil
	}
	s.SetCondition(s.t, s.c)
	c := s.c
	return s, func() tea.Msg { return conditionMsg{c} }
}

// minMach is the lowest Mach the screen goes to, model.MinBuffetMach
// rounded up to 0.01.
func (s *turnsScreen) minMach() float64 {
	m := model.MinBuffetMach(s.t, s.c.Weight, model.AirISA(s.c.Altitude, s.c.ISADev))
	return math.Min(s.t.MMO, math.Ceil(m*100-1e-9)/100)
}

func (s *turnsScreen) View() string { return s.view }

func (s *turnsScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	if s.t == nil || len(s.rows) == 0 {
		s.view = placeholder(s.w, s.h, "no condition")
		return
	}
	c := s.c
	level := model.LevelFlight(s.t, c.Weight, model.AirISA(c.Altitude, c.ISADev), c.Mach, c.excess(s.t))
	title := truncate(s.st.Title.Render("Turns")+s.st.Muted.Render(fmt.Sprintf("  %.1f t · FL%03.0f · M%.2f · ISA %+.0f °C · wings level %.0f kg/h",
		c.Weight/1000, c.Altitude/model.Foot/100, c.Mach, math.Round(c.ISADev)+0, level.FuelFlow*model.Hour)), s.w) + "\n" +
		s.st.Muted.Render(truncate("level turn: n = 1/cos(bank), induced drag × n², wave drag at the turning CL", s.w))
	lines := []string{
		s.st.Header.Render(fmt.Sprintf("%4s %6s %5s %8s %7s %6s", "bank", "n", "CL", "induced", "total", "kg/h")),
	}
	beyond := 0
	for _, r := range s.rows {
		style, mark := s.st.Text, ""
		if r.Buffet {
			style, mark = s.st.Limit, " !" // the 1.3 g buffet margin is not kept
			beyond++
		}
		lines = append(lines, style.Render(fmt.Sprintf("%3.0f° %6.4f %5.3f %+7.1f%% %+6.1f%% %+6.0f%s",
			r.Bank*180/math.Pi, r.LoadFactor, r.CL, r.InducedIncreasePct, r.TotalIncreasePct, r.ExtraFuelFlow*model.Hour, mark)))
	}
	if beyond > 0 {
		lines = append(lines, "", s.st.Limit.Render("! beyond buffet: the 1.3 g"), s.st.Limit.Render("  margin is not kept"))
	}
	left := strings.Join(lines, "\n")
	if beyond > 0 {
		title += "\n" + s.st.Limit.Render(truncate(fmt.Sprintf("beyond buffet from %.0f° of bank: fly faster or lower", s.firstBuffet()), s.w))
	}
	rightW := s.w - lipgloss.Width(left) - 2
	if rightW < 24 {
		s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(title + "\n" + left)
		return
	}
	// The curves are the table's rows, drawn at every 5° (the pipeline's
	// table, not a second computation).
	var tot, ind [][2]float64
	var ys []float64
	for _, r := range s.rows {
		deg := r.Bank * 180 / math.Pi
		tot = append(tot, [2]float64{deg, r.TotalIncreasePct})
		ind = append(ind, [2]float64{deg, r.InducedIncreasePct})
		ys = append(ys, r.TotalIncreasePct, r.InducedIncreasePct)
	}
	_, hi := span(ys, 0.05, 1)
	ys0 := niceStep(hi, 8)
	hi = math.Ceil(hi/ys0) * ys0
	step := 5.0
	if rightW < 50 {
		step = 15
	}
	var xt []tick
	for d := 0.0; d <= 45; d += step {
		xt = append(xt, tick{d, fmt.Sprintf("%.0f°", d)})
	}
	chartH := max(4, min(s.h-lipgloss.Height(title)-1, 18))
	// The axis runs a little past 45° so that the last label has room.
	spec := chartSpec{w: rightW, h: chartH, minX: 0, maxX: 48, minY: 0, maxY: hi, axis: s.st.Muted, xTicks: xt,
		yTicks: niceTicks(0, hi, 5, func(v float64) string { return fmt.Sprintf("%.0f%%", v) }),
		series: []series{{points: ind, line: true, style: s.st.Accent}, {points: tot, line: true, style: s.st.Flag}}}
	legend := s.st.Muted.Render("drag increase vs bank · ") + s.st.Accent.Render("induced") + " · " + s.st.Flag.Render("total")
	right := truncate(legend, rightW) + "\n" + spec.render("no chart")
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(title + "\n" + lipgloss.JoinHorizontal(lipgloss.Top, left, "  ", right))
}

// firstBuffet is the lowest bank of the table beyond buffet, degrees.
func (s *turnsScreen) firstBuffet() float64 {
	for _, r := range s.rows {
		if r.Buffet {
			return r.Bank * 180 / math.Pi
		}
	}
	return math.NaN()
}
