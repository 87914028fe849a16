package tui

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/charmbracelet/bubbles/cursor"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/textinput"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"
	"gonum.org/v1/gonum/stat"

	"dragdeck/model"
)

// openTailMsg asks the root to open the Tail screen on a tail.
type openTailMsg struct{ tail string }

type fleetKeys struct {
	Up, Down, PgUp, PgDn, Open, Filter, Clear key.Binding
}

var fleetKeyMap = fleetKeys{
	Up: keyUp, Down: keyDown, PgUp: keyPgUp, PgDn: keyPgDn, Open: keyEnter,
	Filter: key.NewBinding(key.WithKeys("/"), key.WithHelp("/", "filter tails")),
	Clear:  key.NewBinding(key.WithKeys("esc"), key.WithHelp("esc", "clear filter")),
}

// fleetScreen lists every tail, most severe first.
type fleetScreen struct {
	data      *Data
	st        Styles
	w, h      int
	cursor    int
	offset    int
	filter    textinput.Model
	filtering bool
	rows      []model.TailAssessment // after the filter
	sparkLo   float64
	sparkHi   float64
	sparks    map[string]string // per tail, drawn for width sparkW
	sparkW    int
	view      string
}

func newFleetScreen(st Styles) *fleetScreen {
	ti := textinput.New()
	ti.Prompt = "filter: "
	ti.Placeholder = "tail or flag"
	ti.CharLimit = 32
	ti.Cursor.SetMode(cursor.CursorStatic) // no blink timer
	return &fleetScreen{st: st, filter: ti}
}

func (s *fleetScreen) Title() string { return "Fleet" }

func (s *fleetScreen) Init() tea.Cmd { return nil }

func (s *fleetScreen) Capturing() bool { return s.filtering }

func (s *fleetScreen) ShortHelp() []key.Binding {
	if s.filtering {
		return []key.Binding{key.NewBinding(key.WithKeys("enter"), key.WithHelp("enter", "keep filter")), fleetKeyMap.Clear}
	}
	return []key.Binding{fleetKeyMap.Up, fleetKeyMap.Down, fleetKeyMap.Open, fleetKeyMap.Filter}
}

func (s *fleetScreen) FullHelp() [][]key.Binding {
	return [][]key.Binding{{fleetKeyMap.Up, fleetKeyMap.Down, fleetKeyMap.PgUp, fleetKeyMap.PgDn}, {fleetKeyMap.Open, fleetKeyMap.Filter, fleetKeyMap.Clear}}
}

