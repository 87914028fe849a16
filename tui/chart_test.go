package tui

import (
	"math"
	"testing"
)

func TestThin(t *testing.T) {
	var pts [][2]float64
	for i := 0; i < 10000; i++ {
		pts = append(pts, [2]float64{float64(i), math.Sin(float64(i) / 300)})
	}
	pts[5000][1] = 9 // a spike must survive
	cases := []struct {
		name    string
		in      [][2]float64
		buckets int
		max     int
	}{
		{"few points kept", pts[:50], 100, 50},
		{"many points thinned", pts, 100, 200},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got := thin(c.in, c.buckets)
			if len(got) > c.max || len(got) == 0 {
				t.Fatalf("%d points, want at most %d", len(got), c.max)
			}
			lo, hi := math.Inf(1), math.Inf(-1)
			for i, p := range got {
				if i > 0 && p[0] < got[i-1][0] {
					t.Fatalf("x out of order at %d", i)
				}
				lo, hi = math.Min(lo, p[1]), math.Max(hi, p[1])
			}
			wantLo, wantHi := math.Inf(1), math.Inf(-1)
			for _, p := range c.in {
				wantLo, wantHi = math.Min(wantLo, p[1]), math.Max(wantHi, p[1])
			}
			if lo != wantLo || hi != wantHi {
				t.Errorf("range %g … %g, want %g … %g (extremes kept)", lo, hi, wantLo, wantHi)
			}
		})
	}
}
