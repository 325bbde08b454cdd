package parquetfile_test

import (
	"context"
	"fmt"
	"strings"

	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

// ExampleRead reads a directory of three parts written by another tool
// (see testdata/write_fixtures.mjs).
func ExampleRead() {
	d, err := parquetfile.Read(context.Background(), "testdata/clinic-parts", nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(d.Rows(), "rows")
	for _, v := range d.Variables() {
		fmt.Println(strings.TrimSpace(fmt.Sprintf("%s: %v %s", v.Name, v.Kind, v.Coding())))
	}
	// Output:
	// 240 rows
	// age: continuous
	// dose: continuous
	// treated: binary "true" = 1, "false" = 0 (reference)
	// site: categorical "north", "south" each vs "east" (reference)
	// arm: categorical "drug", "placebo" each vs "control" (reference)
	// relapse: binary 1 vs 0 (reference)
	// smoker: binary "yes" = 1, "no" = 0 (reference)
}

// ExampleRead_error shows the message for a column that mixes numbers
// and text: it names the row of the file and the column.
func ExampleRead_error() {
	_, err := parquetfile.Read(context.Background(), "testdata/mixed.parquet", nil)
	fmt.Println(err)
	// Output:
	// table: row 58 of mixed.parquet, column 1 ("level"): "-" is not a number, and the column's other 119 values are; correct the source, or add "-" to ReadOptions.MissingCodes (if it marks a missing value), or add "level" to ReadOptions.AsIs (to read the column as text)
}
