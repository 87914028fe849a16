package demo

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"
	"time"

	"dragdeck/model"
)

// RecordingDir is where Write puts the demo's continuous recordings.
const RecordingDir = "recordings"

// RecordingTruth is one continuous 1 Hz recording of a whole flight: its
// planted stretches, and the tail's true drag deviation on that day (the
// airframe's, %) that every stable window must give back.
type RecordingTruth struct {
	File         string         `json:"file"`
	Tail         string         `json:"tail"`
	Flight       string         `json:"flight"`
	Rows         int            `json:"rows"`
	DeviationPct float64        `json:"deviation_pct"`
	Stretches    []StretchTruth `json:"stretches"`
	rows         []demoRow      // the samples, for Write and NewFleet
	fanSpeed     bool           // the tail records N1
}

// StretchTruth is one planted part of a recording, [From, To) in RFC 3339.
type StretchTruth struct {
	Kind string `json:"kind"` // climb, steady, turn, step climb, speed change, turbulence, descent
	From string `json:"from"`
	To   string `json:"to"`
}

// recordingPlan is the flight of a demo recording: kind and seconds.
var recordingPlan = []struct {
	kind string
	secs int
}{
	{"steady", 1200}, {"turn", 180}, {"steady", 720}, {"step climb", 120}, {"steady", 900},
	{"speed change", 60}, {"steady", 600}, {"turbulence", 240}, {"steady", 720},
}

// recordings makes the demo's recordings: one night flight of a drifting
// tail and one of a steady tail, about 60 days before the end (outside the
// recent level's 30 days), at 1 Hz from FL100 in the climb to FL100 in the
// descent.
// They draw from a generator of their own, so the snapshots stay as they
// are.
func (g *demoGen) recordings() []RecordingTruth {
	rng := rand.New(rand.NewPCG(g.cfg.Seed, 0x7265636f7264))
	var out []RecordingTruth
	for k, role := range []string{RoleDrift, RoleSteady} {
		for i := range g.tails {
			tt := &g.tails[i]
			if tt.Role != role || g.cfg.Days < 90 {
				continue
			}
			// a night flight: the day's snapshot flights start after 05:00
			// and end before 20:00, so no other flight of the tail overlaps
			dep := g.end.AddDate(0, 0, -60-k).Add(20 * time.Minute)
			out = append(out, g.recording(tt, fmt.Sprintf("DDR%03d", 1+k), dep, rng))
			break
		}
	}
	return out
}

// recording flies one whole flight of tt at 1 Hz.
func (g *demoGen) recording(tt *TailTruth, flight string, dep time.Time, rng *rand.Rand) RecordingTruth {
	c := tt.ctxAt(dep)
	w := 1.08 * c.wMid
	cruise := c.cruiseLevel(w) - 2000
	const dev = 3.0 // K above standard all flight
	mach := math.Round((c.machLo+0.012)*1000) / 1000
	alt, m := 10000.0, 0.62
	t := dep.Add(10 * time.Minute)
	rec := RecordingTruth{Tail: tt.Tail, Flight: flight, DeviationPct: tt.deviation(dep), Stretches: []StretchTruth{}, fanSpeed: tt.FanSpeed}
	stretch := func(kind string, from time.Time) {
		rec.Stretches = append(rec.Stretches, StretchTruth{Kind: kind, From: from.Format(time.RFC3339), To: t.Format(time.RFC3339)})
	}
	tas := func(altFt, mach float64) float64 { return model.AirISA(altFt*model.Foot, dev).TAS(mach) / model.Knot }
	sample := func(vs, bank, nextMach float64, sensor func(*demoRow)) {
		acc := (tas(alt+vs/60, nextMach) - tas(alt, m)) * 60 // kt per minute
		r := g.snapshot(tt, t, flight, w, alt, m, dev, bank, vs, acc, rng.NormFloat64()*0.002)
		if vs < 0 {
			// a steep descent of a clean airframe can need less than no
			// thrust: the engines sit at idle, taken as a tenth of level
			// flight's fuel (our choice), never at a negative fuel flow
			r.ffKgph = max(r.ffKgph, 0.1*g.snapshot(tt, t, flight, w, alt, m, dev, 0, 0, 0, 0).ffKgph)
		}
		w -= r.ffKgph / 3600
		// What the recorder gives: the true values with small sensor noise.
		r.altFt += rng.NormFloat64() * 2
		r.mach += rng.NormFloat64() * 0.0003
		r.satC += rng.NormFloat64() * 0.05
		if sensor != nil {
			sensor(&r)
		}
		r.altFt = math.Round(r.altFt)
		rec.rows = append(rec.rows, r)
		alt += vs / 60
		m = nextMach
		t = t.Add(time.Second)
	}
	from := t
	for alt < cruise { // climb: 2,500 ft/min falling to 1,000 ft/min
		vs := math.Min(2500-1500*(alt-10000)/(cruise-10000), (cruise-alt)*60)
		sample(vs, 0, math.Min(mach, m+0.0003), nil)
	}
	alt, m = cruise, mach
	stretch("climb", from)
	for _, p := range recordingPlan {
		from := t
		for s := 0; s < p.secs; s++ {
			switch p.kind {
			case "turn":
				sample(0, 20, m, nil)
			case "step climb":
				sample(1000, 0, m, nil)
			case "speed change":
				sample(0, 0, m+0.02/float64(p.secs), nil)
			case "turbulence":
				sample(0, 0, m, func(r *demoRow) {
					r.mach += rng.NormFloat64() * 0.006
					r.altFt += rng.NormFloat64() * 60
					r.ffKgph *= 1 + rng.NormFloat64()*0.03
				})
			default:
				sample(0, 0, m, nil)
			}
		}
		stretch(p.kind, from)
	}
	from = t
	for alt > 10000 { // descent at 2,000 ft/min
		sample(-math.Min(2000, (alt-10000)*60), 0, math.Max(0.62, m-0.0003), nil)
	}
	stretch("descent", from)
	rec.Rows = len(rec.rows)
	return rec
}

// recordingBytes writes a recording in the snapshot format without vs_fpm
// and accel_kt_per_min (extract derives them), with n1_pct when the tail
// records it.
func (g *demoGen) recordingBytes(rec RecordingTruth) []byte {
	var b bytes.Buffer
	b.WriteString("# 1 Hz recording of one whole flight of the invented demo fleet (for extract and replay)\n")
	b.WriteString("time,tail,flight,weight_kg,alt_ft,mach,sat_c,fuel_flow_kgph,bank_deg")
	if rec.fanSpeed {
		b.WriteString(",n1_pct")
	}
	b.WriteByte('\n')
	var buf []byte
	for _, r := range rec.rows {
		buf = appendFields(r, buf[:0], num{r.w, 0}, num{r.altFt, 0}, num{r.mach, 4}, num{r.satC, 2}, num{r.ffKgph, 1}, num{r.bankDeg, 1})
		if rec.fanSpeed {
			buf = append(buf, ',')
			if r.n1 > 0 {
				buf = strconv.AppendFloat(buf, r.n1, 'f', 2, 64)
			}
		}
		buf = append(buf, '\n')
		b.Write(buf)
	}
	return b.Bytes()
}
