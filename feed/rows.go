package feed

import (
	"bytes"
	"errors"
	"io"
	"os"
	"slices"
)

// ReadRows reads again the rows of a snapshot file that start at the given
// byte offsets (Record.Offset), as they were read the first time, with
// their lines: a replay's records, read back on demand rather than kept
// in memory. The stretch of the file from the first offset to the last is
// decoded with the file's header; where the file changes its layout (a
// header line inside it, simple = false) the whole file is read as
// ReadFileWith reads it. The records come in file order; offsets that
// hold no accepted row are left out.
func ReadRows(path string, offsets []int64, simple bool, opt ReadOptions) ([]Record, error) {
	if len(offsets) == 0 {
		return nil, nil
	}
	want := make(map[int64]bool, len(offsets))
	for _, o := range offsets {
		want[o] = true
	}
	var out []Record
	keep := func(r Record) {
		if want[r.Offset] {
			out = append(out, r)
		}
	}
	whole := func() ([]Record, error) {
		out = out[:0]
		res := ReadFileWith(path, opt, keep, nil)
		return out, res.Err
	}
	if !simple {
		return whole()
	}
	f, err := OpenRegular(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	hdr, bodyStart, _, ok := readHeader(f, path, opt.Layout)
	from, to := slices.Min(offsets), slices.Max(offsets)
	if !ok || from < bodyStart {
		return whole()
	}
	lines, err := countLines(f, from)
	if err != nil {
		return nil, err
	}
	fi, err := f.Stat()
	if err != nil {
		return nil, err
	}
	r := NewReader(io.NewSectionReader(f, from, fi.Size()-from), path)
	r.d = partDecoder(path, hdr, opt)
	r.d.stopAtHeader = true
	r.base, r.offBase = lines, from
	for {
		rec, err := r.Next()
		if err == nil {
			keep(rec)
			if rec.Offset >= to {
				break
			}
			continue
		}
		var re *RowError
		if errors.As(err, &re) {
			continue
		}
		if errors.Is(err, errHeaderInPart) {
			return whole() // a new layout inside the stretch
		}
		if err != io.EOF {
			return nil, err
		}
		break
	}
	return out, nil
}

// countLines counts the line ends in the first n bytes of f.
func countLines(f *os.File, n int64) (int, error) {
	buf := make([]byte, 256<<10)
	lines := 0
	for off := int64(0); off < n; {
		k, err := f.ReadAt(buf[:min(int64(len(buf)), n-off)], off)
		lines += bytes.Count(buf[:k], []byte{'\n'})
		off += int64(k)
		if err != nil && off < n {
			return 0, err
		}
	}
	return lines, nil
}
