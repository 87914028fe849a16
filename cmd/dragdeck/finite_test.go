package main

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"
	"time"

	"dragdeck/feed"
	"dragdeck/model"
)

// No analysed value can stop the JSON writer: a non-finite one is written
// as null and named in non_finite (json: unsupported value: +Inf ended a
// live follow), and finite ones are written as encoding/json writes them.
func TestJSONNonFinite(t *testing.T) {
	cases := []struct {
		name string
		v    float64
		want string
	}{
		{"finite", 0.78, "0.78"},
		{"large", 1e21, "1e+21"},
		{"NaN", math.NaN(), "null"},
		{"+Inf", math.Inf(1), "null"},
		{"-Inf", math.Inf(-1), "null"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			b, err := json.Marshal(finite(c.v))
			if err != nil || string(b) != c.want {
				t.Fatalf("%s, %v; want %s", b, err, c.want)
			}
		})
	}
	p := model.Analyze(feed.DemoType(), model.Snapshot{Weight: 65000, Altitude: 10668, Mach: 0.78, SAT: 219, FuelFlow: 0.64})
	p.Drag, p.DragDevPct = math.Inf(1), math.NaN()
	var buf bytes.Buffer
	sw := &snapshotWriter{w: &buf, json: true, enc: json.NewEncoder(&buf)}
	if err := sw.enc.Encode(snapshotLine{Time: time.Now().UTC().Format(time.RFC3339), Tail: "T", pointJSON: newPointJSON(p)}); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if !strings.Contains(out, `"drag_n":null`) || !strings.Contains(out, `"non_finite":["drag_deviation_pct","drag_n"]`) {
		t.Errorf("line %s", out)
	}
	good := newPointJSON(model.Analyze(feed.DemoType(), model.Snapshot{Weight: 65000, Altitude: 10668, Mach: 0.78, SAT: 219, FuelFlow: 0.64}))
	if good.NonFinite != nil {
		t.Errorf("a plain snapshot lists non-finite fields %v", good.NonFinite)
	}
}
