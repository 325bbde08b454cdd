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
// The package is apart from table so that the Parquet library it uses
// (github.com/parquet-go/parquet-go, with its compression codecs) is
// linked only into programs that read Parquet; the antecedent package
// does not import it.
package parquetfile
