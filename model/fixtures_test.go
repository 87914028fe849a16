package model

import "math"

// bizJet is the hypothetical business jet of Anderson, Introduction to Flight
// (ch. 6 worked examples): W 19,815 lb, S 318 ft², b 53.3 ft, CD0 0.02,
// e 0.81. Wave drag is switched off (κ_A 1.5 puts M_cr above Mach 1) and TSFC
// is constant (b = 0) so that the textbook's parabolic-polar results hold.
func bizJet() *Type {
	return &Type{
		Name:           "textbook business jet",
		WingArea:       318 * Foot * Foot,
		Span:           53.3 * Foot,
		CD0:            0.02,
		Oswald:         0.81,
		KappaA:         1.5,
		ThicknessRatio: 0.1,
		Sweep:          0,
		EngineCount:    2,
		TSFCA:          TSFCPerHour(0.6),
		TSFCB:          0,
		MMO:            0.95,
		MaxAltitude:    45000 * Foot,
		CLBuffet:       3,
	}
}

const bizJetWeight = 19815 * Pound // kg

// twin is an invented narrow-body twin for the cruise tests (not the demo
// type, so that tuning the demo cannot hide a regression here).
func twin() *Type {
	return &Type{
		Name:              "test twin (invented)",
		WingArea:          120,
		Span:              34,
		CD0:               0.022,
		Oswald:            0.76,
		KappaA:            0.94,
		ThicknessRatio:    0.12,
		Sweep:             26 * math.Pi / 180,
		EngineCount:       2,
		TSFCA:             TSFCPerHour(0.40),
		TSFCB:             TSFCPerHour(0.33),
		MaxThrustPerDelta: 130000,
		MMO:               0.82,
		MaxAltitude:       41000 * Foot,
		CLBuffet:          0.84,
	}
}
