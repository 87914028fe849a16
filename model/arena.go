package model

// arena hands out zeroed float64 buffers from one slab, for the columns a
// tail's trend works on (per-flight deviations, prefix sums, pair slopes):
// AnalyzeTrend resets it from one tail to the next, so that a fleet's
// trends take no fresh memory for them once the slab has grown to the
// largest tail's needs. A buffer stays valid until the reset; nothing it
// holds may outlive the trend. A nil arena allocates each buffer anew.
type arena struct {
	slab []float64
	used int
}

// floats returns a zeroed buffer of length n.
func (a *arena) floats(n int) []float64 {
	if a == nil {
		return make([]float64, n)
	}
	if a.used+n > len(a.slab) {
		// A new slab; the buffers handed out keep the old one alive.
		a.slab, a.used = make([]float64, max(2*len(a.slab), n, 4096)), 0
	}
	s := a.slab[a.used : a.used+n : a.used+n]
	a.used += n
	clear(s)
	return s
}

// reset makes the whole slab free again.
func (a *arena) reset() { a.used = 0 }
