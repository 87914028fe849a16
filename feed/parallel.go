package feed

import (
	"bufio"
	"bytes"
	"errors"
	"io"
	"os"
	"sync"
	"sync/atomic"
)

// Sizes of the parts a file is cut into for ReadFileParallel: parts of
// partBytes, or a partsPerFile-th of a larger file up to maxPartBytes (a
// part's points are filed tail by tail: the more tails a file has, the
// more rows a part needs for its tails' share to be worth filing);
// smaller files are read by one decoder.
var (
	partBytes    int64 = 1 << 20
	maxPartBytes int64 = 8 << 20
	minParallel  int64 = 4 << 20
	headerWindow       = 2*maxLine + 64<<10 // where the header must be found
)

// partsPerFile is how many parts a large file is cut into: enough for the
// cores to finish together (the last part is the only one alone).
const partsPerFile = 128

// partSize is the size of the parts of a file of size bytes.
func partSize(size int64) int64 {
	return max(partBytes, min(maxPartBytes, size/partsPerFile))
}

// part is one stretch of a file, [start, end) at line ends, and what its
// decoder found in it, with lines counted from the part's start.
type part struct {
	start, end int64
	recs       []Record
	rejects    []*RowError
	stats      Stats
	lines      int
	headerAt   bool     // it holds a header line: read again from its start, in order
	err        error    // an I/O error
	sink       PartSink // takes its records as they are decoded (ReadFileParts)
	merge      func()   // what the sink made of them, to hand on (ReadFileParts)
	done       chan struct{}
}

// ReadFileParallel is ReadFileWith with several decoders at once: after
// its header, the file is cut into parts at line ends (a field never spans
// lines, so a line end is always a row's end), each decoded by one of
// workers goroutines, and the records and rejects are handed to accept and
// reject in file order, on the caller's goroutine, with the file's own line
// numbers, the same as ReadFileWith gives (rejects after the records of
// their part). A header line inside the file (a new layout) is met in its
// part; the file is then read on from that part's start by one decoder, as
// ReadFileWith reads it. A small file, or workers < 2, is read by
// ReadFileWith.
func ReadFileParallel(path string, opt ReadOptions, workers int, accept func(Record), reject func(*RowError)) FileResult {
	return readParts(path, opt, workers, nil, accept, reject)
}

// A PartSink takes the records of one part of a file (ReadFileParts) as
// they are decoded, a few hundred at a time, so that they are worked on
// while they are still in the processor's cache.
type PartSink interface {
	// Add is given the next records of the part, in file order, on the
	// goroutine that decodes it; the slice is reused once Add returns.
	Add(recs []Record)
	// Done is called on that goroutine once the part is decoded; the
	// function it returns hands the sink's result on, in file order, on
	// the caller's goroutine. A part that must be read again (a header
	// line inside it) or could not be read has its sink dropped instead,
	// without Done.
	Done() func()
}

// ReadFileParts is ReadFileParallel for a caller that works on the records
// itself in parallel: newSink gives a sink for each part of the file,
// which takes the part's records on the goroutine that decodes them (a
// few thousand in all, in file order) while other parts are decoded; what
// its Done returns is called in file order on the caller's goroutine,
// between the rejects of the parts before and after, to hand its result
// on. Within a sink a record's Line counts from the start of its part (its
// Offset is the file's). Where the file is read by one decoder (a small
// file, workers < 2, after a header line inside the file), a sink takes
// batchRecords records at a time on the caller's goroutine, with the
// file's own lines, and its Done and what that returns are called at once.
func ReadFileParts(path string, opt ReadOptions, workers int, newSink func() PartSink, reject func(*RowError)) FileResult {
	var batch []Record
	flush := func() {
		if len(batch) > 0 {
			s := newSink()
			s.Add(batch)
			s.Done()()
			batch = batch[:0]
		}
	}
	accept := func(r Record) {
		if batch == nil {
			batch = make([]Record, 0, batchRecords)
		}
		batch = append(batch, r)
		if len(batch) == batchRecords {
			flush()
		}
	}
	rejectInOrder := func(e *RowError) { // the records before a reject are handed on first
		flush()
		if reject != nil {
			reject(e)
		}
	}
	res := readParts(path, opt, workers, newSink, accept, rejectInOrder)
	flush()
	return res
}

// sinkBatch is how many records a worker decodes before it hands them to
// the part's sink: 256 records of about 180 bytes stay in the cache.
const sinkBatch = 256

