package tui

import (
	"fmt"
	"math"
	"slices"
	"strconv"
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
	// liveBatchMsg is what arrived from a live file since the last
	// frame: the screen takes it in one go, so that 10,000 rows a second
	// cost one update per frame, not one per row.
	liveBatchMsg struct {
		recs    []feed.Record
		notice  string         // the last notice, if any
		reject  *feed.RowError // the last reject, if any
		rejects int            // how many rows were rejected
		end     *liveEndMsg    // the follower stopped
	}
)

// maxLiveBatch bounds one batch, so that a backlog shows as it is read.
const maxLiveBatch = 20000

// add puts one live message into the batch; it reports whether the
// follower has stopped.
func (b *liveBatchMsg) add(msg tea.Msg) bool {
	switch msg := msg.(type) {
	case liveRecordMsg:
		b.recs = append(b.recs, msg.rec)
	case liveNoticeMsg:
		b.notice = msg.text
	case liveRejectMsg:
		b.reject = msg.err
		b.rejects++
	case liveEndMsg:
		b.end = &msg
		return true
	}
	return false
}

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

// maxReplayWait caps the wait between two snapshots on screen; minFrame
// is the shortest, so that a replay at no waiting still lets the screen
// draw.
const (
	maxReplayWait = 2 * time.Second
	minFrame      = 20 * time.Millisecond
)

// after schedules a message after d; tests replace it to run replays
// without waiting.
var after = tea.Tick

// flightScreen replays a flight (paced by a feed.Player) or follows a live
// file.
type flightScreen struct {
	roster  *model.Roster
	t       *model.Type // the type of the current snapshot
	cfg     model.TrendConfig
	st      Styles
	w, h    int
	tail    string
	flight  string
	recs    []feed.Record // the whole replay, or what has arrived live
	points  []model.Point // analysis of recs[:pos]
	left    []string      // per point, why the trend leaves it out ("" if usable)
	span    spanCache     // the current flight's snapshots, for pos
	stab    stability     // the current flight's stable windows, when it is a recording
	player  *feed.Player
	pos     int // snapshots shown
	playing bool
	speed   float64 // times real time; 0: no waiting
	gen     int
	live    bool
	source  string
	notice  string
	ci      float64 // cost index, kg/min
	// level is the tail's recent drag deviation, %, from the pipeline (NaN
	// when unknown: then the flight's own median so far is used).
	level float64

	opt       model.Optimum // for the current snapshot and the own polar
	optOK     bool
	bank      model.BankRow
	excessPct float64 // the own polar's deviation, %
	ownFrom   string  // where excessPct comes from
	view      string
}

func newFlightScreen(st Styles) *flightScreen {
	return &flightScreen{st: st, speed: 60, level: math.NaN(), cfg: model.DefaultTrendConfig()}
}

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

// Replay starts a replay of recs (time order) at speed, playing. cfg says
// which snapshots the trend leaves out; level is the tail's recent
// deviation, % (NaN when unknown).
func (s *flightScreen) Replay(r *model.Roster, cfg model.TrendConfig, tail, flight string, recs []feed.Record, speed, level float64) tea.Cmd {
	s.roster, s.t, s.cfg, s.tail, s.flight, s.recs, s.live, s.source, s.notice = r, firstType(r, recs), cfg, tail, flight, recs, false, "", ""
	s.speed, s.level = speed, level
	s.player = feed.NewPlayer(recs, speed)
	s.player.MaxWait = maxReplayWait
	s.points, s.left = s.points[:0], s.left[:0]
	s.pos = 0
	s.gen++
	s.playing = len(recs) > 0
	s.seek(min(1, len(recs)))
	return s.schedule()
}

