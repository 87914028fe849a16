package feed

import (
	"fmt"
	"strings"
	"testing"
	"unsafe"
)

// idTable gives one shared copy of each id, whatever the bytes it is read
// from, judges an id only once, keeps none that is bad, and forgets all
// on reset.
func TestIDTable(t *testing.T) {
	tests := []struct {
		name string
		ids  []string
		bad  []string // refused, with a reason
	}{
		{"a fleet's tails", []string{"DD101", "DD102", "DW150"}, nil},
		{"thousands: the table grows", func() []string {
			var s []string
			for i := 0; i < 5000; i++ {
				s = append(s, fmt.Sprintf("T%04d", i))
			}
			return s
		}(), nil},
		{"bad ids", []string{"OK1"}, []string{"a\x01b", string([]byte{0xff, 0xfe}), strings.Repeat("x", MaxIDBytes+1)}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var tab idTable
			first := map[string]string{}
			for round := 0; round < 2; round++ {
				for _, id := range tt.ids {
					got, why := tab.intern([]byte(id)) // fresh bytes each time
					if why != "" || got != id {
						t.Fatalf("%q: %q %q", id, got, why)
					}
					if f, ok := first[id]; ok && unsafe.StringData(f) != unsafe.StringData(got) {
						t.Fatalf("%q: a second copy", id)
					}
					first[id] = got
				}
				for _, b := range tt.bad {
					if got, why := tab.intern([]byte(b)); why == "" || got != "" {
						t.Errorf("%q: %q, accepted", b, got)
					}
				}
			}
			if tab.n != len(tt.ids) {
				t.Errorf("%d ids kept, want %d", tab.n, len(tt.ids))
			}
			if s, why := tab.intern(nil); s != "" || why != "" {
				t.Errorf("the empty id: %q %q", s, why)
			}
			tab.reset()
			if tab.n != 0 || tab.last != "" {
				t.Errorf("after reset: %d ids, last %q", tab.n, tab.last)
			}
			if len(tt.ids) > 0 {
				if got, _ := tab.intern([]byte(tt.ids[0])); unsafe.StringData(got) == unsafe.StringData(first[tt.ids[0]]) {
					t.Errorf("after reset, the old copy is given back")
				}
			}
		})
	}
}
