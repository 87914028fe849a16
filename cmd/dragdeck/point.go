package main

import (
	"encoding/json"
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"dragdeck/feed"
	"dragdeck/model"
)

// pointJSON is the stable JSON of one analysed snapshot; its field names
// are used by scripts and do not change.
type pointJSON struct {
	CL                   finite `json:"cl"`
	CDMeasured           finite `json:"cd_measured"`
	CDBaseline           finite `json:"cd_baseline"`
	CDInduced            finite `json:"cd_induced"`
	CDWave               finite `json:"cd_wave"`
	CDParasiteBaseline   finite `json:"cd_parasite_baseline"`
	CDParasiteMeasured   finite `json:"cd_parasite_measured"`
	ExcessDragCounts     finite `json:"excess_drag_counts"`
	DragDeviationPct     finite `json:"drag_deviation_pct"`
	FuelFlowExpectedKgph finite `json:"fuel_flow_expected_kgph"`
	FuelFlowDeviationPct finite `json:"fuel_flow_deviation_pct"`
	ThrustN              finite `json:"thrust_n"`
	DragN                finite `json:"drag_n"`
	LoadFactor           finite `json:"load_factor"`
	TASKt                finite `json:"tas_kt"`
	ISADevC              finite `json:"isa_dev_c"`
	Delta                finite `json:"delta"`
	Theta                finite `json:"theta"`
	QPa                  finite `json:"q_pa"`
	// ThrustSource is "fan speed" or "fuel flow"; with fuel flow the drag
	// includes engine effects and the engine deviation is null.
	ThrustSource       string   `json:"thrust_source"`
	N1CorrectedPct     *float64 `json:"n1_corrected_pct"`
	EngineDeviationPct *float64 `json:"engine_deviation_pct"`
	// NonFinite names the fields written as null because the analysis
	// gave no finite value for them (absent when every value is finite).
	NonFinite []string `json:"non_finite,omitempty"`
}

// The thrust sources, as the JSON and CSV name them.
const (
	sourceFanSpeed = "fan speed"
	sourceFuelFlow = "fuel flow"
)

// thrustSource names where a point's thrust came from.
func thrustSource(p model.Point) string {
	if p.ThrustFromN1 {
		return sourceFanSpeed
	}
	return sourceFuelFlow
}

func newPointJSON(p model.Point) pointJSON {
	j := pointJSON{
		CL: finite(p.CL), CDMeasured: finite(p.CDMeasured), CDBaseline: finite(p.CDBaseline),
		CDInduced: finite(p.CDInduced), CDWave: finite(p.CDWave),
		CDParasiteBaseline: finite(p.CDParasiteBaseline), CDParasiteMeasured: finite(p.CDParasiteMeasured),
		ExcessDragCounts: finite(p.ExcessCounts), DragDeviationPct: finite(p.DragDevPct),
		FuelFlowExpectedKgph: finite(p.FuelFlowExpected * model.Hour), FuelFlowDeviationPct: finite(p.FuelFlowDevPct),
		ThrustN: finite(p.Thrust), DragN: finite(p.Drag), LoadFactor: finite(p.LoadFactor),
		TASKt: finite(p.TAS / model.Knot), ISADevC: finite(p.ISADev),
		Delta: finite(p.Delta), Theta: finite(p.Theta), QPa: finite(p.Q),
		ThrustSource: thrustSource(p), N1CorrectedPct: num(p.N1Corrected), EngineDeviationPct: num(p.EngineDevPct),
	}
	j.NonFinite = nonFinite(map[string]float64{"cl": p.CL, "cd_measured": p.CDMeasured, "cd_baseline": p.CDBaseline,
		"cd_induced": p.CDInduced, "cd_wave": p.CDWave, "cd_parasite_baseline": p.CDParasiteBaseline,
		"cd_parasite_measured": p.CDParasiteMeasured, "excess_drag_counts": p.ExcessCounts, "drag_deviation_pct": p.DragDevPct,
		"fuel_flow_expected_kgph": p.FuelFlowExpected, "fuel_flow_deviation_pct": p.FuelFlowDevPct, "thrust_n": p.Thrust,
		"drag_n": p.Drag, "load_factor": p.LoadFactor, "tas_kt": p.TAS, "isa_dev_c": p.ISADev, "delta": p.Delta,
		"theta": p.Theta, "q_pa": p.Q})
	return j
}

