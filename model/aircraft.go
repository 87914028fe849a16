package model

import (
	"fmt"
	"math"
)

// Type is an aircraft type: its geometry, baseline drag polar, wave-drag
// parameters, engine and limits, all in SI units. It is usually loaded from a
// type file (DESIGN.md §3.2) by package feed; the Key of a FieldError names
// the type-file key.
type Type struct {
	Name string

	WingArea float64 // reference wing area S, m²
	Span     float64 // wing span b, m

	CD0    float64 // baseline parasite drag coefficient
	Oswald float64 // span efficiency e

	KappaA         float64 // Korn technology factor κ_A
	ThicknessRatio float64 // mean thickness-to-chord ratio t/c
	Sweep          float64 // quarter-chord sweep Λ, rad

	EngineCount int     // number of engines
	TSFCA       float64 // TSFC constant term a, kg/(N·s) (type file: per hour)
	TSFCB       float64 // TSFC Mach term b, kg/(N·s) (type file: per hour)
	// MaxThrustPerDelta is the maximum cruise thrust of one engine divided
	// by δ, N; zero when the type does not give it.
	MaxThrustPerDelta float64
	// Thrust gives an engine's thrust from its corrected fan speed; nil
	// when the type has no table (thrust then comes from fuel flow).
	Thrust *ThrustTable

	MMO         float64 // maximum operating Mach
	MaxAltitude float64 // certified ceiling, pressure altitude, m
	CLBuffet    float64 // 1 g buffet-onset lift coefficient
}

// FieldError is a type value that is missing or impossible. Key is the
// type-file key, e.g. "wing.area_m2".
type FieldError struct {
	Key    string
	Reason string
}

func (e *FieldError) Error() string { return e.Key + ": " + e.Reason }

// TSFCPerHour converts a TSFC coefficient in the trade's kg/(kgf·h)
// (≡ lb/(lbf·h) ≡ 1/h) to SI kg/(N·s): divide by g0 and by 3600 s.
func TSFCPerHour(c float64) float64 { return c / (G0 * Hour) }

// Validate reports the first impossible value of t as a *FieldError that
// names its type-file key.
func (t *Type) Validate() error {
	bad := func(key, format string, args ...any) error {
		return &FieldError{Key: key, Reason: fmt.Sprintf(format, args...)}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case !finite(t.WingArea) || t.WingArea <= 0:
		return bad("wing.area_m2", "must be > 0, got %g", t.WingArea)
	case !finite(t.Span) || t.Span <= 0:
		return bad("wing.span_m", "must be > 0, got %g", t.Span)
	case !finite(t.CD0) || t.CD0 <= 0 || t.CD0 >= 0.2:
		return bad("polar.cd0", "must be in (0, 0.2), got %g", t.CD0)
	case !finite(t.Oswald) || t.Oswald <= 0 || t.Oswald > 1.2:
		return bad("polar.oswald", "must be in (0, 1.2], got %g", t.Oswald)
	case !finite(t.KappaA) || t.KappaA <= 0 || t.KappaA > 1.5:
		return bad("wave.kappa_a", "must be in (0, 1.5], got %g", t.KappaA)
	case !finite(t.ThicknessRatio) || t.ThicknessRatio <= 0 || t.ThicknessRatio >= 0.5:
		return bad("wave.thickness_ratio", "must be in (0, 0.5), got %g", t.ThicknessRatio)
	case !finite(t.Sweep) || t.Sweep < 0 || t.Sweep >= 70*math.Pi/180:
		return bad("wave.sweep_deg", "must be in [0, 70), got %g", t.Sweep*180/math.Pi)
	case t.EngineCount < 1 || t.EngineCount > 8:
		return bad("engine.count", "must be 1 … 8, got %d", t.EngineCount)
	case !finite(t.TSFCA) || t.TSFCA <= 0:
		return bad("engine.tsfc_a_per_h", "must be > 0, got %g", t.TSFCA*G0*Hour)
	case !finite(t.TSFCB) || t.TSFCA+t.TSFCB <= 0:
		return bad("engine.tsfc_b_per_h", "a + b must be > 0 so that TSFC stays positive up to Mach 1, got b = %g", t.TSFCB*G0*Hour)
	case !finite(t.MaxThrustPerDelta) || t.MaxThrustPerDelta < 0:
		return bad("engine.max_cruise_thrust_per_delta_n", "must be > 0 when given, got %g", t.MaxThrustPerDelta)
	case !finite(t.MMO) || t.MMO <= 0 || t.MMO >= 1:
		return bad("limits.mmo", "must be in (0, 1), got %g", t.MMO)
	case !finite(t.MaxAltitude) || t.MaxAltitude <= 0 || t.MaxAltitude > 65000*Foot:
		return bad("limits.max_alt_ft", "must be in (0, 65000], got %g", t.MaxAltitude/Foot)
	case !finite(t.CLBuffet) || t.CLBuffet <= 0 || t.CLBuffet > 3:
		return bad("limits.cl_buffet", "must be in (0, 3], got %g", t.CLBuffet)
	}
	return nil
}

