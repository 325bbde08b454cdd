package table

import (
	"fmt"
	"io"
	"runtime"
	"slices"
	"strconv"
	"strings"
)

// CSVOptions bounds and tunes ReadCSV. The zero value, or nil, gives the
// defaults written on each field.
type CSVOptions struct {
	// Comma is the field separator, a single-byte character; zero means
	// ','.
	Comma rune
	// DecimalComma reads numbers written with a decimal comma ("7,5"); a
	// number with a decimal point is then not a number. With ',' as the
	// separator such numbers must be quoted.
	DecimalComma bool
	// MissingCodes lists cell values that mark a missing value besides the
	// empty cell and NA, NaN, N/A and null (any case), for example ".",
	// "-" or "999". They are matched exactly, after surrounding spaces are
	// trimmed, in every column.
	MissingCodes []string
	// Reference maps a binary or categorical text column to its reference
	// level: coded 0, or left out of the indicators. A column not named
	// takes the default of DefaultReference.
	Reference map[string]string
	// CodedOne maps a binary text column to the level coded 1 (the other
	// level becomes the reference).
	CodedOne map[string]string
	// AsIs lists columns read as they are, without the checks for odd
	// cells: a column of numbers with some text cells is read as text, a
	// text column keeps its rare levels and levels that differ only in
	// case, and a column of 0s and 1s with a few other numbers is read as
	// continuous.
	AsIs []string
	// MaxFieldBytes bounds one field; zero means 1 MiB. A line may hold at
	// most four times as many bytes.
	MaxFieldBytes int
	// MaxColumns bounds the number of columns; zero means 10,000.
	MaxColumns int
	// MaxLevels bounds the distinct values of a text column; zero means 50.
	MaxLevels int
	// MaxRows bounds the number of data rows; zero means no bound.
	MaxRows int
	// Workers bounds the goroutines that parse the file's blocks; zero
	// means GOMAXPROCS.
	Workers int
}

// CSVError reports a problem at a line and column of a CSV file, with the
// changes of options that would let the file be read, if any.
type CSVError struct {
	Line   int    // 1-based line in the file
	Column int    // 1-based column (field) number, 0 when not about one column
	Name   string // the column's header name, when known
	Err    error
	// Fixes lists the options that would resolve the problem, each with
	// the condition under which it is the right one. Correcting the file
	// is always another way.
	Fixes []Fix
}

// Fix is one way to resolve a CSVError: a CSVOptions field and the value
// to give it (or to add to it, for a list).
type Fix struct {
	Option string // "Comma", "DecimalComma", "MissingCodes" or "AsIs"
	Value  string // the separator, missing-value code or column name; "" for DecimalComma
	When   string // when this is the right fix, e.g. "if it marks a missing value"
}

// Error implements the error interface; fixes are written as CSVOptions
// settings.
func (e *CSVError) Error() string { return "table: " + e.Describe(csvFix) }

// Describe returns the message without the package prefix, writing each
// fix with option, which lets a program name its own settings (a
// command-line flag, say) instead of the CSVOptions fields.
func (e *CSVError) Describe(option func(Fix) string) string {
	var b strings.Builder
	switch {
	case e.Column > 0 && e.Name != "":
		fmt.Fprintf(&b, "CSV line %d, column %d (%q): %v", e.Line, e.Column, e.Name, e.Err)
	case e.Column > 0:
		fmt.Fprintf(&b, "CSV line %d, column %d: %v", e.Line, e.Column, e.Err)
	default:
		fmt.Fprintf(&b, "CSV line %d: %v", e.Line, e.Err)
	}
	writeFixes(&b, e.Fixes, e.Column > 0, "correct the file", option)
	return b.String()
}

// writeFixes writes the fixes of an error after its message; about a
// cell, they are offered besides correcting the source.
func writeFixes(b *strings.Builder, fixes []Fix, cell bool, correct string, option func(Fix) string) {
	for i, f := range fixes {
		switch {
		case i == 0 && cell:
			b.WriteString("; " + correct + ", or ")
		case i == 0:
			b.WriteString("; ")
		default:
			b.WriteString(", or ")
		}
		b.WriteString(option(f))
		if f.When != "" {
			b.WriteString(" (" + f.When + ")")
		}
	}
}

