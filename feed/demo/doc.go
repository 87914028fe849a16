// Package demo makes dragdeck's invented demo fleet: an invented airline
// flying three invented types (a twin, its wingtip-device variant with one
// retrofit half-way, a long-range twin; or any one type given), whose snapshots are
// made through the model's own equations from a known truth. Each tail has a
// drag deviation that may drift, step, drop after a repair or sit high, plus
// measurement noise; a few rows are broken on purpose and a few snapshots
// are turns or climbs that the trend must leave out. NewFleet builds the
// fleet in memory (the dashboard's built-in demo); Write puts its snapshot,
// fleet, events and type files and its truth.json in a folder (the demo command),
// so that every later analysis can be checked against what was put in.
//
// The data are invented: no real operator, registration or manufacturer.
package demo
