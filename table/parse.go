package table

import (
	"bytes"
	"math"
)

// blockSize is the size of the blocks a file is cut into for parsing.
const blockSize = 1 << 20

// cellRef is one cell kept for a message.
type cellRef struct {
	line  int
	value string
}

// keep is how many odd cells of each sort a column keeps for messages.
const keep = 5

// colText is what a block knows of one column beyond its numbers: its
// text and true/false cells.
type colText struct {
	text      []string // nil until the block's first text cell, then one per row ("" unless text)
	nText     int
	nBool     int
	firstText []cellRef
	firstBool []cellRef
	intern    map[string]string
}

// block is a span of the file, cut at a line break outside quoted fields,
// and what parsing it gave.
type block struct {
	data  []byte
	line  int // file line of data[0]
	off   int // index in the columns of the block's first row
	bound int // the block's rows are at most this many

	rows  int
	lines []int     // file line of each row
	text  []colText // nil unless a cell was not a number; then one per column
	err   error
}

// parser parses records from bytes; one per goroutine.
type parser struct {
	rd      *reader
	fields  [][]byte
	quoted  []byte // unescaped quoted fields
	scratch []byte
}

// nextRecord parses the record starting at data[pos] (not an empty line)
// and returns its fields, which share data or p.quoted until the next
// call, the position after it and the line after it. It returns a
// *CSVError for a malformed record.
func (p *parser) nextRecord(data []byte, pos, line int) ([][]byte, int, int, error) {
	p.fields = p.fields[:0]
	p.quoted = p.quoted[:0]
	comma := p.rd.comma
	var spans [][2]int // quoted fields, as spans of p.quoted, by field
	start := line
	for {
		if pos < len(data) && data[pos] == '"' {
			pos++
			from := len(p.quoted)
			for {
				i := bytes.IndexByte(data[pos:], '"')
				if i < 0 {
					return nil, 0, 0, &CSVError{Line: start, Column: len(p.fields) + 1, Err: badCSV("a quoted field is not closed")}
				}
				seg := data[pos : pos+i]
				for len(seg) > 0 {
					k := bytes.IndexByte(seg, '\n')
					if k < 0 {
						p.quoted = append(p.quoted, seg...)
						break
					}
					part := seg[:k]
					if len(part) > 0 && part[len(part)-1] == '\r' {
						part = part[:len(part)-1]
					}
					p.quoted = append(p.quoted, part...)
					p.quoted = append(p.quoted, '\n')
					line++
					seg = seg[k+1:]
				}
				pos += i + 1
				if len(p.quoted)-from > p.rd.o.MaxFieldBytes {
					return nil, 0, 0, &CSVError{Line: line, Column: len(p.fields) + 1, Err: badCSV("field longer than %d bytes", p.rd.o.MaxFieldBytes)}
				}
				if pos < len(data) && data[pos] == '"' {
					p.quoted = append(p.quoted, '"')
					pos++
					continue
				}
				break
			}
			spans = append(spans, [2]int{from, len(p.quoted)})
			p.fields = append(p.fields, nil) // filled by finish: p.quoted may move
			switch {
			case pos == len(data):
				return p.finish(spans), pos, line, nil
			case data[pos] == comma:
				pos++
				continue
			case data[pos] == '\n':
				return p.finish(spans), pos + 1, line + 1, nil
			case data[pos] == '\r' && pos+1 < len(data) && data[pos+1] == '\n':
				return p.finish(spans), pos + 2, line + 1, nil
			case data[pos] == '\r' && pos+1 == len(data):
				return p.finish(spans), pos + 1, line, nil
			}
			return nil, 0, 0, &CSVError{Line: line, Column: len(p.fields), Err: badCSV("extraneous or missing \" in a quoted field")}
		}
		end := len(data)
		if i := bytes.IndexByte(data[pos:], '\n'); i >= 0 {
			end = pos + i
		}
		rest := data[pos:end]
		if len(rest) > p.rd.maxLine {
			return nil, 0, 0, &CSVError{Line: line, Err: badCSV("line longer than %d bytes", p.rd.maxLine)}
		}
		k := bytes.IndexByte(rest, comma)
		if k >= 0 {
			rest = rest[:k]
		} else if len(rest) > 0 && rest[len(rest)-1] == '\r' {
			rest = rest[:len(rest)-1]
		}
		if bytes.IndexByte(rest, '"') >= 0 {
			return nil, 0, 0, &CSVError{Line: line, Column: len(p.fields) + 1, Err: badCSV("a quote inside a field that does not start with one")}
		}
		p.fields = append(p.fields, rest)
		spans = append(spans, [2]int{-1, -1})
		if k >= 0 {
			pos += k + 1
			continue
		}
		if end == len(data) {
			return p.finish(spans), end, line, nil
		}
		return p.finish(spans), end + 1, line + 1, nil
	}
}

