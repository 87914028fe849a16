package pipeline

import (
	"math"

	"dragdeck/model"
)

// packed is a tail's points while its files are read: about 26 bytes a
// point where a model.TrendPoint takes 40, since every point of a fleet is
// held until the reading ends. The deviation and the expected fuel flow are
// kept as they are, the engine deviation only where it is a number (a
// tail without fan speed has none), and the rest as bytes: per point one
// byte of flags, the change of time from the point before (a zigzag
// varint, in whole seconds where it is whole, as in most exports) and the
// change of flight id (a zigzag varint). Each column is chunked
// (addChunked), so that nothing moves while the tail is read. unpack gives
// the points back exactly (a NaN stays a NaN).
type packed struct {
	dev, ffe, eng [][]float64
	meta          [][]byte
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
)

// packScratch is the columns of the points being packed, reused.
type packScratch struct {
	dev, ffe, eng []float64
	meta          []byte
}

// add packs pts after the points added before, with sc's buffers.
func (pk *packed) add(pts []model.TrendPoint, sc *packScratch) {
	sc.dev, sc.ffe, sc.eng, sc.meta = sc.dev[:0], sc.ffe[:0], sc.eng[:0], sc.meta[:0]
	for i := range pts {
		p := &pts[i]
		flags := byte(p.Manoeuvre&3) << manoeuvreBits
		if p.OutsideTable {
			flags |= flagOutside
		}
		if p.HasEngine {
			flags |= flagEngine
		}
		if !math.IsNaN(p.EngineDevPct) {
			flags |= flagEngValue
			sc.eng = append(sc.eng, p.EngineDevPct)
		}
		d := int64(uint64(p.UnixNano) - uint64(pk.lastNs)) // wraps: exact both ways
		if d%1e9 == 0 {
			flags |= flagSeconds
			d /= 1e9
		}
		sc.meta = append(sc.meta, flags)
		sc.meta = appendZigzag(sc.meta, d)
		sc.meta = appendZigzag(sc.meta, int64(p.Flight)-int64(pk.lastFlight))
		sc.dev, sc.ffe = append(sc.dev, p.DevPct), append(sc.ffe, p.FuelFlowExpected)
		pk.lastNs, pk.lastFlight = p.UnixNano, p.Flight
	}
	pk.dev, pk.ffe = addChunked(pk.dev, sc.dev), addChunked(pk.ffe, sc.ffe)
	if len(sc.eng) > 0 {
		pk.eng = addChunked(pk.eng, sc.eng)
	}
	pk.meta = addChunked(pk.meta, sc.meta)
	pk.n += len(pts)
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
	dev, ffe, eng := chunkReader[float64]{cs: pk.dev}, chunkReader[float64]{cs: pk.ffe}, chunkReader[float64]{cs: pk.eng}
	var ns int64
	var flight model.FlightID
	for range pk.n {
		flags := meta.next()
		d := zigzag(&meta)
		if flags&flagSeconds != 0 {
			d *= 1e9
		}
		ns = int64(uint64(ns) + uint64(d))
		flight = model.FlightID(int64(flight) + zigzag(&meta))
		p := model.TrendPoint{UnixNano: ns, Flight: flight, DevPct: dev.next(), FuelFlowExpected: ffe.next(), EngineDevPct: math.NaN(),
			OutsideTable: flags&flagOutside != 0, HasEngine: flags&flagEngine != 0, Manoeuvre: model.Manoeuvre(flags>>manoeuvreBits) & 3}
		if flags&flagEngValue != 0 {
			p.EngineDevPct = eng.next()
		}
		dst = append(dst, p)
	}
	*pk = packed{}
	return dst
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
