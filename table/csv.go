package table

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// CSVOptions bounds and tunes ReadCSV. The zero value, or nil, gives the
// defaults written on each field.
type CSVOptions struct {
	// Comma is the field separator; zero means ','.
	Comma rune
	// MaxFieldBytes bounds one field; zero means 1 MiB.
	MaxFieldBytes int
	// MaxColumns bounds the number of columns; zero means 10,000.
	MaxColumns int
	// MaxLevels bounds the distinct values of a text column; zero means 50.
	MaxLevels int
	// MaxRows bounds the number of data rows; zero means no bound.
	MaxRows int
}

// CSVError reports a problem at a line and column of a CSV file.
type CSVError struct {
	Line   int    // 1-based line in the file
	Column int    // 1-based column, 0 when not about one column
	Name   string // the column's header name, when known
	Err    error
}

// Error implements the error interface.
func (e *CSVError) Error() string {
	switch {
	case e.Column > 0 && e.Name != "":
		return fmt.Sprintf("table: CSV line %d, column %d (%q): %v", e.Line, e.Column, e.Name, e.Err)
	case e.Column > 0:
		return fmt.Sprintf("table: CSV line %d, column %d: %v", e.Line, e.Column, e.Err)
	}
	return fmt.Sprintf("table: CSV line %d: %v", e.Line, e.Err)
}

// Unwrap returns the underlying error.
func (e *CSVError) Unwrap() error { return e.Err }

// isMissing reports whether a cell marks a missing value.
func isMissing(s string) bool {
	switch strings.ToLower(s) {
	case "", "na", "nan", "n/a", "null":
		return true
	}
	return false
}

