package model_test

import (
	"fmt"
	"math"

	"dragdeck/model"
)

// exampleType is an invented narrow-body twin.
func exampleType() *model.Type {
	return &model.Type{
		Name: "example twin (invented)", WingArea: 120, Span: 34,
		CD0: 0.022, Oswald: 0.76,
		KappaA: 0.94, ThicknessRatio: 0.12, Sweep: 26 * math.Pi / 180,
		EngineCount: 2, TSFCA: model.TSFCPerHour(0.40), TSFCB: model.TSFCPerHour(0.33),
		MaxThrustPerDelta: 130000,
		MMO:               0.82, MaxAltitude: 41000 * model.Foot, CLBuffet: 0.84,
	}
}

func ExampleISA() {
	T, p := model.ISA(11000)
	fmt.Printf("11 km: %.2f K, %.1f Pa\n", T, p)
	air := model.AirISA(35000*model.Foot, 0)
	fmt.Printf("FL350: delta %.4f theta %.4f sigma %.4f\n", air.Delta(), air.Theta(), air.Sigma())
	// Output:
	// 11 km: 216.65 K, 22632.0 Pa
	// FL350: delta 0.2353 theta 0.7594 sigma 0.3099
}

func ExampleAnalyze() {
	ty := exampleType()
	s := model.Snapshot{
		Weight:   65000,
		Altitude: 35000 * model.Foot,
		Mach:     0.78,
		SAT:      -54.3 + model.CelsiusZero,
		FuelFlow: 2450 / model.Hour,
	}
	p := model.Analyze(ty, s)
	fmt.Printf("CL %.3f  CD measured %.5f  baseline %.5f\n", p.CL, p.CDMeasured, p.CDBaseline)
	fmt.Printf("excess %.0f counts (%+.1f %%), fuel flow %+.1f %%\n", p.ExcessCounts, p.DragDevPct, p.FuelFlowDevPct)
	// Output:
	// CL 0.523  CD measured 0.03442  baseline 0.03420
	// excess 2 counts (+0.6 %), fuel flow +0.6 %
}

// A fleet's snapshots, analysed in place with the air of their flight
// levels remembered: the same point as Analyze's.
func ExampleAnalyzeInto() {
	ty := exampleType()
	var levels model.Levels // one per goroutine
	var p model.Point
	for _, ff := range []float64{2450, 2500} { // two snapshots at FL350
		s := model.Snapshot{Weight: 65000, Altitude: 35000 * model.Foot, Mach: 0.78, SAT: -54.3 + model.CelsiusZero, FuelFlow: ff / model.Hour}
		model.AnalyzeInto(&p, ty, &s, &levels)
		fmt.Printf("%.0f kg/h: excess %+.1f %%, the same as Analyze: %v\n", ff, p.DragDevPct, fmt.Sprint(p) == fmt.Sprint(model.Analyze(ty, s))) // NaN-safe
	}
	// Output:
	// 2450 kg/h: excess +0.6 %, the same as Analyze: true
	// 2500 kg/h: excess +2.7 %, the same as Analyze: true
}

// Points and what is kept beside them put in time order together.
func ExampleTimeOrder() {
	pts := []model.TrendPoint{{UnixNano: 30}, {UnixNano: 10}, {UnixNano: 20}}
	names := []string{"third", "first", "second"} // beside the points
	if order := model.TimeOrder(pts); order != nil {
		model.Reorder(pts, order)
		model.Reorder(names, order)
	}
	fmt.Println(pts[0].UnixNano, pts[1].UnixNano, pts[2].UnixNano, names)
	// Output:
	// 10 20 30 [first second third]
}

func ExampleBankTable() {
	ty := exampleType()
	air := model.AirISA(35000*model.Foot, 0)
	for _, r := range model.BankTable(ty, 65000, air, 0.78, 0)[4:7] {
		fmt.Printf("%2.0f°  n %.4f  induced %+5.1f %%  total %+5.1f %%  fuel %+4.0f kg/h\n",
			r.Bank*180/math.Pi, r.LoadFactor, r.InducedIncreasePct, r.TotalIncreasePct, r.ExtraFuelFlow*model.Hour)
	}
	// Output:
	// 20°  n 1.0642  induced +13.2 %  total  +4.9 %  fuel +119 kg/h
	// 25°  n 1.1034  induced +21.7 %  total  +8.1 %  fuel +196 kg/h
	// 30°  n 1.1547  induced +33.3 %  total +12.4 %  fuel +302 kg/h
}

func ExampleCruiseOptimum() {
	ty := exampleType()
	o := model.CruiseOptimum(ty, 65000, 35000*model.Foot, 0, 0, 0)
	fmt.Printf("Mach: min drag %.3f, max range %.3f, long range %.3f\n",
		o.MinDrag.Mach, o.MaxRange.Mach, o.LongRange.Mach)
	fmt.Printf("SR %.1f NM/t, optimum FL%.0f, maximum FL%.0f (%s)\n",
		o.MaxRange.SR/model.NauticalMile*1000, o.OptimumAltitude/model.Foot/100, o.MaxAltitude/model.Foot/100, o.MaxAltLimit)
	// Output:
	// Mach: min drag 0.669, max range 0.758, long range 0.789
	// SR 185.6 NM/t, optimum FL397, maximum FL403 (buffet)
}

// A thrust table gives one engine's net thrust per δ from the corrected fan
// speed; between grid points it is bilinear.
func ExampleThrustTable_At() {
	tt, err := model.NewThrustTable(
		[]float64{80, 90},                           // N1k, %
		[]float64{0.7, 0.8},                         // Mach
		[][]float64{{60000, 86000}, {58000, 83500}}) // N per δ, invented
	if err != nil {
		fmt.Println(err)
		return
	}
	f, ok := tt.At(85, 0.75)
	fmt.Printf("F/δ = %.0f N, inside the table: %v\n", f, ok)
	_, ok = tt.At(95, 0.75)
	fmt.Println("at 95 % inside:", ok)
	// Output:
	// F/δ = 71875 N, inside the table: true
	// at 95 % inside: false
}
