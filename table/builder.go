package table

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// ReadOptions bounds and tunes the readers of typed sources: ReadRows
// (a database result) and the Parquet reader of package parquetfile.
// Its fields mean what the CSVOptions fields of the same names mean, with
// the same defaults; the zero value, or nil, gives them.
type ReadOptions struct {
	// MissingCodes lists text cells that mark a missing value besides
	// NULL (a null cell) and the empty text, NA, NaN, N/A and null (any
	// case); they are matched exactly, after surrounding spaces are
	// trimmed, in text columns.
	MissingCodes []string
	// Reference maps a binary or categorical text column to its reference
	// level.
	Reference map[string]string
	// CodedOne maps a binary text column to the level coded 1.
	CodedOne map[string]string
	// AsIs lists columns read as they are, without the checks for odd
	// cells.
	AsIs []string
	// MaxFieldBytes bounds one text cell and one column name; zero means
	// 1 MiB.
	MaxFieldBytes int
	// MaxColumns bounds the number of columns; zero means 10,000.
	MaxColumns int
	// MaxLevels bounds the distinct values of a text column; zero means 50.
	MaxLevels int
	// MaxRows bounds the number of rows; zero means no bound.
	MaxRows int
}

// SourceError reports a problem at a row and column of a source other
// than a CSV file: a database result, or a Parquet file or one of its
// parts. It carries the same facts and fixes as a CSVError.
type SourceError struct {
	// At names the row as messages do: "result row 11", or "row 11 of
	// part-0003.parquet"; "" when the problem concerns no one row.
	At     string
	Row    int    // 1-based row of the result or of Part; 0 when not about one row
	Part   string // the file of a source read from files, when known
	Column int    // 1-based column, 0 when not about one column
	Name   string // the column's name, when known
	Err    error
	// Fixes lists the options that would resolve the problem, as for a
	// CSVError; correcting the source is always another way.
	Fixes []Fix
}

// Error implements the error interface; fixes are written as ReadOptions
// settings.
func (e *SourceError) Error() string {
	return "table: " + e.Describe(func(f Fix) string { return optionFix("ReadOptions", f) })
}

// Describe returns the message without the package prefix, writing each
// fix with option.
func (e *SourceError) Describe(option func(Fix) string) string {
	var b strings.Builder
	var where []string
	if e.At != "" {
		where = append(where, e.At)
	} else if e.Part != "" {
		where = append(where, e.Part)
	}
	switch {
	case e.Column > 0 && e.Name != "":
		where = append(where, fmt.Sprintf("column %d (%q)", e.Column, e.Name))
	case e.Column > 0:
		where = append(where, fmt.Sprintf("column %d", e.Column))
	}
	if len(where) > 0 {
		b.WriteString(strings.Join(where, ", ") + ": ")
	}
	fmt.Fprint(&b, e.Err)
	writeFixes(&b, e.Fixes, e.Column > 0, "correct the source", option)
	return b.String()
}

// Unwrap returns the underlying error.
func (e *SourceError) Unwrap() error { return e.Err }

// Builder builds a Dataset from cells of known type — numbers, truth
// values, text and missing values — fed column by column, and decides
// each column's kind, levels, coding and odd cells in the one place
// ReadCSV does, with the same limits and messages. ReadRows and package
// parquetfile use it; a reader of another source can too.
//
// Cells may be fed in any order of columns, but each column's cells in
// row order; every column must receive the same number of cells before
// Dataset is called. A Builder is not safe for concurrent use.
type Builder struct {
	names    []string
	rules    rules
	codes    map[string]bool
	maxField int
	maxRows  int
	word     string
	parts    []part
	cols     []buildColumn
	scratch  []byte
}

// part is a file of a source read from several, from its first row.
type part struct {
	name  string
	first int
}

// buildColumn is one column being built.
type buildColumn struct {
	x []float64
	t colText
}

