package feed

import "time"

// Clock is the time source of replay and follow, so that tests run on a
// fake clock.
type Clock interface {
	Now() time.Time
	After(d time.Duration) <-chan time.Time
}

// RealClock is the wall clock.
type RealClock struct{}

// Now returns the current time.
func (RealClock) Now() time.Time { return time.Now() }

// After waits for d on the wall clock.
func (RealClock) After(d time.Duration) <-chan time.Time { return time.After(d) }
