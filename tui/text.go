package tui

import (
	"strings"

	"github.com/charmbracelet/lipgloss"
	"github.com/charmbracelet/x/ansi"
)

// truncate cuts s to w terminal cells, ending in "…" when it cuts. It
// understands colour codes and wide characters (charmbracelet/x/ansi), so
// styled text can be cut after it is styled.
func truncate(s string, w int) string {
	if w <= 0 {
		return ""
	}
	return ansi.Truncate(s, w, "…")
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

// clean removes control characters (escape sequences among them) from text
// that comes from the data, so that a tail name cannot drive the terminal.
func clean(s string) string {
	return strings.Map(func(r rune) rune {
		if r < 0x20 || r == 0x7f || (r >= 0x80 && r < 0xa0) {
			return -1
		}
		return r
	}, s)
}