// Live switches the screen to records arriving from source.
func (s *flightScreen) Live(r *model.Roster, cfg model.TrendConfig, source string) {
	s.roster, s.t, s.cfg, s.source, s.live, s.playing, s.level = r, firstType(r, nil), cfg, source, true, false, math.NaN()
	s.recs, s.points, s.left, s.pos, s.tail, s.flight, s.notice = nil, nil, nil, 0, "", "", ""
	s.player = nil
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

// firstType is the type shown before a snapshot is: that of the first
// record, or the roster's single type, or its first type by name.
func firstType(r *model.Roster, recs []feed.Record) *model.Type {
	if len(recs) > 0 {
		if _, t, _ := r.At(recs[0].Tail, recs[0].Time); t != nil {
			return t
		}
	}
	if t := r.Single(); t != nil {
		return t
	}
	return r.Types[r.TypeNames()[0]]
}

// seek shows the first n snapshots.
func (s *flightScreen) seek(n int) {
	n = max(0, min(n, len(s.recs)))
	for len(s.points) < n {
		r := s.recs[len(s.points)]
		p, snap, typ, why := s.roster.Analyze(r.Tail, r.Time, r.Snap)
		if typ == nil { // the readers reject such rows; never analysed
			p.DragDevPct = math.NaN()
		}
		s.points = append(s.points, p)
		if why == "" {
			// the flight does not decide whether a point is usable
			why = s.cfg.Usable(s.cfg.NewPoint(r.Time, 0, &snap, &p))
		}
		s.left = append(s.left, why)
	}
	s.points, s.left = s.points[:n], s.left[:n]
	s.pos = n
	if s.player != nil {
		s.player.Seek(n)
	}
	s.update()
}

// update recomputes what depends on the current snapshot: the optimum and
// the bank penalty, with the own polar at the tail's recent level (or,
// unknown, the median of this flight's usable snapshots so far).
func (s *flightScreen) update() {
	s.optOK = false
	r, _, ok := s.current()
	if ok {
		if _, typ, _ := s.roster.At(r.Tail, r.Time); typ != nil {
			s.t = typ
		}
		s.excessPct, s.ownFrom = s.level, levelFrom
		if math.IsNaN(s.level) {
			played, _ := s.flightSpan()
			var devs []float64
			for _, i := range played {
				if s.left[i] == "" {
					devs = append(devs, s.points[i].DragDevPct)
				}
			}
			s.excessPct, s.ownFrom = model.Median(devs), flightFrom
		}
		air := model.AirAt(r.Snap.Altitude, r.Snap.SAT)
		excess := model.ExcessFromDeviation(s.t, r.Snap.Weight, air, r.Snap.Mach, s.excessPct)
		if s.t.CD0+excess > 0 {
			s.opt = model.CruiseOptimum(s.t, r.Snap.Weight, r.Snap.Altitude, air.ISADev(), s.ci/model.Minute, excess)
			s.optOK = true
		}
		s.bank = model.BankPenalty(s.t, r.Snap.Weight, air, r.Snap.Mach, excess, r.Snap.Bank)
		if s.tail == "" {
			s.tail, s.flight = r.Tail, r.Flight
		}
	}
	s.render()
}

// schedule asks for the next replay tick, after the player's wait.
func (s *flightScreen) schedule() tea.Cmd {
	if !s.playing || s.live || s.player == nil || s.pos >= len(s.recs) {
		s.playing = s.playing && s.pos < len(s.recs)
		return nil
	}
	s.player.Speed = s.speed
	gen := s.gen
	return after(max(minFrame, s.player.Wait()), func(time.Time) tea.Msg { return replayTickMsg{gen} })
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
	case liveBatchMsg:
		if !s.live {
			return s, nil
		}
		switch {
		case msg.reject != nil && msg.rejects > 1:
			s.notice = fmt.Sprintf("rejected %d rows, the last %s", msg.rejects, msg.reject.Error())
		case msg.reject != nil:
			s.notice = "rejected " + msg.reject.Error()
		}
		if msg.notice != "" {
			s.notice = msg.notice
		}
		if msg.end != nil && msg.end.err != nil {
			s.notice = "stopped: " + msg.end.err.Error()
		}
		if len(msg.recs) > 0 {
			s.recs = append(s.recs, msg.recs...)
			s.seek(len(s.recs)) // renders
		} else {
			s.render()
		}
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
		head = s.st.Flag.Render("● LIVE") + s.st.Muted.Render(fmt.Sprintf("  following %s · %d snapshots", clean(s.source), len(s.recs)))
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
		flight, tail := s.flight, s.tail
		if r, _, ok := s.current(); ok {
			flight, tail = r.Flight, r.Tail
		}
		head = s.st.Title.Render("Flight "+clean(flight)+" · "+clean(tail)) + s.st.Muted.Render(fmt.Sprintf("  replay %d/%d · %s · %s", s.pos, len(s.recs), speed, state))
	}
	lines := []string{head}
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
		lines[0] += s.st.Muted.Render(" · " + clean(r.Tail) + " " + clean(r.Flight))
	}
	lines[0] = truncate(lines[0], s.w)
	sn := r.Snap
	lines = append(lines, truncate(fmt.Sprintf("%s  %.0f ft  M%.3f  %.1f t  SAT %.1f °C (ISA %+.1f)  fuel %.0f kg/h  bank %.0f°",
		r.Time.UTC().Format("2006-01-02 15:04Z"), sn.Altitude/model.Foot, sn.Mach, sn.Weight/1000,
		sn.SAT-model.CelsiusZero, p.ISADev, sn.FuelFlow*model.Hour, sn.Bank*180/math.Pi), s.w))
	use := "used by the trend"
	if why := s.left[s.pos-1]; why != "" {
		use = "left out of the trend: " + why
	}
	lines = append(lines, s.st.Muted.Render(truncate(use+" · "+thrustNote(p), s.w)))
	stab := s.stableOf()
	if stab != nil && !stab.recording {
		stab = nil
	}
	if stab != nil {
		lines = append(lines, truncate(s.stableLine(stab), s.w))
	}
	lines = append(lines, s.splitBars(p)...)
	lines = append(lines, "", s.bankLine(p))
	if s.optOK {
		lines = append(lines, s.machLine(sn.Mach), s.altLine(sn.Altitude))
	}
	chartH := s.h - len(lines) - 1
	if stab != nil {
		chartH-- // the strip of stable windows
	}
	if chartH >= 4 {
		legend := s.st.Muted.Render("drag deviation over the flight so far, % · ") + s.st.Accent.Render("line: used by the trend") +
			s.st.Muted.Render(" · dots: left out (climb, turn, speed change)")
		if stab != nil {
			legend += s.st.Accent.Render(" · big dots: stable windows")
		}
		lines = append(lines, truncate(legend, s.w), s.deviationChart(s.w, chartH, stab))
		if stab != nil {
			lines = append(lines, s.stableStrip(stab, s.w))
		}
	}
	s.view = lipgloss.NewStyle().MaxWidth(s.w).MaxHeight(s.h).Render(strings.Join(lines, "\n"))
}

