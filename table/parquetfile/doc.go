// Package parquetfile reads a table.Dataset from Parquet files: one file,
// or a directory of parts written by a data platform.
//
// Columns become variables by their Parquet types (booleans binary,
// numbers numeric, strings by their values), nulls become missing values,
// and every column's kind, levels, coding and odd cells are decided by
// table.Builder, the place table.ReadCSV and table.ReadRows use too: the
// same table read from CSV, a database or Parquet gives the same Dataset.
// Files are read one row group and one column at a time.
//
// A truncated or damaged file gives an error naming it, never a panic
// (the library's panics on damaged footers and pages are turned into
// errors at this package's boundary). One limit remains: parquet-go
// decodes a damaged run-length-encoded run before the page can be checked,
// so a small damaged file can make it allocate far more memory than the
// file's size before the error comes; read untrusted files under a memory
// limit (GOMEMLIMIT, or the container's).
//
// The package is apart from table so that the Parquet library it uses
// (github.com/parquet-go/parquet-go, with its compression codecs) is
// linked only into programs that read Parquet; the antecedent package
// does not import it.
package parquetfile
