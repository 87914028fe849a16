package model

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat"
)

// PolarPoint is one analysed snapshot as the polar fit uses it.
type PolarPoint struct {
	CL         float64
	CDMeasured float64
	CDWave     float64 // baseline wave drag at the point, removed before the fit
}

// PolarFit is a least-squares parabolic polar CD = CD0 + k CL² (DESIGN.md
// §4.11) with the ordinary-least-squares standard errors of its two
// coefficients (Draper & Smith, Applied Regression Analysis, ch. 1):
//
//	s² = Σ r² / (n − 2),  SE(k) = s / √Sxx,  SE(CD0) = s √(1/n + x̄²/Sxx),
//
// where x = CL², x̄ its mean and Sxx = Σ (x − x̄)².
type PolarFit struct {
	CD0, K         float64
	SECD0, SEK     float64
	ResidualSD     float64 // s, in drag coefficient
	N              int
	CL2Min, CL2Max float64
}

// MinCL2Span is the least spread of CL² (max − min) the fit accepts: with
// less, k is not determined (common practice: the points must span a
// range of lift).
const MinCL2Span = 0.05

// FitPolar fits CD_measured − ΔCD_wave = CD0 + k CL² by least squares
// (gonum stat.LinearRegression). It refuses fewer than 10 points or points
// whose CL² spans less than MinCL2Span.
func FitPolar(pts []PolarPoint) (PolarFit, error) {
	n := len(pts)
	if n < 10 {
		return PolarFit{}, fmt.Errorf("%d points: the fit needs at least 10", n)
	}
	x, y := make([]float64, n), make([]float64, n)
	f := PolarFit{N: n, CL2Min: math.Inf(1), CL2Max: math.Inf(-1)}
	for i, p := range pts {
		x[i] = p.CL * p.CL
		y[i] = p.CDMeasured - p.CDWave
		f.CL2Min, f.CL2Max = math.Min(f.CL2Min, x[i]), math.Max(f.CL2Max, x[i])
	}
	if f.CL2Max-f.CL2Min < MinCL2Span {
		return f, fmt.Errorf("the points span CL² %.3f … %.3f only; the fit needs a spread of at least %.2f "+
			"(take more weights, levels or speeds, or more tails and dates)", f.CL2Min, f.CL2Max, MinCL2Span)
	}
	f.CD0, f.K = stat.LinearRegression(x, y, nil, false)
	mx := stat.Mean(x, nil)
	var sxx, sse float64
	for i := range x {
		sxx += (x[i] - mx) * (x[i] - mx)
		r := y[i] - f.CD0 - f.K*x[i]
		sse += r * r
	}
	s := math.Sqrt(sse / float64(n-2))
	f.ResidualSD = s
	f.SEK = s / math.Sqrt(sxx)
	f.SECD0 = s * math.Sqrt(1/float64(n)+mx*mx/sxx)
	return f, nil
}

// Oswald returns the span efficiency e = 1/(π AR k) of a fitted k on the
// type's wing.
func (f PolarFit) Oswald(t *Type) float64 { return 1 / (math.Pi * t.AspectRatio() * f.K) }