// finish points the quoted fields at their unescaped text.
func (p *parser) finish(spans [][2]int) [][]byte {
	for j, s := range spans {
		if s[0] >= 0 {
			p.fields[j] = p.quoted[s[0]:s[1]]
		}
	}
	return p.fields
}

// parseBlock parses the rows of b into the columns cols, b's first row at
// index b.off.
func (p *parser) parseBlock(b *block, cols [][]float64) {
	rd := p.rd
	data, line := b.data, b.line
	ncol := len(cols)
	b.lines = make([]int, 0, b.bound)
	quotes := bytes.IndexByte(data, '"') >= 0
	fast := !rd.numCode
	row := b.off
	pos := 0
	for pos < len(data) {
		if k := blank(data, pos); k > 0 {
			pos += k
			line++
			continue
		}
		if fast && !quotes {
			next, err := p.fastRow(b, cols, row, data, pos, line)
			if err != nil {
				b.err = err
				return
			}
			b.lines = append(b.lines, line)
			row++
			pos = next
			line++
			continue
		}
		fields, next, nextLine, err := p.nextRecord(data, pos, line)
		if err != nil {
			b.err = err
			return
		}
		if len(fields) != ncol {
			b.err = fieldCount(line, len(fields), ncol)
			return
		}
		for j, f := range fields {
			x, err := p.cell(b, j, row-b.off, f, line)
			if err != nil {
				b.err = err
				return
			}
			cols[j][row] = x
		}
		b.lines = append(b.lines, line)
		row++
		pos, line = next, nextLine
	}
	b.rows = row - b.off
}

func fieldCount(line, got, want int) error {
	return &CSVError{Line: line, Err: badCSV("row has %d field(s), the header has %d", got, want)}
}

// fastRow parses the row without quotes that starts at data[pos], numbers
// read in place, and returns the position after its line break.
func (p *parser) fastRow(b *block, cols [][]float64, row int, data []byte, pos, line int) (int, error) {
	rd := p.rd
	comma, point := rd.comma, rd.point
	ncol := len(cols)
	start := pos
	for j := 0; ; j++ {
		x, n, ok := scanNumber(data[pos:], point)
		e := pos + n
		end := false
		if ok {
			switch {
			case e == len(data) || data[e] == '\n':
				end = true
			case data[e] == comma:
			case data[e] == '\r' && (e+1 == len(data) || data[e+1] == '\n'):
				end = true
			default:
				ok = false
			}
		}
		if !ok {
			// Not a plain number: find the field's end and read it as a
			// cell.
			e = pos
			for e < len(data) && data[e] != comma && data[e] != '\n' {
				e++
			}
			f := data[pos:e]
			if e == len(data) || data[e] == '\n' {
				end = true
				if len(f) > 0 && f[len(f)-1] == '\r' {
					f = f[:len(f)-1]
				}
			}
			if j < ncol {
				var err error
				if x, err = p.cell(b, j, row-b.off, f, line); err != nil {
					return 0, p.rowError(data, start, j, line, ncol, err)
				}
			}
		} else if e < len(data) && data[e] == '\r' {
			e++
		}
		if j < ncol {
			cols[j][row] = x
		}
		if end {
			if e-start > rd.maxLine {
				return 0, &CSVError{Line: line, Err: badCSV("line longer than %d bytes", rd.maxLine)}
			}
			if j+1 != ncol {
				return 0, fieldCount(line, j+1, ncol)
			}
			return e + 1, nil
		}
		pos = e + 1
	}
}

// rowError returns the error the general path gives for a row without
// quotes starting at data[start] in which field j failed with err: a line
// too long or a wrong number of fields come first.
func (p *parser) rowError(data []byte, start, j, line, ncol int, err error) error {
	end := bytes.IndexByte(data[start:], '\n')
	if end < 0 {
		end = len(data) - start
	}
	row := data[start : start+end]
	if len(row) > p.rd.maxLine {
		return &CSVError{Line: line, Err: badCSV("line longer than %d bytes", p.rd.maxLine)}
	}
	if n := bytes.Count(row, []byte{p.rd.comma}) + 1; n != ncol {
		return fieldCount(line, n, ncol)
	}
	return err
}

