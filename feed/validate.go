package feed

import (
	"fmt"
	"math"

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
)

// Limits of a usable snapshot (DESIGN.md §3.1).
const (
	MinAltitudeFt = -1000.0
	MaxAltitudeFt = 65000.0
	MinSATC       = -100.0
	MaxSATC       = 60.0
)

// SnapshotError is a snapshot value that cannot be used.
type SnapshotError struct {
	Field  Field
	Reason string
}

func (e *SnapshotError) Error() string { return string(e.Field) + ": " + e.Reason }

// CheckSnapshot returns the first reason why s (SI units) cannot be
// analysed, or nil: non-finite numbers, weight ≤ 0, Mach outside (0, 1),
// pressure altitude outside −1,000 … 65,000 ft, SAT outside −100 … +60 °C,
// fuel flow ≤ 0, |bank| ≥ 90°.
func CheckSnapshot(s model.Snapshot) *SnapshotError {
	bad := func(f Field, format string, args ...any) *SnapshotError {
		return &SnapshotError{Field: f, Reason: fmt.Sprintf(format, args...)}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	ft := s.Altitude / model.Foot
	satC := s.SAT - model.CelsiusZero
	switch {
	case !finite(s.Weight):
		return bad(FieldWeight, "not a finite number")
	case s.Weight <= 0:
		return bad(FieldWeight, "must be > 0, got %g kg", s.Weight)
	case !finite(s.Altitude):
		return bad(FieldAltitude, "not a finite number")
	case ft < MinAltitudeFt-1e-9 || ft > MaxAltitudeFt+1e-9:
		return bad(FieldAltitude, "pressure altitude %g ft outside -1000 … 65000 ft", ft)
	case !finite(s.Mach):
		return bad(FieldMach, "not a finite number")
	case s.Mach <= 0 || s.Mach >= 1:
		return bad(FieldMach, "must be in (0, 1), got %g", s.Mach)
	case !finite(s.SAT):
		return bad(FieldSAT, "not a finite number")
	case satC < MinSATC-1e-9 || satC > MaxSATC+1e-9:
		return bad(FieldSAT, "static air temperature %.2f °C outside -100 … +60 °C", satC)
	case !finite(s.FuelFlow):
		return bad(FieldFuelFlow, "not a finite number")
	case s.FuelFlow <= 0:
		return bad(FieldFuelFlow, "must be > 0, got %g kg/h", s.FuelFlow*model.Hour)
	case !finite(s.Bank):
		return bad(FieldBank, "not a finite number")
	case math.Abs(s.Bank) >= math.Pi/2:
		return bad(FieldBank, "|bank| must be < 90°, got %g°", s.Bank*180/math.Pi)
	case !finite(s.VS):
		return bad(FieldVS, "not a finite number")
	case !finite(s.Accel):
		return bad(FieldAccel, "not a finite number")
	}
	return nil
}
