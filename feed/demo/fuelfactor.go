package demo

import (
	"time"

	"dragdeck/model"
)

// TrueFuelFlowDevPct is the fuel-flow deviation (%) that the truth gives a
// snapshot s of the tail at t: the fuel that its planted airframe excess
// (ΔCD = deviation/100 × the reference CD, lift-independent) and engine
// deviation burn at s's condition, against the fuel of the baseline polar
// and engine model, without the recorders' noise:
//
//	100 ((1 + e/100) (D_excess + climb) / (D_baseline + climb) − 1),
//	climb = W g0 VS/TAS + W dV/dt.
//
// False for a tail the truth does not hold. On a fleet made with Clean,
// the recorded condition is the true one, so this is the truth of the
// monitored fuel factor (model.FactorSeries).
func (d *Fleet) TrueFuelFlowDevPct(tail string, t time.Time, s model.Snapshot) (float64, bool) {
	for i := range d.Truth.Tails {
		tt := &d.Truth.Tails[i]
		if tt.Tail != tail || tt.ctx == nil {
			continue
		}
		c := tt.ctxAt(t)
		air := model.AirAt(s.Altitude, s.SAT)
		q := air.DynamicPressure(s.Mach)
		cl := model.LiftCoefficient(model.LoadFactor(s.Bank), s.Weight, q, c.ty.WingArea)
		climb := s.Weight*model.G0*s.VS/air.TAS(s.Mach) + s.Weight*s.Accel
		excess := c.ty.CD(cl, s.Mach, tt.deviation(t)/100*c.refCD)*q*c.ty.WingArea + climb
		base := c.ty.CD(cl, s.Mach, 0)*q*c.ty.WingArea + climb
		return 100 * ((1+tt.Engine.deviation(t)/100)*excess/base - 1), true
	}
	return 0, false
}
