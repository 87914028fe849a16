package model

import "testing"

func TestArena(t *testing.T) {
	tests := []struct {
		name  string
		sizes []int
	}{
		{"within one slab", []int{10, 20, 30}},
		{"a buffer larger than the slab", []int{10, 10000, 5}},
		{"many small", []int{1000, 1000, 1000, 1000, 1000}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			for _, a := range []*arena{nil, new(arena)} {
				for round := 0; round < 2; round++ {
					var bufs [][]float64
					for i, n := range tt.sizes {
						b := a.floats(n)
						if len(b) != n || cap(b) != n {
							t.Fatalf("buffer %d: len %d cap %d, want %d", i, len(b), cap(b), n)
						}
						for k := range b {
							if b[k] != 0 {
								t.Fatalf("buffer %d not zeroed at %d", i, k)
							}
							b[k] = float64(i + 1)
						}
						bufs = append(bufs, b)
					}
					for i, b := range bufs { // no buffer overlaps another
						for k := range b {
							if b[k] != float64(i+1) {
								t.Fatalf("buffer %d overwritten at %d", i, k)
							}
						}
					}
					if a != nil {
						a.reset()
					}
				}
			}
		})
	}
}
