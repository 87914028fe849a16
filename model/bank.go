package model

import "math"

// BankRow is the cost of a level turn at one bank angle, against wings level
// at the same weight, altitude, temperature and Mach.
type BankRow struct {
	Bank               float64 // rad
	LoadFactor         float64 // n = 1/cos φ
	InducedIncreasePct float64 // 100 (n² − 1)
	TotalIncreasePct   float64 // 100 (CD(φ) − CD(0)) / CD(0)
	ExtraFuelFlow      float64 // TSFC · ΔD, kg/s
	CL                 float64 // lift coefficient in the turn
	Drag               float64 // N, in the turn
	Buffet             bool    // CL · 1.3 > cl_buffet: the 1.3 g buffet margin is not kept
}

// BankPenalty is the drag and fuel cost of a level turn at bank φ (rad)
// (DESIGN.md §4.6): lift grows with the load factor n = 1/cos φ, so the
// induced drag grows by n² and the wave drag is taken at the turning CL;
// the extra fuel flow is TSFC · ΔD. excess is an added lift-independent drag
// coefficient (zero for the baseline polar).
func BankPenalty(t *Type, w float64, air Air, mach, excess, bank float64) BankRow {
	q := air.DynamicPressure(mach)
	qs := q * t.WingArea
	cl0 := LiftCoefficient(1, w, q, t.WingArea)
	cd0 := t.CD(cl0, mach, excess)
	n := LoadFactor(bank)
	cl := n * cl0
	cd := t.CD(cl, mach, excess)
	tsfc := t.TSFC(mach, air.Theta())
	return BankRow{
		Bank:               bank,
		LoadFactor:         n,
		InducedIncreasePct: 100 * (n*n - 1),
		TotalIncreasePct:   100 * (cd - cd0) / cd0,
		ExtraFuelFlow:      tsfc * (cd - cd0) * qs,
		CL:                 cl,
		Drag:               cd * qs,
		Buffet:             BuffetMargin*cl > t.CLBuffet,
	}
}

// BankTable is BankPenalty at 0, 5, … 45° of bank.
func BankTable(t *Type, w float64, air Air, mach, excess float64) []BankRow {
	rows := make([]BankRow, 0, 10)
	for deg := 0; deg <= 45; deg += 5 {
		rows = append(rows, BankPenalty(t, w, air, mach, excess, float64(deg)*math.Pi/180))
	}
	return rows
}

// MinBuffetMach is the lowest Mach at which 1 g level flight of weight w (kg)
// in air keeps the 1.3 g buffet margin, CL · 1.3 ≤ cl_buffet (trade
// convention): q = ½ γ p M² ≥ 1.3 W g0 / (S cl_buffet), so
// M = √(2 · 1.3 W g0 / (γ p S cl_buffet)). Below it a turn table means
// nothing.
func MinBuffetMach(t *Type, w float64, air Air) float64 {
	return math.Sqrt(2 * BuffetMargin * w * G0 / (Gamma * air.P * t.WingArea * t.CLBuffet))
}
