package tui

import (
	"context"
	"fmt"
	"math"
	"strings"
	"sync/atomic"
	"time"

	"github.com/charmbracelet/bubbles/help"
	"github.com/charmbracelet/bubbles/key"
	"github.com/charmbracelet/bubbles/progress"
	tea "github.com/charmbracelet/bubbletea"
	"github.com/charmbracelet/lipgloss"

	"dragdeck/feed"
	"dragdeck/model"
)

// The screens, in tab order.
const (
	scrFleet = iota
	scrTail
	scrFlight
	scrCruise
	scrTurns
	scrAbout
	numScreens
)

// Loader loads the dashboard's data in the background.
type Loader struct {
	Total    int64         // bytes to read (0: unknown)
	Progress *atomic.Int64 // bytes read so far
	Load     func() (*Data, error)
}

// Messages of the root.
type (
	loadedMsg struct {
		data *Data
		err  error
	}
	progressTickMsg struct{}
)

// Model is the dashboard's root model.
type Model struct {
	ctx     context.Context
	st      Styles
	fleet   *fleetScreen
	tail    *tailScreen
	flight  *flightScreen
	cruise  *cruiseScreen
	turns   *turnsScreen
	about   *aboutScreen
	screens [numScreens]Screen
	active  int
	help    help.Model
	w, h    int

	data    *Data
	loader  *Loader
	loading bool
	loadErr error
	bar     progress.Model
	cond    Condition
	start   tea.Cmd // what Init starts
	live    chan tea.Msg
}

// Option sets up the dashboard.
type Option func(*Model)

// WithReplay opens the Flight screen on a replay of recs at speed. cfg says
// which snapshots the trend leaves out. Fleet and Tail say that they need
// a fleet.
func WithReplay(r *model.Roster, cfg model.TrendConfig, recs []feed.Record, speed float64) Option {
	return func(m *Model) {
		tail, flight := "", ""
		if len(recs) > 0 {
			tail, flight = recs[0].Tail, recs[0].Flight
		}
		m.active = scrFlight
		m.start = m.flight.Replay(r, cfg, tail, flight, recs, speed, math.NaN())
		m.cond = defaultCondition(m.flight.t)
		m.noFleet("replaying one flight")
	}
}

// WithLive opens the Flight screen following the file at path.
func WithLive(r *model.Roster, cfg model.TrendConfig, path string, tail string) Option {
	return func(m *Model) {
		m.active = scrFlight
		m.flight.Live(r, cfg, path)
		m.live = make(chan tea.Msg, 1024)
		ch, ctx := m.live, m.ctx
		go func() {
			fl := &feed.Follower{Path: path, CheckTail: feed.RosterCheck(r), Notice: func(s string) { ch <- liveNoticeMsg{s} }}
			err := fl.Run(ctx, func(r feed.Record) error {
				if tail == "" || r.Tail == tail {
					ch <- liveRecordMsg{r}
				}
				return nil
			}, func(e *feed.RowError) { ch <- liveRejectMsg{e} })
			ch <- liveEndMsg{err}
		}()
		m.start = m.waitLive()
		m.cond = defaultCondition(m.flight.t)
		m.noFleet("following a live file")
	}
}

// noFleet tells the Fleet and Tail screens why they are empty.
func (m *Model) noFleet(what string) {
	msg := what + ": no fleet is loaded here (dragdeck dash FILE... shows the fleet)"
	m.fleet.SetEmpty(msg)
	m.tail.SetEmpty(msg)
}

// New returns the dashboard on data (nil with a loader: loaded in the
// background).
func New(ctx context.Context, data *Data, loader *Loader, opts ...Option) *Model {
	st := NewStyles(DefaultTheme)
	m := &Model{ctx: ctx, st: st, help: help.New(), loader: loader}
	m.help.Styles.ShortKey = st.Accent
	m.help.Styles.FullKey = st.Accent
	m.help.Styles.ShortDesc = st.Muted
	m.help.Styles.FullDesc = st.Muted
	m.fleet, m.tail, m.flight = newFleetScreen(st), newTailScreen(st), newFlightScreen(st)
	m.cruise, m.turns, m.about = newCruiseScreen(st), newTurnsScreen(st), newAboutScreen(st)
	m.screens = [numScreens]Screen{m.fleet, m.tail, m.flight, m.cruise, m.turns, m.about}
	m.bar = progress.New(progress.WithGradient(string(DefaultTheme.Accent.Dark), string(DefaultTheme.Improve.Dark)))
	m.cond = defaultCondition(nil)
	for _, o := range opts {
		o(m)
	}
	if data != nil {
		m.setData(data)
	} else if loader != nil {
		m.loading = true
	}
	return m
}

