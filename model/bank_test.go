package model

import (
	"math"
	"testing"
)

// A level turn at bank φ needs lift n W g0 with n = 1/cos φ, so induced drag
// grows by n²: 30° gives n = 1.1547 and induced +33.3 % (standard flight
// mechanics, DESIGN.md §4.6).
func TestBankTable(t *testing.T) {
	ty := twin()
	air := AirISA(35000*Foot, 0)
	rows := BankTable(ty, 65000, air, 0.78, 0)
	if len(rows) != 10 {
		t.Fatalf("%d rows, want 10 (0 … 45° by 5°)", len(rows))
	}
	base := LevelFlight(ty, 65000, air, 0.78, 0)
	tsfc := ty.TSFC(0.78, air.Theta())
	for i, r := range rows {
		deg := float64(5 * i)
		if math.Abs(r.Bank-deg*math.Pi/180) > 1e-12 {
			t.Fatalf("row %d bank %g rad, want %g°", i, r.Bank, deg)
		}
		n := 1 / math.Cos(r.Bank)
		if math.Abs(r.InducedIncreasePct-100*(n*n-1)) > 1e-9 {
			t.Errorf("%g°: induced +%.4f %%, want %.4f", deg, r.InducedIncreasePct, 100*(n*n-1))
		}
		// Total drag rises less than induced (parasite is unchanged) but more
		// than induced alone would add when wave drag grows with CL.
		wantCD := ty.CD0 + ty.K()*math.Pow(n*base.CL, 2) + ty.WaveDrag(n*base.CL, 0.78)
		if got := 100 * (wantCD - base.CD) / base.CD; math.Abs(r.TotalIncreasePct-got) > 1e-9 {
			t.Errorf("%g°: total +%.4f %%, want %.4f", deg, r.TotalIncreasePct, got)
		}
		if want := tsfc * (r.Drag - base.Drag); math.Abs(r.ExtraFuelFlow-want) > 1e-12 {
			t.Errorf("%g°: extra fuel %g kg/s, want %g", deg, r.ExtraFuelFlow, want)
		}
		if i > 0 && r.TotalIncreasePct <= rows[i-1].TotalIncreasePct {
			t.Errorf("%g°: drag increase not growing with bank", deg)
		}
	}
	if got := rows[6].InducedIncreasePct; math.Abs(got-33.33) > 0.005 {
		t.Errorf("30°: induced +%.3f %%, want +33.3", got)
	}
	if rows[0].TotalIncreasePct != 0 || rows[0].ExtraFuelFlow != 0 {
		t.Errorf("0° row should cost nothing: %+v", rows[0])
	}
}
