package tui

import (
	"strings"

	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/viewport"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
)

// Caution is the dashboard's statement of what it is not.
const Caution = "dragdeck is an engineering monitoring aid. It is not approved performance data, not for " +
	"dispatch or flight-deck use, and does not replace the type's certified performance data. Its " +
	"results defer to the operator's approved procedures and local regulations."

type aboutKeys struct{ Up, Down, PgUp, PgDn key.Binding }

var aboutKeyMap = aboutKeys{Up: keyUp, Down: keyDown, PgUp: keyPgUp, PgDn: keyPgDn}

// aboutScreen says what the tool is, its caution first, its units and its
// screens, in a viewport that scrolls when the terminal is short.
type aboutScreen struct {
	st Styles
	vp viewport.Model
}

func newAboutScreen(st Styles) *aboutScreen {
	vp := viewport.New(0, 0)
	vp.KeyMap = viewport.KeyMap{Up: aboutKeyMap.Up, Down: aboutKeyMap.Down, PageUp: aboutKeyMap.PgUp, PageDown: aboutKeyMap.PgDn}
	return &aboutScreen{st: st, vp: vp}
}

func (s *aboutScreen) Title() string { return "About" }
func (s *aboutScreen) Init() tea.Cmd { return nil }
func (s *aboutScreen) View() string  { return s.vp.View() }

func (s *aboutScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	var cmd tea.Cmd
	s.vp, cmd = s.vp.Update(msg)
	return s, cmd
}

func (s *aboutScreen) ShortHelp() []key.Binding {
	return []key.Binding{aboutKeyMap.Up, aboutKeyMap.Down}
}

func (s *aboutScreen) FullHelp() [][]key.Binding {
	return [][]key.Binding{{aboutKeyMap.Up, aboutKeyMap.Down, aboutKeyMap.PgUp, aboutKeyMap.PgDn}}
}

func (s *aboutScreen) SetSize(w, h int) {
	s.vp.Width, s.vp.Height = w, h
	width := max(20, min(w, 96))
	p := lipgloss.NewStyle().Width(width)
	parts := []string{
		s.st.Title.Render("dragdeck") + s.st.Muted.Render(" — excess drag of every tail, trended, priced and explained"),
		"",
		s.st.Flag.Render("Caution"),
		p.Render(Caution),
		p.Render(factorCaution),
		"",
		p.Render("Each cruise snapshot (weight, pressure altitude, Mach, air temperature, fuel flow, bank) becomes " +
			"measured drag: thrust from fuel flow, less climb and acceleration. It is split into induced, wave and " +
			"parasite parts against the type's baseline polar; the excess is trended per tail, flagged when it sits " +
			"high, grows or steps, and priced in fuel and CO2."),
		"",
		s.st.Header.Render("Units"),
		p.Render("Weights in kg and t, altitudes in ft and flight levels (pressure altitude), temperatures in °C, " +
			"fuel flow in kg/h, speeds as Mach, specific range in NM per tonne of fuel, drag as coefficients and " +
			"drag counts (0.0001), deviations in % of baseline drag and trends in percentage points (pp) per 100 days. " +
			"Times are UTC."),
		"",
		s.st.Header.Render("Screens"),
		p.Render("Fleet: every tail, most severe first. Tail: when its drag rose, why it is flagged, what it costs. " +
			"Flight: replay or live, the drag split, the turn penalty, the best Mach and level for this weight. " +
			"Cruise: specific range by Mach and level for a weight. Turns: the cost of a bank."),
	}
	s.vp.SetContent(lipgloss.NewStyle().MaxWidth(w).Render(strings.Join(parts, "\n")))
}
