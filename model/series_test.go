package model

import (
	"testing"
	"time"
)

// The kinds of the events file: those naming the engines or the fuel-flow
// meter restart the engine series, the others the airframe series.
func TestEngineEvent(t *testing.T) {
	tests := []struct {
		kind string
		want bool
	}{
		{"engine change", true},
		{"Engine Wash", true},
		{"shop visit", true},
		{"fuel flow meter replaced", true},
		{"wash", false},
		{"repair", false},
		{"seal replaced", false},
		{"paint", false},
		{"winglet retrofit", false},
	}
	for _, tc := range tests {
		t.Run(tc.kind, func(t *testing.T) {
			if got := EngineEvent(tc.kind); got != tc.want {
				t.Errorf("EngineEvent(%q) = %v, want %v", tc.kind, got, tc.want)
			}
		})
	}
	evs := []Event{{Time: day0, Kind: "wash"}, {Time: day0.Add(time.Hour), Kind: "engine change"}, {Time: day0.Add(2 * time.Hour), Kind: "paint"}}
	af, en := SplitEvents(evs)
	if len(af) != 2 || af[1].Kind != "paint" || len(en) != 1 || en[0].Kind != "engine change" {
		t.Errorf("split: airframe %v, engine %v", af, en)
	}
}
