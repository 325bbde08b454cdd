package table

import (
	"context"
	"database/sql"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
)

// sqlClass is how ReadRows reads a column, from its database type.
type sqlClass uint8

const (
	sqlAny     sqlClass = iota // type unknown or not declared: by each value
	sqlNumeric                 // integers, floating point, decimals
	sqlBool                    // boolean
	sqlText                    // character strings
	sqlOther                   // dates, times, bytes and the like: not read
)

// sqlTypeClass classifies a database type name as drivers report it
// (ColumnType.DatabaseTypeName: "INT4", "NUMERIC", "VARCHAR(20)",
// "DOUBLE PRECISION"). The names are those of PostgreSQL and SQLite's
// type affinity rules plus the SQL standard's (common practice).
func sqlTypeClass(name string) sqlClass {
	t := strings.ToUpper(strings.TrimSpace(name))
	if i := strings.IndexByte(t, '('); i >= 0 {
		t = strings.TrimSpace(t[:i])
	}
	t = strings.TrimSuffix(t, " UNSIGNED")
	switch t {
	case "":
		return sqlAny
	case "BOOL", "BOOLEAN":
		return sqlBool
	case "INT", "INT2", "INT4", "INT8", "INTEGER", "SMALLINT", "BIGINT", "TINYINT", "MEDIUMINT",
		"FLOAT", "FLOAT4", "FLOAT8", "REAL", "DOUBLE", "DOUBLE PRECISION", "NUMERIC", "DECIMAL", "NUMBER",
		"SERIAL", "BIGSERIAL", "SMALLSERIAL":
		return sqlNumeric
	case "TEXT", "VARCHAR", "CHAR", "BPCHAR", "CHARACTER", "CHARACTER VARYING", "NAME", "CITEXT",
		"NVARCHAR", "NCHAR", "CLOB", "STRING", "VARYING CHARACTER", "NATIVE CHARACTER":
		return sqlText
	case "DATE", "TIME", "TIMETZ", "TIMESTAMP", "TIMESTAMPTZ", "DATETIME", "INTERVAL", "BYTEA", "BLOB",
		"UUID", "JSON", "JSONB", "XML", "INET", "CIDR", "MACADDR", "MONEY", "BIT", "VARBIT", "POINT":
		return sqlOther
	}
	return sqlAny
}

// ReadRows reads a dataset from the result of a database query, streaming
// its rows, and closes rows. The caller brings the driver and the query;
// a query made with a context (QueryContext) is stopped with it, and
// ReadRows also stops when ctx is done.
//
// Each result column becomes a variable named as the column. A column's
// declared type decides how its values are read: a boolean column gives
// true and false (Binary, levels "false" and "true"); a numeric column
// (integer, floating point, numeric or decimal, as int64, float64 or the
// decimal's text) gives numbers, Binary when they are all 0 or 1 and
// Continuous otherwise; a text column, and a column whose type the driver
// does not declare, is read cell by cell as ReadCSV reads a CSV cell, so
// a text column becomes Binary or Categorical by its values, and a column
// of numbers written as text is numeric. SQL NULL, a NaN, and empty or
// NA-like text are missing (NaN). Columns of dates, times, bytes and other
// types are refused: convert them in the query.
//
// Kinds, levels, coding, missing values, limits and the checks for odd
// cells are decided as ReadCSV decides them (see Builder), so the same
// table read from CSV and from a database gives the same Dataset. Errors
// are *SourceError values naming the result row (1-based, "result row
// 11") and the column, with the ReadOptions that would resolve them: a
// column that mixes numbers and text (as SQLite allows), a value of a type
// that is not read, or too many rows. A failure of the connection while
// reading is returned wrapped, with the rows read so far.
func ReadRows(ctx context.Context, rows *sql.Rows, opts *ReadOptions) (*Dataset, error) {
	defer rows.Close()
	types, err := rows.ColumnTypes()
	if err != nil {
		return nil, fmt.Errorf("%w: reading the result's columns: %w", ErrData, err)
	}
	names := make([]string, len(types))
	classes := make([]sqlClass, len(types))
	for j, t := range types {
		names[j] = strings.TrimSpace(t.Name())
		classes[j] = sqlTypeClass(t.DatabaseTypeName())
	}
	b, err := NewBuilder(names, opts, "result row")
	if err != nil {
		return nil, err
	}
	for j, c := range classes {
		if c == sqlOther {
			return nil, b.Fail(j, -1, badData("the type %s is not read; convert it in the query to a number or text, or leave the column out", types[j].DatabaseTypeName()))
		}
	}
	cells := make([]any, len(names))
	dest := make([]any, len(names))
	for j := range cells {
		dest[j] = &cells[j]
	}
	n := 0
	for rows.Next() {
		if n%1024 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, fmt.Errorf("table: reading the result stopped after %d rows: %w", n, err)
			}
		}
		if err := rows.Scan(dest...); err != nil {
			return nil, b.Fail(-1, n, fmt.Errorf("%w: %w", ErrData, err))
		}
		for j, v := range cells {
			if err := readValue(b, j, n, classes[j], v); err != nil {
				return nil, err
			}
			cells[j] = nil
		}
		n++
	}
	if err := rows.Err(); err != nil {
		return nil, fmt.Errorf("table: reading the result failed after %d rows: %w", n, err)
	}
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("table: reading the result stopped after %d rows: %w", n, err)
	}
	return b.Dataset()
}

// readValue feeds the value v that database/sql scanned into an any (nil,
// int64, float64, bool, []byte, string or time.Time, or what a driver's
// own type is) to column j of b at row i.
func readValue(b *Builder, j, i int, class sqlClass, v any) error {
	switch v := v.(type) {
	case nil:
		return b.Missing(j)
	case bool:
		return b.Bool(j, v)
	case int64:
		if class == sqlBool && (v == 0 || v == 1) {
			return b.Bool(j, v == 1) // SQLite stores booleans as 0 and 1
		}
		return b.Number(j, float64(v))
	case float64:
		return b.Number(j, v)
	case float32:
		return b.Number(j, float64(v))
	case int32:
		return b.Number(j, float64(v))
	case int:
		return b.Number(j, float64(v))
	case []byte:
		return readText(b, j, class, string(v))
	case string:
		return readText(b, j, class, v)
	case time.Time:
		return b.Fail(j, i, badData("%s is a date or time, which is not read; convert the column in the query to a number or text", v.Format(time.RFC3339)))
	}
	return b.Fail(j, i, badData("a value of Go type %T is not read; convert the column in the query to a number or text", v))
}

// readText reads a value the driver gives as text: the digits of a
// numeric or decimal column, a boolean's letters, or a text cell.
func readText(b *Builder, j int, class sqlClass, s string) error {
	switch class {
	case sqlNumeric:
		if x, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil && !math.IsInf(x, 0) {
			return b.Number(j, x)
		}
	case sqlBool:
		switch strings.ToLower(strings.TrimSpace(s)) {
		case "t", "true":
			return b.Bool(j, true)
		case "f", "false":
			return b.Bool(j, false)
		}
	}
	return b.Text(j, s)
}
