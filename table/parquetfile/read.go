package parquetfile

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/deprecated"
	"github.com/parquet-go/parquet-go/format"

	"github.com/antecedent-lab/antecedent/table"
)

// ErrFile is matched (errors.Is) by the errors for a file that is not a
// readable Parquet file, a part whose columns differ from the first
// part's, and a column of a type that is not read.
var ErrFile = errors.New("parquetfile: bad Parquet file")

// fileError is an error about a file, matching ErrFile.
type fileError struct{ msg string }

func (e *fileError) Error() string        { return "parquetfile: " + e.msg }
func (e *fileError) Is(target error) bool { return target == ErrFile }

func badFile(format string, args ...any) error {
	return &fileError{fmt.Sprintf(format, args...)}
}

// class is how a column's values are read.
type class uint8

const (
	number   class = iota // integers and floating point
	unsigned              // unsigned integers
	decimal               // decimals: an integer and a scale
	truth                 // booleans
	text                  // UTF-8 strings
)

// column is what the reader knows of one column of the schema.
type column struct {
	name  string
	class class
	scale int // of a decimal
	kind  parquet.Kind
}

// Read reads a dataset from the Parquet file at path, or from the parts
// of a directory: its files whose names end in ".parquet", in name order,
// which must have the same columns. See ReadFrom for how columns are
// read. Errors about a cell are *table.SourceError values naming the row
// of its part ("row 11 of part-0003.parquet") and the column.
func Read(ctx context.Context, path string, opts *table.ReadOptions) (*table.Dataset, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	files := []string{path}
	if st.IsDir() {
		entries, err := os.ReadDir(path)
		if err != nil {
			return nil, err
		}
		files = files[:0]
		for _, e := range entries {
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".parquet") && !strings.HasPrefix(e.Name(), ".") {
				files = append(files, filepath.Join(path, e.Name()))
			}
		}
		if len(files) == 0 {
			return nil, badFile("%s: no files ending in .parquet in the directory", path)
		}
	}
	var parts []source
	defer func() {
		for _, p := range parts {
			p.close()
		}
	}()
	for _, name := range files {
		f, err := os.Open(name)
		if err != nil {
			return nil, err
		}
		fi, err := f.Stat()
		if err != nil {
			f.Close()
			return nil, err
		}
		parts = append(parts, source{r: f, size: fi.Size(), name: filepath.Base(name), close: func() { f.Close() }})
	}
	return read(ctx, parts, opts)
}

// ReadFrom reads a dataset from one Parquet file of size bytes, read
// through r and called name in messages.
//
// Each top-level column becomes a variable named as the column. Booleans
// give true and false (Binary, levels "false" and "true"); integers,
// floating point and decimals give numbers, Binary when they are all 0 or
// 1 and Continuous otherwise; strings (dictionary-encoded or not) are
// read cell by cell as table.ReadCSV reads a CSV cell, so a string column
// becomes Binary or Categorical by its values. Nulls, NaN and empty or
// NA-like strings are missing. Columns of dates, times, bytes, nested
// groups and lists are refused: convert them before writing the file.
//
// Kinds, levels, coding, missing values, limits and the checks for odd
// cells are decided as table.ReadCSV decides them (see table.Builder), so
// the same table read from CSV and from Parquet gives the same Dataset.
// The file is read one row group at a time, one column at a time, so
// memory stays near the columns being built. A truncated or corrupt file
// gives an error naming it, matching ErrFile.
func ReadFrom(ctx context.Context, r io.ReaderAt, size int64, name string, opts *table.ReadOptions) (*table.Dataset, error) {
	return read(ctx, []source{{r: r, size: size, name: name, close: func() {}}}, opts)
}

// source is one file to read.
type source struct {
	r     io.ReaderAt
	size  int64
	name  string
	close func()
}

// open opens a file's footer and checks its columns against want (nil
// for the first file).
func open(s source, want []column) (f *parquet.File, cols []column, err error) {
	defer func() {
		// The Parquet library panics on some corrupt footers and schemas
		// (found by FuzzReadFrom): that is a bad file, reported as such,
		// not a crash of the caller.
		if p := recover(); p != nil {
			f, cols, err = nil, nil, badFile("%s: corrupt footer or schema (%v)", s.name, p)
		}
	}()
	f, err = openFile(s)
	if err != nil {
		return nil, nil, err
	}
	cols, err = schema(s.name, f.Schema())
	if err != nil {
		return nil, nil, err
	}
	if want != nil {
		if len(cols) != len(want) {
			return nil, nil, badFile("%s has %d columns, the first part %d", s.name, len(cols), len(want))
		}
		for j, c := range cols {
			if c.name != want[j].name || c.class != want[j].class || c.scale != want[j].scale {
				return nil, nil, badFile("%s: column %d is %q (%s), but in the first part %q (%s)", s.name, j+1, c.name, c.describe(), want[j].name, want[j].describe())
			}
		}
	}
	return f, cols, nil
}

