// Package model is dragdeck's pure cruise-performance core: the ICAO standard
// atmosphere, an aircraft type (baseline drag polar, wave drag, engine), the
// analysis of one cruise snapshot into measured drag and its split, the
// bank-angle penalty, and the cruise optimum for a weight.
//
// Everything here is in SI units (kg, m, s, N, K, Pa, rad) and free of I/O,
// clocks and mutable globals. Feet, knots, pounds and degrees Celsius exist
// only at the edges (package feed and the command line); the conversion
// constants below are the exact definitions they use.
//
// Following the trade, mass is called weight; lift is weight × g0 × n.
//
// The results are an engineering monitoring aid, not approved performance
// data; they defer to the operator's approved procedures and local
// regulations.
package model
