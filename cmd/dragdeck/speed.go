package main

import (
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"dragdeck/feed"
	"dragdeck/model"
)

// speedJSON is the stable JSON of a cruise optimum , for the
// polar asked for (the baseline plus --excess-counts).
type speedJSON struct {
	MachMinDrag      finite `json:"mach_min_drag"`
	MachMaxRange     finite `json:"mach_max_range"`
	MachLongRange    finite `json:"mach_long_range"`
	MachEcon         finite `json:"mach_econ"`
	SRMaxNmPerKg     finite `json:"sr_max_nm_per_kg"`
	OptimumAltFt     finite `json:"optimum_alt_ft"`
	MaxAltFt         finite `json:"max_alt_ft"`
	MaxAltLimit      string `json:"max_alt_limit"`
	FuelFlowMaxRange finite `json:"fuel_flow_max_range_kgph"`
	ExcessDragCounts finite `json:"excess_drag_counts"`
	// Baseline is the same for the type's baseline polar, given when
	// --excess-counts is not zero.
	Baseline *speedJSON `json:"baseline,omitempty"`
}

func newSpeedJSON(o model.Optimum, counts float64) *speedJSON {
	return &speedJSON{
		MachMinDrag:      finite(o.MinDrag.Mach),
		MachMaxRange:     finite(o.MaxRange.Mach),
		MachLongRange:    finite(o.LongRange.Mach),
		MachEcon:         finite(o.Econ.Mach),
		SRMaxNmPerKg:     finite(o.MaxRange.SR / model.NauticalMile),
		OptimumAltFt:     finite(o.OptimumAltitude / model.Foot),
		MaxAltFt:         finite(o.MaxAltitude / model.Foot),
		MaxAltLimit:      string(o.MaxAltLimit),
		FuelFlowMaxRange: finite(o.MaxRange.FuelFlow * model.Hour),
		ExcessDragCounts: finite(counts),
	}
}

func runSpeed(e *env, args []string) error {
	fs := newFlagSet("speed",
		"dragdeck speed [--type FILE] --weight-kg W --alt-ft H [--isa-dev-c D] [--cost-index CI] [--excess-counts N] [--json]",
		`Cruise optimum for a weight at one level, over Mach up to MMO:
  minimum-drag Mach; maximum-range Mach (greatest specific range SR = TAS/FF);
  long-range Mach (the faster Mach with 99 % of the best SR, capped at MMO);
  economy Mach (least (FF + 60 CI)/TAS for a cost index CI in kg/min).
Optimum altitude is the level of greatest SR at maximum-range Mach; maximum
altitude the highest level that keeps a 1.3 g buffet margin at long-range Mach,
has the thrust (when the type gives it) and is within the type's ceiling.
--excess-counts adds a tail's excess drag to CD0, so the table shows what the
drag costs in speed and level against the baseline.`,
		"dragdeck speed --weight-kg 65000 --alt-ft 35000 --cost-index 25 --excess-counts 30")
	types := fs.oneTypeFlags()
	w := fs.float("weight-kg", "W", 0, true, "gross weight, kg")
	alt := fs.float("alt-ft", "H", 0, true, "pressure altitude, ft")
	dev := fs.float("isa-dev-c", "D", 0, false, "temperature deviation from ISA, °C")
	ci := fs.float("cost-index", "CI", 0, false, "cost index, kg of fuel per minute of time")
	counts := fs.float("excess-counts", "N", 0, false, "excess drag added to CD0, drag counts (0.0001)")
	asJSON := fs.jsonFlag()
	if err := fs.noArgs(fs.parse(args, e.stdout)); err != nil {
		return helpOK(err)
	}
	t, err := types.one()
	if err != nil {
		return err
	}
	h := feed.MetresFromFeet(*alt)
	tISA, _ := model.ISA(h)
	s := model.Snapshot{Weight: *w, Altitude: h, Mach: 0.5, SAT: tISA + *dev, FuelFlow: 1}
	if bad := feed.CheckSnapshot(s); bad != nil {
		if bad.Field == feed.FieldSAT {
			return usageErrorf("--isa-dev-c: %s", bad.Reason)
		}
		return flagError(bad)
	}
	switch {
	case math.IsNaN(*ci) || math.IsInf(*ci, 0) || *ci < 0:
		return usageErrorf("--cost-index: must be ≥ 0 kg/min, got %g", *ci)
	case math.IsNaN(*counts) || math.IsInf(*counts, 0) || t.CD0+*counts*model.DragCount <= 0:
		return usageErrorf("--excess-counts: CD0 + excess must stay > 0, got %g counts", *counts)
	}
	ciSI := *ci / model.Minute
	o := model.CruiseOptimum(t, *w, h, *dev, ciSI, *counts*model.DragCount)
	var base *model.Optimum
	if *counts != 0 {
		b := model.CruiseOptimum(t, *w, h, *dev, ciSI, 0)
		base = &b
	}
	if *asJSON {
		j := newSpeedJSON(o, *counts)
		if base != nil {
			j.Baseline = newSpeedJSON(*base, 0)
		}
		return writeJSON(e.stdout, j)
	}
	fmt.Fprintf(e.stdout, "Cruise optimum: %s\n%.0f kg at %.0f ft, ISA %+.1f °C, cost index %g kg/min\n",
		t.Name, *w, *alt, *dev, *ci)
	if base != nil {
		writeOptimum(e.stdout, "baseline polar", *base, *ci)
		writeOptimum(e.stdout, fmt.Sprintf("with %+g counts of excess drag", *counts), o, *ci)
		fmt.Fprintf(e.stdout, "\nThe excess costs %.1f %% of specific range at maximum-range Mach.\n",
			100*(1-o.MaxRange.SR/base.MaxRange.SR))
	} else {
		writeOptimum(e.stdout, "baseline polar", o, *ci)
	}
	fmt.Fprintf(e.stdout, "\n%s\n", caution)
	return nil
}

func writeOptimum(w io.Writer, title string, o model.Optimum, ci float64) {
	fmt.Fprintf(w, "\n%s\n", title)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "speed\tMach\tTAS kt\tfuel flow kg/h\tSR NM/t\tCL\t")
	for _, r := range []struct {
		name string
		l    model.Level
	}{
		{"minimum drag", o.MinDrag},
		{"maximum range", o.MaxRange},
		{"long range", o.LongRange},
		{fmt.Sprintf("economy (CI %g)", ci), o.Econ},
	} {
		fmt.Fprintf(tw, "%s\t%.3f\t%.0f\t%.0f\t%.1f\t%.3f\t\n", r.name, r.l.Mach, r.l.TAS/model.Knot,
			r.l.FuelFlow*model.Hour, r.l.SR/model.NauticalMile*1000, r.l.CL)
	}
	tw.Flush()
	fmt.Fprintf(w, "optimum altitude  %.0f ft (SR %.1f NM/t at its maximum-range Mach)\n",
		o.OptimumAltitude/model.Foot, o.OptimumSR/model.NauticalMile*1000)
	fmt.Fprintf(w, "maximum altitude  %.0f ft (limited by %s)\n", o.MaxAltitude/model.Foot, limitText(o.MaxAltLimit))
}

func limitText(l model.Limit) string {
	switch l {
	case model.LimitBuffet:
		return "the 1.3 g buffet margin"
	case model.LimitThrust:
		return "maximum cruise thrust"
	case model.LimitCeiling:
		return "the type's ceiling"
	}
	return "nothing feasible: no level keeps the buffet margin and thrust"
}
