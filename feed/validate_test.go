package feed

import (
	"math"
	"testing"

	"dragdeck/model"
)

func goodSnapshot() model.Snapshot {
	return model.Snapshot{Weight: 65000, Altitude: 35000 * model.Foot, Mach: 0.78,
		SAT: KelvinFromCelsius(-54), FuelFlow: KgPerSFromKgPerH(2400)}
}

// Every reject reason of DESIGN.md §3.1, named by field.
func TestCheckSnapshot(t *testing.T) {
	tests := []struct {
		name  string
		spoil func(*model.Snapshot)
		want  Field // "" for accepted
	}{
		{"good", func(*model.Snapshot) {}, ""},
		{"limits are inclusive", func(s *model.Snapshot) { s.Altitude = 65000 * model.Foot; s.SAT = KelvinFromCelsius(-100) }, ""},
		{"weight zero", func(s *model.Snapshot) { s.Weight = 0 }, FieldWeight},
		{"weight NaN", func(s *model.Snapshot) { s.Weight = math.NaN() }, FieldWeight},
		{"altitude too low", func(s *model.Snapshot) { s.Altitude = -1001 * model.Foot }, FieldAltitude},
		{"altitude too high", func(s *model.Snapshot) { s.Altitude = 65001 * model.Foot }, FieldAltitude},
		{"Mach zero", func(s *model.Snapshot) { s.Mach = 0 }, FieldMach},
		{"Mach one", func(s *model.Snapshot) { s.Mach = 1 }, FieldMach},
		{"SAT too cold", func(s *model.Snapshot) { s.SAT = KelvinFromCelsius(-101) }, FieldSAT},
		{"SAT too hot", func(s *model.Snapshot) { s.SAT = KelvinFromCelsius(61) }, FieldSAT},
		{"fuel flow zero", func(s *model.Snapshot) { s.FuelFlow = 0 }, FieldFuelFlow},
		{"fuel flow Inf", func(s *model.Snapshot) { s.FuelFlow = math.Inf(1) }, FieldFuelFlow},
		{"bank 90", func(s *model.Snapshot) { s.Bank = RadFromDeg(90) }, FieldBank},
		{"bank -95", func(s *model.Snapshot) { s.Bank = RadFromDeg(-95) }, FieldBank},
		{"vs NaN", func(s *model.Snapshot) { s.VS = math.NaN() }, FieldVS},
		{"accel Inf", func(s *model.Snapshot) { s.Accel = math.Inf(-1) }, FieldAccel},
		{"N1 not recorded", func(s *model.Snapshot) { s.N1 = 0 }, ""},
		{"N1 at 130 %", func(s *model.Snapshot) { s.N1 = 130 }, ""},
		{"N1 above 130 %", func(s *model.Snapshot) { s.N1 = 130.5 }, FieldN1},
		{"N1 negative", func(s *model.Snapshot) { s.N1 = -1 }, FieldN1},
		{"N1 NaN", func(s *model.Snapshot) { s.N1 = math.NaN() }, FieldN1},
		// sin γ = VS/TAS must stay below 1: at M0.78, FL350 and ISA−0 TAS is
		// about 449 kt = 45,500 ft/min.
		{"vs above TAS", func(s *model.Snapshot) { s.VS = MPerSFromFtPerMin(50000) }, FieldVS},
		{"vs below TAS", func(s *model.Snapshot) { s.VS = MPerSFromFtPerMin(-40000) }, ""},
		{"weight 1e308", func(s *model.Snapshot) { s.Weight = 1e308 }, FieldWeight},
		{"fuel flow 1e308", func(s *model.Snapshot) { s.FuelFlow = 1e308 }, FieldFuelFlow},
		{"Mach 1e-300", func(s *model.Snapshot) { s.Mach = 1e-300 }, FieldMach},
		{"accel 1e308", func(s *model.Snapshot) { s.Accel = -1e308 }, FieldAccel},
		{"vs 1e308", func(s *model.Snapshot) { s.VS = 1e308 }, FieldVS},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := goodSnapshot()
			tc.spoil(&s)
			err := CheckSnapshot(s)
			switch {
			case tc.want == "" && err != nil:
				t.Errorf("rejected: %v", err)
			case tc.want != "" && (err == nil || err.Field != tc.want):
				t.Errorf("got %v, want a %s error", err, tc.want)
			}
		})
	}
}

// A message never prints a 300-digit number.
func TestCheckSnapshotShortNumbers(t *testing.T) {
	s := goodSnapshot()
	s.Weight = 1e308
	err := CheckSnapshot(s)
	if err == nil || len(err.Error()) > 80 {
		t.Fatalf("error %q", err)
	}
}