// ReadCSV reads a dataset from CSV with a header row. Cells that are
// empty, NA, NaN, N/A or null (any case) are missing. A column whose
// present cells are all numbers is numeric (Binary when they are all 0 or
// 1, Continuous otherwise); true/false (any case) count as 1/0; any other
// text makes the column a text column (see Dataset.AddText). A leading
// byte-order mark is ignored. Errors name the line and column.
func ReadCSV(r io.Reader, opts *CSVOptions) (*Dataset, error) {
	var o CSVOptions
	if opts != nil {
		o = *opts
	}
	if o.MaxFieldBytes <= 0 {
		o.MaxFieldBytes = 1 << 20
	}
	if o.MaxColumns <= 0 {
		o.MaxColumns = 10_000
	}
	cr := csv.NewReader(&limitedLines{r: r, max: o.MaxFieldBytes * 4})
	if o.Comma != 0 {
		cr.Comma = o.Comma
	}
	cr.ReuseRecord = true
	head, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, &CSVError{Line: 1, Err: fmt.Errorf("%w: empty file, expected a header row", ErrCSV)}
	}
	if err != nil {
		return nil, csvErr(err)
	}
	if len(head) > o.MaxColumns {
		return nil, &CSVError{Line: 1, Err: fmt.Errorf("%w: %d columns, more than the limit of %d", ErrCSV, len(head), o.MaxColumns)}
	}
	names := make([]string, len(head))
	seen := map[string]int{}
	for j, h := range head {
		if j == 0 {
			h = strings.TrimPrefix(h, "\ufeff")
		}
		h = strings.TrimSpace(h)
		if h == "" {
			return nil, &CSVError{Line: 1, Column: j + 1, Err: fmt.Errorf("%w: empty column name", ErrCSV)}
		}
		if k, dup := seen[h]; dup {
			return nil, &CSVError{Line: 1, Column: j + 1, Name: h, Err: fmt.Errorf("%w: name also used by column %d", ErrCSV, k+1)}
		}
		if len(h) > o.MaxFieldBytes {
			return nil, &CSVError{Line: 1, Column: j + 1, Err: fmt.Errorf("%w: name longer than %d bytes", ErrCSV, o.MaxFieldBytes)}
		}
		seen[h] = j
		names[j] = h
	}
	p := len(names)
	nums := make([][]float64, p)
	texts := make([][]string, p) // non-nil once a column turns out to be text
	textLine := make([]int, p)
	rows := 0
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) && errors.Is(pe.Err, csv.ErrFieldCount) {
				return nil, &CSVError{Line: pe.Line, Err: fmt.Errorf("%w: row has %d field(s), the header has %d", ErrCSV, len(rec), p)}
			}
			return nil, csvErr(err)
		}
		line, _ := cr.FieldPos(0)
		row := rows
		if o.MaxRows > 0 && row >= o.MaxRows {
			return nil, &CSVError{Line: line, Err: fmt.Errorf("%w: more than %d rows", ErrCSV, o.MaxRows)}
		}
		for j, s := range rec {
			if len(s) > o.MaxFieldBytes {
				return nil, &CSVError{Line: line, Column: j + 1, Name: names[j], Err: fmt.Errorf("%w: field longer than %d bytes", ErrCSV, o.MaxFieldBytes)}
			}
			s = strings.TrimSpace(s)
			if texts[j] != nil {
				if isMissing(s) {
					s = ""
				}
				texts[j] = append(texts[j], strings.Clone(s))
				continue
			}
			x, err := parseCell(s)
			if err != nil {
				if errors.Is(err, errInfinite) {
					return nil, &CSVError{Line: line, Column: j + 1, Name: names[j], Err: fmt.Errorf("%w: %q is infinite", ErrData, s)}
				}
				// The column is text: convert what was read so far.
				texts[j] = make([]string, row, row+1024)
				for i := range row {
					if !math.IsNaN(nums[j][i]) {
						texts[j][i] = strconv.FormatFloat(nums[j][i], 'g', -1, 64)
					}
				}
				textLine[j] = line
				texts[j] = append(texts[j], strings.Clone(s))
				nums[j] = nil
				continue
			}
			nums[j] = append(nums[j], x)
		}
		rows++
	}
	if rows == 0 {
		return nil, &CSVError{Line: 2, Err: fmt.Errorf("%w: header only, no data rows", ErrCSV)}
	}
	d := &Dataset{rows: rows}
	for j, name := range names {
		if texts[j] != nil {
			if err := d.AddText(name, texts[j], o.MaxLevels); err != nil {
				return nil, &CSVError{Line: textLine[j], Column: j + 1, Name: name, Err: err}
			}
			continue
		}
		if err := d.addNumeric(name, nums[j]); err != nil {
			return nil, &CSVError{Line: 1, Column: j + 1, Name: name, Err: err}
		}
	}
	return d, nil
}

var errInfinite = errors.New("infinite")

func parseCell(s string) (float64, error) {
	if isMissing(s) {
		return math.NaN(), nil
	}
	switch strings.ToLower(s) {
	case "true":
		return 1, nil
	case "false":
		return 0, nil
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		var ne *strconv.NumError
		if errors.As(err, &ne) && errors.Is(ne.Err, strconv.ErrRange) {
			return 0, errInfinite
		}
		return 0, err
	}
	if math.IsInf(x, 0) {
		return 0, errInfinite
	}
	return x, nil
}

func csvErr(err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &CSVError{Line: pe.Line, Column: pe.Column, Err: fmt.Errorf("%w: %v", ErrCSV, pe.Err)}
	}
	return &CSVError{Line: 0, Err: err}
}

// limitedLines fails a read when a single line exceeds max bytes, so a
// hostile file cannot make the CSV reader buffer without bound.
type limitedLines struct {
	r    io.Reader
	max  int
	line int
}

var errLineTooLong = errors.New("line too long")

func (l *limitedLines) Read(p []byte) (int, error) {
	n, err := l.r.Read(p)
	for _, b := range p[:n] {
		if b == '\n' {
			l.line = 0
			continue
		}
		l.line++
		if l.line > l.max {
			return 0, fmt.Errorf("%w: %w (more than %d bytes)", ErrCSV, errLineTooLong, l.max)
		}
	}
	return n, err
}
