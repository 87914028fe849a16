package tui

import "github.com/charmbracelet/lipgloss"

// Theme holds the dashboard's colours; each means one thing everywhere.
type Theme struct {
	Text    lipgloss.AdaptiveColor // ordinary text
	Muted   lipgloss.AdaptiveColor // labels, axes, per-flight points, snapshots left out
	Accent  lipgloss.AdaptiveColor // titles, the selection, rolling medians, induced drag
	Flag    lipgloss.AdaptiveColor // flagged tails, steps up, excess drag
	Improve lipgloss.AdaptiveColor // improvements, steps down
	Drift   lipgloss.AdaptiveColor // drift lines, growth
	Event   lipgloss.AdaptiveColor // maintenance events
	Base    lipgloss.AdaptiveColor // baseline polar and baseline values
	Wave    lipgloss.AdaptiveColor // wave drag
	Limit   lipgloss.AdaptiveColor // beyond a limit: buffet margin, thrust
	Engine  lipgloss.AdaptiveColor // the engine series (thrust from fan speed)
	Plan    lipgloss.AdaptiveColor // the fuel factor in use and proposed for flight planning
}

// DefaultTheme is dragdeck's own palette.
var DefaultTheme = Theme{
	Text:    lipgloss.AdaptiveColor{Light: "#1f2328", Dark: "#d8dee4"},
	Muted:   lipgloss.AdaptiveColor{Light: "#6e7781", Dark: "#7d8590"},
	Accent:  lipgloss.AdaptiveColor{Light: "#0b5cad", Dark: "#5ab0f0"},
	Flag:    lipgloss.AdaptiveColor{Light: "#b3261e", Dark: "#ff6b5e"},
	Improve: lipgloss.AdaptiveColor{Light: "#1a7f37", Dark: "#4cc38a"},
	Drift:   lipgloss.AdaptiveColor{Light: "#9a5b00", Dark: "#f0a030"},
	Event:   lipgloss.AdaptiveColor{Light: "#6f42c1", Dark: "#b392f0"},
	Base:    lipgloss.AdaptiveColor{Light: "#57606a", Dark: "#adbac7"},
	Wave:    lipgloss.AdaptiveColor{Light: "#1b7c83", Dark: "#39c5cf"},
	Limit:   lipgloss.AdaptiveColor{Light: "#bf3989", Dark: "#f778ba"},
	Engine:  lipgloss.AdaptiveColor{Light: "#6b6b00", Dark: "#d7d75f"},
	Plan:    lipgloss.AdaptiveColor{Light: "#3e4b9e", Dark: "#8c9eff"},
}

// Styles are every style the screens use, derived from a Theme.
type Styles struct {
	Title, Tab, TabActive, Header, Muted, Text, Selected           lipgloss.Style
	Flag, Improve, Drift, Event, Base, Accent, Wave, Limit, Engine lipgloss.Style
	Plan                                                           lipgloss.Style
	Box, Help                                                      lipgloss.Style
}

// NewStyles derives the styles from t.
func NewStyles(t Theme) Styles {
	s := lipgloss.NewStyle()
	return Styles{
		Title:     s.Foreground(t.Accent).Bold(true),
		Tab:       s.Foreground(t.Muted).Padding(0, 1),
		TabActive: s.Foreground(t.Accent).Bold(true).Underline(true).Padding(0, 1),
		Header:    s.Foreground(t.Text).Bold(true),
		Muted:     s.Foreground(t.Muted),
		Text:      s.Foreground(t.Text),
		Selected:  s.Foreground(t.Accent).Bold(true).Reverse(true),
		Flag:      s.Foreground(t.Flag).Bold(true),
		Improve:   s.Foreground(t.Improve),
		Drift:     s.Foreground(t.Drift),
		Event:     s.Foreground(t.Event),
		Base:      s.Foreground(t.Base),
		Accent:    s.Foreground(t.Accent),
		Wave:      s.Foreground(t.Wave),
		Limit:     s.Foreground(t.Limit).Bold(true),
		Engine:    s.Foreground(t.Engine),
		Plan:      s.Foreground(t.Plan).Bold(true),
		Box:       s.Border(lipgloss.RoundedBorder()).BorderForeground(t.Muted).Padding(0, 1),
		Help:      s.Foreground(t.Muted),
	}
}

// Selection markers: the selected row of a list starts with selMark, the
// others with noMark, so that the selection shows without colour too.
const (
	selMark = "▶ "
	noMark  = "  "
	markW   = 2 // cells of either
)

// Glyphs of the drag split bars: each part has its own, so that the parts
// show without colour too.
const (
	glyphInduced  = "█"
	glyphWave     = "▓"
	glyphParasite = "▒"
	glyphExcess   = "░"
)
