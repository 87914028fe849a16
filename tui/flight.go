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
	"dragdeck/model"
)

// Messages of the Flight screen.
type (
	replayTickMsg struct{ gen int }
	liveRecordMsg struct{ rec feed.Record }
	liveNoticeMsg struct{ text string }
	liveRejectMsg struct{ err *feed.RowError }
	liveEndMsg    struct{ err error }
)

type flightKeys struct {
	Play, Faster, Slower, Step, Back, Start, End key.Binding
}

var flightKeyMap = flightKeys{
	Play:   key.NewBinding(key.WithKeys(" ", "p"), key.WithHelp("space", "play/pause")),
	Faster: key.NewBinding(key.WithKeys("+", "="), key.WithHelp("+", "faster")),
	Slower: key.NewBinding(key.WithKeys("-"), key.WithHelp("-", "slower")),
	Step:   key.NewBinding(key.WithKeys("right", "l"), key.WithHelp("→/l", "next snapshot")),
	Back:   key.NewBinding(key.WithKeys("left", "h"), key.WithHelp("←/h", "previous")),
	Start:  key.NewBinding(key.WithKeys("g", "home"), key.WithHelp("g", "to start")),
	End:    key.NewBinding(key.WithKeys("G", "end"), key.WithHelp("G", "to end")),
}

// maxReplayWait caps the wait between two snapshots on screen.
const maxReplayWait = 2 * time.Second

// flightScreen replays a flight or follows a live file.
type flightScreen struct {
	t       *model.Type
	st      Styles
	w, h    int
	tail    string
	flight  string
	recs    []feed.Record // the whole replay, or what has arrived live
	points  []model.Point // analysis of recs[:pos]
	pos     int           // snapshots shown
	playing bool
	speed   float64 // times real time; 0: as fast as the screen goes
	gen     int
	live    bool
	source  string
	notice  string
	ci      float64 // cost index, kg/min

	opt       model.Optimum // for the current snapshot and the flight's own polar
	optOK     bool
	bank      model.BankRow
	excessPct float64
	view      string
}

func newFlightScreen(st Styles) *flightScreen { return &flightScreen{st: st, speed: 60} }

func (s *flightScreen) Title() string { return "Flight" }

func (s *flightScreen) Init() tea.Cmd { return nil }

func (s *flightScreen) ShortHelp() []key.Binding {
	if s.live {
		return nil
	}
	return []key.Binding{flightKeyMap.Play, flightKeyMap.Faster, flightKeyMap.Slower, flightKeyMap.Step, flightKeyMap.Back}
}

func (s *flightScreen) FullHelp() [][]key.Binding {
	if s.live {
		return nil
	}
	return [][]key.Binding{{flightKeyMap.Play, flightKeyMap.Faster, flightKeyMap.Slower}, {flightKeyMap.Step, flightKeyMap.Back, flightKeyMap.Start, flightKeyMap.End}}
}

func (s *flightScreen) SetSize(w, h int) {
	s.w, s.h = w, h
	s.render()
}

// Replay starts a replay of recs (time order) at speed, playing.
func (s *flightScreen) Replay(t *model.Type, tail, flight string, recs []feed.Record, speed float64) tea.Cmd {
	s.t, s.tail, s.flight, s.recs, s.live, s.source, s.notice = t, tail, flight, recs, false, "", ""
	s.speed = speed
	s.points = s.points[:0]
	s.pos = 0
	s.gen++
	s.playing = len(recs) > 0
	s.seek(min(1, len(recs)))
	return s.schedule()
}

// Live switches the screen to records arriving from source.
func (s *flightScreen) Live(t *model.Type, source string) {
	s.t, s.source, s.live, s.playing = t, source, true, false
	s.recs, s.points, s.pos, s.tail, s.flight, s.notice = nil, nil, 0, "", "", ""
	s.gen++
	s.render()
}

// current returns the snapshot on screen.
func (s *flightScreen) current() (feed.Record, model.Point, bool) {
	if s.pos == 0 {
		return feed.Record{}, model.Point{}, false
	}
	return s.recs[s.pos-1], s.points[s.pos-1], true
}

