package feed

// idTable interns ids (tails, flights): an open-addressing table of the
// ids seen, probed linearly from a hash of their bytes (FNV-1a) and at most
// half full, which finds the short id of every row for less than a map's
// lookup, and the id of the row before, which a recording repeats on every
// row.
type idTable struct {
	slots []string // a power of two; "" is an empty slot (the empty id is never kept)
	n     int
	last  string
}

// intern returns the one copy of the id b, judging b (badID) only the
// first time it is seen; why says why it cannot be used.
func (t *idTable) intern(b []byte) (s, why string) {
	if len(b) == 0 {
		return "", "" // nothing to share
	}
	if t.last == string(b) {
		return t.last, ""
	}
	h := fnv1a(b)
	mask := uint32(len(t.slots) - 1)
	for i := h & mask; len(t.slots) > 0; i = (i + 1) & mask {
		if t.slots[i] == "" {
			break
		}
		if t.slots[i] == string(b) {
			t.last = t.slots[i]
			return t.last, ""
		}
	}
	if why := badID(b); why != "" {
		return "", why
	}
	s = string(b)
	t.add(s, h)
	t.last = s
	return s, ""
}

// add keeps s (not yet in the table, not empty), of hash h.
func (t *idTable) add(s string, h uint32) {
	if 2*(t.n+1) > len(t.slots) {
		old := t.slots
		t.slots, t.n = make([]string, max(256, 2*len(old))), 0
		for _, o := range old {
			if o != "" {
				t.add(o, fnv1a(o))
			}
		}
	}
	mask := uint32(len(t.slots) - 1)
	i := h & mask
	for t.slots[i] != "" {
		i = (i + 1) & mask
	}
	t.slots[i] = s
	t.n++
}

// fnv1a is the FNV-1a hash of an id's bytes (Fowler, Noll and Vo; ids
// are short, and it mixes each byte in at once).
func fnv1a[T string | []byte](b T) uint32 {
	h := uint32(2166136261)
	for i := 0; i < len(b); i++ {
		h = (h ^ uint32(b[i])) * 16777619
	}
	return h
}

// reset forgets every id but keeps the room.
func (t *idTable) reset() {
	clear(t.slots)
	t.n, t.last = 0, ""
}
