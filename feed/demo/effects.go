package demo

// Effects are the errors of recorded data that the demo puts on its
// snapshots (DESIGN.md §4.14), each switchable: a true value is computed
// from the tail's planted drag, then recorded with these errors, as an
// airline's recorders give them. Sizes are standard deviations of normal
// errors; zero switches an effect off. The draws are made whether an effect
// is on or not, so that switching one leaves the others' values unchanged.
//
// Their effect on the drag deviation at cruise (§4.14): a weight error of
// 1 % moves it by about −0.8 pp, a Mach error of +0.002 by about −0.3 pp,
// SAT +1 K by about −0.2 pp, a fuel-flow error by its full size (without
// fan speed). Medians over flights remove most of these, not all.
type Effects struct {
	// WeightErrorPct is the recorded weight's error per flight, % (a
	// load-sheet and fuel-gauge error that holds over the flight).
	WeightErrorPct float64 `json:"weight_error_pct_sd"`
	// MachNoise is the recorded Mach's error per snapshot.
	MachNoise float64 `json:"mach_noise_sd"`
	// SATNoiseK is the recorded static air temperature's error per
	// snapshot, K.
	SATNoiseK float64 `json:"sat_noise_k_sd"`
	// FuelFlowScatterPct is the flight-to-flight scatter of fuel flow, %
	// (one error for the whole flight), on top of the per-snapshot noise
	// that is always there.
	FuelFlowScatterPct float64 `json:"fuel_flow_scatter_pct_sd"`
	// Seasonal is the seasonal swing of the air temperature (±6 K over
	// the year) with day-to-day weather (4 K) and flight-to-flight
	// differences (1.5 K); without it every flight is at ISA.
	Seasonal bool `json:"seasonal_temperature"`
}

// DefaultEffects are the demo's sensor effects, of the size recorded data
// carry (common practice; no single source).
func DefaultEffects() Effects {
	return Effects{WeightErrorPct: 0.3, MachNoise: 0.001, SATNoiseK: 0.3, FuelFlowScatterPct: 0.4, Seasonal: true}
}

// fuelFlowNoise is the per-snapshot fuel-flow noise, always on (a fraction):
// without any scatter the change-point search has no noise to scale by.
const fuelFlowNoise = 0.006
