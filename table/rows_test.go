package table_test

import (
	"context"
	"database/sql"
	"database/sql/driver"
	"errors"
	"io"
	"math"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent/table"
)

// The driver below serves fixed results from memory, so that ReadRows can
// be tested in the core module without a database; the same reader is
// tested against a real PostgreSQL server and SQLite in the sqltest
// module.

// memResult is a result the test driver serves: column names, their
// declared types, rows of driver values, and an error returned after
// failAfter rows (when failAfter >= 0).
type memResult struct {
	names     []string
	types     []string
	rows      [][]driver.Value
	failAfter int
	failWith  error
}

var (
	memMu      sync.Mutex
	memResults = map[string]memResult{}
	registered sync.Once
)

type memDriver struct{}

func (memDriver) Open(string) (driver.Conn, error) { return memConn{}, nil }

type memConn struct{}

func (memConn) Prepare(query string) (driver.Stmt, error) { return memStmt{query}, nil }
func (memConn) Close() error                              { return nil }
func (memConn) Begin() (driver.Tx, error)                 { return nil, errors.New("no transactions") }

type memStmt struct{ query string }

func (memStmt) Close() error                               { return nil }
func (memStmt) NumInput() int                              { return 0 }
func (memStmt) Exec([]driver.Value) (driver.Result, error) { return nil, errors.New("read only") }
func (s memStmt) Query([]driver.Value) (driver.Rows, error) {
	memMu.Lock()
	r, ok := memResults[s.query]
	memMu.Unlock()
	if !ok {
		return nil, errors.New("no such result")
	}
	return &memRows{r: r}, nil
}

type memRows struct {
	r memResult
	i int
}

func (r *memRows) Columns() []string { return r.r.names }
func (r *memRows) Close() error      { return nil }
func (r *memRows) Next(dest []driver.Value) error {
	if r.r.failAfter >= 0 && r.i == r.r.failAfter {
		return r.r.failWith
	}
	if r.i == len(r.r.rows) {
		return io.EOF
	}
	copy(dest, r.r.rows[r.i])
	r.i++
	return nil
}
func (r *memRows) ColumnTypeDatabaseTypeName(j int) string { return r.r.types[j] }

