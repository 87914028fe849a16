package model

import "testing"

// BenchmarkCruiseOptimum is the cost of a full optimum (speeds, optimum and
// maximum altitude), computed for every snapshot the Flight screen shows.
func BenchmarkCruiseOptimum(b *testing.B) {
	ty := twin()
	for i := 0; i < b.N; i++ {
		CruiseOptimum(ty, 65000, 35000*Foot, 0, 0, 0)
	}
}
