package table

import (
	"bytes"
	"errors"
	"io"
	"io/fs"
	"sync"
	"sync/atomic"
)

// source reads the input into buffers.
type source struct {
	r    io.Reader
	size int64 // total bytes when the reader tells it, else -1
	eof  bool
	err  error
}

// sizeOf returns the bytes r will yield when it says so (a file, or a
// reader of bytes or strings), else -1.
func sizeOf(r io.Reader) int64 {
	switch s := r.(type) {
	case interface{ Len() int }:
		return int64(s.Len())
	case interface{ Stat() (fs.FileInfo, error) }:
		if fi, err := s.Stat(); err == nil && fi.Mode().IsRegular() {
			return fi.Size()
		}
	}
	return -1
}

// fill reads into buf until it holds want bytes or the input ends, and
// returns it.
func (s *source) fill(buf []byte, want int) []byte {
	if cap(buf) < want {
		buf = append(make([]byte, 0, want), buf...)
	}
	for !s.eof && len(buf) < want {
		n, err := s.r.Read(buf[len(buf):want])
		buf = buf[:len(buf)+n]
		if errors.Is(err, io.EOF) {
			s.eof = true
		} else if err != nil {
			s.err, s.eof = err, true
		}
	}
	return buf
}

// stream cuts the input, starting with the bytes head (read bytes so far
// in all), into blocks that end at line breaks outside quoted fields and
// parses them on the reader's workers into one column per variable. Each
// block's rows go to the places of its line breaks, counted before it is
// parsed, so blocks are parsed in any order; the columns hold gaps where
// lines are blank or break inside quotes. Input buffers are reused, and
// the columns are sized from the input's length when it is known, so
// that memory is touched about once. Parsing stops early after an error
// or once more than MaxRows rows are read.
func (rd *reader) stream(src *source, head []byte, line int, read int64) ([]*block, [][]float64, error) {
	type job struct {
		b    *block
		cols [][]float64
	}
	var (
		blocks   []*block
		inflight sync.WaitGroup
		stop     atomic.Bool
		rows     atomic.Int64
	)
	free := make(chan []byte, rd.workers+2)
	jobs := make(chan job)
	var workers sync.WaitGroup
	for range rd.workers {
		workers.Go(func() {
			p := &parser{rd: rd}
			for jb := range jobs {
				p.parseBlock(jb.b, jb.cols)
				if jb.b.err != nil {
					stop.Store(true)
				}
				if rd.o.MaxRows > 0 && rows.Add(int64(jb.b.rows)) > int64(rd.o.MaxRows) {
					stop.Store(true)
				}
				select {
				case free <- jb.b.data[:0]:
				default:
				}
				jb.b.data = nil
				inflight.Done()
			}
		})
	}
	var cols [][]float64
	off := 0
	hdr := read - int64(len(head)) // bytes of the header
	var done int64                 // bytes of the blocks cut so far
	buf := head
	want := blockSize
	for !stop.Load() {
		buf = src.fill(buf, want)
		if len(buf) == 0 {
			break
		}
		cut := len(buf) - 1
		if !src.eof {
			if cut = safeCut(buf); cut < 0 {
				if len(buf) <= rd.maxLine+blockSize {
					want = 2 * len(buf)
					continue
				}
				// A record this long is malformed or over the limits:
				// parsed as it is, the block fails with the right error.
				cut = len(buf) - 1
			}
		}
		want = blockSize
		data := buf[:cut+1]
		done += int64(len(data))
		b := &block{data: data, line: line, off: off}
		breaks := bytes.Count(data, []byte{'\n'})
		b.bound = breaks
		if data[len(data)-1] != '\n' {
			b.bound++
		}
		if cols == nil || off+b.bound > len(cols[0]) {
			inflight.Wait()
			cols = rd.grow(cols, off+b.bound, done, src.size-hdr)
		}
		blocks = append(blocks, b)
		inflight.Add(1)
		jobs <- job{b, cols}
		off += b.bound
		line += breaks
		var next []byte
		select {
		case next = <-free:
		default:
			next = make([]byte, 0, blockSize)
		}
		buf = append(next, buf[cut+1:]...)
		if src.eof && len(buf) == 0 {
			break
		}
	}
	close(jobs)
	workers.Wait()
	if src.err != nil {
		return nil, nil, src.err
	}
	if cols == nil {
		cols = make([][]float64, len(rd.names))
	}
	return blocks, cols, nil
}

// grow returns columns that can hold need rows, keeping the rows of
// cols: sized to the whole input when its length is known (the rows of
// the done bytes so far, scaled to all size bytes, with 5% to spare), else
// doubled.
func (rd *reader) grow(cols [][]float64, need int, done, size int64) [][]float64 {
	n := 2 * need
	if size > 0 && done > 0 {
		if est := int(float64(size)/float64(done)*float64(need)*1.05) + 64; est > need {
			n = est
		}
	}
	old := 0
	if cols != nil {
		old = len(cols[0])
		n = max(n, 2*old)
	}
	out := make([][]float64, len(rd.names))
	for j := range out {
		out[j] = make([]float64, n)
		if cols != nil {
			copy(out[j], cols[j][:old])
		}
	}
	return out
}