// seek shows the first n snapshots.
func (s *flightScreen) seek(n int) {
	n = max(0, min(n, len(s.recs)))
	for len(s.points) < n {
		s.points = append(s.points, model.Analyze(s.t, s.recs[len(s.points)].Snap))
	}
	s.points = s.points[:n]
	s.pos = n
	s.update()
}

// update recomputes what depends on the current snapshot.
func (s *flightScreen) update() {
	s.optOK = false
	r, p, ok := s.current()
	if ok {
		devs := make([]float64, s.pos)
		for i := range devs {
			devs[i] = s.points[i].DragDevPct
		}
		s.excessPct = model.Median(devs)
		air := model.AirAt(r.Snap.Altitude, r.Snap.SAT)
		excess := s.excessPct / 100 * p.CDBaseline
		if s.t.CD0+excess > 0 {
			s.opt = model.CruiseOptimum(s.t, r.Snap.Weight, r.Snap.Altitude, air.ISADev(), s.ci/model.Minute, excess)
			s.optOK = true
		}
		s.bank = model.BankPenalty(s.t, r.Snap.Weight, air, r.Snap.Mach, 0, r.Snap.Bank)
		if s.tail == "" {
			s.tail, s.flight = r.Tail, r.Flight
		}
	}
	s.render()
}

// schedule asks for the next replay tick.
func (s *flightScreen) schedule() tea.Cmd {
	if !s.playing || s.live || s.pos >= len(s.recs) {
		s.playing = s.playing && s.pos < len(s.recs)
		return nil
	}
	wait := 50 * time.Millisecond
	if s.speed > 0 && s.pos > 0 {
		gap := s.recs[s.pos].Time.Sub(s.recs[s.pos-1].Time)
		wait = min(maxReplayWait, max(20*time.Millisecond, time.Duration(float64(gap)/s.speed)))
	}
	gen := s.gen
	return tea.Tick(wait, func(time.Time) tea.Msg { return replayTickMsg{gen} })
}

func (s *flightScreen) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case replayTickMsg:
		if msg.gen != s.gen || !s.playing {
			return s, nil
		}
		s.seek(s.pos + 1)
		cmd := s.schedule()
		if !s.playing {
			s.render()
		}
		return s, cmd
	case liveRecordMsg:
		if !s.live {
			return s, nil
		}
		s.recs = append(s.recs, msg.rec)
		s.seek(len(s.recs))
		return s, nil
	case liveNoticeMsg:
		s.notice = msg.text
		s.render()
		return s, nil
	case liveRejectMsg:
		s.notice = "rejected " + msg.err.Error()
		s.render()
		return s, nil
	case liveEndMsg:
		if msg.err != nil {
			s.notice = "stopped: " + msg.err.Error()
		}
		s.render()
		return s, nil
	case tea.KeyMsg:
		if s.live {
			return s, nil
		}
		switch {
		case key.Matches(msg, flightKeyMap.Play):
			if s.pos >= len(s.recs) {
				s.seek(min(1, len(s.recs)))
			}
			s.playing = !s.playing
			s.gen++
			s.render()
			return s, s.schedule()
		case key.Matches(msg, flightKeyMap.Faster):
			s.speed = math.Min(3600, math.Max(1, s.speed*2))
		case key.Matches(msg, flightKeyMap.Slower):
			s.speed = math.Max(1, s.speed/2)
		case key.Matches(msg, flightKeyMap.Step):
			s.playing = false
			s.seek(s.pos + 1)
		case key.Matches(msg, flightKeyMap.Back):
			s.playing = false
			s.seek(max(1, s.pos-1))
		case key.Matches(msg, flightKeyMap.Start):
			s.seek(min(1, len(s.recs)))
		case key.Matches(msg, flightKeyMap.End):
			s.playing = false
			s.seek(len(s.recs))
		default:
			return s, nil
		}
		s.gen++
		s.render()
		return s, s.schedule()
	}
	return s, nil
}

func (s *flightScreen) View() string { return s.view }

