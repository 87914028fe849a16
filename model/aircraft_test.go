package model

import (
	"errors"
	"math"
	"testing"
)

// Lock's fourth-power law at the drag-divergence Mach: ΔCD = 20 (0.1/80)^(4/3)
// = 0.00269 and dCD/dM = 0.1 (both follow from the definition of M_dd; Gur,
// Mason & Schetz, J. Aircraft 47(4), 2010).
func TestLockLawAtDragDivergence(t *testing.T) {
	ty := twin()
	for _, cl := range []float64{0.3, 0.5, 0.7} {
		mdd := ty.DragDivergenceMach(cl)
		if got := ty.WaveDrag(cl, mdd); math.Abs(got-0.00269) > 0.000005 {
			t.Errorf("CL %.1f: ΔCD_wave(M_dd) = %.6f, want 0.00269", cl, got)
		}
		const h = 1e-6
		slope := (ty.WaveDrag(cl, mdd+h) - ty.WaveDrag(cl, mdd-h)) / (2 * h)
		if math.Abs(slope-0.1) > 1e-6 {
			t.Errorf("CL %.1f: dCD/dM at M_dd = %.7f, want 0.1", cl, slope)
		}
		if w := ty.WaveDrag(cl, ty.CriticalMach(cl)-0.01); w != 0 {
			t.Errorf("CL %.1f: wave drag %g below M_cr, want 0", cl, w)
		}
	}
}

// Korn equation terms (Gur, Mason & Schetz 2010): for an unswept wing
// M_dd = κ_A − t/c − CL/10; sweep divides by cos Λ, cos²Λ, cos³Λ.
func TestKornEquation(t *testing.T) {
	tests := []struct {
		name           string
		kappa, tc, deg float64
		cl, want       float64
	}{
		{"unswept", 0.95, 0.12, 0, 0.5, 0.95 - 0.12 - 0.05},
		{"30 degrees", 0.95, 0.12, 30, 0.5,
			0.95/math.Cos(math.Pi/6) - 0.12/math.Pow(math.Cos(math.Pi/6), 2) - 0.5/(10*math.Pow(math.Cos(math.Pi/6), 3))},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ty := &Type{KappaA: tc.kappa, ThicknessRatio: tc.tc, Sweep: tc.deg * math.Pi / 180}
			if got := ty.DragDivergenceMach(tc.cl); math.Abs(got-tc.want) > 1e-12 {
				t.Errorf("M_dd = %.6f, want %.6f", got, tc.want)
			}
		})
	}
}

// Anderson, Introduction to Flight, hypothetical business jet: aspect ratio
// 53.3²/318 = 8.93 and (L/D)max = 1/(2√(CD0 k)) ≈ 16.9 (from memory of the
// book; rounded).
func TestBizJetPolar(t *testing.T) {
	ty := bizJet()
	if ar := ty.AspectRatio(); math.Abs(ar-8.93) > 0.005 {
		t.Errorf("AR = %.4f, want 8.93", ar)
	}
	ldMax := 1 / (2 * math.Sqrt(ty.CD0*ty.K()))
	if math.Abs(ldMax-16.9) > 0.05 {
		t.Errorf("(L/D)max = %.3f, want 16.9", ldMax)
	}
}

// Common practice: the induced-drag coefficient k CL² is inversely
// proportional to aspect ratio (k = 1/(π e AR)).
func TestInducedInverseAspectRatio(t *testing.T) {
	a := twin()
	b := twin()
	b.Span *= math.Sqrt2 // AR doubles at the same area
	if r := a.K() / b.K(); math.Abs(r-2) > 1e-12 {
		t.Errorf("k ratio for doubled AR = %g, want 2", r)
	}
}

// TSFC = (a + b M) √θ (Mattingly, Aircraft Engine Design): linear in Mach and
// in √θ.
func TestTSFC(t *testing.T) {
	ty := twin()
	got := ty.TSFC(0.8, 0.75)
	want := (ty.TSFCA + 0.8*ty.TSFCB) * math.Sqrt(0.75)
	if math.Abs(got-want) > 1e-18 {
		t.Errorf("TSFC = %g, want %g", got, want)
	}
	if mt := ty.MaxThrust(0.2); math.Abs(mt-2*130000*0.2) > 1e-9 {
		t.Errorf("MaxThrust(0.2) = %g N, want %g", mt, 2*130000*0.2)
	}
	if !math.IsInf(bizJet().MaxThrust(0.2), 1) {
		t.Error("a type without max thrust should have unlimited thrust")
	}
}

func TestValidateNamesKey(t *testing.T) {
	tests := []struct {
		key   string
		spoil func(*Type)
	}{
		{"wing.area_m2", func(t *Type) { t.WingArea = 0 }},
		{"wing.span_m", func(t *Type) { t.Span = -1 }},
		{"polar.cd0", func(t *Type) { t.CD0 = math.NaN() }},
		{"polar.oswald", func(t *Type) { t.Oswald = 1.3 }},
		{"wave.kappa_a", func(t *Type) { t.KappaA = 0 }},
		{"wave.thickness_ratio", func(t *Type) { t.ThicknessRatio = 0 }},
		{"wave.sweep_deg", func(t *Type) { t.Sweep = -0.1 }},
		{"engine.count", func(t *Type) { t.EngineCount = 0 }},
		{"engine.tsfc_a_per_h", func(t *Type) { t.TSFCA = 0 }},
		{"engine.tsfc_b_per_h", func(t *Type) { t.TSFCB = -t.TSFCA }},
		{"engine.max_cruise_thrust_per_delta_n", func(t *Type) { t.MaxThrustPerDelta = -5 }},
		{"limits.mmo", func(t *Type) { t.MMO = 1 }},
		{"limits.max_alt_ft", func(t *Type) { t.MaxAltitude = 0 }},
		{"limits.cl_buffet", func(t *Type) { t.CLBuffet = 0 }},
		// degenerate values that once gave +Inf or absurd results
		{"wing.area_m2", func(t *Type) { t.WingArea = 1e-300 }},
		{"limits.mmo", func(t *Type) { t.MMO = 1e-9 }},
		{"polar.oswald", func(t *Type) { t.Oswald = 1e-9 }},
		{"wing.span_m", func(t *Type) { t.Span = 100 }},                       // aspect ratio 89
		{"engine.tsfc_b_per_h", func(t *Type) { t.TSFCB = TSFCPerHour(1.4) }}, // TSFC 1.5 at M0.8
		{"engine.max_cruise_thrust_per_delta_n", func(t *Type) { t.MaxThrustPerDelta = 1e-6 }},
		{"polar.cd0", func(t *Type) { t.CD0 = 0.5 }},
		{"limits.max_alt_ft", func(t *Type) { t.MaxAltitude = 1e9 }},
	}
	if err := twin().Validate(); err != nil {
		t.Fatalf("valid type rejected: %v", err)
	}
	for _, tc := range tests {
		t.Run(tc.key, func(t *testing.T) {
			ty := twin()
			tc.spoil(ty)
			err := ty.Validate()
			var fe *FieldError
			if !errors.As(err, &fe) || fe.Key != tc.key {
				t.Fatalf("Validate() = %v, want a FieldError for %s", err, tc.key)
			}
		})
	}
}
