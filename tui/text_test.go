package tui

import (
	"testing"

	"github.com/charmbracelet/lipgloss"
)

func TestTruncate(t *testing.T) {
	red := lipgloss.NewStyle().Foreground(lipgloss.Color("1"))
	tests := []struct {
		name string
		in   string
		w    int
	}{
		{"plain", "DD101 level step", 8},
		{"styled", red.Render("DD101") + " level", 8},
		{"wide", "drift ±1 °C ▶", 6},
		{"fits", "abc", 5},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := truncate(tc.in, tc.w)
			if w := lipgloss.Width(got); w > tc.w {
				t.Errorf("%q is %d wide, want ≤ %d", got, w, tc.w)
			}
		})
	}
	if got := clean("DD\x1b]0;owned\x07101"); got != "DD]0;owned101" {
		t.Errorf("clean kept control characters: %q", got)
	}
}