func csvFix(f Fix) string { return optionFix("CSVOptions", f) }

// optionFix writes a fix as a setting of the options struct typ.
func optionFix(typ string, f Fix) string {
	switch f.Option {
	case "Comma":
		return fmt.Sprintf("set %s.Comma to %s", typ, strconv.QuoteRune(rune(f.Value[0])))
	case "DecimalComma":
		return "set " + typ + ".DecimalComma"
	case "MissingCodes":
		return fmt.Sprintf("add %q to %s.MissingCodes", f.Value, typ)
	case "AsIs":
		return fmt.Sprintf("add %q to %s.AsIs", f.Value, typ)
	case "MaxLevels":
		return "raise " + typ + ".MaxLevels"
	}
	return f.Option + " " + f.Value
}

// Unwrap returns the underlying error.
func (e *CSVError) Unwrap() error { return e.Err }

// problem is an error that reads as its message alone and matches a
// sentinel with errors.Is.
type problem struct {
	is  error
	msg string
}

func (p *problem) Error() string        { return p.msg }
func (p *problem) Is(target error) bool { return target == p.is }

func badCSV(format string, args ...any) error {
	return &problem{ErrCSV, fmt.Sprintf(format, args...)}
}

func badData(format string, args ...any) error {
	return &problem{ErrData, fmt.Sprintf(format, args...)}
}

// ReadCSV reads a dataset from CSV with a header row, as RFC 4180
// describes it (fields may be quoted, quoted fields may hold separators,
// doubled quotes and line breaks); empty lines are skipped and a leading
// byte-order mark is ignored. Surrounding spaces are trimmed from names
// and cells. Cells that are empty, NA, NaN, N/A or null (any case), or one
// of opts.MissingCodes, are missing.
//
// A column whose present cells are all numbers is numeric: Binary when
// they are all 0 or 1, Continuous otherwise; true and false (any case)
// count as 1 and 0 in a column of 0/1 values. A column whose present cells
// are all text is a text column (see Dataset.AddText; opts.Reference and
// opts.CodedOne choose its coding). Nothing is re-typed silently: a column
// that mixes numbers and text, a text column with a rare level (at most
// five cells and at most 1% of the column, in a column of three or more
// levels) or with two levels that differ only in case, and a column of 0s
// and 1s with a few other numbers (as few) are errors that list the odd
// cells with their lines, unless the column is in opts.AsIs.
//
// Errors are *CSVError values naming the line and column, with the
// options that would resolve them; a header with one field that holds
// another common separator says which. The file is parsed in blocks on
// opts.Workers goroutines; the result does not depend on their number.
func ReadCSV(r io.Reader, opts *CSVOptions) (*Dataset, error) {
	rd, err := newReader(opts)
	if err != nil {
		return nil, err
	}
	return rd.read(r)
}

// reader holds one ReadCSV call's resolved settings.
type reader struct {
	o       CSVOptions
	rules   rules
	comma   byte
	point   byte
	codes   map[string]bool
	numCode bool // a missing-value code reads as a number
	maxLine int
	workers int
	names   []string
}

func newReader(opts *CSVOptions) (*reader, error) {
	rd := &reader{comma: ',', point: '.'}
	if opts != nil {
		rd.o = *opts
	}
	o := &rd.o
	if o.MaxFieldBytes <= 0 {
		o.MaxFieldBytes = 1 << 20
	}
	if o.MaxColumns <= 0 {
		o.MaxColumns = 10_000
	}
	if o.MaxLevels <= 0 {
		o.MaxLevels = 50
	}
	rd.maxLine = 4 * o.MaxFieldBytes
	if o.Comma != 0 {
		if o.Comma >= 0x80 || o.Comma == '"' || o.Comma == '\r' || o.Comma == '\n' || o.Comma == ' ' {
			return nil, fmt.Errorf("%w: separator %q is not supported; use a single-byte character other than a quote, a space or a line break", ErrCSV, o.Comma)
		}
		rd.comma = byte(o.Comma)
	}
	if o.DecimalComma {
		rd.point = ','
	}
	var scratch []byte
	for _, c := range o.MissingCodes {
		c = strings.TrimSpace(c)
		if c == "" {
			continue
		}
		if rd.codes == nil {
			rd.codes = map[string]bool{}
		}
		rd.codes[c] = true
		if _, ok := parseNumber([]byte(c), rd.point, &scratch); ok {
			rd.numCode = true
		}
	}
	rd.rules = rules{reference: o.Reference, codedOne: o.CodedOne, asIs: o.AsIs, maxLevels: o.MaxLevels, point: rd.point, csv: true}
	rd.workers = o.Workers
	if rd.workers <= 0 {
		rd.workers = runtime.GOMAXPROCS(0)
	}
	return rd, nil
}

