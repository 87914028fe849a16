package tui

import (
	"context"
	"testing"

	tea "github.com/charmbracelet/bubbletea"
)

// BenchmarkView is one frame of the Fleet screen at 200 × 60 with 100 tails
// (budget: 15 ms; screens draw on data or size changes and View returns the
// cached frame).
func BenchmarkView(b *testing.B) {
	m := sized(smallData(b, 100, 365), 200, 60)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		_ = m.View()
	}
}

// BenchmarkResize redraws every screen at 200 × 60 with 100 tails, the
// cost of a window resize.
func BenchmarkResize(b *testing.B) {
	m := sized(smallData(b, 100, 365), 200, 60)
	press(m, "enter", "enter", "G")
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		m.Update(tea.WindowSizeMsg{Width: 200 - i%2, Height: 60})
	}
}

// BenchmarkOpenTail is the cost of opening a tail: its polar fit and charts.
func BenchmarkOpenTail(b *testing.B) {
	m := sized(smallData(b, 100, 365), 200, 60)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		m.Update(openTailMsg{tail: m.data.Fleet.Tails[i%100].Tail})
	}
}

// BenchmarkFirstFrame is the frame shown while a large fleet loads.
func BenchmarkFirstFrame(b *testing.B) {
	for i := 0; i < b.N; i++ {
		m := New(context.Background(), nil, &Loader{Total: 100e6, Load: func() (*Data, error) { return nil, nil }})
		m.Update(tea.WindowSizeMsg{Width: 200, Height: 60})
		_ = m.View()
	}
}
