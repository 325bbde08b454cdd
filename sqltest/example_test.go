package sqltest_test

import (
	"context"
	"database/sql"
	"fmt"
	"strings"

	_ "modernc.org/sqlite"

	"github.com/antecedent-lab/antecedent/table"
)

// Example reads a query's result with table.ReadRows through a driver the
// caller brings (here the pure-Go SQLite driver): the BOOLEAN column is
// binary false/true, REAL and INTEGER columns numeric, the TEXT column
// categorical by its values, and NULL missing.
func Example() {
	ctx := context.Background()
	db, err := sql.Open("sqlite", ":memory:")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer db.Close()
	db.SetMaxOpenConns(1) // one connection: one in-memory database
	for _, q := range []string{
		"CREATE TABLE visits (age INTEGER, dose REAL, treated BOOLEAN, site TEXT)",
		`INSERT INTO visits VALUES (54, 2.5, true, 'north'), (61, NULL, false, 'south'),
			(47, 1.25, true, 'east'), (70, 3, false, 'north'), (58, 2, NULL, 'east')`,
	} {
		if _, err := db.ExecContext(ctx, q); err != nil {
			fmt.Println(err)
			return
		}
	}
	rows, err := db.QueryContext(ctx, "SELECT age, dose, treated, site FROM visits")
	if err != nil {
		fmt.Println(err)
		return
	}
	d, err := table.ReadRows(ctx, rows, &table.ReadOptions{Reference: map[string]string{"site": "north"}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, v := range d.Variables() {
		fmt.Println(strings.TrimSpace(fmt.Sprintf("%s: %v %s", v.Name, v.Kind, v.Coding())))
	}
	fmt.Println(d.Missing())
	// Output:
	// age: continuous
	// dose: continuous
	// treated: binary "true" = 1, "false" = 0 (reference)
	// site: categorical "east", "south" each vs "north" (reference)
	// table: missing values: "dose" has 1 missing value (data row 2); "treated" has 1 missing value (data row 5); choose the missing-value policy complete-case or available-case to proceed
}