func runPoint(e *env, args []string) error {
	fs := newFlagSet("point",
		"dragdeck point [--type FILE] --weight-kg W --alt-ft H --mach M --fuel-flow-kgph F --sat-c C [--bank-deg B] [--vs-fpm V] [--accel-kt-per-min A] [--n1-pct N] [--json]",
		`Analyses one cruise snapshot against the type's baseline drag polar.
Thrust comes from fuel flow through TSFC = (a + b M) sqrt(theta), so the drag
includes engine effects; with --n1-pct and a type file with a [thrust] table it
comes from the fan speed instead (corrected N1k = N1/sqrt(theta_t2), thrust =
count x delta x F(N1k, M)) and the engine deviation 100 (FF/(TSFC Fn) - 1) is
given apart from the airframe's. Drag is thrust less the climb and
acceleration terms (energy method). The measured drag coefficient is split
into induced (k CL^2), wave (Korn + Lock) and parasite parts; the excess over
the baseline is given in drag counts (0.0001) and in %.
A vertical speed at or above the true airspeed is refused. A lift coefficient
beyond the 1.3 g buffet margin, or a negative parasite drag (thrust that does
not cover induced and wave drag), is warned about on stderr and listed in
the JSON "warnings".`,
		"dragdeck point --weight-kg 65000 --alt-ft 35000 --mach 0.78 --fuel-flow-kgph 2350 --sat-c -54")
	types := fs.oneTypeFlags()
	w := fs.float("weight-kg", "W", 0, true, "gross weight, kg")
	alt := fs.float("alt-ft", "H", 0, true, "pressure altitude, ft")
	mach := fs.float("mach", "M", 0, true, "Mach number")
	ff := fs.float("fuel-flow-kgph", "F", 0, true, "total fuel flow of all engines, kg/h")
	sat := fs.float("sat-c", "C", 0, true, "static air temperature, °C")
	bank := fs.float("bank-deg", "B", 0, false, "bank angle, degrees")
	vs := fs.float("vs-fpm", "V", 0, false, "vertical speed, ft/min (climb positive)")
	acc := fs.float("accel-kt-per-min", "A", 0, false, "rate of change of true airspeed, kt/min")
	n1 := fs.float("n1-pct", "N", 0, false, "fan speed N1 averaged over the engines, % of reference (0: not recorded)")
	asJSON := fs.jsonFlag()
	if err := fs.noArgs(fs.parse(args, e.stdout)); err != nil {
		return helpOK(err)
	}
	t, err := types.one()
	if err != nil {
		return err
	}
	s := model.Snapshot{
		Weight:   *w,
		Altitude: feed.MetresFromFeet(*alt),
		Mach:     *mach,
		SAT:      feed.KelvinFromCelsius(*sat),
		FuelFlow: feed.KgPerSFromKgPerH(*ff),
		Bank:     feed.RadFromDeg(*bank),
		VS:       feed.MPerSFromFtPerMin(*vs),
		Accel:    feed.MPerS2FromKtPerMin(*acc),
		N1:       *n1,
	}
	if bad := feed.CheckSnapshot(s); bad != nil {
		return flagError(bad)
	}
	p := model.Analyze(t, s)
	warnings := p.Warnings(t)
	if s.N1 > 0 && t.Thrust == nil {
		warnings = append(warnings, "the type file has no [thrust] table: thrust from fuel flow, so the drag includes engine effects")
	}
	for _, w := range warnings {
		fmt.Fprintf(e.stderr, "dragdeck point: warning: %s\n", w)
	}
	if *asJSON {
		if warnings == nil {
			warnings = []string{}
		}
		return writeJSON(e.stdout, struct {
			pointJSON
			Warnings []string `json:"warnings"`
		}{newPointJSON(p), warnings})
	}
	writePointTable(e.stdout, t, s, p)
	return nil
}

// helpOK turns errHelp into success; other errors pass through.
func helpOK(err error) error {
	if err == errHelp {
		return nil
	}
	return err
}

func writeJSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	return enc.Encode(v)
}

func writePointTable(w io.Writer, t *model.Type, s model.Snapshot, p model.Point) {
	fmt.Fprintf(w, "Snapshot analysis: %s\n", t.Name)
	fmt.Fprintf(w, "%.0f kg at %.0f ft, Mach %.3f, SAT %.1f °C (ISA %+.1f), bank %.1f° (n %.4f)\n\n",
		s.Weight, s.Altitude/model.Foot, s.Mach, s.SAT-model.CelsiusZero, p.ISADev, s.Bank*180/math.Pi, p.LoadFactor)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	row := func(cells ...string) {
		for _, c := range cells {
			fmt.Fprint(tw, c, "\t")
		}
		fmt.Fprintln(tw)
	}
	f5 := func(v float64) string { return fmt.Sprintf("%.5f", v) }
	row("drag coefficient", "measured", "baseline", "difference")
	row("parasite", f5(p.CDParasiteMeasured), f5(p.CDParasiteBaseline), fmt.Sprintf("%+.5f", p.CDParasiteMeasured-p.CDParasiteBaseline))
	row("induced k CL²", f5(p.CDInduced), f5(p.CDInduced), "")
	row("wave", f5(p.CDWave), f5(p.CDWave), "")
	row("total", f5(p.CDMeasured), f5(p.CDBaseline), fmt.Sprintf("%+.5f", p.CDMeasured-p.CDBaseline))
	tw.Flush()
	fmt.Fprintf(w, "\nexcess drag       %+.1f counts (%+.2f %% of baseline drag)\n", p.ExcessCounts, p.DragDevPct)
	fmt.Fprintf(w, "fuel flow         %.0f kg/h, expected %.0f kg/h (%+.2f %%)\n", s.FuelFlow*model.Hour, p.FuelFlowExpected*model.Hour, p.FuelFlowDevPct)
	fmt.Fprintf(w, "thrust / drag     %.0f N / %.0f N\n", p.Thrust, p.Drag)
	if p.ThrustFromN1 {
		fmt.Fprintf(w, "thrust from       fan speed, N1k %.1f %%: the drag deviation is the airframe's\n", p.N1Corrected)
		fmt.Fprintf(w, "engine deviation  %+.2f %% (fuel burnt against the fuel the model needs for that thrust)\n", p.EngineDevPct)
	} else {
		fmt.Fprintf(w, "thrust from       fuel flow: the drag includes engine effects; engine deviation unknown\n")
	}
	fmt.Fprintf(w, "lift coefficient  %.4f\n", p.CL)
	fmt.Fprintf(w, "air               TAS %.1f kt, q %.0f Pa, delta %.4f, theta %.4f\n\n", p.TAS/model.Knot, p.Q, p.Delta, p.Theta)
	fmt.Fprintln(w, caution)
}
