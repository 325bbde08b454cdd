// Package table holds the data a discovery runs on: a Dataset of named
// variables stored column-major, each with a kind (continuous, binary or
// categorical) and, for binary and categorical variables, its levels and
// coding; readers that build a Dataset from CSV and from database
// results; and the detection of missing values.
//
// A numeric column whose present values are all 0 or 1 is binary, any
// other numeric column continuous. A text column with two values is
// binary; with more it is categorical and enters a regression as one
// indicator column per level other than the reference. The reference of a
// text column is the one level that reads as an absence (no, none,
// negative, control, not …), or else its most common level; callers choose
// another with CSVOptions.Reference and CSVOptions.CodedOne, or
// Dataset.SetReference. Variable.Coding says the coding in words.
//
// ReadCSV never re-types a column silently: a bad cell in a column of
// numbers, a rare or case-variant level in a text column, and a stray
// number in a column of 0s and 1s stop the reading with a *CSVError that
// names the line, the column and the value and suggests the option that
// fits (missing-value codes, decimal commas, the separator, or reading
// the column as it is). It parses the file's bytes directly, in blocks on
// several goroutines, with a number parser that gives exactly
// strconv.ParseFloat's result.
//
// ReadRows reads a database/sql query result the same way, and Builder
// is the one place where every reader's cells become columns: CSV,
// database results and Parquet files (package parquetfile) give the same
// Dataset for the same table, with the same checks, limits and messages
// (naming a CSV line, a result row, or a row of a file). Typed sources
// keep their types: booleans are binary, numbers numeric, text read by
// its values as CSV text is, and nulls missing.
//
// Missing values are NaN; Missing lists them per variable (by file line
// for data read from CSV) and Present gives the rows where a set of
// variables is complete.
//
// The package knows no solver: which loss a variable is fitted with, and
// what is done about missing values, are decided by the caller.
package table
