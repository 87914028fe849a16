package feed

import (
	"math"

	"dragdeck/model"
)

// Conversions from the file and flag units of DESIGN.md §3.1 to SI, using
// the exact definitions in package model.

// KgFromLb converts pounds to kilograms (1 lb = 0.45359237 kg exactly).
func KgFromLb(lb float64) float64 { return lb * model.Pound }

// MetresFromFeet converts feet to metres (1 ft = 0.3048 m exactly).
func MetresFromFeet(ft float64) float64 { return ft * model.Foot }

// KgPerSFromKgPerH converts kg/h to kg/s.
func KgPerSFromKgPerH(v float64) float64 { return v / model.Hour }

// KgPerSFromLbPerH converts lb/h to kg/s.
func KgPerSFromLbPerH(v float64) float64 { return v * model.Pound / model.Hour }

// KelvinFromCelsius converts °C to K.
func KelvinFromCelsius(c float64) float64 { return c + model.CelsiusZero }

// RadFromDeg converts degrees to radians.
func RadFromDeg(d float64) float64 { return d * math.Pi / 180 }

// MPerSFromFtPerMin converts ft/min to m/s.
func MPerSFromFtPerMin(v float64) float64 { return v * model.Foot / model.Minute }

// MPerS2FromKtPerMin converts a rate of change of airspeed in kt/min to m/s².
func MPerS2FromKtPerMin(v float64) float64 { return v * model.Knot / model.Minute }

// FtPerMinFromMPerS converts a vertical speed, m/s → ft/min.
func FtPerMinFromMPerS(v float64) float64 { return v / model.Foot * model.Minute }

// KtPerMinFromMPerS2 converts an acceleration, m/s² → kt/min.
func KtPerMinFromMPerS2(v float64) float64 { return v / model.Knot * model.Minute }

// SATFromTAT returns the static air temperature (K) from the total air
// temperature tat (K) at Mach m, with recovery factor 1:
// SAT = TAT / (1 + (γ−1)/2 M²) = TAT / (1 + 0.2 M²) (adiabatic stagnation
// temperature; Anderson, Introduction to Flight, ch. 4).
func SATFromTAT(tat, m float64) float64 { return tat / (1 + 0.2*m*m) }
