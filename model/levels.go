package model

import "math"

// Levels remembers the ISA temperature and pressure (ISA) of the pressure
// altitudes met lately: a fleet's cruise snapshots sit at a few flight
// levels, and the power law of the troposphere costs more than the rest of
// a snapshot's analysis. The values are ISA's own. A zero Levels is ready
// for use; it is not safe for concurrent use (one per goroutine).
type Levels struct {
	h, t, p [levelSlots]float64
	set     [levelSlots]bool
}

// levelSlots is how many altitudes a Levels holds: the flight levels of a
// fleet's cruise, a few dozen.
const levelSlots = 64

// ISA is the package's ISA(h) for l's remembered altitudes; a nil l
// remembers none.
func (l *Levels) ISA(h float64) (T, p float64) {
	if l == nil {
		return ISA(h)
	}
	k := math.Float64bits(h) * 0x9E3779B97F4A7C15 >> 58 // Fibonacci hashing into 64 slots
	if l.set[k] && l.h[k] == h {
		return l.t[k], l.p[k]
	}
	T, p = ISA(h)
	l.h[k], l.t[k], l.p[k], l.set[k] = h, T, p, true
	return T, p
}

// AirAt is the package's AirAt with l's remembered altitudes.
func (l *Levels) AirAt(h, sat float64) Air {
	tISA, p := l.ISA(h)
	return Air{Altitude: h, T: sat, P: p, TISA: tISA}
}
