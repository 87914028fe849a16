package model

import (
	"fmt"
	"math"
)

// ExcessFromDeviation turns a drag deviation devPct (% of baseline drag)
// into the added lift-independent drag coefficient it means at weight w
// (kg), air and Mach: ΔCD = devPct/100 · CD_baseline(CL, M). Excess drag is
// taken as lift-independent (DESIGN §4.5), so the same deviation is a
// different ΔCD at another condition. NaN gives 0 (no excess known).
func ExcessFromDeviation(t *Type, w float64, air Air, mach, devPct float64) float64 {
	if math.IsNaN(devPct) {
		return 0
	}
	return devPct / 100 * LevelFlight(t, w, air, mach, 0).CD
}

// Warnings lists what makes an analysed snapshot doubtful although its
// values are valid: a lift coefficient beyond the 1.3 g buffet margin (the
// aircraft could not be flying steadily there), and a measured parasite drag
// below zero (the thrust is too small for the lift: fuel flow of one engine,
// a unit, or the wrong weight).
func (p Point) Warnings(t *Type) []string {
	var w []string
	if BuffetMargin*p.CL > t.CLBuffet {
		w = append(w, fmt.Sprintf("CL %.3f is beyond the 1.3 g buffet margin (CL ≤ %.3f at 1 g): check weight, altitude and Mach", p.CL, t.CLBuffet/BuffetMargin))
	}
	if p.OutsideThrustTable {
		w = append(w, fmt.Sprintf("corrected fan speed N1k %.1f %% at this Mach is outside the type's thrust table: thrust from fuel flow, and the trend leaves such a snapshot out", p.N1Corrected))
	}
	if p.CDParasiteMeasured < 0 {
		w = append(w, fmt.Sprintf("measured parasite drag %.5f is negative: the thrust does not cover the induced and wave drag (is the fuel flow that of all engines, in the right unit?)", p.CDParasiteMeasured))
	}
	return w
}
