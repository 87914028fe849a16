// Package feed brings data into dragdeck and converts it to the SI units of
// package model: the aircraft type file (TOML, DESIGN.md §3.2) with the
// built-in demo type, and the unit conversions of the file and flag edges.
// Errors carry their context as file:line: key: reason.
package feed
