package main

import (
	"math"

	"dragdeck/model"
)

// factorFlags declares the fuel-factor policy's flags of report, dash and
// factor; the function it returns gives the policy after parsing: the
// defaults, the fleet file's [fuel_factor] table over them, the flags
// given over both.
func factorFlags(fs *flagSet) func(*model.Roster) (*model.FactorPolicy, error) {
	d := model.DefaultFactorPolicy()
	window := fs.float("factor-window-days", "D", d.WindowDays, false, "fuel factor: trailing window of the monitored level, days")
	flights := fs.Int("factor-min-flights", d.MinFlights, "fuel factor: fewest flights behind a monitored level")
	fs.argNames["factor-min-flights"] = "N"
	round := fs.float("factor-round-pct", "P", d.RoundPct, false, "fuel factor: the step a factor is rounded to, %")
	band := fs.float("factor-dead-band-pct", "P", d.DeadBandPct, false, "fuel factor: propose only a change of at least this, % ...")
	periods := fs.Int("factor-periods", d.Periods, "... held in each of the last N monthly periods")
	fs.argNames["factor-periods"] = "N"
	lo := fs.float("factor-min-pct", "P", d.MinPct, false, "fuel factor: a factor below this needs a note to approve, %")
	hi := fs.float("factor-max-pct", "P", d.MaxPct, false, "fuel factor: a factor above this needs a note to approve, %")
	change := fs.float("factor-max-change-pct", "P", d.MaxChangePct, false, "fuel factor: a larger change in one step is marked for a second look, %")
	return func(r *model.Roster) (*model.FactorPolicy, error) {
		p := d
		if r != nil && r.FuelFactor != nil {
			p = *r.FuelFactor
		}
		set := func(name string, dst *float64, v float64) {
			if fs.isSet(name) {
				*dst = v
			}
		}
		set("factor-window-days", &p.WindowDays, *window)
		set("factor-round-pct", &p.RoundPct, *round)
		set("factor-dead-band-pct", &p.DeadBandPct, *band)
		set("factor-min-pct", &p.MinPct, *lo)
		set("factor-max-pct", &p.MaxPct, *hi)
		set("factor-max-change-pct", &p.MaxChangePct, *change)
		if fs.isSet("factor-min-flights") {
			p.MinFlights = *flights
		}
		if fs.isSet("factor-periods") {
			p.Periods = *periods
		}
		for _, v := range []float64{p.WindowDays, p.RoundPct, p.DeadBandPct, p.MinPct, p.MaxPct, p.MaxChangePct} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, usageErrorf("fuel factor: %g is not a number a policy can use", v)
			}
		}
		if err := p.Check(); err != nil {
			return nil, usageErrorf("fuel factor policy: %v (the fleet file's [fuel_factor] or the --factor-* flags)", err)
		}
		return &p, nil
	}
}
