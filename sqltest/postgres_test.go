package sqltest

import (
	"context"
	"database/sql"
	"errors"
	"math"
	"os"
	"strings"
	"testing"

	_ "github.com/jackc/pgx/v5/stdlib"

	"github.com/antecedent-lab/antecedent/table"
)

// postgres opens the server of testdata/pg.sh named by ANTECEDENT_PG_URL.
// Without it the test is skipped, unless ANTECEDENT_REQUIRE_PG is set (as
// CI sets it), when it fails.
func postgres(t *testing.T) *sql.DB {
	t.Helper()
	url := os.Getenv("ANTECEDENT_PG_URL")
	if url == "" {
		if os.Getenv("ANTECEDENT_REQUIRE_PG") != "" {
			t.Fatal("ANTECEDENT_PG_URL is not set; start a server with testdata/pg.sh start and export ANTECEDENT_PG_URL=$(testdata/pg.sh url)")
		}
		t.Skip("no PostgreSQL server: run testdata/pg.sh start and export ANTECEDENT_PG_URL=$(testdata/pg.sh url)")
	}
	db, err := sql.Open("pgx", url)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	if err := db.PingContext(context.Background()); err != nil {
		t.Fatalf("PostgreSQL at ANTECEDENT_PG_URL: %v", err)
	}
	return db
}

// TestPostgresMatchesCSVAndParquet reads the clinic table, loaded by
// testdata/pg.sh into typed columns (integer, numeric(6,2), boolean, text,
// varchar, bigint, NULLs), from a real PostgreSQL server, and compares it
// bit for bit with the same table read from CSV and from Parquet.
func TestPostgresMatchesCSVAndParquet(t *testing.T) {
	db := postgres(t)
	ctx := context.Background()
	rows, err := db.QueryContext(ctx, "SELECT "+clinicColumns+" FROM clinic ORDER BY row_id")
	if err != nil {
		t.Fatal(err)
	}
	fromPG, err := table.ReadRows(ctx, rows, nil)
	if err != nil {
		t.Fatal(err)
	}
	fromCSV, fromParquet := csvAndParquet(t)
	sameDataset(t, "PostgreSQL vs CSV", fromPG, fromCSV)
	sameDataset(t, "Parquet vs CSV", fromParquet, fromCSV)
}

// TestPostgresTypes checks that PostgreSQL's numeric, integer, floating
// point, boolean, text and NULL columns arrive as ReadRows documents:
// numbers (NULL and NaN missing), false/true, levels.
func TestPostgresTypes(t *testing.T) {
	db := postgres(t)
	ctx := context.Background()
	conn, err := db.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	// Values typed in by hand; the expected numbers are their decimal
	// values read by strconv.ParseFloat (common practice), float4 values
	// exactly representable in 32 bits.
	for _, q := range []string{
		`CREATE TEMP TABLE typed (
			id int, exact numeric(12, 4), small int2, big int8, single float4, double float8,
			flag boolean, label text, code varchar(8))`,
		`INSERT INTO typed VALUES
			(1, 12.3456, 3, 9007199254740993, 0.5, 'NaN', true, 'alpha', 'x1'),
			(2, -0.0001, NULL, -2, 1.25, 2.5, false, 'beta', 'x2'),
			(3, NULL, 7, 0, NULL, -1e300, NULL, NULL, 'x1'),
			(4, 100, -1, 1, -2.75, 0, true, 'alpha', 'x2')`,
	} {
		if _, err := conn.ExecContext(ctx, q); err != nil {
			t.Fatal(err)
		}
	}
	nan := math.NaN()
	rows, err := conn.QueryContext(ctx, "SELECT exact, small, big, single, double, flag, label, code FROM typed ORDER BY id")
	if err != nil {
		t.Fatal(err)
	}
	d, err := table.ReadRows(ctx, rows, nil)
	if err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string][]float64{
		"exact":  {12.3456, -0.0001, nan, 100},
		"small":  {3, nan, 7, -1},
		"big":    {9007199254740992, -2, 0, 1}, // 2^53+1 rounds to 2^53
		"single": {0.5, 1.25, nan, -2.75},
		"double": {nan, 2.5, -1e300, 0},
		"flag":   {1, 0, nan, 1},
		"label":  {0, 1, nan, 0}, // alpha is the reference (the most common)
		"code":   {0, 1, 0, 1},
	} {
		col, err := d.Column(name)
		if err != nil {
			t.Fatal(err)
		}
		for i, w := range want {
			if col[i] != w && !(math.IsNaN(w) && math.IsNaN(col[i])) {
				t.Errorf("%s row %d: %v, want %v", name, i+1, col[i], w)
			}
		}
	}
	got := variables(d)
	for name, want := range map[string]string{
		"exact": "continuous", "flag": "binary false/true", "label": "binary alpha/beta", "code": "binary x1/x2",
	} {
		if got[name] != want {
			t.Errorf("%s: %q, want %q", name, got[name], want)
		}
	}

	// A date and an infinite value are refused, naming the column (and
	// the row).
	for _, tc := range []struct {
		query string
		want  string
	}{
		{"SELECT exact, current_date AS visit FROM typed", `column 2 ("visit"): the type DATE is not read`},
		{"SELECT exact, CASE WHEN id = 3 THEN 'Infinity'::float8 ELSE 1 END AS x FROM typed ORDER BY id", `result row 3, column 2 ("x"): +Inf is infinite`},
	} {
		rows, err := conn.QueryContext(ctx, tc.query)
		if err != nil {
			t.Fatal(err)
		}
		_, err = table.ReadRows(ctx, rows, nil)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.query, err, tc.want)
		}
	}
}

// TestPostgresDroppedConnection terminates the server process that is
// sending a long result before the reader has read it: ReadRows returns
// the connection's error, never a panic and never a partial dataset.
func TestPostgresDroppedConnection(t *testing.T) {
	db := postgres(t)
	ctx := context.Background()
	conn, err := db.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	var pid int
	if err := conn.QueryRowContext(ctx, "SELECT pg_backend_pid()").Scan(&pid); err != nil {
		t.Fatal(err)
	}
	// Two million rows do not fit in the socket buffers: the server is
	// still sending when it is terminated.
	rows, err := conn.QueryContext(ctx, "SELECT g::float8 AS x, (g % 2)::int AS y FROM generate_series(1, 2000000) AS g")
	if err != nil {
		t.Fatal(err)
	}
	var ok bool
	if err := db.QueryRowContext(ctx, "SELECT pg_terminate_backend($1)", pid).Scan(&ok); err != nil || !ok {
		t.Fatalf("pg_terminate_backend: %v %v", ok, err)
	}
	d, err := table.ReadRows(ctx, rows, nil)
	if err == nil {
		t.Fatalf("no error; %d rows read", d.Rows())
	}
	if !strings.Contains(err.Error(), "reading the result failed after") {
		t.Errorf("error %q does not say where the reading failed", err)
	}
	if errors.Is(err, table.ErrData) {
		t.Errorf("error %q is reported as bad data", err)
	}
}

// TestPostgresCancel stops a long read with its context.
func TestPostgresCancel(t *testing.T) {
	db := postgres(t)
	ctx, cancel := context.WithCancel(context.Background())
	rows, err := db.QueryContext(ctx, "SELECT g::float8 AS x FROM generate_series(1, 2000000) AS g")
	if err != nil {
		t.Fatal(err)
	}
	cancel()
	if _, err := table.ReadRows(ctx, rows, nil); !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want context.Canceled", err)
	}
}
