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

// Validate reports the first value of t outside its plausible range as a
// *FieldError that names its type-file key. The ranges are wide enough for
// any jet transport or business jet (common practice, not a source): a value
// outside them is a typing or unit error, and would otherwise give infinite
// or absurd results (a wing area of 1e-300 m², an MMO of 1e-9).
func (t *Type) Validate() error {
	deg := 180 / math.Pi
	perH := G0 * Hour
	for _, r := range []struct {
		key    string
		v      float64
		lo, hi float64 // plausible range, inclusive
		unit   string
	}{
		{"wing.area_m2", t.WingArea, 5, 2000, " m²"},
		{"wing.span_m", t.Span, 5, 120, " m"},
		{"polar.cd0", t.CD0, 0.005, 0.1, ""},
		{"polar.oswald", t.Oswald, 0.4, 1.2, ""},
		{"wave.kappa_a", t.KappaA, 0.7, 1.1, ""},
		{"wave.thickness_ratio", t.ThicknessRatio, 0.04, 0.25, ""},
		{"wave.sweep_deg", t.Sweep * deg, 0, 60, "°"},
		{"engine.count", float64(t.EngineCount), 1, 8, ""},
		{"engine.tsfc_a_per_h", t.TSFCA * perH, 0.05, 1.5, " /h"},
		{"engine.tsfc_b_per_h", t.TSFCB * perH, -1, 1.5, " /h"},
		{"limits.mmo", t.MMO, 0.4, 0.99, ""},
		{"limits.max_alt_ft", t.MaxAltitude / Foot, 10000, 65000, " ft"},
		{"limits.cl_buffet", t.CLBuffet, 0.3, 1.5, ""},
	} {
		if !(r.v >= r.lo && r.v <= r.hi) { // NaN fails too
			return &FieldError{Key: r.key, Reason: fmt.Sprintf("must be %g … %g%s, got %.4g", r.lo, r.hi, r.unit, r.v)}
		}
	}
	if ar := t.AspectRatio(); ar < 3 || ar > 20 {
		return &FieldError{Key: "wing.span_m", Reason: fmt.Sprintf("aspect ratio b²/S must be 3 … 20, got %.3g", ar)}
	}
	if a08 := (t.TSFCA + 0.8*t.TSFCB) * perH; a08 < 0.2 || a08 > 1.5 || t.TSFCA+t.TSFCB <= 0 {
		return &FieldError{Key: "engine.tsfc_b_per_h", Reason: fmt.Sprintf("TSFC a + 0.8 b at Mach 0.8 must be 0.2 … 1.5 /h and a + b > 0, got %.3g and %.3g", a08, (t.TSFCA+t.TSFCB)*perH)}
	}
	if m := t.MaxThrustPerDelta; m != 0 && !(m >= 1e3 && m <= 2e6) {
		return &FieldError{Key: "engine.max_cruise_thrust_per_delta_n", Reason: fmt.Sprintf("must be 1000 … 2e+06 N when given, got %.4g", m)}
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
