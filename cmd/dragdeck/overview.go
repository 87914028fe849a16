package main

import (
	"fmt"
	"strings"
	"text/tabwriter"

	"dragdeck/feed"
	"dragdeck/model"
)

// runOverview prints the built-in demo type's cruise table: for a range of
// weights, the optimum and maximum altitude and the speeds at the optimum.
func runOverview(e *env) error {
	t := feed.DemoType()
	fmt.Fprintf(e.stdout, "dragdeck: cruise table of the built-in demo type, %s (ISA, cost index 0)\n\n", t.Name)
	tw := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "weight kg\toptimum ft\tmaximum ft\tlimit\tmax-range M\tlong-range M\tfuel flow kg/h\tSR NM/t\t")
	for w := 50000.0; w <= 78000; w += 4000 {
		maxAlt, lim := model.MaxAltitude(t, w, 0, 0)
		opt, _ := model.OptimumAltitude(t, w, 0, 0, maxAlt)
		air := model.AirISA(opt, 0)
		mr := model.MaxRangeMach(t, w, air, 0)
		lrc := model.LongRangeMach(t, w, air, 0, mr)
		fmt.Fprintf(tw, "%.0f\t%.0f\t%.0f\t%s\t%.3f\t%.3f\t%.0f\t%.1f\t\n", w, opt/model.Foot, maxAlt/model.Foot, lim,
			mr.Mach, lrc.Mach, mr.FuelFlow*model.Hour, mr.SR/model.NauticalMile*1000)
	}
	tw.Flush()
	var names []string
	for _, c := range commands() {
		names = append(names, c.name)
	}
	fmt.Fprintf(e.stdout, "\nSpeeds, fuel flow and specific range are at the optimum altitude.\n"+
		"Commands: %s.\nRun 'dragdeck help' for what each does, 'dragdeck COMMAND --help' for its flags.\n\n%s\n",
		strings.Join(names, ", "), caution)
	return nil
}