func (s *flightScreen) render() {
	if s.w <= 0 || s.h <= 0 {
		return
	}
	var head string
	switch {
	case s.live:
		head = s.st.Flag.Render("● LIVE") + s.st.Muted.Render(fmt.Sprintf("  following %s · %d snapshots", s.source, len(s.recs)))
	case len(s.recs) == 0:
		s.view = placeholder(s.w, s.h, "no flight: open one from the Tail screen (enter on a flight)")
		return
	default:
		state := "paused"
		if s.playing {
			state = "playing"
		} else if s.pos >= len(s.recs) {
			state = "at the end"
		}
		speed := fmt.Sprintf("×%g", s.speed)
		if s.speed == 0 {
			speed = "no waiting"
		}
		head = s.st.Title.Render("Flight "+s.flight+" · "+s.tail) + s.st.Muted.Render(fmt.Sprintf("  replay %d/%d · %s · %s", s.pos, len(s.recs), speed, state))
	}
	lines := []string{truncate(head, s.w+40)}
	if s.notice != "" {
		lines = append(lines, s.st.Muted.Render(truncate(s.notice, s.w)))
	}
	r, p, ok := s.current()
	if !ok {
		lines = append(lines, s.st.Muted.Render("waiting for the first snapshot…"))
		s.view = strings.Join(lines, "\n")
		return
	}
	if s.live {
		lines[0] += s.st.Muted.Render(" · " + r.Tail + " " + r.Flight)
	}
	sn := r.Snap
	lines = append(lines, truncate(fmt.Sprintf("%s  %.0f ft  M%.3f  %.1f t  SAT %.1f °C (ISA %+.1f)  fuel %.0f kg/h  bank %.0f°",
		r.Time.UTC().Format("2006-01-02 15:04Z"), sn.Altitude/model.Foot, sn.Mach, sn.Weight/1000,
		sn.SAT-model.CelsiusZero, p.ISADev, sn.FuelFlow*model.Hour, sn.Bank*180/math.Pi), s.w), "")
	lines = append(lines, s.splitBars(p)...)
	lines = append(lines, "", s.bankLine(p))
	if s.optOK {
		lines = append(lines, s.machLine(sn.Mach), s.altLine(sn.Altitude))
	}
	chartH := s.h - len(lines) - 1
	if chartH >= 4 {
		lines = append(lines, s.st.Muted.Render("drag deviation over the flight so far, %"), s.deviationChart(s.w, chartH))
	}
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(strings.Join(lines, "\n"))
}

// splitBars draws the baseline and measured drag coefficients as stacked
// bars: induced, wave and parasite, and the excess (or the shortfall).
func (s *flightScreen) splitBars(p model.Point) []string {
	width := max(10, s.w-34)
	full := math.Max(p.CDMeasured, p.CDBaseline)
	cells := func(v float64) int { return int(math.Round(v / full * float64(width))) }
	bar := func(parts []float64, styles []lipgloss.Style) string {
		var b strings.Builder
		used := 0
		for i, v := range parts {
			n := max(0, cells(v))
			if i == len(parts)-1 {
				n = max(0, min(n, width-used))
			}
			used += n
			b.WriteString(styles[i].Render(strings.Repeat("█", n)))
		}
		return b.String() + strings.Repeat(" ", max(0, width-used))
	}
	parasite := math.Min(p.CDParasiteMeasured, p.CDParasiteBaseline)
	excess := p.CDParasiteMeasured - p.CDParasiteBaseline
	st := []lipgloss.Style{s.st.Accent, s.st.Drift, s.st.Base, s.st.Flag}
	base := bar([]float64{p.CDInduced, p.CDWave, p.CDParasiteBaseline}, st)
	meas := bar([]float64{p.CDInduced, p.CDWave, parasite, math.Max(0, excess)}, st)
	exStyle := s.st.Flag
	if excess < 0 {
		exStyle = s.st.Improve
	}
	return []string{
		fmt.Sprintf("baseline %s CD %.5f", base, p.CDBaseline),
		fmt.Sprintf("measured %s CD %.5f", meas, p.CDMeasured),
		truncate(s.st.Accent.Render(fmt.Sprintf("induced %.5f", p.CDInduced))+" · "+s.st.Drift.Render(fmt.Sprintf("wave %.5f", p.CDWave))+" · "+
			s.st.Base.Render(fmt.Sprintf("parasite %.5f", p.CDParasiteBaseline))+" · "+
			exStyle.Render(fmt.Sprintf("excess %+.1f counts (%+.2f %%)", p.ExcessCounts, p.DragDevPct)), s.w+120),
	}
}

