// Package model is dragdeck's pure cruise-performance core:
//
//   - the ICAO standard atmosphere and an aircraft type (baseline drag polar,
//     Korn drag divergence and Lock wave drag, TSFC engine model);
//   - the analysis of one cruise snapshot into measured drag (energy method)
//     and its induced, wave and parasite parts, with warnings, and a drag
//     deviation turned back into ΔCD;
//   - the bank-angle penalty and buffet margin, level flight and the cruise
//     optimum (maximum-range, long-range and economy Mach, optimum and
//     maximum altitude) for a weight;
//   - the per-tail trend: usable points, per-flight medians, rolling median,
//     steps by penalised piecewise-linear segmentation, drift by Theil–Sen
//     with its interval and intercept, recent level; the fleet's flags,
//     severity order and cost; and the fit of a tail's own polar.
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