// query registers result under a fresh name and returns its rows.
func query(t *testing.T, r memResult) *sql.Rows {
	t.Helper()
	registered.Do(func() { sql.Register("antecedent-mem", memDriver{}) })
	memMu.Lock()
	memResults[t.Name()] = r
	memMu.Unlock()
	db, err := sql.Open("antecedent-mem", "")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	rows, err := db.QueryContext(context.Background(), t.Name())
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestReadRowsMatchesCSV reads one table from CSV and from a result with
// typed columns (numeric, boolean, text, NULL) and compares the datasets
// bit for bit.
func TestReadRowsMatchesCSV(t *testing.T) {
	const csv = `dose,treated,site,arm,score
1.5,true,north,control,0
2.25,false,south,drug,1
,true,east,control,1
4,false,north,drug,0
3.5,,south,placebo,
0.5,true,east,control,1
`
	want, err := table.ReadCSV(strings.NewReader(csv), nil)
	if err != nil {
		t.Fatal(err)
	}
	rows := query(t, memResult{
		names: []string{"dose", "treated", "site", "arm", "score"},
		types: []string{"NUMERIC", "BOOL", "TEXT", "VARCHAR(10)", "INT4"},
		rows: [][]driver.Value{
			{[]byte("1.5"), true, "north", "control", int64(0)},
			{2.25, false, "south", "drug", int64(1)},
			{nil, true, "east", "control", int64(1)},
			{int64(4), false, "north", "drug", int64(0)},
			{"3.5", nil, "south", "placebo", nil},
			{0.5, true, "east", "control", int64(1)},
		},
		failAfter: -1,
	})
	got, err := table.ReadRows(context.Background(), rows, nil)
	if err != nil {
		t.Fatal(err)
	}
	sameDataset(t, got, want)
}

// sameDataset compares two datasets' variables and columns bit for bit.
func sameDataset(t *testing.T, got, want *table.Dataset) {
	t.Helper()
	if got.Rows() != want.Rows() {
		t.Fatalf("%d rows, want %d", got.Rows(), want.Rows())
	}
	gv, wv := got.Variables(), want.Variables()
	if len(gv) != len(wv) {
		t.Fatalf("%d variables, want %d", len(gv), len(wv))
	}
	for i := range gv {
		if gv[i].Name != wv[i].Name || gv[i].Kind != wv[i].Kind || strings.Join(gv[i].Levels, "|") != strings.Join(wv[i].Levels, "|") {
			t.Errorf("variable %d: %+v, want %+v", i, gv[i], wv[i])
		}
	}
	gc, wc := got.Columns(), want.Columns()
	for c := range gc {
		for i := range gc[c] {
			if math.Float64bits(gc[c][i]) != math.Float64bits(wc[c][i]) {
				t.Fatalf("column %s row %d: %v, want %v", got.TermName(c), i, gc[c][i], wc[c][i])
			}
		}
	}
}

func TestReadRowsErrors(t *testing.T) {
	dropped := errors.New("connection reset by peer")
	many := make([][]driver.Value, 300)
	for i := range many {
		many[i] = []driver.Value{float64(i)}
	}
	mixed := make([][]driver.Value, 0, 200)
	for i := range 200 {
		mixed = append(mixed, []driver.Value{int64(i)})
	}
	mixed[150] = []driver.Value{"-"}
	for _, tc := range []struct {
		name string
		r    memResult
		opts *table.ReadOptions
		want []string
		is   error
	}{
		{"mixed types", memResult{names: []string{"age"}, types: []string{"INTEGER"}, rows: mixed},
			nil, []string{`result row 151, column 1 ("age")`, `"-" is not a number`, `add "-" to ReadOptions.MissingCodes`, `add "age" to ReadOptions.AsIs`}, table.ErrData},
		{"date column", memResult{names: []string{"seen"}, types: []string{"DATE"}, rows: [][]driver.Value{{time.Now()}}},
			nil, []string{`column 1 ("seen")`, "the type DATE is not read"}, table.ErrData},
		{"time value", memResult{names: []string{"seen"}, types: []string{""}, rows: [][]driver.Value{{1.0}, {time.Date(2024, 1, 2, 0, 0, 0, 0, time.UTC)}}},
			nil, []string{`result row 2, column 1 ("seen")`, "2024-01-02T00:00:00Z is a date or time"}, table.ErrData},
		{"dropped connection", memResult{names: []string{"x"}, types: []string{"FLOAT8"}, rows: many, failAfter: 120, failWith: dropped},
			nil, []string{"failed after 120 rows", "connection reset by peer"}, dropped},
		{"too many rows", memResult{names: []string{"x"}, types: []string{"FLOAT8"}, rows: many},
			&table.ReadOptions{MaxRows: 100}, []string{"result row 101", "more than 100 rows"}, table.ErrData},
		{"duplicate names", memResult{names: []string{"x", "x"}, types: []string{"INT4", "INT4"}, rows: [][]driver.Value{{1, 2}}},
			nil, []string{`column 2 ("x"): name also used by column 1`}, table.ErrData},
		{"infinite", memResult{names: []string{"x"}, types: []string{"FLOAT8"}, rows: [][]driver.Value{{1.0}, {math.Inf(1)}}},
			nil, []string{`result row 2, column 1 ("x"): +Inf is infinite`}, table.ErrData},
		{"single level", memResult{names: []string{"arm"}, types: []string{"TEXT"}, rows: [][]driver.Value{{"a"}, {"a"}}},
			nil, []string{`text column "arm" has the single value "a"`}, table.ErrData},
		{"no rows", memResult{names: []string{"x"}, types: []string{"FLOAT8"}},
			nil, []string{"no rows"}, table.ErrData},
		{"unknown option column", memResult{names: []string{"x"}, types: []string{"FLOAT8"}, rows: [][]driver.Value{{1.0}}},
			&table.ReadOptions{AsIs: []string{"y"}}, []string{`ReadOptions.AsIs names "y", which is not a column of the source`}, table.ErrData},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if tc.r.failAfter == 0 && tc.r.failWith == nil {
				tc.r.failAfter = -1
			}
			_, err := table.ReadRows(context.Background(), query(t, tc.r), tc.opts)
			if err == nil {
				t.Fatal("no error")
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("error %q does not contain %q", err, w)
				}
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %q is not %v", err, tc.is)
			}
		})
	}
}

func TestReadRowsContext(t *testing.T) {
	rows := make([][]driver.Value, 5000)
	for i := range rows {
		rows[i] = []driver.Value{float64(i)}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := table.ReadRows(ctx, query(t, memResult{names: []string{"x"}, types: []string{"FLOAT8"}, rows: rows, failAfter: -1}), nil)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want context.Canceled", err)
	}
}
