package model

// Physical constants of the ICAO standard atmosphere (ICAO Doc 7488,
// US Standard Atmosphere 1976).
const (
	P0    = 101325.0  // sea-level standard pressure, Pa
	T0    = 288.15    // sea-level standard temperature, K
	Rho0  = 1.225     // sea-level standard density, kg/m³
	G0    = 9.80665   // standard acceleration of gravity, m/s²
	R     = 287.05287 // specific gas constant of dry air, J/(kg·K)
	Gamma = 1.4       // ratio of specific heats of air
)

// Exact unit definitions used at the edges (international yard and pound
// agreement, 1959; the international nautical mile, 1929).
const (
	Foot         = 0.3048        // m
	NauticalMile = 1852.0        // m
	Knot         = 1852.0 / 3600 // m/s
	Pound        = 0.45359237    // kg
	Hour         = 3600.0        // s
	Minute       = 60.0          // s
	CelsiusZero  = 273.15        // K at 0 °C
)

// DragCount is one drag count, a drag-coefficient increment of 0.0001
// (common practice).
const DragCount = 1e-4

// CO2PerFuel is the mass of CO2 emitted per mass of jet fuel burnt,
// 3.16 kg/kg (ICAO Carbon Emissions Calculator methodology).
const CO2PerFuel = 3.16