// openFile opens the file's footer. The magic bytes are checked here so
// that a file that is not Parquet at all gets a plain message.
func openFile(s source) (*parquet.File, error) {
	const magic = "PAR1"
	var head, tail [4]byte
	if s.size < 12 {
		return nil, badFile("%s: %d bytes, too short for a Parquet file (truncated?)", s.name, s.size)
	}
	if _, err := s.r.ReadAt(head[:], 0); err != nil {
		return nil, fmt.Errorf("parquetfile: %s: %w", s.name, err)
	}
	if _, err := s.r.ReadAt(tail[:], s.size-4); err != nil {
		return nil, fmt.Errorf("parquetfile: %s: %w", s.name, err)
	}
	switch {
	case string(head[:]) != magic:
		return nil, badFile("%s: not a Parquet file (it does not begin with %q)", s.name, magic)
	case string(tail[:]) != magic:
		return nil, badFile("%s: the file does not end with %q: truncated, or still being written", s.name, magic)
	}
	f, err := parquet.OpenFile(s.r, s.size, parquet.SkipPageIndex(true), parquet.SkipBloomFilters(true), parquet.ReadBufferSize(1<<20))
	if err != nil {
		return nil, badFile("%s: not a readable Parquet file: %v", s.name, err)
	}
	return f, nil
}

// schema returns the columns of a file's schema, refusing nested and
// repeated columns and types that are not read.
func schema(file string, s *parquet.Schema) ([]column, error) {
	var cols []column
	for _, fld := range s.Fields() {
		name := fld.Name()
		if !fld.Leaf() {
			return nil, badFile("%s: column %q is a nested group or list, which is not read; write one column per variable", file, name)
		}
		if fld.Repeated() {
			return nil, badFile("%s: column %q is repeated (a list), which is not read; write one column per variable", file, name)
		}
		c, err := classify(fld.Type())
		if err != nil {
			return nil, badFile("%s: column %q: %v", file, name, err)
		}
		c.name = name
		cols = append(cols, c)
	}
	if len(cols) == 0 {
		return nil, badFile("%s: no columns", file)
	}
	return cols, nil
}

// classify decides how a column of type t is read, from its physical type
// and its logical (or, in older files, converted) type, as the Parquet
// format's LogicalTypes.md defines them.
func classify(t parquet.Type) (column, error) {
	kind := t.Kind()
	c := column{kind: kind}
	lt := t.LogicalType()
	var conv deprecated.ConvertedType = -1
	if ct := t.ConvertedType(); ct != nil {
		conv = *ct
	}
	if lt != nil && lt.Value != nil {
		switch v := lt.Value.(type) {
		case *format.StringType, *format.EnumType:
			if kind == parquet.ByteArray {
				c.class = text
				return c, nil
			}
		case *format.DecimalType:
			c.class, c.scale = decimal, int(v.Scale)
			return c, nil
		case *format.IntType:
			if kind == parquet.Int32 || kind == parquet.Int64 {
				c.class = number
				if !v.IsSigned {
					c.class = unsigned
				}
				return c, nil
			}
		case *format.NullType:
		default:
			return c, fmt.Errorf("the logical type %s is not read; convert it to a number or text before writing the file", lt)
		}
	}
	switch conv {
	case deprecated.UTF8, deprecated.Enum:
		c.class = text
		return c, nil
	case deprecated.Decimal:
		return c, fmt.Errorf("a decimal without its scale in the schema is not read")
	case deprecated.Uint8, deprecated.Uint16, deprecated.Uint32, deprecated.Uint64:
		c.class = unsigned
		return c, nil
	case deprecated.Date, deprecated.TimeMillis, deprecated.TimeMicros, deprecated.TimestampMillis, deprecated.TimestampMicros, deprecated.Interval:
		return c, fmt.Errorf("dates and times are not read; convert the column to a number before writing the file")
	}
	switch kind {
	case parquet.Boolean:
		c.class = truth
	case parquet.Int32, parquet.Int64, parquet.Float, parquet.Double:
		c.class = number
	case parquet.Int96:
		return c, fmt.Errorf("INT96 (an old form of timestamp) is not read; convert the column to a number before writing the file")
	case parquet.ByteArray, parquet.FixedLenByteArray:
		return c, fmt.Errorf("bytes without a string type are not read; write the column as strings or numbers")
	default:
		return c, fmt.Errorf("the type %s is not read", t)
	}
	return c, nil
}

// describe names a column's class in messages.
func (c column) describe() string {
	switch c.class {
	case truth:
		return "boolean"
	case text:
		return "string"
	case decimal:
		return fmt.Sprintf("decimal with scale %d", c.scale)
	case unsigned:
		return "unsigned integer"
	}
	return "number"
}