func (s *flightScreen) bankLine(p model.Point) string {
	deg := s.bank.Bank * 180 / math.Pi
	if math.Abs(deg) < 0.5 {
		return s.st.Muted.Render(fmt.Sprintf("bank 0° · n %.3f · no turn penalty", p.LoadFactor))
	}
	return s.st.Drift.Render(fmt.Sprintf("bank %.0f° · n %.3f · induced drag %+.0f %% · total %+.1f %% · extra fuel %+.0f kg/h",
		deg, s.bank.LoadFactor, s.bank.InducedIncreasePct, s.bank.TotalIncreasePct, s.bank.ExtraFuelFlow*model.Hour))
}

// scale draws marks on a number line of width w from lo to hi.
func scale(w int, lo, hi float64, marks []struct {
	v float64
	r rune
}) string {
	line := []rune(strings.Repeat("─", max(w, 2)))
	for _, m := range marks {
		i := int(math.Round((m.v - lo) / (hi - lo) * float64(len(line)-1)))
		if i >= 0 && i < len(line) {
			line[i] = m.r
		}
	}
	return string(line)
}

func (s *flightScreen) machLine(flown float64) string {
	o := s.opt
	lo, hi := math.Min(flown, o.MaxRange.Mach)-0.02, math.Max(math.Max(flown, o.LongRange.Mach), o.Econ.Mach)+0.02
	w := max(10, s.w-60)
	sc := scale(w, lo, hi, []struct {
		v float64
		r rune
	}{{o.Econ.Mach, 'E'}, {o.LongRange.Mach, 'L'}, {o.MaxRange.Mach, 'R'}, {flown, '●'}})
	return truncate(fmt.Sprintf("Mach %.2f %s %.2f  ● %.3f R %.3f L %.3f E %.3f (CI %g)", lo, sc, hi, flown, o.MaxRange.Mach, o.LongRange.Mach, o.Econ.Mach, s.ci), s.w+20)
}

func (s *flightScreen) altLine(flown float64) string {
	o := s.opt
	fl := func(h float64) float64 { return h / model.Foot / 100 }
	lo := math.Min(fl(flown), fl(o.OptimumAltitude)) - 10
	hi := math.Max(fl(flown), fl(o.MaxAltitude)) + 10
	w := max(10, s.w-60)
	sc := scale(w, lo, hi, []struct {
		v float64
		r rune
	}{{fl(o.OptimumAltitude), 'O'}, {fl(o.MaxAltitude), 'X'}, {fl(flown), '●'}})
	return truncate(fmt.Sprintf("FL   %3.0f %s %3.0f  ● FL%03.0f O FL%03.0f X FL%03.0f (%s) · own polar %+.1f %%",
		lo, sc, hi, fl(flown), fl(o.OptimumAltitude), fl(o.MaxAltitude), o.MaxAltLimit, s.excessPct), s.w+20)
}

func (s *flightScreen) deviationChart(w, h int) string {
	if s.pos < 2 {
		return placeholder(w, h, "one snapshot so far")
	}
	t0 := s.recs[0].Time
	pts := make([][2]float64, s.pos)
	ys := make([]float64, s.pos)
	for i := 0; i < s.pos; i++ {
		pts[i] = [2]float64{s.recs[i].Time.Sub(t0).Minutes(), s.points[i].DragDevPct}
		ys[i] = pts[i][1]
	}
	lo, hi := span(ys, 0.1, 0.5)
	maxX := math.Max(pts[s.pos-1][0], 1)
	if !s.live {
		maxX = math.Max(s.recs[len(s.recs)-1].Time.Sub(t0).Minutes(), 1)
	}
	spec := chartSpec{w: w, h: h, minX: 0, maxX: maxX, minY: lo, maxY: hi, axis: s.st.Muted,
		xFmt:   func(_ int, v float64) string { return fmt.Sprintf("%.0f min", v) },
		yFmt:   func(_ int, v float64) string { return fmt.Sprintf("%+.1f", v) },
		series: []series{{points: pts, line: true, style: s.st.Accent}}}
	return spec.render("no data")
}
