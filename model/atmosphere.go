package model

import "math"

// Layer boundaries and lapse rates of the ICAO standard atmosphere up to
// 32 km geopotential altitude (ICAO Doc 7488; US Standard Atmosphere 1976).
const (
	tropopause   = 11000.0 // m
	stratosphere = 20000.0 // m, top of the isothermal layer
	lapseTropo   = -0.0065 // K/m, 0–11 km
	lapseStrato  = 0.001   // K/m, 20–32 km
	tTropopause  = 216.65  // K, 11–20 km
)

// pressure at the layer bases, Pa, from the layer equations themselves.
var (
	pTropopause   = P0 * math.Pow(tTropopause/T0, -G0/(lapseTropo*R))
	pStratosphere = pTropopause * math.Exp(-G0*(stratosphere-tropopause)/(R*tTropopause))
)

// ISA returns the standard temperature T (K) and pressure p (Pa) at the
// geopotential (pressure) altitude h in metres:
//
//	0–11 km:  T = T0 − 0.0065 h,       p = p0 (T/T0)^(g0/(0.0065 R))
//	11–20 km: T = 216.65 K,            p = p11 exp(−g0 (h − 11000)/(R · 216.65))
//	20–32 km: T = 216.65 + 0.001 (h − 20000), p = p20 (T/216.65)^(−g0/(0.001 R))
//
// Source: ICAO Doc 7488 / US Standard Atmosphere 1976. Altitudes outside
// −5 … 32 km continue the nearest layer's law; callers validate their range.
func ISA(h float64) (T, p float64) {
	switch {
	case h <= tropopause:
		T = T0 + lapseTropo*h
		return T, P0 * math.Pow(T/T0, -G0/(lapseTropo*R))
	case h <= stratosphere:
		return tTropopause, pTropopause * math.Exp(-G0*(h-tropopause)/(R*tTropopause))
	default:
		T = tTropopause + lapseStrato*(h-stratosphere)
		return T, pStratosphere * math.Pow(T/tTropopause, -G0/(lapseStrato*R))
	}
}

// StandardTemperature is the ISA temperature (K) at pressure altitude h,
// ISA's T without its pressure (which costs a power).
func StandardTemperature(h float64) float64 {
	switch {
	case h <= tropopause:
		return T0 + lapseTropo*h
	case h <= stratosphere:
		return tTropopause
	}
	return tTropopause + lapseStrato*(h-stratosphere)
}

// TrueAirspeed is M a at Mach m in air of static temperature sat (K), m/s:
// Air.TAS without the air's pressure.
func TrueAirspeed(m, sat float64) float64 { return m * math.Sqrt(Gamma*R*sat) }

// Air is the state of the air at one pressure altitude and temperature.
type Air struct {
	Altitude float64 // pressure altitude, m
	T        float64 // static air temperature, K
	P        float64 // static pressure, Pa
	TISA     float64 // standard temperature at this pressure altitude, K
}

// AirAt returns the air at pressure altitude h (m) with static air
// temperature sat (K). Pressure follows the ISA (pressure altitude is
// defined by it); temperature is the observed one.
func AirAt(h, sat float64) Air { return (*Levels)(nil).AirAt(h, sat) }

// AirISA returns the air at pressure altitude h (m) with the temperature
// deviation dev (K) from standard.
func AirISA(h, dev float64) Air {
	tISA, p := ISA(h)
	return Air{Altitude: h, T: tISA + dev, P: p, TISA: tISA}
}

// Delta is the pressure ratio δ = p/p0.
func (a Air) Delta() float64 { return a.P / P0 }

// Theta is the temperature ratio θ = T/T0.
func (a Air) Theta() float64 { return a.T / T0 }

// Density is ρ = p/(R T), kg/m³.
func (a Air) Density() float64 { return a.P / (R * a.T) }

// Sigma is the density ratio σ = ρ/ρ0.
func (a Air) Sigma() float64 { return a.Density() / Rho0 }

// ISADev is the deviation from standard temperature, K.
func (a Air) ISADev() float64 { return a.T - a.TISA }

// SpeedOfSound is a = √(γ R T), m/s.
func (a Air) SpeedOfSound() float64 { return math.Sqrt(Gamma * R * a.T) }

// TAS is the true airspeed M a at Mach m, m/s.
func (a Air) TAS(m float64) float64 { return m * a.SpeedOfSound() }

// DynamicPressure is q = ½ γ p M² at Mach m, Pa.
func (a Air) DynamicPressure(m float64) float64 { return 0.5 * Gamma * a.P * m * m }
