package model

import (
	"cmp"
	"slices"
)

// TimeOrder returns the order that sorts pts by time, stably (points of the
// same time stay in the order given): the k-th point in time is
// pts[order[k]]. Nil when pts are in time order already, as the points of
// a file in time order are. The order serves for pts and for whatever is
// kept beside them (their details, where their rows are): Reorder.
func TimeOrder(pts []TrendPoint) []int32 {
	if slices.IsSortedFunc(pts, ByTime) {
		return nil
	}
	order := make([]int32, len(pts))
	for i := range order {
		order[i] = int32(i)
	}
	slices.SortFunc(order, func(a, b int32) int { // the index breaks ties: stable
		return cmp.Or(cmp.Compare(pts[a].UnixNano, pts[b].UnixNano), cmp.Compare(a, b))
	})
	return order
}

// Reorder puts s in order (TimeOrder's): s[k] becomes the s[order[k]] of
// before. len(order) must be len(s).
func Reorder[T any](s []T, order []int32) {
	old := slices.Clone(s)
	for k, i := range order {
		s[k] = old[i]
	}
}
