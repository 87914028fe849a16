package model

import (
	"math"
	"math/rand/v2"
	"testing"
)

// Exact parabolic data is fitted exactly; noisy data lands within about two
// standard errors (OLS, Draper & Smith ch. 1) in 95 % of repeats; a narrow
// CL range is refused.
func TestFitPolar(t *testing.T) {
	ty := twin()
	mk := func(n int, clLo, clHi, noise float64, rng *rand.Rand) []PolarPoint {
		pts := make([]PolarPoint, n)
		for i := range pts {
			cl := clLo + (clHi-clLo)*float64(i)/float64(n-1)
			w := ty.WaveDrag(cl, 0.78)
			pts[i] = PolarPoint{CL: cl, CDWave: w, CDMeasured: ty.CD0 + ty.K()*cl*cl + w + noise*rng.NormFloat64()}
		}
		return pts
	}
	rng := rand.New(rand.NewPCG(11, 0))
	f, err := FitPolar(mk(50, 0.35, 0.65, 0, rng))
	if err != nil || math.Abs(f.CD0-ty.CD0) > 1e-12 || math.Abs(f.K-ty.K()) > 1e-12 || f.ResidualSD > 1e-12 {
		t.Fatalf("exact data: %+v, %v", f, err)
	}
	if e := f.Oswald(ty); math.Abs(e-ty.Oswald) > 1e-9 {
		t.Errorf("Oswald from k: %g, want %g", e, ty.Oswald)
	}
	within := 0
	for k := 0; k < 200; k++ {
		f, err := FitPolar(mk(300, 0.4, 0.65, 0.0005, rng))
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(f.CD0-ty.CD0) <= 1.96*f.SECD0 && math.Abs(f.K-ty.K()) <= 1.96*f.SEK {
			within++
		}
	}
	// Each coefficient alone is covered 95 % of the time; both together a
	// little less (they are correlated).
	if within < 170 {
		t.Errorf("both coefficients within 1.96 SE in %d of 200 fits", within)
	}
	if _, err := FitPolar(mk(100, 0.50, 0.53, 0.0005, rng)); err == nil {
		t.Error("a CL² span of 0.03 should be refused")
	}
	if _, err := FitPolar(mk(5, 0.3, 0.7, 0, rng)); err == nil {
		t.Error("5 points should be refused")
	}
}
