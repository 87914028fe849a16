package pipeline

import (
	"math"

	"dragdeck/model"
)

// packed is a tail's points while its files are read: about 29 bytes a
// point where a model.TrendPoint takes 48, since every point of a fleet is
// held until the reading ends. The deviation and the expected fuel flow
// are kept as they are, the fuel-flow deviation as its difference from
// the deviation in a float32 (the two differ by the engine's share, a few
// per cent at most: back to within 1e-6 pp, far below any use of it), the
// engine deviation only where it is a number (a tail without fan speed
// has none), and the rest as bytes: per point one
// byte of flags, the change of time from the point before (a zigzag
// varint, in whole minutes or seconds where it is whole, as in most
// exports) and the change of flight id (a zigzag varint); the first point
// of each part's segment has its time and flight in full instead, so that
// a segment is packed where its part is analysed and merge only appends
// it. Each column is chunked (addChunked), so that nothing moves while the
// tail is read. unpack gives the points back exactly but for the
// fuel-flow deviation's rounding (a NaN stays a NaN).
type packed struct {
	dev, ffe, eng [][]float64
	ffd           [][]float32 // FuelFlowDevPct − DevPct
	meta          [][]byte
	n             int
}

// segment is one tail's points of one part, packed as they are analysed.
type segment struct {
	dev, ffe, eng []float64
	ffd           []float32
	meta          []byte
	n             int
	lastNs        int64
	lastFlight    model.FlightID
}

// The bits of a point's flags byte.
const (
	flagOutside   = 1 << 0 // OutsideTable
	flagEngine    = 1 << 1 // HasEngine
	flagEngValue  = 1 << 2 // EngineDevPct is a number, kept in eng
	flagSeconds   = 1 << 3 // the time's change is in whole seconds
	manoeuvreBits = 4      // Manoeuvre, in bits 4 and 5
	flagFull      = 1 << 6 // time and flight in full, not as changes
	flagMinutes   = 1 << 7 // the time's change is in whole minutes
)

// reset empties the segment, keeping its buffers.
func (s *segment) reset() {
	s.dev, s.ffe, s.ffd, s.eng, s.meta, s.n = s.dev[:0], s.ffe[:0], s.ffd[:0], s.eng[:0], s.meta[:0], 0
}

// add packs one point after those added before.
func (s *segment) add(p *model.TrendPoint) {
	flags := byte(p.Manoeuvre&3) << manoeuvreBits
	if p.OutsideTable {
		flags |= flagOutside
	}
	if p.HasEngine {
		flags |= flagEngine
	}
	if !math.IsNaN(p.EngineDevPct) {
		flags |= flagEngValue
		s.eng = append(s.eng, p.EngineDevPct)
	}
	d, f := p.UnixNano, int64(p.Flight)
	if s.n == 0 {
		flags |= flagFull
	} else {
		d = int64(uint64(p.UnixNano) - uint64(s.lastNs)) // wraps: exact both ways
		f -= int64(s.lastFlight)
	}
	switch {
	case d%60e9 == 0:
		flags |= flagMinutes
		d /= 60e9
	case d%1e9 == 0:
		flags |= flagSeconds
		d /= 1e9
	}
	s.meta = append(s.meta, flags)
	s.meta = appendZigzag(s.meta, d)
	s.meta = appendZigzag(s.meta, f)
	s.dev, s.ffe, s.ffd = append(s.dev, p.DevPct), append(s.ffe, p.FuelFlowExpected), append(s.ffd, float32(p.FuelFlowDevPct-ffdBase(p.DevPct)))
	s.lastNs, s.lastFlight = p.UnixNano, p.Flight
	s.n++
}

// add appends a segment's points after those added before.
func (pk *packed) add(s *segment) {
	pk.dev, pk.ffe, pk.ffd = addChunked(pk.dev, s.dev), addChunked(pk.ffe, s.ffe), addChunked(pk.ffd, s.ffd)
	if len(s.eng) > 0 {
		pk.eng = addChunked(pk.eng, s.eng)
	}
	pk.meta = addChunked(pk.meta, s.meta)
	pk.n += s.n
}

// appendZigzag appends v as a zigzag varint (small changes of either sign
// take one or two bytes).
func appendZigzag(b []byte, v int64) []byte {
	u := uint64(v<<1) ^ uint64(v>>63)
	for u >= 0x80 {
		b = append(b, byte(u)|0x80)
		u >>= 7
	}
	return append(b, byte(u))
}

// unpack appends the points to dst and lets the chunks go.
func (pk *packed) unpack(dst []model.TrendPoint) []model.TrendPoint {
	if pk == nil || pk.n == 0 {
		return dst
	}
	meta := chunkReader[byte]{cs: pk.meta}
	dev, ffe, ffd, eng := chunkReader[float64]{cs: pk.dev}, chunkReader[float64]{cs: pk.ffe}, chunkReader[float32]{cs: pk.ffd}, chunkReader[float64]{cs: pk.eng}
	var ns int64
	var flight model.FlightID
	for range pk.n {
		flags := meta.next()
		d := zigzag(&meta)
		switch {
		case flags&flagMinutes != 0:
			d *= 60e9
		case flags&flagSeconds != 0:
			d *= 1e9
		}
		f := zigzag(&meta)
		if flags&flagFull != 0 {
			ns, flight = d, model.FlightID(f)
		} else {
			ns, flight = int64(uint64(ns)+uint64(d)), model.FlightID(int64(flight)+f)
		}
		p := model.TrendPoint{UnixNano: ns, Flight: flight, DevPct: dev.next(), FuelFlowExpected: ffe.next(), EngineDevPct: math.NaN(),
			OutsideTable: flags&flagOutside != 0, HasEngine: flags&flagEngine != 0, Manoeuvre: model.Manoeuvre(flags>>manoeuvreBits) & 3}
		p.FuelFlowDevPct = ffdBase(p.DevPct) + float64(ffd.next())
		if flags&flagEngValue != 0 {
			p.EngineDevPct = eng.next()
		}
		dst = append(dst, p)
	}
	*pk = packed{}
	return dst
}

// ffdBase is what the fuel-flow deviation is kept as a difference from:
// the deviation, or 0 where that is not a number (so that a fuel-flow
// deviation beside it survives).
func ffdBase(dev float64) float64 {
	if math.IsNaN(dev) || math.IsInf(dev, 0) {
		return 0
	}
	return dev
}

// zigzag reads a zigzag varint.
func zigzag(r *chunkReader[byte]) int64 {
	var u uint64
	for s := uint(0); ; s += 7 {
		b := r.next()
		u |= uint64(b&0x7f) << s
		if b < 0x80 {
			break
		}
	}
	return int64(u>>1) ^ -int64(u&1)
}

// chunkReader reads the values of chunks in order, across their bounds.
type chunkReader[T any] struct {
	cs   [][]T
	c, i int
}

func (r *chunkReader[T]) next() T {
	for r.i >= len(r.cs[r.c]) {
		r.c, r.i = r.c+1, 0
	}
	v := r.cs[r.c][r.i]
	r.i++
	return v
}
