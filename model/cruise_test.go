package model

import (
	"math"
	"testing"
)

// Parabolic polar, standard textbook results (Anderson, Introduction to
// Flight, ch. 6): at minimum drag the induced drag equals the parasite drag
// and L/D = (L/D)max = 1/(2√(CD0 k)) ≈ 16.9 for the business jet; at jet
// maximum range at constant altitude (max √CL/CD) CD0 = 3 k CL²,
// (√CL/CD)max ≈ 23.4 for the business jet (from memory of the book;
// rounded) and V = 3^¼ V_md.
func TestParabolicPolarOptima(t *testing.T) {
	ty := bizJet()
	for _, ft := range []float64{20000, 30000} {
		air := AirISA(ft*Foot, 0)
		md := MinDragMach(ty, bizJetWeight, air, 0)
		mr := MaxRangeMach(ty, bizJetWeight, air, 0)
		induced := ty.K() * md.CL * md.CL
		if math.Abs(induced/ty.CD0-1) > 1e-4 {
			t.Errorf("FL%.0f min drag: induced %.6f vs parasite %.6f", ft/100, induced, ty.CD0)
		}
		if ld := md.CL / md.CD; math.Abs(ld-16.9) > 0.05 {
			t.Errorf("FL%.0f (L/D)max = %.3f, want 16.9", ft/100, ld)
		}
		if r := 3 * ty.K() * mr.CL * mr.CL / ty.CD0; math.Abs(r-1) > 1e-4 {
			t.Errorf("FL%.0f max range: 3kCL²/CD0 = %.6f, want 1", ft/100, r)
		}
		if v := math.Sqrt(mr.CL) / mr.CD; math.Abs(v-23.4) > 0.05 {
			t.Errorf("FL%.0f (√CL/CD)max = %.3f, want 23.4", ft/100, v)
		}
		if r := mr.Mach / md.Mach; math.Abs(r-math.Pow(3, 0.25)) > 1e-4 {
			t.Errorf("FL%.0f V_mr/V_md = %.5f, want 3^¼ = %.5f", ft/100, r, math.Pow(3, 0.25))
		}
	}
}

// Common practice (no source): below the minimum-drag speed the induced drag
// is more than half the total.
func TestInducedDominatesBelowMinDrag(t *testing.T) {
	ty := bizJet()
	air := AirISA(25000*Foot, 0)
	md := MinDragMach(ty, bizJetWeight, air, 0)
	for _, f := range []float64{0.7, 0.85, 0.95} {
		l := LevelFlight(ty, bizJetWeight, air, f*md.Mach, 0)
		if share := ty.K() * l.CL * l.CL / l.CD; share <= 0.5 {
			t.Errorf("at %.0f %% of V_md induced share %.3f, want > 0.5", 100*f, share)
		}
	}
}

// bruteMax scans f on [lo, hi] with step and returns the best x: an
// independent, slow check of the optimiser.
func bruteMax(f func(float64) float64, lo, hi, step float64) float64 {
	best, bx := math.Inf(-1), lo
	for x := lo; x <= hi+1e-12; x += step {
		if v := f(x); v > best {
			best, bx = v, x
		}
	}
	return bx
}