// NewBuilder returns a Builder for the columns names. word names a row in
// messages ("result row" for a database result, "row" for a file read in
// parts). It returns a *SourceError for too many columns, an empty,
// duplicate or over-long name, and an error when opts names a column that
// is not among names.
func NewBuilder(names []string, opts *ReadOptions, word string) (*Builder, error) {
	var o ReadOptions
	if opts != nil {
		o = *opts
	}
	if o.MaxFieldBytes <= 0 {
		o.MaxFieldBytes = 1 << 20
	}
	if o.MaxColumns <= 0 {
		o.MaxColumns = 10_000
	}
	if o.MaxLevels <= 0 {
		o.MaxLevels = 50
	}
	if j, dup, err := checkNames(names, o.MaxColumns, o.MaxFieldBytes, ErrData); err != nil {
		e := &SourceError{Column: j, Err: err}
		if dup {
			e.Name = names[j-1]
		}
		return nil, e
	}
	if err := checkOptionNames(names, "ReadOptions", "the source", o.Reference, o.CodedOne, o.AsIs, ErrData); err != nil {
		return nil, err
	}
	b := &Builder{
		names:    append([]string(nil), names...),
		rules:    rules{reference: o.Reference, codedOne: o.CodedOne, asIs: o.AsIs, maxLevels: o.MaxLevels, point: '.'},
		maxField: o.MaxFieldBytes,
		maxRows:  o.MaxRows,
		word:     word,
		cols:     make([]buildColumn, len(names)),
	}
	for _, c := range o.MissingCodes {
		if c = strings.TrimSpace(c); c != "" {
			if b.codes == nil {
				b.codes = map[string]bool{}
			}
			b.codes[c] = true
		}
	}
	return b, nil
}

// Part starts a new part of the source, such as the next file of a
// directory of files: rows fed from now on are numbered from 1 in
// messages, which name the part ("row 11 of part-0003.parquet").
func (b *Builder) Part(name string) {
	b.parts = append(b.parts, part{name, len(b.cols[0].x)})
}

// Grow makes room for n more rows in every column, for a reader that
// knows how many are coming: the columns are then allocated once.
func (b *Builder) Grow(n int) {
	if b.maxRows > 0 {
		n = min(n, b.maxRows+1)
	}
	for j := range b.cols {
		b.cols[j].x = slices.Grow(b.cols[j].x, n)
	}
}

// Rows returns the number of cells fed to column j so far.
func (b *Builder) Rows(j int) int { return len(b.cols[j].x) }

// Number adds a number to column j; NaN is a missing value. It returns a
// *SourceError for an infinite value, or when the column would hold more
// rows than ReadOptions.MaxRows.
func (b *Builder) Number(j int, x float64) error {
	c := &b.cols[j]
	if math.IsInf(x, 0) {
		return b.fail(j, len(c.x), badData("%s is infinite", strconv.FormatFloat(x, 'g', -1, 64)))
	}
	c.x = append(c.x, x)
	return b.checkRows(j)
}

// Numbers adds the numbers xs to column j, as Number adds each.
func (b *Builder) Numbers(j int, xs []float64) error {
	c := &b.cols[j]
	for i, x := range xs {
		if math.IsInf(x, 0) {
			return b.fail(j, len(c.x)+i, badData("%s is infinite", strconv.FormatFloat(x, 'g', -1, 64)))
		}
	}
	c.x = append(c.x, xs...)
	return b.checkRows(j)
}

// Bool adds a truth value to column j: as ReadCSV reads true and false,
// 1 and 0 in a column of 0/1 values.
func (b *Builder) Bool(j int, v bool) error {
	c := &b.cols[j]
	x := 0.0
	word := "false"
	if v {
		x, word = 1, "true"
	}
	c.t.addBool([]byte(word), len(c.x))
	c.x = append(c.x, x)
	return b.checkRows(j)
}

// Missing adds a missing value (a null) to column j.
func (b *Builder) Missing(j int) error {
	b.cols[j].x = append(b.cols[j].x, math.NaN())
	return b.checkRows(j)
}

// Text adds a text cell to column j, read as ReadCSV reads a cell: after
// surrounding spaces are trimmed it is missing when empty, NA, NaN, N/A,
// null (any case) or one of ReadOptions.MissingCodes; a number when it
// is one (decimal point); true or false; else text. It returns a
// *SourceError for a cell longer than ReadOptions.MaxFieldBytes or an
// infinite number.
func (b *Builder) Text(j int, s string) error {
	return b.text(j, []byte(s))
}

// TextBytes is Text for a cell held in bytes, which it does not keep.
func (b *Builder) TextBytes(j int, f []byte) error { return b.text(j, f) }

func (b *Builder) text(j int, f []byte) error {
	c := &b.cols[j]
	i := len(c.x)
	if len(f) > b.maxField {
		return b.fail(j, i, badData("text longer than %d bytes", b.maxField))
	}
	f = bytes.TrimSpace(f) // as ReadCSV trims a cell
	x, class := classify(f, b.codes, '.', &b.scratch)
	switch class {
	case numberCell:
		if math.IsInf(x, 0) {
			return b.fail(j, i, badData("%q is infinite", f))
		}
	case boolCell:
		c.t.addBool(f, i)
	case textCell:
		c.t.addText(f, i, i, 0)
	}
	c.x = append(c.x, x)
	return b.checkRows(j)
}

