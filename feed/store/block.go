package store

import (
	"encoding/binary"
	"errors"
	"math"

	"dragdeck/feed"
)

// A block is up to blockSize snapshots of one tail, in the order they were
// imported, packed into one BLOB: a row per snapshot would make an import
// of a million snapshots a million B-tree inserts (about 15 s here); a row
// per block makes it a thousand. Each snapshot keeps its file and line.
//
// Layout (little-endian; uvarint is encoding/binary's):
//
//	uvarint n; uvarint flights, each uvarint length + bytes; uvarint files, likewise;
//	n × { int64 time (Unix ns), uvarint flight index, uvarint file index,
//	      uvarint line, uvarint samples,
//	      10 × float64: weight, altitude, mach, sat, fuel flow, bank, vs, accel, n1, seconds }
const blockSize = 1024

var errBlock = errors.New("damaged snapshot block")

// encodeBlock packs records of one tail.
func encodeBlock(recs []feed.Record) []byte {
	flights, files := map[string]int{}, map[string]int{}
	var flightNames, fileNames []string
	index := func(m map[string]int, names *[]string, s string) int {
		i, ok := m[s]
		if !ok {
			i = len(*names)
			m[s] = i
			*names = append(*names, s)
		}
		return i
	}
	for _, r := range recs {
		index(flights, &flightNames, r.Flight)
		index(files, &fileNames, r.File)
	}
	b := make([]byte, 0, 16+len(recs)*96)
	b = binary.AppendUvarint(b, uint64(len(recs)))
	for _, names := range [][]string{flightNames, fileNames} {
		b = binary.AppendUvarint(b, uint64(len(names)))
		for _, s := range names {
			b = binary.AppendUvarint(b, uint64(len(s)))
			b = append(b, s...)
		}
	}
	for _, r := range recs {
		s := r.Snap
		b = binary.LittleEndian.AppendUint64(b, uint64(r.Time.UnixNano()))
		b = binary.AppendUvarint(b, uint64(flights[r.Flight]))
		b = binary.AppendUvarint(b, uint64(files[r.File]))
		b = binary.AppendUvarint(b, uint64(max(r.Line, 0)))
		b = binary.AppendUvarint(b, uint64(max(r.Samples, 0)))
		for _, v := range [...]float64{s.Weight, s.Altitude, s.Mach, s.SAT, s.FuelFlow, s.Bank, s.VS, s.Accel, s.N1, r.Seconds} {
			b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
		}
	}
	return b
}

// decodeBlock unpacks a block of tail, calling fn for each record.
func decodeBlock(tail string, b []byte, fn func(feed.Record)) error {
	d := decoder{b: b}
	n := d.uvarint()
	var names [2][]string
	for k := range names {
		m := d.uvarint()
		if m > uint64(len(b)) {
			return errBlock
		}
		for i := uint64(0); i < m; i++ {
			names[k] = append(names[k], d.str())
		}
	}
	if d.err || n > uint64(len(b)) {
		return errBlock
	}
	for i := uint64(0); i < n; i++ {
		var r feed.Record
		r.Tail = tail
		r.Time = unixTime(int64(d.u64()))
		fl, fi := d.uvarint(), d.uvarint()
		r.Line, r.Samples = int(d.uvarint()), int(d.uvarint())
		s := &r.Snap
		for _, p := range [...]*float64{&s.Weight, &s.Altitude, &s.Mach, &s.SAT, &s.FuelFlow, &s.Bank, &s.VS, &s.Accel, &s.N1, &r.Seconds} {
			*p = math.Float64frombits(d.u64())
		}
		if d.err || fl >= uint64(len(names[0])) || fi >= uint64(len(names[1])) {
			return errBlock
		}
		r.Flight, r.File = names[0][fl], names[1][fi]
		fn(r)
	}
	if len(d.b) != 0 {
		return errBlock
	}
	return nil
}

// decoder reads a block, remembering the first error.
type decoder struct {
	b   []byte
	err bool
}

func (d *decoder) uvarint() uint64 {
	v, k := binary.Uvarint(d.b)
	if k <= 0 {
		d.err, d.b = true, nil
		return 0
	}
	d.b = d.b[k:]
	return v
}

func (d *decoder) u64() uint64 {
	if len(d.b) < 8 {
		d.err, d.b = true, nil
		return 0
	}
	v := binary.LittleEndian.Uint64(d.b)
	d.b = d.b[8:]
	return v
}

func (d *decoder) str() string {
	n := d.uvarint()
	if n > uint64(len(d.b)) {
		d.err, d.b = true, nil
		return ""
	}
	s := string(d.b[:n])
	d.b = d.b[n:]
	return s
}
