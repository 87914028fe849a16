package main

import (
	"encoding/json"
	"math"
	"sort"
)

// finite is a number of the JSON output that is written as null when it is
// not finite: encoding/json refuses NaN and ±Inf with an error, which would
// end a live follow or replay on one extreme snapshot. Finite values are
// written exactly as encoding/json writes a float64.
type finite float64

func (f finite) MarshalJSON() ([]byte, error) {
	v := float64(f)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return []byte("null"), nil
	}
	return json.Marshal(v)
}

// nonFinite names the fields among named whose value is not finite, for
// the JSON's "non_finite" list (nil when all are).
func nonFinite(named map[string]float64) []string {
	var out []string
	for name, v := range named {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			out = append(out, name)
		}
	}
	sort.Strings(out)
	return out
}
