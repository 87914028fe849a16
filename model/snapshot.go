package model

import "math"

// Snapshot is one steady cruise record in SI units.
type Snapshot struct {
	Weight   float64 // gross weight (mass), kg
	Altitude float64 // pressure altitude, m
	Mach     float64 // flight Mach number
	SAT      float64 // static air temperature, K
	FuelFlow float64 // total fuel flow of all engines, kg/s
	Bank     float64 // bank angle, rad (0 in wings-level flight)
	VS       float64 // vertical speed, m/s (positive up)
	Accel    float64 // rate of change of true airspeed, m/s²
	N1       float64 // fan speed averaged over the engines, % of reference; 0 when not recorded
}

// LoadFactor is n = 1/cos φ in a level turn at bank φ (rad).
func LoadFactor(bank float64) float64 {
	if bank == 0 { // wings level, most snapshots: 1/cos 0 without the cosine
		return 1
	}
	return 1 / math.Cos(bank)
}

// LiftCoefficient is CL = n W g0 / (q S) for weight w (kg), dynamic pressure
// q (Pa) and wing area s (m²).
func LiftCoefficient(n, w, q, s float64) float64 { return n * w * G0 / (q * s) }

// Point is the analysis of one snapshot against a type's baseline polar.
// Drag coefficients are dimensionless; forces in N; fuel flow in kg/s.
type Point struct {
	LoadFactor float64 // n
	CL         float64 // lift coefficient

	CDMeasured         float64 // D/(q S)
	CDBaseline         float64 // CD0 + k CL² + ΔCD_wave
	CDInduced          float64 // k CL²
	CDWave             float64 // ΔCD_wave (Korn + Lock)
	CDParasiteBaseline float64 // the type's CD0
	CDParasiteMeasured float64 // CD_measured − induced − wave

	ExcessCounts float64 // (CD_measured − CD_baseline) / 0.0001
	DragDevPct   float64 // 100 (CD_measured − CD_baseline) / CD_baseline

	FuelFlowExpected float64 // kg/s on the baseline polar
	FuelFlowDevPct   float64 // 100 (FF − FF_expected) / FF_expected

	Thrust float64 // net thrust of all engines, N: from fan speed when ThrustFromN1, else from fuel flow
	// ThrustFromN1 is true when the thrust came from the fan speed and the
	// type's thrust table; the drag deviation is then the airframe's alone.
	ThrustFromN1 bool
	// OutsideThrustTable is true when the snapshot has a fan speed and the
	// type a table, but N1k or Mach lies outside its grid: the snapshot is
	// not usable (its thrust fell back to fuel flow).
	OutsideThrustTable bool
	N1Corrected        float64 // N1k, %; NaN without a fan speed or a table
	// EngineDevPct is 100 (FF / (TSFC_model · Fn) − 1): fuel burnt against
	// the fuel the model needs for the thrust measured from the fan speed.
	// NaN when the thrust came from fuel flow (unknown, never 0).
	EngineDevPct float64
	Drag         float64 // energy-corrected drag, N
	TSFC         float64 // kg/(N·s)

	TAS    float64 // true airspeed, m/s
	ISADev float64 // K
	Delta  float64 // p/p0
	Theta  float64 // T/T0
	Q      float64 // dynamic pressure, Pa
}

// Analyze turns a snapshot into measured drag by the energy method and
// compares it with the type's baseline polar (DESIGN.md §4.5):
//
//	T  = FF / TSFC                           (thrust from fuel flow; TSFC in kg/(N·s) here)
//	T  = count · δ · F(N1k, M)               (instead, with a fan speed and a thrust table)
//	engine dev = 100 (FF / (TSFC · T) − 1)   (only with thrust from the fan speed)
//	D  = T − W g0 sinγ − W dV/dt,  sinγ = VS/TAS
//	CD_measured = D/(q S),  ΔCD = CD_measured − CD_baseline
//	FF_expected = TSFC · (CD_baseline q S + W g0 sinγ + W dV/dt)
//
// Excess drag is taken as lift-independent: parasite measured =
// CD_measured − k CL² − ΔCD_wave. The function does not validate its input;
// package feed rejects impossible snapshots before they get here.
func Analyze(t *Type, s Snapshot) Point {
	var p Point
	AnalyzeInto(&p, t, &s, nil)
	return p
}

// AnalyzeInto is Analyze writing the point into p, with the standard
// atmosphere of the levels l remembers (nil: none): the same values, for
// a caller that analyses millions of snapshots (a Point is 200 bytes).
func AnalyzeInto(p *Point, t *Type, s *Snapshot, l *Levels) {
	air := l.AirAt(s.Altitude, s.SAT)
	*p = Point{}
	p.Delta = air.Delta()
	p.Theta = air.Theta()
	p.ISADev = air.ISADev()
	p.TAS = air.TAS(s.Mach)
	p.Q = air.DynamicPressure(s.Mach)
	p.LoadFactor = LoadFactor(s.Bank)
	p.CL = LiftCoefficient(p.LoadFactor, s.Weight, p.Q, t.WingArea)

	p.TSFC = t.TSFC(s.Mach, p.Theta)
	p.Thrust = s.FuelFlow / p.TSFC
	p.N1Corrected, p.EngineDevPct = math.NaN(), math.NaN()
	if s.N1 > 0 && t.Thrust != nil {
		p.N1Corrected = CorrectedN1(s.N1, s.Mach, p.Theta)
		if f, ok := t.Thrust.At(p.N1Corrected, s.Mach); ok {
			p.Thrust = float64(t.EngineCount) * p.Delta * f
			p.ThrustFromN1 = true
			p.EngineDevPct = 100 * (s.FuelFlow/(p.TSFC*p.Thrust) - 1)
		} else {
			p.OutsideThrustTable = true
		}
	}
	sinGamma := s.VS / p.TAS
	energy := s.Weight*G0*sinGamma + s.Weight*s.Accel // N spent on climb and acceleration
	p.Drag = p.Thrust - energy

	qs := p.Q * t.WingArea
	p.CDMeasured = p.Drag / qs
	p.CDInduced = t.K() * p.CL * p.CL
	p.CDWave = t.WaveDrag(p.CL, s.Mach)
	p.CDParasiteBaseline = t.CD0
	p.CDBaseline = t.CD0 + p.CDInduced + p.CDWave
	p.CDParasiteMeasured = p.CDMeasured - p.CDInduced - p.CDWave

	excess := p.CDMeasured - p.CDBaseline
	p.ExcessCounts = excess / DragCount
	p.DragDevPct = 100 * excess / p.CDBaseline

	p.FuelFlowExpected = p.TSFC * (p.CDBaseline*qs + energy)
	p.FuelFlowDevPct = 100 * (s.FuelFlow - p.FuelFlowExpected) / p.FuelFlowExpected
}
