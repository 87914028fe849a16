package pipeline

import (
	"math"
	"math/rand/v2"
	"testing"

	"dragdeck/model"
)

// Packed points come back exactly as they were given, in the order given,
// whatever the times (whole seconds or not, backwards, far apart), flights,
// flags and values (a NaN engine deviation stays NaN), and in whatever
// segments they are added, but for the fuel-flow deviation, back within
// 1e-6 pp (kept as a float32 difference from the deviation); they take
// well under a TrendPoint's 48 bytes.
func TestPacked(t *testing.T) {
	base := int64(1_750_000_000) * 1e9
	rng := rand.New(rand.NewPCG(3, 4))
	random := func(n int) []model.TrendPoint {
		pts := make([]model.TrendPoint, n)
		ns := base
		for i := range pts {
			switch rng.IntN(5) {
			case 3:
				ns += int64(rng.IntN(600)) * 60e9 // whole minutes
			case 0:
				ns += int64(rng.IntN(7200)) * 1e9 // whole seconds (and minutes, one in sixty)
			case 1:
				ns += int64(rng.IntN(1e12)) // any nanosecond
			case 2:
				ns -= int64(rng.IntN(86400)) * 1e9 // backwards (a file out of order)
			}
			p := model.TrendPoint{UnixNano: ns, DevPct: rng.NormFloat64(), FuelFlowExpected: 0.6 + rng.Float64(),
				FuelFlowDevPct: rng.NormFloat64(), EngineDevPct: math.NaN(), Flight: model.FlightID(rng.IntN(5000)),
				OutsideTable: rng.IntN(9) == 0, Manoeuvre: model.Manoeuvre(rng.IntN(4))}
			if rng.IntN(4) > 0 {
				p.HasEngine, p.EngineDevPct = true, rng.NormFloat64()
			}
			pts[i] = p
		}
		return pts
	}
	edge := []model.TrendPoint{
		{UnixNano: math.MinInt64 + 1, DevPct: math.Inf(1), Flight: math.MaxUint32, EngineDevPct: math.NaN()},
		{UnixNano: math.MaxInt64, DevPct: math.NaN(), FuelFlowExpected: math.Copysign(0, -1), EngineDevPct: 5, HasEngine: true, Manoeuvre: model.ManoeuvreAccel},
		{UnixNano: 0, Flight: 0, EngineDevPct: math.Inf(-1), FuelFlowDevPct: math.NaN()},
		{UnixNano: 1, DevPct: math.NaN(), FuelFlowDevPct: 2.5, EngineDevPct: math.NaN()},
		{UnixNano: 2, DevPct: 3.25, FuelFlowDevPct: -1.75, EngineDevPct: math.NaN()},
	}
	tests := []struct {
		name  string
		pts   []model.TrendPoint
		parts []int // sizes of the parts added, in turn
	}{
		{"one part", random(1000), []int{1000}},
		{"many small parts", random(3000), repeat(3, 1000)},
		{"uneven parts", random(2000), []int{1, 999, 7, 993}},
		{"extremes", edge, []int{1, 2, 2}},
		{"none", nil, nil},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var pk packed
			var seg segment
			at := 0
			for _, n := range tt.parts {
				seg.reset()
				for i := range tt.pts[at : at+n] {
					seg.add(&tt.pts[at+i])
				}
				pk.add(&seg)
				at += n
			}
			got := pk.unpack(nil)
			if len(got) != len(tt.pts) {
				t.Fatalf("%d points back, %d added", len(got), len(tt.pts))
			}
			for i, w := range tt.pts {
				g := got[i]
				same := func(a, b float64) bool {
					return a == b && math.Signbit(a) == math.Signbit(b) || math.IsNaN(a) && math.IsNaN(b)
				}
				near := func(a, b float64) bool {
					return math.Abs(a-b) <= 1e-6 || math.IsNaN(a) && math.IsNaN(b)
				}
				if g.UnixNano != w.UnixNano || g.Flight != w.Flight || g.OutsideTable != w.OutsideTable || g.HasEngine != w.HasEngine ||
					g.Manoeuvre != w.Manoeuvre || !same(g.DevPct, w.DevPct) || !same(g.FuelFlowExpected, w.FuelFlowExpected) || !near(g.FuelFlowDevPct, w.FuelFlowDevPct) || !same(g.EngineDevPct, w.EngineDevPct) {
					t.Fatalf("point %d: %+v, packed %+v", i, g, w)
				}
			}
			if pk.n != 0 || pk.meta != nil {
				t.Errorf("the packed points are not let go")
			}
		})
	}
	// Size: an export (snapshots 20 minutes apart, few flights, three
	// points in four with fan speed) packs in about 33 bytes a point.
	var pk packed
	var seg segment
	pts := make([]model.TrendPoint, 10000)
	for i := range pts {
		pts[i] = model.TrendPoint{UnixNano: base + int64(i)*1200e9, Flight: model.FlightID(i / 3 % 40), DevPct: 1, FuelFlowExpected: 0.7,
			EngineDevPct: math.NaN()}
		if i%4 > 0 {
			pts[i].HasEngine, pts[i].EngineDevPct = true, 0.5
		}
	}
	for i := range pts {
		seg.add(&pts[i])
	}
	pk.add(&seg)
	bytes := 0
	for _, c := range pk.meta {
		bytes += cap(c)
	}
	for _, cs := range [][][]float64{pk.dev, pk.ffe, pk.eng} {
		for _, c := range cs {
			bytes += 8 * cap(c)
		}
	}
	for _, c := range pk.ffd {
		bytes += 4 * cap(c)
	}
	if per := float64(bytes) / float64(len(pts)); per > 30 {
		t.Errorf("%.1f bytes a point, want about 29", per)
	}
	if model.ManoeuvreAccel > 3 {
		t.Errorf("a manoeuvre needs more than the two bits it is packed in")
	}
}