func (b *Builder) checkRows(j int) error {
	if n := len(b.cols[j].x); b.maxRows > 0 && n > b.maxRows {
		return b.fail(0, n-1, badData("more than %d rows", b.maxRows))
	}
	return nil
}

// Fail returns a *SourceError about the cell in column j (0-based; -1 for
// none) and row i (0-based, counted over all parts; -1 for none), for a
// reader that finds a problem the Builder cannot see, such as a value of
// an unsupported type.
func (b *Builder) Fail(j, i int, err error) error { return b.fail(j, i, err) }

func (b *Builder) fail(j, i int, err error, fixes ...Fix) error {
	e := &SourceError{Err: err, Fixes: fixes}
	if j >= 0 {
		e.Column, e.Name = j+1, b.names[j]
	}
	if i >= 0 {
		e.Row, e.Part = b.locate(i)
		e.At = b.row(i)
	} else if len(b.parts) == 1 {
		e.Part = b.parts[0].name
	}
	return e
}

// locate returns row i's 1-based number in its part, and the part.
func (b *Builder) locate(i int) (int, string) {
	for k := len(b.parts) - 1; k >= 0; k-- {
		if i >= b.parts[k].first {
			return i - b.parts[k].first + 1, b.parts[k].name
		}
	}
	return i + 1, ""
}

// row names row i: "result row 12", "row 12 of part-0003.parquet".
func (b *Builder) row(i int) string {
	n, p := b.locate(i)
	if p == "" {
		return b.word + " " + strconv.Itoa(n)
	}
	return fmt.Sprintf("%s %d of %s", b.word, n, p)
}

// rows names rows: "result rows 7, 19", "rows 7, 19 of part-0003.parquet".
func (b *Builder) rows(is []int) string {
	if len(is) == 1 {
		return b.row(is[0])
	}
	nums := make([]int, len(is))
	samePart := true
	_, first := b.locate(is[0])
	for k, i := range is {
		var p string
		nums[k], p = b.locate(i)
		samePart = samePart && p == first
	}
	if !samePart {
		s := make([]string, len(is))
		for k, i := range is {
			s[k] = b.row(i)
		}
		return strings.Join(s, ", ")
	}
	if first == "" {
		return b.word + "s " + joinInts(nums)
	}
	return fmt.Sprintf("%ss %s of %s", b.word, joinInts(nums), first)
}

// Dataset decides each column's kind, levels and coding from its cells,
// as ReadCSV does, and returns the dataset; the Builder must not be used
// afterwards. It returns a *SourceError naming the row and column for a
// column that mixes numbers and text, a rare or case-variant level, a
// stray number among 0s and 1s, too many levels, no rows, or columns of
// different lengths.
func (b *Builder) Dataset() (*Dataset, error) {
	rows := len(b.cols[0].x)
	for j := range b.cols {
		if n := len(b.cols[j].x); n != rows {
			return nil, b.fail(j, -1, badData("%d values, but column %d (%q) has %d", n, 1, b.names[0], rows))
		}
	}
	if rows == 0 {
		return nil, b.fail(-1, -1, badData("no rows"))
	}
	d := &Dataset{rows: rows}
	for j := range b.cols {
		c := &b.cols[j]
		if cap(c.x)-rows > rows/8 {
			// The memory left over by growth is not kept.
			c.x = append(make([]float64, 0, rows), c.x...)
		}
		in := &columnIn{name: b.names[j], col: c.x[:rows:rows], texts: []*colText{&c.t}, naming: builderNaming{b}}
		in.textAt = func(i int) string {
			if i < len(c.t.text) {
				return c.t.text[i]
			}
			return ""
		}
		in.fail = func(k int, err error, fixes ...Fix) error { return b.fail(j, k, err, fixes...) }
		if err := b.rules.decide(d, in); err != nil {
			return nil, err
		}
		b.cols[j] = buildColumn{}
	}
	return d, nil
}

// builderNaming names a Builder's rows in the messages of rules.decide.
type builderNaming struct{ b *Builder }

func (n builderNaming) row(k int) string     { return n.b.row(k) }
func (n builderNaming) rows(ks []int) string { return n.b.rows(ks) }
