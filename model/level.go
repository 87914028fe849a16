package model

// Level is steady wings-level flight at one weight, air state and Mach.
type Level struct {
	Mach     float64
	TAS      float64 // m/s
	CL       float64
	CD       float64
	Drag     float64 // N
	FuelFlow float64 // kg/s, TSFC · D
	SR       float64 // specific range TAS/FF, m/kg
}

// LevelFlight evaluates steady 1 g level flight of weight w (kg) at Mach
// mach in air, on the type's polar with an added lift-independent drag
// coefficient excess (DESIGN.md §4.7): D = CD q S, FF = TSFC · D,
// SR = TAS / FF.
func LevelFlight(t *Type, w float64, air Air, mach, excess float64) Level {
	q := air.DynamicPressure(mach)
	cl := LiftCoefficient(1, w, q, t.WingArea)
	cd := t.CD(cl, mach, excess)
	d := cd * q * t.WingArea
	tas := air.TAS(mach)
	ff := t.TSFC(mach, air.Theta()) * d
	return Level{Mach: mach, TAS: tas, CL: cl, CD: cd, Drag: d, FuelFlow: ff, SR: tas / ff}
}
