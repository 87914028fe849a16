package feed

import (
	"fmt"
	"math"
	"strconv"

	"dragdeck/model"
)

// Field names a snapshot quantity. Its String is the canonical column name
// in file units (DESIGN.md §3.1); the command line uses the same name as a
// flag, with dashes (weight_kg → --weight-kg).
type Field string

// The snapshot fields that are validated.
const (
	FieldWeight   Field = "weight_kg"
	FieldAltitude Field = "alt_ft"
	FieldMach     Field = "mach"
	FieldFuelFlow Field = "fuel_flow_kgph"
	FieldSAT      Field = "sat_c"
	FieldBank     Field = "bank_deg"
	FieldVS       Field = "vs_fpm"
	FieldAccel    Field = "accel_kt_per_min"
	FieldN1       Field = "n1_pct"
)

// Limits of a usable snapshot. Altitude and temperature are those of the
// snapshot format; the weight, fuel-flow, Mach and acceleration bounds are
// plausibility limits well beyond any transport aircraft (common practice),
// there so that one absurd value cannot turn an analysis infinite.
const (
	MinAltitudeFt    = -1000.0
	MaxAltitudeFt    = 65000.0
	MinSATC          = -100.0
	MaxSATC          = 60.0
	MaxWeightKg      = 1e6   // 1,000 t
	MaxFuelFlowKgph  = 1e5   // all engines
	MinMach          = 0.05  // below it the dynamic pressure is too small to analyse
	MaxAccelKtPerMin = 100.0 // |rate of change of true airspeed|
	MaxN1Pct         = 130.0 // fan speed, % of the reference speed
)

const notFinite = "not a finite number"

// SnapshotError is a snapshot value that cannot be used.
type SnapshotError struct {
	Field  Field
	Reason string
	Err    error // ErrNotFinite or ErrRange
}

func (e *SnapshotError) Error() string { return string(e.Field) + ": " + e.Reason }

// Unwrap returns the kind of error.
func (e *SnapshotError) Unwrap() error { return e.Err }

// CheckSnapshot returns the first reason why s (SI units) cannot be
// analysed, or nil: non-finite numbers, weight outside (0, 1,000 t], Mach
// outside [0.05, 1), pressure altitude outside −1,000 … 65,000 ft, SAT
// outside −100 … +60 °C, fuel flow outside (0, 100,000 kg/h], |bank| ≥ 90°,
// |vertical speed| ≥ true airspeed (sin γ would exceed 1), |acceleration|
// > 100 kt/min, fan speed N1 outside (0, 130] % (0 itself means "not
// recorded").
func CheckSnapshot(s model.Snapshot) *SnapshotError {
	bad := func(f Field, format string, args ...any) *SnapshotError {
		kind := ErrRange
		if format == notFinite {
			kind = ErrNotFinite
		}
		return &SnapshotError{Field: f, Reason: fmt.Sprintf(format, args...), Err: kind}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	ft := s.Altitude / model.Foot
	satC := s.SAT - model.CelsiusZero
	switch {
	case !finite(s.Weight):
		return bad(FieldWeight, notFinite)
	case s.Weight <= 0:
		return bad(FieldWeight, "must be > 0")
	case s.Weight > MaxWeightKg:
		return bad(FieldWeight, "%s kg is above the plausible %g kg", short(s.Weight), MaxWeightKg)
	case !finite(s.Altitude):
		return bad(FieldAltitude, notFinite)
	case ft < MinAltitudeFt-1e-9 || ft > MaxAltitudeFt+1e-9:
		return bad(FieldAltitude, "pressure altitude %.0f ft outside -1000 … 65000 ft", ft)
	case !finite(s.Mach):
		return bad(FieldMach, notFinite)
	case s.Mach < MinMach || s.Mach >= 1:
		return bad(FieldMach, "must be in [%g, 1), got %s", MinMach, short(s.Mach))
	case !finite(s.SAT):
		return bad(FieldSAT, notFinite)
	case satC < MinSATC-1e-9 || satC > MaxSATC+1e-9:
		return bad(FieldSAT, "static air temperature %.2f °C outside -100 … +60 °C", satC)
	case !finite(s.FuelFlow):
		return bad(FieldFuelFlow, notFinite)
	case s.FuelFlow <= 0:
		return bad(FieldFuelFlow, "must be > 0")
	case s.FuelFlow*model.Hour > MaxFuelFlowKgph:
		return bad(FieldFuelFlow, "%s kg/h is above the plausible %g kg/h", short(s.FuelFlow*model.Hour), MaxFuelFlowKgph)
	case !finite(s.Bank):
		return bad(FieldBank, notFinite)
	case math.Abs(s.Bank) >= math.Pi/2:
		return bad(FieldBank, "|bank| must be < 90°, got %g°", s.Bank*180/math.Pi)
	case !finite(s.VS):
		return bad(FieldVS, notFinite)
	case s.VS != 0 && math.Abs(s.VS) >= model.TrueAirspeed(s.Mach, s.SAT):
		tas := model.TrueAirspeed(s.Mach, s.SAT)
		return bad(FieldVS, "|vertical speed| %s ft/min is not below the true airspeed (%.0f ft/min)", short(math.Abs(s.VS)/model.Foot*model.Minute), tas/model.Foot*model.Minute)
	case !finite(s.Accel):
		return bad(FieldAccel, notFinite)
	case math.Abs(s.Accel) > MaxAccelKtPerMin*model.Knot/model.Minute:
		return bad(FieldAccel, "|acceleration| %s kt/min is above the plausible %g kt/min", short(math.Abs(s.Accel)/model.Knot*model.Minute), MaxAccelKtPerMin)
	case !finite(s.N1):
		return bad(FieldN1, notFinite)
	case s.N1 < 0 || s.N1 > MaxN1Pct:
		return bad(FieldN1, "fan speed must be in (0, %g] %%, got %s %%", MaxN1Pct, short(s.N1))
	}
	return nil
}

// short formats v with at most 6 significant digits, so that a message never
// prints a 300-digit number.
func short(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
