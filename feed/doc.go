// Package feed brings data into dragdeck and converts it to the SI units of
// package model:
//
//   - the aircraft type file (TOML, strict: unknown keys and missing keys are
//     errors with their line) and the built-in demo type;
//   - snapshot files (CSV): the column layout, a line-fed Decoder shared by
//     the file Reader and the Follower, validation against plausibility
//     bounds, and typed row errors (RowError wraps a sentinel such as
//     ErrNumber or ErrRange, as encoding/csv and strconv do);
//   - events files, replay loading and the Player that paces replay for the
//     replay command and the dashboard, and the follower of a growing file;
//   - the unit conversions of the file and flag edges (ft, kt, lb, °C, TAT).
//
// Times become UTC once, on reading. Errors carry their context as
// file:line: column: reason. The fleet pipeline built on this package is in
// feed/pipeline, the invented demo fleet in feed/demo.
package feed