// splitBars draws the baseline and measured drag coefficients as stacked
// bars: induced, wave and parasite, and the excess (or the shortfall). Each
// part has its own glyph as well as its own colour, so the parts show
// without colour too.
func (s *flightScreen) splitBars(p model.Point) []string {
	width := max(10, s.w-34)
	full := math.Max(p.CDMeasured, p.CDBaseline)
	cells := func(v float64) int { return int(math.Round(v / full * float64(width))) }
	glyphs := []string{glyphInduced, glyphWave, glyphParasite, glyphExcess}
	st := []lipgloss.Style{s.st.Accent, s.st.Wave, s.st.Base, s.st.Flag}
	bar := func(parts []float64) string {
		var b strings.Builder
		used := 0
		for i, v := range parts {
			n := max(0, cells(v))
			if i == len(parts)-1 {
				n = max(0, min(n, width-used))
			}
			used += n
			b.WriteString(st[i].Render(strings.Repeat(glyphs[i], n)))
		}
		return b.String() + strings.Repeat(" ", max(0, width-used))
	}
	parasite := math.Min(p.CDParasiteMeasured, p.CDParasiteBaseline)
	excess := p.CDParasiteMeasured - p.CDParasiteBaseline
	base := bar([]float64{p.CDInduced, p.CDWave, p.CDParasiteBaseline})
	meas := bar([]float64{p.CDInduced, p.CDWave, parasite, math.Max(0, excess)})
	exStyle := s.st.Flag
	if excess < 0 {
		exStyle = s.st.Improve
	}
	return []string{
		fmt.Sprintf("baseline %s CD %.5f", base, p.CDBaseline),
		fmt.Sprintf("measured %s CD %.5f", meas, p.CDMeasured),
		truncate(s.st.Accent.Render(fmt.Sprintf("%s induced %.5f", glyphInduced, p.CDInduced))+" · "+
			s.st.Wave.Render(fmt.Sprintf("%s wave %.5f", glyphWave, p.CDWave))+" · "+
			s.st.Base.Render(fmt.Sprintf("%s parasite %.5f", glyphParasite, p.CDParasiteBaseline))+" · "+
			exStyle.Render(fmt.Sprintf("%s excess %+.1f counts (%+.2f %%)", glyphExcess, p.ExcessCounts, p.DragDevPct)), s.w),
	}
}