// header checks the header's fields and stores the column names.
func (rd *reader) header(fields [][]byte, raw []byte) error {
	if len(fields) == 1 {
		if err := rd.separatorHint(raw); err != nil {
			return err
		}
	}
	rd.names = make([]string, len(fields))
	for j, f := range fields {
		h := string(f)
		if j == 0 {
			h = strings.TrimPrefix(h, "\ufeff")
		}
		rd.names[j] = strings.TrimSpace(h)
	}
	if j, dup, err := checkNames(rd.names, rd.o.MaxColumns, rd.o.MaxFieldBytes, ErrCSV); err != nil {
		e := &CSVError{Line: 1, Column: j, Err: err}
		if dup {
			e.Name = rd.names[j-1]
		}
		return e
	}
	return checkOptionNames(rd.names, "CSVOptions", "the file", rd.o.Reference, rd.o.CodedOne, rd.o.AsIs, ErrCSV)
}

// checkNames checks the column names of a source: how many, none empty
// or longer than maxBytes, none twice. It returns the 1-based column at
// fault (0 when the problem is their number), whether the name is used
// twice, and the problem, wrapping sentinel.
func checkNames(names []string, maxColumns, maxBytes int, sentinel error) (int, bool, error) {
	if len(names) > maxColumns {
		return 0, false, &problem{sentinel, fmt.Sprintf("%d columns, more than the limit of %d", len(names), maxColumns)}
	}
	seen := make(map[string]int, len(names))
	for j, h := range names {
		if h == "" {
			return j + 1, false, &problem{sentinel, "empty column name"}
		}
		if k, dup := seen[h]; dup {
			return j + 1, true, &problem{sentinel, fmt.Sprintf("name also used by column %d", k+1)}
		}
		if len(h) > maxBytes {
			return j + 1, false, &problem{sentinel, fmt.Sprintf("name longer than %d bytes", maxBytes)}
		}
		seen[h] = j
	}
	return 0, false, nil
}

// checkOptionNames returns an error when the options Reference, CodedOne
// or AsIs of the options struct typ name a column that src (such as "the
// file") does not have.
func checkOptionNames(names []string, typ, src string, reference, codedOne map[string]string, asIs []string, sentinel error) error {
	for _, opt := range []struct {
		field string
		names []string
	}{{"Reference", mapKeys(reference)}, {"CodedOne", mapKeys(codedOne)}, {"AsIs", asIs}} {
		for _, n := range opt.names {
			if !slices.Contains(names, n) {
				return fmt.Errorf("%w: %s.%s names %q, which is not a column of %s (columns: %s)", sentinel, typ, opt.field, n, src, listNames(names, 12))
			}
		}
	}
	return nil
}

func mapKeys(m map[string]string) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	return keys
}

// listNames quotes up to max names, then says how many more.
func listNames(names []string, max int) string {
	q := make([]string, 0, min(len(names), max)+1)
	for i, n := range names {
		if i == max {
			q = append(q, fmt.Sprintf("and %d more", len(names)-max))
			break
		}
		q = append(q, strconv.Quote(n))
	}
	return strings.Join(q, ", ")
}

var separatorNames = map[byte]string{',': "commas", ';': "semicolons", '\t': "tabs", '|': "vertical bars"}

// counted returns the plural noun plural, made singular for one.
func counted(n int, plural string) string {
	if n == 1 {
		return strings.TrimSuffix(plural, "s")
	}
	return plural
}

func separatorName(c byte) string {
	if n, ok := separatorNames[c]; ok {
		return n
	}
	return fmt.Sprintf("%q characters", c)
}

