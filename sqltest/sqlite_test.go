package sqltest

import (
	"context"
	"database/sql"
	"errors"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	_ "modernc.org/sqlite"

	"github.com/antecedent-lab/antecedent/table"
)

// sqlite opens a new SQLite database in a temporary file, through the
// pure-Go driver modernc.org/sqlite.
func sqlite(t *testing.T) *sql.DB {
	t.Helper()
	db, err := sql.Open("sqlite", filepath.Join(t.TempDir(), "test.db"))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

// loadClinic loads the clinic CSV into an SQLite table with declared
// types (INTEGER, REAL, BOOLEAN, TEXT, VARCHAR); empty cells become NULL.
func loadClinic(t *testing.T, db *sql.DB) {
	t.Helper()
	ctx := context.Background()
	if _, err := db.ExecContext(ctx, `CREATE TABLE clinic (row_id INTEGER PRIMARY KEY,
		age INTEGER, dose REAL, treated BOOLEAN, site TEXT, arm VARCHAR(20), relapse BIGINT, smoker TEXT)`); err != nil {
		t.Fatal(err)
	}
	_, records := clinicRecords(t)
	tx, err := db.BeginTx(ctx, nil)
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range records {
		args := []any{i + 1}
		for j, cell := range r {
			var v any
			switch {
			case cell == "":
			case j == 0 || j == 5:
				v, err = strconv.ParseInt(cell, 10, 64)
			case j == 1:
				v, err = strconv.ParseFloat(cell, 64)
			case j == 2:
				v, err = strconv.ParseBool(cell)
			default:
				v = cell
			}
			if err != nil {
				t.Fatal(err)
			}
			args = append(args, v)
		}
		if _, err := tx.ExecContext(ctx, "INSERT INTO clinic VALUES (?, ?, ?, ?, ?, ?, ?, ?)", args...); err != nil {
			t.Fatal(err)
		}
	}
	if err := tx.Commit(); err != nil {
		t.Fatal(err)
	}
}

// TestSQLiteMatchesCSVAndParquet reads the clinic table from SQLite and
// compares it bit for bit with the same table read from CSV and from
// Parquet.
func TestSQLiteMatchesCSVAndParquet(t *testing.T) {
	db := sqlite(t)
	loadClinic(t, db)
	ctx := context.Background()
	rows, err := db.QueryContext(ctx, "SELECT "+clinicColumns+" FROM clinic ORDER BY row_id")
	if err != nil {
		t.Fatal(err)
	}
	fromSQLite, err := table.ReadRows(ctx, rows, nil)
	if err != nil {
		t.Fatal(err)
	}
	fromCSV, fromParquet := csvAndParquet(t)
	sameDataset(t, "SQLite vs CSV", fromSQLite, fromCSV)
	sameDataset(t, "SQLite vs Parquet", fromSQLite, fromParquet)
}

// TestSQLiteMixedTypes: SQLite lets one column hold numbers and text (its
// type affinity only prefers one). ReadRows refuses such a column, naming
// the result row and the column, as ReadCSV does for the same cells.
func TestSQLiteMixedTypes(t *testing.T) {
	db := sqlite(t)
	ctx := context.Background()
	if _, err := db.ExecContext(ctx, "CREATE TABLE m (id INTEGER PRIMARY KEY, weight REAL, arm TEXT, score)"); err != nil {
		t.Fatal(err)
	}
	for i := range 150 {
		weight := any(60 + float64(i%40)/2)
		score := any(i % 9)
		switch i {
		case 41:
			weight = "unknown" // stored as text in a REAL column
		case 97:
			score = "n/a"
		}
		arm := []string{"control", "drug"}[i%2]
		if _, err := db.ExecContext(ctx, "INSERT INTO m VALUES (?, ?, ?, ?)", i+1, weight, arm, score); err != nil {
			t.Fatal(err)
		}
	}
	read := func(q string, opts *table.ReadOptions) (*table.Dataset, error) {
		rows, err := db.QueryContext(ctx, q)
		if err != nil {
			t.Fatal(err)
		}
		return table.ReadRows(ctx, rows, opts)
	}
	_, err := read("SELECT weight, arm FROM m ORDER BY id", nil)
	const want = `table: result row 42, column 1 ("weight"): "unknown" is not a number, and the column's other 149 values are; correct the source, or add "unknown" to ReadOptions.MissingCodes (if it marks a missing value), or add "weight" to ReadOptions.AsIs (to read the column as text)`
	if err == nil || err.Error() != want {
		t.Fatalf("error\n%v\nwant\n%s", err, want)
	}
	// The fix the message offers works.
	d, err := read("SELECT weight, arm FROM m ORDER BY id", &table.ReadOptions{MissingCodes: []string{"unknown"}})
	if err != nil {
		t.Fatal(err)
	}
	var me *table.MissingError
	if !errors.As(d.Missing(), &me) || len(me.Columns) != 1 || me.Columns[0].Count != 1 || me.Columns[0].FirstRows[0] != 42 {
		t.Errorf("missing: %v", d.Missing())
	}
	// A column without a declared type, whose values are numbers except
	// a missing-value word, is numeric ("n/a" is missing, as in CSV).
	d, err = read("SELECT score FROM m ORDER BY id", nil)
	if err != nil {
		t.Fatal(err)
	}
	if v := variables(d)["score"]; v != "continuous" {
		t.Errorf("score: %q", v)
	}
	// And the same cells through CSV give the same message but for
	// lines instead of result rows.
	var sb strings.Builder
	sb.WriteString("weight,arm\n")
	rows, err := db.QueryContext(ctx, "SELECT weight, arm FROM m ORDER BY id")
	if err != nil {
		t.Fatal(err)
	}
	for rows.Next() {
		var w, a any
		if err := rows.Scan(&w, &a); err != nil {
			t.Fatal(err)
		}
		sb.WriteString(toText(w) + "," + toText(a) + "\n")
	}
	rows.Close()
	_, err = table.ReadCSV(strings.NewReader(sb.String()), nil)
	csvWant := strings.NewReplacer("result row 42", "CSV line 43", "correct the source", "correct the file", "ReadOptions", "CSVOptions").Replace(want)
	if err == nil || err.Error() != csvWant {
		t.Fatalf("CSV error\n%v\nwant\n%s", err, csvWant)
	}
}

func toText(v any) string {
	switch v := v.(type) {
	case float64:
		return strconv.FormatFloat(v, 'g', -1, 64)
	case int64:
		return strconv.FormatInt(v, 10)
	case string:
		return v
	case []byte:
		return string(v)
	}
	return ""
}
