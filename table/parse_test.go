package table

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"strconv"
	"testing"
)

// records parses data with the reader's record parser, skipping empty
// lines as encoding/csv does.
func records(data []byte) ([][]string, error) {
	p := &parser{rd: &reader{comma: ',', o: CSVOptions{MaxFieldBytes: 1 << 20}, maxLine: 4 << 20}}
	var out [][]string
	pos, line := 0, 1
	for pos < len(data) {
		if k := blank(data, pos); k > 0 {
			pos, line = pos+k, line+1
			continue
		}
		fields, next, nextLine, err := p.nextRecord(data, pos, line)
		if err != nil {
			return nil, err
		}
		rec := make([]string, len(fields))
		for i, f := range fields {
			rec[i] = string(f)
		}
		out = append(out, rec)
		pos, line = next, nextLine
	}
	return out, nil
}

// FuzzRecords checks the record parser against the standard library's
// encoding/csv (RFC 4180, strict quotes): the same records and fields
// whenever encoding/csv accepts the input, and an error whenever it
// refuses it.
func FuzzRecords(f *testing.F) {
	for _, s := range []string{"a,b\n1,2\n", "\"a\nb\",c\r\n\r\n1,\"x\"\"y\"\n", "a,\"b\n", "a\"b,c\n", "\"a\"b\n", "x\r\ny\r", ",\n,,\n"} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, in []byte) {
		cr := csv.NewReader(bytes.NewReader(in))
		cr.FieldsPerRecord = -1
		var want [][]string
		var werr error
		for {
			rec, err := cr.Read()
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				werr = err
				break
			}
			want = append(want, rec)
		}
		got, err := records(in)
		if werr != nil {
			if err == nil {
				t.Fatalf("encoding/csv refuses %q (%v), we read %q", in, werr, got)
			}
			return
		}
		if err != nil {
			t.Fatalf("encoding/csv reads %q as %q, we fail: %v", in, want, err)
		}
		if len(got) != len(want) {
			t.Fatalf("%q: %d records, encoding/csv %d (%q vs %q)", in, len(got), len(want), got, want)
		}
		for i := range got {
			if len(got[i]) != len(want[i]) {
				t.Fatalf("%q record %d: %q, encoding/csv %q", in, i, got[i], want[i])
			}
			for k := range got[i] {
				if got[i][k] != want[i][k] {
					t.Fatalf("%q record %d: %q, encoding/csv %q", in, i, got[i], want[i])
				}
			}
		}
	})
}

// FuzzParseNumber checks that the number parser agrees exactly with
// strconv.ParseFloat, bit for bit, on whatever both accept.
func FuzzParseNumber(f *testing.F) {
	for _, s := range []string{"0", "-0", "12.3456", "1e5", ".5", "5.", "+3", "123456789012345678901", "9007199254740993",
		"1e22", "1e23", "4.9e-324", "1.7976931348623157e308", "0x1p-2", "Inf", "nan", "1_0", "1e", "-.e1", "0.1000000000000000055511151231257827"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		var scratch []byte
		got, ok := parseNumber([]byte(s), '.', &scratch)
		want, err := strconv.ParseFloat(s, 64)
		var ne *strconv.NumError
		if err != nil && !(errors.As(err, &ne) && ne.Err == strconv.ErrRange) {
			if ok {
				t.Fatalf("%q: read as %g, strconv refuses it", s, got)
			}
			return
		}
		if !ok {
			t.Fatalf("%q: refused, strconv reads %g", s, want)
		}
		if math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want)) {
			t.Fatalf("%q: %v (%x), strconv %v (%x)", s, got, math.Float64bits(got), want, math.Float64bits(want))
		}
	})
}

// TestScanNumberRandom compares the fast path with strconv.ParseFloat on
// decimal strings of every length up to 19 digits and exponents ±30.
func TestScanNumberRandom(t *testing.T) {
	var seed uint64 = 88172645463325252 // xorshift64 (Marsaglia 2003)
	next := func() uint64 { seed ^= seed << 13; seed ^= seed >> 7; seed ^= seed << 17; return seed }
	var scratch []byte
	for range 200_000 {
		digits := int(next()%19) + 1
		b := []byte{}
		if next()%2 == 0 {
			b = append(b, '-')
		}
		point := int(next() % uint64(digits+1))
		for k := range digits {
			if k == point {
				b = append(b, '.')
			}
			b = append(b, byte('0'+next()%10))
		}
		if next()%3 == 0 {
			b = strconv.AppendInt(append(b, 'e'), int64(next()%61)-30, 10)
		}
		got, ok := parseNumber(b, '.', &scratch)
		want, err := strconv.ParseFloat(string(b), 64)
		if err != nil || !ok || math.Float64bits(got) != math.Float64bits(want) {
			t.Fatalf("%s: %v %v, strconv %v %v", b, got, ok, want, err)
		}
	}
}

// BenchmarkScanNumber measures the number scanner on a typical cell.
func BenchmarkScanNumber(b *testing.B) {
	cell := []byte("-0.17644807")
	b.SetBytes(int64(len(cell)))
	var sum float64
	for range b.N {
		x, _, _ := scanNumber(cell, '.')
		sum += x
	}
	if sum == 1 {
		b.Log(sum)
	}
}