// separatorHint returns an error when a one-field header holds another
// common separator: the file is most likely separated by it.
func (rd *reader) separatorHint(raw []byte) error {
	best, n := byte(0), 0
	for _, c := range []byte{',', ';', '\t', '|'} {
		if c == rd.comma {
			continue
		}
		if k := strings.Count(string(raw), string(c)); k > n {
			best, n = c, k
		}
	}
	if n == 0 {
		return nil
	}
	return &CSVError{Line: 1, Err: badCSV("the header has no %s but %d %s, so the file looks separated by %s",
		separatorName(rd.comma), n, counted(n, separatorNames[best]), separatorNames[best]),
		Fixes: []Fix{{Option: "Comma", Value: string(best)}}}
}

// read runs ReadCSV: the header, the blocks, then each column's kind.
func (rd *reader) read(r io.Reader) (*Dataset, error) {
	src := &source{r: r, size: sizeOf(r)}
	buf := src.fill(make([]byte, 0, blockSize), blockSize)
	for !src.eof && safeCut(buf) < 0 {
		if len(buf) > rd.maxLine+blockSize {
			return nil, &CSVError{Line: 1, Err: badCSV("line longer than %d bytes", rd.maxLine)}
		}
		buf = src.fill(buf, 2*len(buf))
	}
	if src.err != nil {
		return nil, src.err
	}
	pos, line := 0, 1
	for pos < len(buf) && blank(buf, pos) > 0 {
		pos += blank(buf, pos)
		line++
	}
	if pos == len(buf) {
		return nil, &CSVError{Line: 1, Err: badCSV("empty file, expected a header row")}
	}
	p := &parser{rd: rd}
	fields, next, nextLine, err := p.nextRecord(buf, pos, line)
	if err != nil {
		return nil, err
	}
	if err := rd.header(fields, buf[pos:next]); err != nil {
		return nil, err
	}
	blocks, cols, err := rd.stream(src, buf[next:], nextLine, int64(len(buf)))
	if err != nil {
		return nil, err
	}
	rows := 0
	for _, b := range blocks {
		if b.err != nil {
			return nil, b.err
		}
		if rd.o.MaxRows > 0 && rows+b.rows > rd.o.MaxRows {
			return nil, &CSVError{Line: b.lines[rd.o.MaxRows-rows], Err: badCSV("more than %d rows", rd.o.MaxRows)}
		}
		rows += b.rows
	}
	if rows == 0 {
		return nil, &CSVError{Line: nextLine, Err: badCSV("header only, no data rows")}
	}
	gaps := false
	for _, b := range blocks {
		gaps = gaps || b.rows < b.bound
	}
	for j, c := range cols {
		if gaps {
			// Blank lines or quoted line breaks: close the gaps.
			at := 0
			for _, b := range blocks {
				at += copy(c[at:], c[b.off:b.off+b.rows])
			}
		}
		cols[j] = c[:rows:rows]
	}
	d := &Dataset{rows: rows, lines: make([]int, 0, rows)}
	for _, b := range blocks {
		d.lines = append(d.lines, b.lines...)
	}
	for j := range rd.names {
		if err := rd.rules.decide(d, rd.columnIn(d, blocks, cols[j], j)); err != nil {
			return nil, err
		}
		cols[j] = nil
	}
	return d, nil
}

// columnIn hands column j of the blocks to rules.decide.
func (rd *reader) columnIn(d *Dataset, blocks []*block, col []float64, j int) *columnIn {
	in := &columnIn{name: rd.names[j], col: col, keys: d.lines, naming: lineNaming{}}
	for _, b := range blocks {
		if b.text != nil {
			in.texts = append(in.texts, &b.text[j])
		}
	}
	// decide asks for the text cells in row order: a cursor over the
	// blocks finds each.
	bi, start := 0, 0
	in.textAt = func(i int) string {
		for i >= start+blocks[bi].rows {
			start += blocks[bi].rows
			bi++
		}
		return blocks[bi].textAt(j, i-start)
	}
	in.fail = func(line int, err error, fixes ...Fix) error {
		if line == noRow {
			line = 1
		}
		return &CSVError{Line: line, Column: j + 1, Name: rd.names[j], Err: err, Fixes: fixes}
	}
	return in
}