// The cruise optimum agrees with a brute-force scan of the same equations,
// and its speeds obey their definitions (DESIGN.md §4.7).
func TestCruiseOptimumDefinitions(t *testing.T) {
	ty := twin()
	tests := []struct {
		name       string
		w, ft, dev float64
		ci, counts float64
	}{
		{"mid weight FL350 ISA", 65000, 35000, 0, 0, 0},
		{"heavy FL310 ISA+10", 76000, 31000, 10, 0, 0},
		{"light FL390 ISA-5 CI 30", 54000, 39000, -5, 30, 0},
		{"mid weight 40 counts excess", 65000, 35000, 0, 20, 40},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			excess := tc.counts * DragCount
			ci := tc.ci / Minute
			o := CruiseOptimum(ty, tc.w, tc.ft*Foot, tc.dev, ci, excess)
			lf := func(m float64) Level { return LevelFlight(ty, tc.w, o.Air, m, excess) }

			if want := bruteMax(func(m float64) float64 { return lf(m).SR }, minSearchMach, ty.MMO, 1e-4); math.Abs(o.MaxRange.Mach-want) > 2e-4 {
				t.Errorf("max-range Mach %.4f, brute force %.4f", o.MaxRange.Mach, want)
			}
			if want := bruteMax(func(m float64) float64 { return -lf(m).Drag }, minSearchMach, ty.MMO, 1e-4); math.Abs(o.MinDrag.Mach-want) > 2e-4 {
				t.Errorf("min-drag Mach %.4f, brute force %.4f", o.MinDrag.Mach, want)
			}
			econ := func(m float64) float64 { l := lf(m); return -(l.FuelFlow + ci) / l.TAS }
			if want := bruteMax(econ, minSearchMach, ty.MMO, 1e-4); math.Abs(o.Econ.Mach-want) > 2e-4 {
				t.Errorf("econ Mach %.4f, brute force %.4f", o.Econ.Mach, want)
			}
			if o.LongRange.Mach < ty.MMO {
				if r := o.LongRange.SR / o.MaxRange.SR; math.Abs(r-LongRangeFraction) > 1e-5 {
					t.Errorf("long-range SR ratio %.6f, want 0.99", r)
				}
			}
			if !(o.LongRange.Mach > o.MaxRange.Mach && o.MaxRange.Mach > o.MinDrag.Mach && o.LongRange.Mach <= ty.MMO) {
				t.Errorf("speeds out of order: md %.4f mr %.4f lrc %.4f", o.MinDrag.Mach, o.MaxRange.Mach, o.LongRange.Mach)
			}
			if tc.ci > 0 && o.Econ.Mach <= o.MaxRange.Mach {
				t.Errorf("econ Mach %.4f with CI %g not above max-range %.4f", o.Econ.Mach, tc.ci, o.MaxRange.Mach)
			}
			if o.OptimumAltitude > o.MaxAltitude+1e-9 {
				t.Errorf("optimum altitude %.0f ft above maximum %.0f ft", o.OptimumAltitude/Foot, o.MaxAltitude/Foot)
			}
			srAt := func(h float64) float64 { return MaxRangeMach(ty, tc.w, AirISA(h, tc.dev), excess).SR }
			if want := bruteMax(srAt, 0, o.MaxAltitude, 50*Foot); math.Abs(o.OptimumAltitude-want) > 60*Foot {
				t.Errorf("optimum altitude %.0f ft, brute force %.0f ft", o.OptimumAltitude/Foot, want/Foot)
			}
		})
	}
}

// At the maximum altitude the binding limit holds with equality: the 1.3 g
// buffet margin (CL · 1.3 = cl_buffet at long-range Mach, the trade's
// convention) or the thrust.
func TestMaxAltitudeLimits(t *testing.T) {
	tests := []struct {
		name   string
		w      float64
		modify func(*Type)
		want   Limit
	}{
		{"heavy: buffet", 76000, func(*Type) {}, LimitBuffet},
		{"weak engines: thrust", 70000, func(t *Type) { t.MaxThrustPerDelta = 70000 }, LimitThrust},
		{"light: ceiling", 45000, func(*Type) {}, LimitCeiling},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ty := twin()
			tc.modify(ty)
			h, lim := MaxAltitude(ty, tc.w, 0, 0)
			if lim != tc.want {
				t.Fatalf("limit %q at %.0f ft, want %q", lim, h/Foot, tc.want)
			}
			air := AirISA(h, 0)
			lrc := LongRangeMach(ty, tc.w, air, 0, MaxRangeMach(ty, tc.w, air, 0))
			switch lim {
			case LimitBuffet:
				if r := BuffetMargin * lrc.CL / ty.CLBuffet; math.Abs(r-1) > 1e-3 {
					t.Errorf("1.3 CL / CL_buffet = %.5f at max altitude, want 1", r)
				}
			case LimitThrust:
				if r := lrc.Drag / ty.MaxThrust(air.Delta()); math.Abs(r-1) > 1e-3 {
					t.Errorf("drag / max thrust = %.5f at max altitude, want 1", r)
				}
			case LimitCeiling:
				if h != ty.MaxAltitude {
					t.Errorf("max altitude %.0f ft, want the ceiling", h/Foot)
				}
			}
		})
	}
}

// Excess drag costs range: the tail's own polar has less specific range, and
// where thrust limits the maximum altitude, a lower one. (Its optimum
// altitude may rise: more parasite drag raises the best CL, √(CD0/3k) on a
// parabolic polar.)
func TestExcessCostsRange(t *testing.T) {
	ty := twin()
	ty.MaxThrustPerDelta = 70000
	base := CruiseOptimum(ty, 65000, 35000*Foot, 0, 0, 0)
	worn := CruiseOptimum(ty, 65000, 35000*Foot, 0, 0, 50*DragCount)
	if worn.MaxRange.SR >= base.MaxRange.SR {
		t.Errorf("SR with 50 counts %.4f not below baseline %.4f", worn.MaxRange.SR, base.MaxRange.SR)
	}
	if base.MaxAltLimit != LimitThrust || worn.MaxAltitude >= base.MaxAltitude {
		t.Errorf("thrust-limited max altitude with 50 counts %.0f ft (%s), baseline %.0f ft (%s): want lower",
			worn.MaxAltitude/Foot, worn.MaxAltLimit, base.MaxAltitude/Foot, base.MaxAltLimit)
	}
}
