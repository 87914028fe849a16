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

// Kinds of reject, for counting rejected rows by reason.
const (
	KindNotFinite = "not finite"
	KindRange     = "out of range"
	KindNumber    = "not a number"
	KindEmpty     = "empty"
	KindTime      = "bad time"
	KindFields    = "wrong number of fields"
	KindQuote     = "bad quoting"
	KindTooLong   = "line too long"
)

const notFinite = "not a finite number"

// SnapshotError is a snapshot value that cannot be used.
type SnapshotError struct {
	Field  Field
	Reason string
	Kind   string // "not finite" or "out of range", for counting by reason
}

func (e *SnapshotError) Error() string { return string(e.Field) + ": " + e.Reason }

// CheckSnapshot returns the first reason why s (SI units) cannot be
// analysed, or nil: non-finite numbers, weight ≤ 0, Mach outside (0, 1),
// pressure altitude outside −1,000 … 65,000 ft, SAT outside −100 … +60 °C,
// fuel flow ≤ 0, |bank| ≥ 90°.
func CheckSnapshot(s model.Snapshot) *SnapshotError {
	bad := func(f Field, format string, args ...any) *SnapshotError {
		kind := KindRange
		if format == notFinite {
			kind = KindNotFinite
		}
		return &SnapshotError{Field: f, Reason: fmt.Sprintf(format, args...), Kind: kind}
	}
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	ft := s.Altitude / model.Foot
	satC := s.SAT - model.CelsiusZero
	switch {
	case !finite(s.Weight):
		return bad(FieldWeight, notFinite)
	case s.Weight <= 0:
		return bad(FieldWeight, "must be > 0")
	case !finite(s.Altitude):
		return bad(FieldAltitude, notFinite)
	case ft < MinAltitudeFt-1e-9 || ft > MaxAltitudeFt+1e-9:
		return bad(FieldAltitude, "pressure altitude %.0f ft outside -1000 … 65000 ft", ft)
	case !finite(s.Mach):
		return bad(FieldMach, notFinite)
	case s.Mach <= 0 || s.Mach >= 1:
		return bad(FieldMach, "must be in (0, 1), got %g", s.Mach)
	case !finite(s.SAT):
		return bad(FieldSAT, notFinite)
	case satC < MinSATC-1e-9 || satC > MaxSATC+1e-9:
		return bad(FieldSAT, "static air temperature %.2f °C outside -100 … +60 °C", satC)
	case !finite(s.FuelFlow):
		return bad(FieldFuelFlow, notFinite)
	case s.FuelFlow <= 0:
		return bad(FieldFuelFlow, "must be > 0")
	case !finite(s.Bank):
		return bad(FieldBank, notFinite)
	case math.Abs(s.Bank) >= math.Pi/2:
		return bad(FieldBank, "|bank| must be < 90°, got %g°", s.Bank*180/math.Pi)
	case !finite(s.VS):
		return bad(FieldVS, notFinite)
	case !finite(s.Accel):
		return bad(FieldAccel, notFinite)
	}
	return nil
}
