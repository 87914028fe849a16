package model

import (
	"math"
	"testing"
)

// Levels gives ISA's values (and AirAt's air), for altitudes met again, new ones, ones that
// share a slot, and for what is not an altitude at all.
func TestLevels(t *testing.T) {
	var l Levels
	tests := []struct {
		name string
		h    []float64 // m, asked in turn
	}{
		{"flight levels met again", []float64{35000 * Foot, 37000 * Foot, 35000 * Foot, 39000 * Foot, 37000 * Foot}},
		{"troposphere, tropopause, stratosphere", []float64{0, 11000, 11000, 15000, 20000, 25000, 25000}},
		{"below sea level and zero's sign", []float64{-300, math.Copysign(0, -1), 0}},
		{"many altitudes, slots shared", func() []float64 {
			var h []float64
			for i := 0; i < 500; i++ {
				h = append(h, float64(i%150)*97.3)
			}
			return h
		}()},
		{"not a number", []float64{math.NaN(), math.NaN()}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			for _, h := range tt.h {
				gotT, gotP := l.ISA(h)
				wantT, wantP := ISA(h)
				same := func(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }
				if !same(gotT, wantT) || !same(gotP, wantP) {
					t.Fatalf("h %g m: %g K %g Pa, ISA %g K %g Pa", h, gotT, gotP, wantT, wantP)
				}
				if a, w := l.AirAt(h, 220), AirAt(h, 220); !same(a.P, w.P) || a.T != w.T || !same(a.TISA, w.TISA) {
					t.Fatalf("h %g m: air %+v, AirAt %+v", h, a, w)
				}
			}
		})
	}
	var none *Levels // nil: ISA itself
	if T, p := none.ISA(15000); T != tTropopause || math.Abs(p-12044.6) > 0.5 {
		t.Errorf("nil Levels at 15 km: %g K %g Pa, want 216.65 K and 12,044.6 Pa", T, p) // ICAO Doc 7488 table, from memory
	}
}
