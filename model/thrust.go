package model

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/interp"
)

// ThrustTable is an engine's net thrust from its corrected fan speed, the
// in-flight thrust determination by corrected parameters (SAE AIR1703):
//
//	θt2 = θ (1 + 0.2 M²)       total temperature ratio, recovery factor 1
//	N1k = N1 / √θt2            corrected fan speed, %
//	Fn  = count · δ · F(N1k, M)
//
// F is the net thrust of one engine divided by δ, N, given on a grid of
// N1k (%) and Mach and interpolated bilinearly inside the grid only.
type ThrustTable struct {
	N1       []float64   // corrected fan speed grid N1k, %, strictly ascending
	Mach     []float64   // Mach grid, strictly ascending
	PerDelta [][]float64 // F, N: one row per Mach, one value per N1 grid point

	rows []interp.PiecewiseLinear // each Mach row, linear in N1k
}

// NewThrustTable checks a thrust table and prepares it for interpolation.
// Each grid needs at least 2 strictly ascending finite points; every row is
// as long as the N1 grid, finite, > 0 and rising with N1. An error is a
// *FieldError naming the type-file key (thrust.n1_corrected_pct,
// thrust.mach, thrust.fn_per_delta_n).
func NewThrustTable(n1, mach []float64, perDelta [][]float64) (*ThrustTable, error) {
	const (
		keyN1   = "thrust.n1_corrected_pct"
		keyMach = "thrust.mach"
		keyFn   = "thrust.fn_per_delta_n"
	)
	bad := func(key, format string, args ...any) error {
		return &FieldError{Key: key, Reason: fmt.Sprintf(format, args...)}
	}
	grid := func(key string, g []float64) error {
		if len(g) < 2 {
			return bad(key, "needs at least 2 points, got %d", len(g))
		}
		for i, v := range g {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				return bad(key, "point %d must be finite and > 0, got %g", i+1, v)
			}
			if i > 0 && v <= g[i-1] {
				return bad(key, "must be strictly ascending: point %d (%g) is not above %g", i+1, v, g[i-1])
			}
		}
		return nil
	}
	if err := grid(keyN1, n1); err != nil {
		return nil, err
	}
	if err := grid(keyMach, mach); err != nil {
		return nil, err
	}
	if len(perDelta) != len(mach) {
		return nil, bad(keyFn, "needs one row per Mach grid point (%d), got %d", len(mach), len(perDelta))
	}
	t := &ThrustTable{N1: n1, Mach: mach, PerDelta: perDelta, rows: make([]interp.PiecewiseLinear, len(mach))}
	for i, row := range perDelta {
		if len(row) != len(n1) {
			return nil, bad(keyFn, "row %d (Mach %g) has %d values, the N1 grid %d", i+1, mach[i], len(row), len(n1))
		}
		for j, v := range row {
			if math.IsNaN(v) || math.IsInf(v, 0) || v <= 0 {
				return nil, bad(keyFn, "row %d value %d must be finite and > 0, got %g", i+1, j+1, v)
			}
			if j > 0 && v <= row[j-1] {
				return nil, bad(keyFn, "row %d (Mach %g) must rise with N1: value %d (%g) is not above %g", i+1, mach[i], j+1, v, row[j-1])
			}
		}
		if err := t.rows[i].Fit(n1, row); err != nil {
			return nil, bad(keyFn, "row %d: %v", i+1, err)
		}
	}
	return t, nil
}

// CorrectedN1 is N1k = N1 / √(θ (1 + 0.2 M²)) for fan speed n1 (%), Mach m
// and static temperature ratio θ: the fan speed referred to standard
// sea-level total temperature at the engine face (recovery factor 1).
func CorrectedN1(n1, m, theta float64) float64 {
	return n1 / math.Sqrt(theta*(1+0.2*m*m))
}

// At returns F(n1k, m), the net thrust of one engine divided by δ, N, by
// bilinear interpolation: linear in N1k along the two Mach rows around m,
// then linear in Mach. ok is false outside the grid (no extrapolation).
func (t *ThrustTable) At(n1k, m float64) (f float64, ok bool) {
	if !(n1k >= t.N1[0] && n1k <= t.N1[len(t.N1)-1] && m >= t.Mach[0] && m <= t.Mach[len(t.Mach)-1]) {
		return math.NaN(), false
	}
	j := sort.SearchFloat64s(t.Mach, m) // first grid Mach ≥ m
	if t.Mach[j] == m {
		return t.rows[j].Predict(n1k), true
	}
	m0, m1 := t.Mach[j-1], t.Mach[j]
	f0, f1 := t.rows[j-1].Predict(n1k), t.rows[j].Predict(n1k)
	return f0 + (f1-f0)*(m-m0)/(m1-m0), true
}