func (m *Model) setData(d *Data) {
	m.data = d
	m.fleet.SetData(d)
	m.tail.SetData(d)
	if tail, ok := m.fleet.selected(); ok && m.active != scrFlight {
		m.tail.SetTail(tail)
		if a, ok := d.Tail(tail); ok {
			m.cond = tailCondition(d.TypeOf(tail), a)
		}
	}
	m.cruise.SetCondition(m.typ(), m.cond)
	m.turns.SetCondition(m.typ(), m.cond)
}

// Err is the error that stopped loading, if any.
func (m *Model) Err() error { return m.loadErr }

// Init starts loading, a replay or a live feed.
func (m *Model) Init() tea.Cmd {
	var cmds []tea.Cmd
	if m.loading {
		l := m.loader
		cmds = append(cmds, func() tea.Msg {
			d, err := l.Load()
			return loadedMsg{d, err}
		}, tickProgress())
	}
	if m.start != nil {
		cmds = append(cmds, m.start)
	}
	return tea.Batch(cmds...)
}

func tickProgress() tea.Cmd {
	return after(100*time.Millisecond, func(time.Time) tea.Msg { return progressTickMsg{} })
}

func (m *Model) waitLive() tea.Cmd {
	ch := m.live
	return func() tea.Msg {
		var b liveBatchMsg
		if b.add(<-ch) {
			return b
		}
		for len(b.recs) < maxLiveBatch {
			select {
			case msg := <-ch:
				if b.add(msg) {
					return b
				}
			default:
				return b
			}
		}
		return b
	}
}

// helpHeight is the number of lines the help takes.
func (m *Model) helpHeight() int {
	if !m.help.ShowAll {
		return 1
	}
	return lipgloss.Height(m.help.View(m.keys()))
}

func (m *Model) resize() {
	ch := max(1, m.h-1-m.helpHeight())
	for _, s := range m.screens {
		s.SetSize(m.w, ch)
	}
	m.help.Width = m.w
	m.bar.Width = max(10, min(60, m.w-20))
}

// activate shows screen i, bringing it up to date.
func (m *Model) activate(i int) {
	m.active = (i + numScreens) % numScreens
	if m.data == nil && m.flight.t == nil {
		return
	}
	t := m.typ()
	switch m.active {
	case scrCruise, scrTurns:
		if r, _, ok := m.flight.current(); ok {
			c := m.cond
			c.Weight, c.Altitude, c.Mach = r.Snap.Weight, r.Snap.Altitude, r.Snap.Mach
			c.ISADev = model.AirAt(r.Snap.Altitude, r.Snap.SAT).ISADev()
			c.Tail, c.ExcessPct, c.ExcessFrom = r.Tail, m.flight.excessPct, m.flight.ownFrom
			c.Type = m.flight.t
			m.cond = c
		}
		m.cruise.SetCondition(t, m.cond)
		m.turns.SetCondition(t, m.cond)
	}
}

// typ is the type of the condition shown: its tail's, else the run's one
// type, else the Flight screen's.
func (m *Model) typ() *model.Type {
	if m.cond.Type != nil {
		return m.cond.Type
	}
	if m.data != nil && m.data.Type != nil {
		return m.data.Type
	}
	if m.flight.t != nil {
		return m.flight.t
	}
	if m.data != nil {
		return firstType(m.data.Roster, nil)
	}
	return nil
}

func (m *Model) Update(msg tea.Msg) (tea.Model, tea.Cmd) {
	switch msg := msg.(type) {
	case tea.WindowSizeMsg:
		m.w, m.h = msg.Width, msg.Height
		m.resize()
		return m, nil
	case loadedMsg:
		m.loading = false
		if msg.err != nil {
			m.loadErr = msg.err
			return m, nil
		}
		m.setData(msg.data)
		m.resize()
		return m, nil
	case progressTickMsg:
		if m.loading {
			return m, tickProgress()
		}
		return m, nil
	case openTailMsg:
		m.tail.SetTail(msg.tail)
		if a, ok := m.data.Tail(msg.tail); ok {
			m.cond = tailCondition(m.data.TypeOf(msg.tail), a)
		}
		m.activate(scrTail)
		return m, nil
	case openFlightMsg:
		level := math.NaN()
		if a, ok := m.data.Tail(msg.tail); ok {
			level = a.RecentPct
		}
		cmd := m.flight.Replay(m.data.Roster, m.data.Config, msg.tail, msg.flight, msg.recs, m.flight.speed, level)
		m.activate(scrFlight)
		return m, cmd
	case conditionMsg:
		m.cond = msg.c
		if m.active == scrCruise {
			m.turns.SetCondition(m.typ(), m.cond)
		} else {
			m.cruise.SetCondition(m.typ(), m.cond)
		}
		return m, nil
	case replayTickMsg:
		_, cmd := m.flight.Update(msg)
		return m, cmd
	case liveBatchMsg:
		m.flight.Update(msg)
		if msg.end != nil {
			return m, nil
		}
		return m, m.waitLive()
	case tea.KeyMsg:
		return m.key(msg)
	}
	return m, nil
}

