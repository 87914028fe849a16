package tui

import "testing"

// BenchmarkFleetKey is a cursor move on the Fleet screen at 200 × 60 with
// 100 tails: the redraw a keypress costs.
func BenchmarkFleetKey(b *testing.B) {
	m := sized(smallData(b, 100, 365), 200, 60)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if i%2 == 0 {
			press(m, "down")
		} else {
			press(m, "up")
		}
	}
}