// read reads the parts in order into one dataset.
func read(ctx context.Context, parts []source, opts *table.ReadOptions) (*table.Dataset, error) {
	files := make([]*parquet.File, len(parts))
	var cols []column
	total := int64(0)
	for k, p := range parts {
		f, c, err := open(p, cols)
		if err != nil {
			return nil, err
		}
		files[k], cols, total = f, c, total+f.NumRows()
	}
	names := make([]string, len(cols))
	for j, c := range cols {
		names[j] = c.name
	}
	b, err := table.NewBuilder(names, opts, "row")
	if err != nil {
		var se *table.SourceError
		if errors.As(err, &se) {
			se.Part = parts[0].name
			return nil, se
		}
		return nil, fmt.Errorf("parquetfile: %s: %w", parts[0].name, err)
	}
	// The footers' row counts size the columns once, unless they claim
	// more than the files could plausibly hold: 16 bytes of columns per
	// byte of file (a damaged or hostile footer must not make the reader
	// reserve memory out of proportion to its input; real data that
	// compress better still fit, the columns then grow as they fill).
	size := int64(0)
	for _, p := range parts {
		size += p.size
	}
	if limit := (16*size + 16<<20) / int64(8*len(cols)); total > 0 && total <= limit {
		b.Grow(int(total))
	}
	buf := make([]parquet.Value, 4096)
	for k, f := range files {
		b.Part(parts[k].name)
		for g, rg := range f.RowGroups() {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
			chunks := rg.ColumnChunks()
			if len(chunks) != len(cols) {
				return nil, badFile("%s: row group %d has %d columns, the schema %d", parts[k].name, g+1, len(chunks), len(cols))
			}
			first := b.Rows(0)
			for j, ch := range chunks {
				if err := readChunk(b, j, cols[j], ch, buf, first+int(rg.NumRows())); err != nil {
					var se *table.SourceError
					if errors.As(err, &se) {
						return nil, err
					}
					return nil, badFile("%s: row group %d, column %q: %v", parts[k].name, g+1, cols[j].name, err)
				}
				if n := int64(b.Rows(j) - first); n != rg.NumRows() {
					return nil, badFile("%s: row group %d, column %q: %d values for %d rows", parts[k].name, g+1, cols[j].name, n, rg.NumRows())
				}
			}
		}
	}
	return b.Dataset()
}

// readChunk feeds the values of one column chunk to column j of b, page
// by page, until the column holds end rows; a chunk with more values than
// its row group's rows is an error.
func readChunk(b *table.Builder, j int, c column, ch parquet.ColumnChunk, buf []parquet.Value, end int) (err error) {
	defer func() {
		// The Parquet library panics on some corrupt pages (found by
		// TestReadBadBytes): a bad file, not a crash of the caller.
		if p := recover(); p != nil {
			err = fmt.Errorf("corrupt data (%v)", p)
		}
	}()
	pages := ch.Pages()
	defer pages.Close()
	for {
		page, err := pages.ReadPage()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		if n := page.NumValues(); n < 0 || int64(b.Rows(j))+n > int64(end) {
			parquet.Release(page)
			return fmt.Errorf("a page holds %d values, more than the row group's rows", n)
		}
		err = readPage(b, j, c, page, buf)
		parquet.Release(page)
		if err != nil {
			return err
		}
	}
}

// readPage feeds one page's values to column j of b.
func readPage(b *table.Builder, j int, c column, page parquet.Page, buf []parquet.Value) error {
	vr := page.Values()
	for {
		n, err := vr.ReadValues(buf)
		for _, v := range buf[:n] {
			if err := value(b, j, c, v); err != nil {
				return err
			}
		}
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
	}
}

// value feeds one value.
func value(b *table.Builder, j int, c column, v parquet.Value) error {
	if v.IsNull() {
		return b.Missing(j)
	}
	switch c.class {
	case truth:
		return b.Bool(j, v.Boolean())
	case text:
		return b.TextBytes(j, v.ByteArray())
	case unsigned:
		if c.kind == parquet.Int32 {
			return b.Number(j, float64(uint32(v.Int32())))
		}
		return b.Number(j, float64(v.Uint64()))
	case decimal:
		x, err := decimalValue(c, v)
		if err != nil {
			return b.Fail(j, b.Rows(j), err)
		}
		return b.Number(j, x)
	}
	switch c.kind {
	case parquet.Int32:
		return b.Number(j, float64(v.Int32()))
	case parquet.Int64:
		return b.Number(j, float64(v.Int64()))
	case parquet.Float:
		return b.Number(j, float64(v.Float()))
	}
	return b.Number(j, v.Double())
}

// decimalValue returns the number closest to a decimal's value, as
// strconv.ParseFloat reads its digits (so a decimal and its text give the
// same float64).
func decimalValue(c column, v parquet.Value) (float64, error) {
	var digits string
	switch c.kind {
	case parquet.Int32:
		digits = strconv.FormatInt(int64(v.Int32()), 10)
	case parquet.Int64:
		digits = strconv.FormatInt(v.Int64(), 10)
	default:
		// Big-endian two's complement, as the format stores wide decimals.
		raw := v.ByteArray()
		n := new(big.Int).SetBytes(raw)
		if len(raw) > 0 && raw[0]&0x80 != 0 {
			n.Sub(n, new(big.Int).Lsh(big.NewInt(1), uint(8*len(raw))))
		}
		digits = n.String()
	}
	x, err := strconv.ParseFloat(digits+"e"+strconv.Itoa(-c.scale), 64)
	if err != nil || math.IsInf(x, 0) {
		return 0, fmt.Errorf("decimal %se%d is out of range", digits, -c.scale)
	}
	return x, nil
}
