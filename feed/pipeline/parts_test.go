package pipeline

import (
	"slices"
	"testing"
	"unsafe"

	"dragdeck/model"
)

// addChunked keeps a tail's points in order, and the room it keeps spare
// is at most an eighth of the points (or one chunk of 4 KB), whatever the
// sizes of the parts they come in; joinChunks gives them back in one slice.
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
			if total != int(next) || spare > max(minChunk/int(unsafe.Sizeof(model.TrendPoint{})), total/8) {
				t.Errorf("%d chunks hold %d points of %d, %d spare", len(cs), total, next, spare)
			}
			got := joinChunks(nil, cs)
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

// inTime sorts points by time with their details and refs beside them,
// and drops a repeated time (the first read stays), with or without them.
func TestInTime(t *testing.T) {
	at := func(ns ...int64) []model.TrendPoint {
		out := make([]model.TrendPoint, len(ns))
		for i, n := range ns {
			out[i].UnixNano = n
			out[i].DevPct = float64(10 * n) // which point it is
		}
		return out
	}
	cases := []struct {
		name     string
		times    []int64
		refs     []int64
		want     []int64 // times after
		wantRefs []int64
		dropped  int
	}{
		{"sorted", []int64{1, 2, 3}, []int64{11, 12, 13}, []int64{1, 2, 3}, []int64{11, 12, 13}, 0},
		{"unsorted", []int64{3, 1, 2}, []int64{13, 11, 12}, []int64{1, 2, 3}, []int64{11, 12, 13}, 0},
		{"repeat kept first", []int64{2, 1, 2, 1}, []int64{21, 11, 22, 12}, []int64{1, 2}, []int64{11, 21}, 2},
		{"no refs", []int64{5, 4, 4}, nil, []int64{4, 5}, nil, 1},
		{"one", []int64{7}, []int64{70}, []int64{7}, []int64{70}, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var det []model.PointDetail // with the refs, details that name them
			for _, r := range c.refs {
				det = append(det, model.PointDetail{CL: float32(r)})
			}
			pts, det, refs, dropped := inTime(at(c.times...), det, append([]int64(nil), c.refs...))
			if c.refs == nil {
				refs = nil
			}
			if len(det) != len(refs) {
				t.Fatalf("%d details for %d refs", len(det), len(refs))
			}
			for i := range det {
				if det[i].CL != float32(refs[i]) {
					t.Errorf("detail %d is of row %g, its ref %d", i, det[i].CL, refs[i])
				}
			}
			got := make([]int64, len(pts))
			for i, p := range pts {
				got[i] = p.UnixNano
				if p.DevPct != float64(10*p.UnixNano) {
					t.Errorf("point %d lost its values: %+v", i, p)
				}
			}
			if !slices.Equal(got, c.want) || !slices.Equal(refs, c.wantRefs) || dropped != c.dropped {
				t.Errorf("times %v refs %v dropped %d; want %v %v %d", got, refs, dropped, c.want, c.wantRefs, c.dropped)
			}
		})
	}
}