// cell reads field f of column j, row i of block b, and returns its
// value: NaN for a missing or text cell.
func (p *parser) cell(b *block, j, i int, f []byte, line int) (float64, error) {
	rd := p.rd
	if len(f) > rd.o.MaxFieldBytes {
		return 0, &CSVError{Line: line, Column: j + 1, Name: rd.names[j], Err: badCSV("field longer than %d bytes", rd.o.MaxFieldBytes)}
	}
	f = bytes.TrimSpace(f)
	x, class := classify(f, rd.codes, rd.point, &p.scratch)
	switch class {
	case missingCell:
		return math.NaN(), nil
	case numberCell:
		if math.IsInf(x, 0) {
			return 0, &CSVError{Line: line, Column: j + 1, Name: rd.names[j], Err: badData("%q is infinite", f)}
		}
		return x, nil
	}
	if b.text == nil {
		b.text = make([]colText, len(rd.names))
	}
	c := &b.text[j]
	if class == boolCell {
		c.addBool(f, line)
		return x, nil
	}
	c.addText(f, i, line, b.bound)
	return math.NaN(), nil
}

// cellClass is what a cell holds.
type cellClass uint8

const (
	missingCell cellClass = iota
	numberCell
	boolCell
	textCell
)

// classify reads a trimmed cell as every reader reads a cell written as
// text: missing when empty, NA, NaN, N/A or null (any case) or one of
// codes; else a number (possibly infinite) with the decimal separator
// point; else true or false (any case), as 1 or 0; else text.
func classify(f []byte, codes map[string]bool, point byte, scratch *[]byte) (float64, cellClass) {
	if len(f) == 0 || codes[string(f)] || missingWord(f) {
		return math.NaN(), missingCell
	}
	if x, ok := parseNumber(f, point, scratch); ok {
		return x, numberCell
	}
	if v, ok := boolWord(f); ok {
		return v, boolCell
	}
	return math.NaN(), textCell
}

// addBool counts a true or false cell f at the row with key k.
func (c *colText) addBool(f []byte, k int) {
	c.nBool++
	if len(c.firstBool) < keep {
		c.firstBool = append(c.firstBool, cellRef{k, string(f)})
	}
}

// addText stores text cell f as row i of the span, at the row with key
// k; a span's text column is made with room for bound rows.
func (c *colText) addText(f []byte, i, k, bound int) {
	c.nText++
	if c.text == nil {
		c.text = make([]string, 0, bound)
		c.intern = map[string]string{}
	}
	for len(c.text) < i {
		c.text = append(c.text, "")
	}
	s, ok := c.intern[string(f)]
	if !ok {
		s = string(f)
		c.intern[s] = s
	}
	if len(c.firstText) < keep {
		c.firstText = append(c.firstText, cellRef{k, s})
	}
	c.text = append(c.text, s)
}

// textAt returns the text cell of row i of the block in column j, or "".
func (b *block) textAt(j, i int) string {
	if b.text == nil || i >= len(b.text[j].text) {
		return ""
	}
	return b.text[j].text[i]
}

// missingWord reports whether a cell is NA, NaN, N/A or null (any case).
func missingWord(f []byte) bool {
	switch len(f) {
	case 2:
		return f[0]|0x20 == 'n' && f[1]|0x20 == 'a'
	case 3:
		return f[0]|0x20 == 'n' && (f[1]|0x20 == 'a' && f[2]|0x20 == 'n' || f[1] == '/' && f[2]|0x20 == 'a')
	case 4:
		return bytes.EqualFold(f, []byte("null"))
	}
	return false
}

// boolWord reads true and false (any case) as 1 and 0.
func boolWord(f []byte) (float64, bool) {
	switch {
	case bytes.EqualFold(f, []byte("true")):
		return 1, true
	case bytes.EqualFold(f, []byte("false")):
		return 0, true
	}
	return 0, false
}

// safeCut returns the index of the last line break in buf that is outside
// quoted fields, buf starting outside one, or -1.
func safeCut(buf []byte) int {
	cut, pos, in := -1, 0, false
	for {
		q := bytes.IndexByte(buf[pos:], '"')
		end := len(buf)
		if q >= 0 {
			end = pos + q
		}
		if !in {
			if i := bytes.LastIndexByte(buf[pos:end], '\n'); i >= 0 {
				cut = pos + i
			}
		}
		if q < 0 {
			return cut
		}
		in = !in
		pos = end + 1
	}
}

// blank returns the length of the empty line at data[pos] ("\n", "\r\n",
// or "\r" at the end), or 0.
func blank(data []byte, pos int) int {
	switch {
	case data[pos] == '\n':
		return 1
	case data[pos] == '\r' && pos+1 < len(data) && data[pos+1] == '\n':
		return 2
	case data[pos] == '\r' && pos+1 == len(data):
		return 1
	}
	return 0
}