// batchRecords is how many records ReadFileParts gives work at a time
// where one decoder reads.
const batchRecords = 4096

// readParts reads path by parts, as ReadFileParallel and ReadFileParts do:
// with newSink nil, every record goes to accept in order; else the records
// of each part go to a sink of its own on their goroutine, and the records
// read by one decoder go to accept.
func readParts(path string, opt ReadOptions, workers int, newSink func() PartSink, accept func(Record), reject func(*RowError)) FileResult {
	fi, err := os.Stat(path)
	if workers < 2 || err != nil || !fi.Mode().IsRegular() || fi.Size() < minParallel {
		return ReadFileWith(path, opt, accept, reject)
	}
	f, err := OpenRegular(path)
	if err != nil {
		return ReadFileWith(path, opt, accept, reject) // says why, as for any file
	}
	defer f.Close()
	hdr, bodyStart, hdrLines, ok := readHeader(f, path, opt.Layout)
	if !ok {
		return ReadFileWith(path, opt, accept, reject)
	}
	size := fi.Size()
	parts := cutParts(f, bodyStart, size)
	res := FileResult{Path: path, Unknown: hdr.unknown, Mapping: hdr.Describe()}

	// At most 2 × workers parts are decoded ahead of the one handed on,
	// so that memory stays with a few parts whatever the file's size.
	var next atomic.Int64
	slots := make(chan struct{}, 2*workers)
	free := make(chan []Record, 2*workers+1) // the record buffers of parts handed on, for later parts
	quit := make(chan struct{})
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var pr partReader
			for {
				select {
				case slots <- struct{}{}:
				case <-quit:
					return
				}
				k := int(next.Add(1) - 1)
				select {
				case <-quit:
					return
				default:
				}
				if k >= len(parts) {
					return
				}
				if newSink != nil {
					parts[k].sink = newSink()
				} else {
					select {
					case parts[k].recs = <-free:
					default:
						parts[k].recs = make([]Record, 0, (parts[k].end-parts[k].start)/40+16)
					}
				}
				decodePart(f, path, hdr, opt, parts[k], &pr)
				if parts[k].sink != nil && parts[k].err == nil && !parts[k].headerAt {
					parts[k].merge = parts[k].sink.Done()
				}
				parts[k].sink = nil
				close(parts[k].done)
			}
		}()
	}
	defer wg.Wait()
	defer close(quit)
	line := hdrLines
	for k, p := range parts {
		<-p.done
		<-slots
		if p.err != nil {
			res.Err = p.err
			break
		}
		if p.headerAt {
			// From here on one decoder, in order, as ReadFileWith reads.
			rest := readFrom(f, path, hdr, opt, p.start, size, line, accept, reject)
			res.Stats.Add(rest.Stats)
			res.Notices, res.Err = rest.Notices, rest.Err
			break
		}
		if p.merge != nil {
			p.merge()
		} else {
			for i := range p.recs {
				p.recs[i].Line += line
				if accept != nil {
					accept(p.recs[i])
				}
			}
		}
		for _, e := range p.rejects {
			e.Line += line
			if reject != nil {
				reject(e)
			}
		}
		res.Stats.Add(p.stats)
		line += p.lines
		if p.recs != nil {
			select {
			case free <- p.recs[:0]:
			default:
			}
		}
		parts[k].recs, parts[k].rejects, parts[k].merge = nil, nil, nil
	}
	return res
}

// readHeader reads the file's first lines up to its header, with one
// decoder, and returns the header, where the body starts and how many
// lines the header and what came before it took; false when there is no
// usable header in the first headerWindow bytes (ReadFileWith then says
// why).
func readHeader(f *os.File, path string, l *Layout) (*header, int64, int, bool) {
	buf := make([]byte, headerWindow)
	n, err := f.ReadAt(buf, 0)
	if err != nil && err != io.EOF {
		return nil, 0, 0, false
	}
	buf = buf[:n]
	d := NewDecoder(path)
	d.SetLayout(l)
	off, line := 0, 0
	for off < len(buf) {
		i := bytes.IndexByte(buf[off:], '\n')
		if i < 0 {
			return nil, 0, 0, false
		}
		line++
		if _, _, err := d.Line(buf[off:off+i], line); err != nil {
			return nil, 0, 0, false
		}
		off += i + 1
		if d.hdr != nil {
			return d.hdr, int64(off), line, true
		}
	}
	return nil, 0, 0, false
}