func (s *flightScreen) bankLine(p model.Point) string {
	deg := s.bank.Bank * 180 / math.Pi
	if math.Abs(deg) < 0.5 {
		return s.st.Muted.Render(fmt.Sprintf("bank 0° · n %.3f · no turn penalty", p.LoadFactor))
	}
	return s.st.Accent.Render(fmt.Sprintf("bank %.0f° · n %.3f · induced drag %+.0f %% · total %+.1f %% · extra fuel %+.0f kg/h",
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
	return truncate(fmt.Sprintf("Mach %.2f %s %.2f  ● %.3f R %.3f L %.3f E %.3f (CI %g)", lo, sc, hi, flown, o.MaxRange.Mach, o.LongRange.Mach, o.Econ.Mach, s.ci), s.w)
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
	return truncate(fmt.Sprintf("FL   %3.0f %s %3.0f  ● FL%03.0f O FL%03.0f X FL%03.0f (%s) · own polar %+.1f %% (%s)",
		lo, sc, hi, fl(flown), fl(o.OptimumAltitude), fl(o.MaxAltitude), o.MaxAltLimit, s.excessPct, s.ownFrom), s.w)
}

// flightSpan returns the indices into recs of the current snapshot's flight
// (same tail, no new flight by model.NewFlight): played ones up to the
// current snapshot, and the whole flight's last time when it is known (not
// live). A replay of many flights or of a fleet thus charts one flight.
func (s *flightScreen) flightSpan() (played []int, last time.Time) {
	c := &s.span
	if c.first == &s.recs[0] && c.n == len(s.recs) && c.pos == s.pos {
		return c.played, c.last
	}
	if s.live && c.first == &s.recs[0] && c.pos > 0 && c.pos < s.pos {
		// Live, the same records with more after them: extend the span
		// forward while the flight goes on.
		played, prev, ok := c.played, s.recs[c.played[len(c.played)-1]], true
		for j := c.pos; j < s.pos && ok; j++ {
			r := s.recs[j]
			if r.Tail != prev.Tail {
				continue
			}
			if ok = !model.NewFlight(prev.Flight, prev.Time, r.Flight, r.Time, s.cfg.FlightGap); ok {
				played, prev = append(played, j), r
			}
		}
		if ok && s.recs[s.pos-1].Tail == prev.Tail {
			*c = spanCache{first: &s.recs[0], n: len(s.recs), pos: s.pos, played: played, last: s.recs[s.pos-1].Time}
			return played, c.last
		}
	}
	played, last = s.computeSpan()
	*c = spanCache{first: &s.recs[0], n: len(s.recs), pos: s.pos, played: played, last: last}
	return played, last
}

// spanCache keeps the flight span of one position, so that a frame does
// not look through the whole replay again, and a live flight extends it.
type spanCache struct {
	first  *feed.Record // &recs[0] when computed: other records, other span
	n, pos int
	played []int
	last   time.Time
}

// computeSpan finds the span of the current flight from scratch.
func (s *flightScreen) computeSpan() (played []int, last time.Time) {
	cur := s.recs[s.pos-1]
	played = []int{s.pos - 1}
	prev := cur
	for j := s.pos - 2; j >= 0; j-- {
		r := s.recs[j]
		if r.Tail != cur.Tail {
			continue
		}
		if model.NewFlight(r.Flight, r.Time, prev.Flight, prev.Time, s.cfg.FlightGap) {
			break
		}
		played, prev = append(played, j), r
	}
	slices.Reverse(played)
	last = cur.Time
	if s.live {
		return played, last
	}
	for j := s.pos; j < len(s.recs); j++ {
		r := s.recs[j]
		if r.Tail != cur.Tail {
			continue
		}
		if model.NewFlight(cur.Flight, last, r.Flight, r.Time, s.cfg.FlightGap) {
			break
		}
		last = r.Time
	}
	return played, last
}

// deviationChart draws the current flight's drag deviation so far against
// minutes from its first snapshot: the snapshots the trend uses joined, the
// ones it leaves out as dots of their own.
func (s *flightScreen) deviationChart(w, h int, stab *stability) string {
	if s.pos == 0 {
		return placeholder(w, h, "no snapshot yet")
	}
	idx, last := s.flightSpan()
	if len(idx) < 2 {
		return placeholder(w, h, "first snapshot of this flight")
	}
	t0 := s.recs[idx[0]].Time
	var used, out [][2]float64
	ys := make([]float64, len(idx))
	for k, i := range idx {
		pt := [2]float64{s.recs[i].Time.Sub(t0).Minutes(), s.points[i].DragDevPct}
		ys[k] = pt[1]
		if s.left[i] == "" {
			used = append(used, pt)
		} else {
			out = append(out, pt)
		}
	}
	if stab != nil && len(used) >= 2 {
		// A recording's climb and descent samples (no climb rate in the
		// data) read as drag of ±100 %: the range is the used samples' and
		// the windows', and those left out beyond it are not drawn.
		ys = ys[:0]
		for _, p := range used {
			ys = append(ys, p[1])
		}
		for _, p := range stab.windowPoints(t0, last) {
			ys = append(ys, p[1])
		}
	}
	lo, hi := span(ys, 0.1, 0.5)
	used, out = thin(used, 2*w), thin(out, 2*w) // a braille cell is 2 dots wide
	maxX := math.Max(last.Sub(t0).Minutes(), 1)
	spec := chartSpec{w: w, h: h, minX: 0, maxX: maxX, minY: lo, maxY: hi, axis: s.st.Muted,
		xTicks: niceTicks(0, maxX, max(1, w/10), func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) + " min" }),
		yFmt:   func(_ int, v float64) string { return fmt.Sprintf("%+.1f", v) },
		series: []series{{points: used, line: true, style: s.st.Accent}, {points: out, style: s.st.Muted}}}
	if stab != nil {
		// each window's snapshot, drawn as a small block of dots so that it
		// stands out from the samples' line
		var big [][2]float64
		dx, dy := maxX/float64(2*w), (hi-lo)/float64(4*h)
		for _, p := range stab.windowPoints(t0, s.recs[s.pos-1].Time) {
			for _, d := range [][2]float64{{0, 0}, {dx, 0}, {0, dy}, {dx, dy}} {
				big = append(big, [2]float64{p[0] + d[0], p[1] + d[1]})
			}
		}
		spec.series = append(spec.series, series{points: big, style: s.st.Accent})
	}
	return spec.render("no data")
}

// thrustNote says where a snapshot's thrust came from: the fan speed, with
// the engine deviation apart from the airframe's, or fuel flow, when the
// drag includes engine effects.
func thrustNote(p model.Point) string {
	if p.ThrustFromN1 {
		return fmt.Sprintf("thrust from fan speed (N1k %.1f %%), engine %+.2f %%", p.N1Corrected, p.EngineDevPct)
	}
	if p.OutsideThrustTable {
		return fmt.Sprintf("N1k %.1f %% outside the thrust table: thrust from fuel flow", p.N1Corrected)
	}
	return "thrust from fuel flow: drag includes engine effects"
}