// SetData gives the screen its fleet.
func (s *fleetScreen) SetData(d *Data) {
	s.data = d
	var all []float64
	for _, a := range d.Fleet.Tails {
		for _, f := range a.Flights {
			all = append(all, f.DevPct)
		}
	}
	s.sparkLo, s.sparkHi = percentileRange(all)
	s.sparks, s.sparkW = nil, -1
	s.applyFilter()
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

func (s *fleetScreen) applyFilter() {
	s.rows = s.rows[:0]
	if s.data != nil {
		q := strings.ToLower(strings.TrimSpace(s.filter.Value()))
		for _, a := range s.data.Fleet.Tails {
			if q == "" || strings.Contains(strings.ToLower(a.Tail), q) || strings.Contains(strings.Join(a.Flags, " "), q) {
				s.rows = append(s.rows, a)
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
	if s.filtering {
		switch km.String() {
		case "enter":
			s.filtering = false
			s.filter.Blur()
		case "esc":
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
	case key.Matches(km, fleetKeyMap.Up):
		s.cursor--
	case key.Matches(km, fleetKeyMap.Down):
		s.cursor++
	case key.Matches(km, fleetKeyMap.PgUp):
		s.cursor -= page
	case key.Matches(km, fleetKeyMap.PgDn):
		s.cursor += page
	case key.Matches(km, fleetKeyMap.Filter):
		s.filtering = true
		s.render()
		return s, s.filter.Focus()
	case key.Matches(km, fleetKeyMap.Clear) && s.filter.Value() != "":
		s.filter.SetValue("")
		s.applyFilter()
		return s, nil
	case key.Matches(km, fleetKeyMap.Open):
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

// listHeight is the number of table rows that fit.
func (s *fleetScreen) listHeight() int { return max(1, s.h-4) }

func (s *fleetScreen) View() string { return s.view }

// Column widths of the table; the sparkline takes what is left.
const (
	colTail  = 8
	colDev   = 7
	colDrift = 7
	colStep  = 17
	colFuel  = 7
	colFlags = 17
)

func (s *fleetScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	if s.data == nil {
		s.view = placeholder(s.w, s.h, "no data")
		return
	}
	d := s.data
	var b strings.Builder
	span := "no snapshots"
	if !d.First.IsZero() {
		span = d.First.Format("2006-01-02") + " … " + d.Last.Format("2006-01-02")
	}
	head := fmt.Sprintf("%s · %s · %d tails · %d snapshots · %d rejected · %s",
		d.Source, d.Type.Name, len(d.Fleet.Tails), d.Stats.Accepted, d.Stats.Rejected, span)
	b.WriteString(s.st.Muted.Render(truncate(head, s.w)) + "\n")
	summary := fmt.Sprintf("fleet median recent deviation %s %% · ", fmtSigned(d.Fleet.MedianRecentPct, 2))
	flagged := fmt.Sprintf("%d flagged", d.Fleet.Flagged)
	if d.Fleet.Flagged > 0 {
		flagged = s.st.Flag.Render(flagged)
	}
	line2 := summary + flagged
	if s.filtering || s.filter.Value() != "" {
		line2 += "   " + s.filter.View()
	}
	b.WriteString(line2 + "\n")
	spark := max(0, s.w-colTail-colDev-colDrift-colStep-colFuel-colFlags-6)
	header := pad("tail", colTail) + padL("dev %", colDev) + padL("drift", colDrift) + " " + pad("last step", colStep) +
		padL("fuel t", colFuel) + " " + pad("flags", colFlags) + " " + pad("per-flight deviation", spark)
	b.WriteString(s.st.Header.Render(truncate(header, s.w)) + "\n")
	if len(s.rows) == 0 {
		msg := "no tails"
		if s.filter.Value() != "" {
			msg = "no tail matches the filter"
		}
		b.WriteString(s.st.Muted.Render(msg) + "\n")
		s.view = b.String()
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
		a := s.rows[i]
		step := "-"
		stepStyle := s.st.Text
		if k := len(a.Steps); k > 0 {
			st := a.Steps[k-1]
			step = st.Time.Format("2006-01-02") + " " + fmtSigned(st.SizePct, 1)
			if st.SizePct < 0 {
				stepStyle = s.st.Improve
			} else {
				stepStyle = s.st.Flag
			}
		}
		flags := strings.Join(a.Flags, " ")
		if flags == "" {
			flags = "-"
		}
		spk := s.sparkFor(a, spark)
		num := pad(a.Tail, colTail) + padL(fmtSigned(a.RecentPct, 2), colDev) + padL(fmtSigned(a.Drift.Slope, 2), colDrift) + " "
		fuel := padL(fmtSigned(a.ExcessFuel/1000, 0), colFuel) + " "
		var line string
		if i == s.cursor {
			line = s.st.Selected.Render(truncate(num+pad(step, colStep)+fuel+pad(flags, colFlags)+" "+spk, s.w))
		} else {
			flagCell := pad(flags, colFlags)
			if len(a.Flags) > 0 {
				flagCell = s.st.Flag.Render(flagCell)
			}
			line = num + stepStyle.Render(pad(step, colStep)) + fuel + flagCell + " " + s.st.Accent.Render(spk)
		}
		b.WriteString(line + "\n")
	}
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(strings.TrimSuffix(b.String(), "\n"))
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

// percentileRange returns the 2nd and 98th percentiles of v (a scale that
// outliers do not flatten), or 0…1 without data.
func percentileRange(v []float64) (float64, float64) {
	if len(v) == 0 {
		return 0, 1
	}
	c := append([]float64(nil), v...)
	sort.Float64s(c)
	lo, hi := stat.Quantile(0.02, stat.LinInterp, c, nil), stat.Quantile(0.98, stat.LinInterp, c, nil)
	if !(hi > lo) {
		return lo - 1, lo + 1
	}
	return lo, hi
}

func fmtSigned(v float64, prec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "-"
	}
	return fmt.Sprintf("%+.*f", prec, v)
}

// pad left-aligns s in w cells; padL right-aligns it.
func pad(s string, w int) string {
	s = truncate(s, w)
	return s + strings.Repeat(" ", max(0, w-lipgloss.Width(s)))
}

func padL(s string, w int) string {
	s = truncate(s, w)
	return strings.Repeat(" ", max(0, w-lipgloss.Width(s))) + s
}

// truncate cuts plain text to w cells.
func truncate(s string, w int) string {
	if w <= 0 {
		return ""
	}
	r := []rune(s)
	if len(r) <= w {
		return s
	}
	if w == 1 {
		return "…"
	}
	return string(r[:w-1]) + "…"
}