// cutParts cuts [from, size) into parts of about partSize, each ending
// just after a line end (or at the end of the file).
func cutParts(f *os.File, from, size int64) []*part {
	var parts []*part
	buf := make([]byte, 64<<10)
	for start := from; start < size; {
		end := start + partSize(size)
		if end >= size {
			end = size
		} else {
			// on to the next line end
			for {
				n, err := f.ReadAt(buf, end)
				if i := bytes.IndexByte(buf[:n], '\n'); i >= 0 {
					end += int64(i) + 1
					break
				}
				end += int64(n)
				if err != nil || end >= size {
					end = size
					break
				}
			}
		}
		parts = append(parts, &part{start: start, end: end, done: make(chan struct{})})
		start = end
	}
	return parts
}

// partDecoder is a decoder that starts with the file's header.
func partDecoder(path string, hdr *header, opt ReadOptions) *Decoder {
	d := NewDecoder(path)
	d.hdr, d.first, d.sep = hdr, false, hdr.sep
	d.layout = opt.Layout
	d.CheckTail = opt.CheckTail
	return d
}

// partReader is a worker's reader of parts: its decoder keeps the names
// it has interned and its buffers from one part to the next.
type partReader struct {
	d     *Decoder
	br    *bufio.Reader
	batch []Record // the records not yet given to the part's sink
}

// decodePart reads one part with the worker's decoder, lines counted from
// the part's start.
func decodePart(f *os.File, path string, hdr *header, opt ReadOptions, p *part, pr *partReader) {
	var src io.Reader = io.NewSectionReader(f, p.start, p.end-p.start)
	if opt.Progress != nil {
		src = countingReader{src, opt.Progress}
	}
	if pr.d == nil {
		pr.d = partDecoder(path, hdr, opt)
		pr.d.stopAtHeader = true
		pr.br = bufio.NewReaderSize(src, 64<<10)
	} else {
		pr.br.Reset(src)
	}
	pr.d.stats = Stats{} // counted per part
	r := &Reader{d: pr.d, br: pr.br}
	r.offBase = p.start
	// Each record is decoded into the next slot of the buffer it goes in
	// (the part's records, or the batch for the sink), not copied there.
	buf := &p.recs
	if p.sink != nil {
		if pr.batch == nil {
			pr.batch = make([]Record, 0, sinkBatch)
		}
		buf = &pr.batch
	}
	used := true // the last slot holds an accepted record, or there is none
	slot := func() *Record {
		if used {
			if b := *buf; len(b) < cap(b) {
				*buf = b[:len(b)+1] // the decoder writes every field of an accepted record
			} else {
				*buf = append(b, Record{})
			}
			used = false
		}
		return &(*buf)[len(*buf)-1]
	}
	accept := func() {
		used = true
		if p.sink != nil && len(pr.batch) == sinkBatch {
			p.sink.Add(pr.batch)
			pr.batch = pr.batch[:0]
		}
	}
	err := r.eachInto(slot, accept, func(e *RowError) { p.rejects = append(p.rejects, e) })
	if !used {
		*buf = (*buf)[:len(*buf)-1] // the slot that the end of the part left empty
	}
	if p.sink != nil && len(pr.batch) > 0 {
		p.sink.Add(pr.batch)
	}
	pr.batch = pr.batch[:0]
	switch {
	case errors.Is(err, errHeaderInPart):
		p.headerAt = true
	case err != nil:
		p.err = err
	}
	p.stats, p.lines = r.Stats(), r.line
}

// readFrom reads [from, size) with one decoder that starts with hdr, in
// order, lines counted after base, as ReadFileWith reads a whole file.
func readFrom(f *os.File, path string, hdr *header, opt ReadOptions, from, size int64, base int, accept func(Record), reject func(*RowError)) FileResult {
	res := FileResult{Path: path}
	var src io.Reader = io.NewSectionReader(f, from, size-from)
	if opt.Progress != nil {
		src = countingReader{src, opt.Progress}
	}
	r := NewReader(src, path)
	r.d = partDecoder(path, hdr, opt)
	r.base, r.offBase = base, from
	r.d.Notice = func(s string) {
		if len(res.Notices) < maxNotices {
			res.Notices = append(res.Notices, s)
		}
	}
	res.Err = r.each(accept, reject)
	res.Stats = r.Stats()
	return res
}