func (m *Model) key(msg tea.KeyMsg) (tea.Model, tea.Cmd) {
	// bubbletea delivers runes that arrive in one read (keys typed fast,
	// tmux send-keys) as one message, "jjj"; the bindings match one key
	// each, so they are taken one at a time. A paste stays whole.
	if msg.Type == tea.KeyRunes && len(msg.Runes) > 1 && !msg.Paste {
		var cmds []tea.Cmd
		for _, r := range msg.Runes {
			one := msg
			one.Runes = []rune{r}
			_, cmd := m.key(one)
			cmds = append(cmds, cmd)
		}
		return m, tea.Batch(cmds...)
	}
	scr := m.screens[m.active]
	if c, ok := scr.(Capturing); ok && c.Capturing() {
		if key.Matches(msg, global.ForceQuit) {
			return m, tea.Quit
		}
		_, cmd := scr.Update(msg)
		return m, cmd
	}
	switch {
	case key.Matches(msg, global.Quit):
		return m, tea.Quit
	case key.Matches(msg, global.Help):
		m.help.ShowAll = !m.help.ShowAll
		m.resize()
		return m, nil
	case key.Matches(msg, global.Next):
		m.activate(m.active + 1)
		return m, nil
	case key.Matches(msg, global.Prev):
		m.activate(m.active - 1)
		return m, nil
	case key.Matches(msg, global.Back):
		switch {
		case m.active == scrFleet:
			_, cmd := scr.Update(msg) // clears a filter
			return m, cmd
		case m.active == scrFlight && m.tail.ok:
			m.activate(scrTail)
		default:
			m.activate(scrFleet)
		}
		return m, nil
	}
	if m.loading {
		return m, nil
	}
	_, cmd := scr.Update(msg)
	return m, cmd
}

// keys is the help of the active screen followed by the global keys.
func (m *Model) keys() help.KeyMap { return combinedKeys{m.screens[m.active]} }

type combinedKeys struct{ s Screen }

func (c combinedKeys) ShortHelp() []key.Binding {
	if cp, ok := c.s.(Capturing); ok && cp.Capturing() {
		// every key goes to the screen (a filter or a form is typed):
		// the global keys do not work, so they are not offered
		return append([]key.Binding{}, c.s.ShortHelp()...)
	}
	return append(append([]key.Binding{}, c.s.ShortHelp()...), global.bindings()...)
}

func (c combinedKeys) FullHelp() [][]key.Binding {
	return append(append([][]key.Binding{}, c.s.FullHelp()...), []key.Binding{global.Next, global.Prev, global.Back, global.Help, global.Quit})
}

func (m *Model) View() string {
	if m.w == 0 {
		return ""
	}
	var tabs []string
	for i, s := range m.screens {
		style := m.st.Tab
		if i == m.active {
			style = m.st.TabActive
		}
		tabs = append(tabs, style.Render(s.Title()))
	}
	header := lipgloss.NewStyle().MaxWidth(m.w).Render(m.st.Title.Render("dragdeck") + " " + strings.Join(tabs, ""))
	body := m.screens[m.active].View()
	ch := max(1, m.h-1-m.helpHeight())
	switch {
	case m.loadErr != nil:
		body = placeholder(m.w, ch, "could not load: "+m.loadErr.Error()+" (q quits)")
	case m.loading && m.active != scrAbout:
		body = m.loadingView(ch)
	}
	body = lipgloss.NewStyle().Height(ch).MaxHeight(ch).MaxWidth(m.w).Render(body)
	// Clipped: bubbles/help lets a short help run past its Width when not
	// even its ellipsis fits.
	helpView := lipgloss.NewStyle().MaxWidth(m.w).Render(m.help.View(m.keys()))
	return header + "\n" + body + "\n" + helpView
}

func (m *Model) loadingView(h int) string {
	done := int64(0)
	if m.loader.Progress != nil {
		done = m.loader.Progress.Load()
	}
	frac := 0.0
	if m.loader.Total > 0 {
		frac = math.Min(1, float64(done)/float64(m.loader.Total))
	}
	msg := fmt.Sprintf("reading and analysing snapshots: %.1f of %.1f MB", float64(done)/1e6, float64(m.loader.Total)/1e6)
	if m.loader.Total > 0 && done >= m.loader.Total {
		msg = fmt.Sprintf("%.1f MB read; trends, flags and cost per tail…", float64(m.loader.Total)/1e6)
	}
	return lipgloss.Place(m.w, h, lipgloss.Center, lipgloss.Center, msg+"\n\n"+m.bar.ViewAs(frac)+"\n\n"+m.st.Muted.Render("tab: About · q: quit"))
}