// AspectRatio is AR = b²/S.
func (t *Type) AspectRatio() float64 { return t.Span * t.Span / t.WingArea }

// K is the induced-drag factor k = 1/(π e AR) of the parabolic polar
// CD = CD0 + k CL² (Anderson, Introduction to Flight, ch. 6).
func (t *Type) K() float64 { return 1 / (math.Pi * t.Oswald * t.AspectRatio()) }

// lockMargin is M_dd − M_cr = (0.1/80)^(1/3): the offset at which Lock's
// fourth-power law gives dCD/dM = 0.1, the definition of drag-divergence
// Mach (Gur, Mason & Schetz, J. Aircraft 47(4), 2010).
var lockMargin = math.Cbrt(0.1 / 80)

// DragDivergenceMach is the Korn equation extended for sweep:
//
//	M_dd = κ_A/cos Λ − (t/c)/cos²Λ − CL/(10 cos³Λ)
//
// (Gur, Mason & Schetz, J. Aircraft 47(4), 2010).
func (t *Type) DragDivergenceMach(cl float64) float64 {
	c := math.Cos(t.Sweep)
	return t.KappaA/c - t.ThicknessRatio/(c*c) - cl/(10*c*c*c)
}

// CriticalMach is M_cr = M_dd − (0.1/80)^(1/3).
func (t *Type) CriticalMach(cl float64) float64 {
	return t.DragDivergenceMach(cl) - lockMargin
}

// WaveDrag is Lock's fourth-power law ΔCD_wave = 20 (M − M_cr)⁴ for
// M > M_cr, else 0 (Gur, Mason & Schetz, J. Aircraft 47(4), 2010).
func (t *Type) WaveDrag(cl, mach float64) float64 {
	d := mach - t.CriticalMach(cl)
	if d <= 0 {
		return 0
	}
	d2 := d * d
	return 20 * d2 * d2
}

// CD is the drag coefficient CD = CD0 + excess + k CL² + ΔCD_wave(CL, M);
// excess is an added lift-independent drag coefficient (zero for the
// baseline polar).
func (t *Type) CD(cl, mach, excess float64) float64 {
	return t.CD0 + excess + t.K()*cl*cl + t.WaveDrag(cl, mach)
}

// TSFC is the thrust-specific fuel consumption (a + b M) √θ in kg/(N·s), the
// high-bypass turbofan form of Mattingly, Aircraft Engine Design. It is taken
// as independent of thrust setting.
func (t *Type) TSFC(mach, theta float64) float64 {
	return (t.TSFCA + t.TSFCB*mach) * math.Sqrt(theta)
}

// MaxThrust is the maximum cruise thrust count × (T/δ) × δ in N, or +Inf when
// the type does not give it.
func (t *Type) MaxThrust(delta float64) float64 {
	if t.MaxThrustPerDelta <= 0 {
		return math.Inf(1)
	}
	return float64(t.EngineCount) * t.MaxThrustPerDelta * delta
}
