package main

import (
	"fmt"
	"math"
	"text/tabwriter"

	"dragdeck/feed"
	"dragdeck/model"
)

// bankJSON is one row of the stable bank-table JSON; its field names are
// used by scripts and do not change.
type bankJSON struct {
	BankDeg                finite `json:"bank_deg"`
	LoadFactor             finite `json:"load_factor"`
	InducedDragIncreasePct finite `json:"induced_drag_increase_pct"`
	TotalDragIncreasePct   finite `json:"total_drag_increase_pct"`
	FuelFlowIncreaseKgph   finite `json:"fuel_flow_increase_kgph"`
}

func runBank(e *env, args []string) error {
	fs := newFlagSet("bank",
		"dragdeck bank [--type FILE] --weight-kg W --alt-ft H --mach M [--sat-c C] [--json]",
		`Bank-angle penalty at one weight, level and Mach, for 0 to 45° of bank in 5°
steps. A level turn needs lift n W g with load factor n = 1/cos(bank): induced
drag grows by n^2 and wave drag is taken at the turning CL; the extra fuel
flow is TSFC times the extra drag. Without --sat-c the ISA temperature is used.
Rows where CL × 1.3 exceeds the type's buffet-onset CL (the 1.3 g margin is
not kept) are marked "! beyond buffet".`,
		"dragdeck bank --weight-kg 65000 --alt-ft 35000 --mach 0.78")
	types := fs.oneTypeFlags()
	w := fs.float("weight-kg", "W", 0, true, "gross weight, kg")
	alt := fs.float("alt-ft", "H", 0, true, "pressure altitude, ft")
	mach := fs.float("mach", "M", 0, true, "Mach number")
	sat := fs.float("sat-c", "C", 0, false, "static air temperature, °C (default: ISA)")
	asJSON := fs.jsonFlag()
	if err := fs.noArgs(fs.parse(args, e.stdout)); err != nil {
		return helpOK(err)
	}
	t, err := types.one()
	if err != nil {
		return err
	}
	h := feed.MetresFromFeet(*alt)
	T, _ := model.ISA(h)
	if fs.isSet("sat-c") {
		T = feed.KelvinFromCelsius(*sat)
	}
	s := model.Snapshot{Weight: *w, Altitude: h, Mach: *mach, SAT: T, FuelFlow: 1}
	if bad := feed.CheckSnapshot(s); bad != nil {
		return flagError(bad)
	}
	air := model.AirAt(h, T)
	rows := model.BankTable(t, *w, air, *mach, 0)
	if *asJSON {
		out := make([]bankJSON, len(rows))
		for i, r := range rows {
			out[i] = bankJSON{
				BankDeg:                finite(degrees(r.Bank)),
				LoadFactor:             finite(r.LoadFactor),
				InducedDragIncreasePct: finite(r.InducedIncreasePct),
				TotalDragIncreasePct:   finite(r.TotalIncreasePct),
				FuelFlowIncreaseKgph:   finite(r.ExtraFuelFlow * model.Hour),
			}
		}
		return writeJSON(e.stdout, out)
	}
	base := model.LevelFlight(t, *w, air, *mach, 0)
	fmt.Fprintf(e.stdout, "Bank-angle penalty: %s\n%.0f kg at %.0f ft, Mach %.3f, SAT %.1f °C (ISA %+.1f); wings level %.0f kg/h\n\n",
		t.Name, *w, *alt, *mach, T-model.CelsiusZero, air.ISADev(), base.FuelFlow*model.Hour)
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "bank °\tload factor\tCL\tinduced drag\ttotal drag\textra fuel kg/h\t\t")
	beyond := 0
	for _, r := range rows {
		mark := ""
		if r.Buffet {
			mark, beyond = "! beyond buffet", beyond+1
		}
		fmt.Fprintf(tw, "%.0f\t%.4f\t%.3f\t%+.1f %%\t%+.1f %%\t%+.0f\t%s\t\n", degrees(r.Bank), r.LoadFactor, r.CL,
			r.InducedIncreasePct, r.TotalIncreasePct, r.ExtraFuelFlow*model.Hour, mark)
	}
	tw.Flush()
	if beyond > 0 {
		fmt.Fprintf(e.stdout, "\n! beyond buffet: CL × 1.3 exceeds the type's buffet-onset CL %.3f; the 1.3 g margin is not kept.\n", t.CLBuffet)
	}
	if mb := model.MinBuffetMach(t, *w, air); *mach < mb {
		fmt.Fprintf(e.stdout, "Mach %.3f is below the buffet-limited Mach %.3f for this weight and level: even wings level is beyond buffet.\n", *mach, mb)
	}
	fmt.Fprintf(e.stdout, "\n%s\n", caution)
	return nil
}

// degrees converts a bank angle to degrees, rounded to 1e-9° so that the
// table's 5° steps print as whole numbers.
func degrees(rad float64) float64 { return math.Round(rad*180/math.Pi*1e9) / 1e9 }
