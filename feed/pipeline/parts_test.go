package pipeline

import (
	"testing"

	"dragdeck/model"
)

// addChunked keeps a tail's points in order, and the room it keeps spare
// is at most an eighth of the points (or one chunk of 64), whatever the
// sizes of the parts they come in; join gives them back in one slice.
func TestAddChunked(t *testing.T) {
	cases := []struct {
		name  string
		parts []int // points per part
	}{
		{"one big part", []int{5000}},
		{"small parts", repeat(4, 3000)},
		{"mixed", []int{1, 70, 3, 900, 2, 2, 64, 128, 5000, 7}},
		{"none", nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var cs [][]model.TrendPoint
			next := int64(0)
			for _, n := range c.parts {
				pts := make([]model.TrendPoint, n)
				for i := range pts {
					pts[i].UnixNano = next
					next++
				}
				cs = addChunked(cs, pts)
			}
			spare, total := 0, 0
			for _, ch := range cs {
				spare += cap(ch) - len(ch)
				total += len(ch)
			}
			if total != int(next) || spare > max(64, total/8) {
				t.Errorf("%d chunks hold %d points of %d, %d spare", len(cs), total, next, spare)
			}
			r := &Result{Points: map[string][]model.TrendPoint{}, chunks: map[string][][]model.TrendPoint{"T": cs}}
			got := r.join("T")
			if len(got) != int(next) || cap(got) != len(got) {
				t.Fatalf("join: %d points (cap %d), want %d", len(got), cap(got), next)
			}
			for i, p := range got {
				if p.UnixNano != int64(i) {
					t.Fatalf("join: point %d is the %dth added", i, p.UnixNano)
				}
			}
		})
	}
}

func repeat(n, times int) []int {
	out := make([]int, times)
	for i := range out {
		out[i] = n
	}
	return out
}
