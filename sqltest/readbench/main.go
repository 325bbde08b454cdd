// Command readbench measures the three readers — table.ReadCSV,
// table.ReadRows (PostgreSQL through pgx, and SQLite) and parquetfile —
// on one synthetic table: rows per second, and the peak resident memory
// of a process that does nothing but read, against the raw column store
// (rows × columns × 8 bytes).
//
// It writes the table (40 continuous columns with four decimals, 10 of
// 0s and 1s, from a fixed seed) as CSV and as Parquet (snappy, row groups
// of 128k rows) into -dir, loads it into the PostgreSQL server at
// ANTECEDENT_PG_URL (COPY) and, with -sqlite, into an SQLite file, then
// reads each -runs times, each read in a fresh child process whose peak
// memory the kernel reports (VmHWM). Every dataset is checked against the
// generated values before its figures are printed.
//
//	cd sqltest && ../sqltest/testdata/pg.sh start
//	ANTECEDENT_PG_URL=$(testdata/pg.sh url) go run ./readbench -rows 1000000 -cols 50
package main

import (
	"bufio"
	"context"
	"database/sql"
	"encoding/json"
	"flag"
	"fmt"
	"log"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"runtime/pprof"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
	_ "github.com/jackc/pgx/v5/stdlib"
	"github.com/parquet-go/parquet-go"
	_ "modernc.org/sqlite"

	"github.com/antecedent-lab/antecedent/table"
	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

func main() {
	rows := flag.Int("rows", 1_000_000, "rows of the table")
	cols := flag.Int("cols", 50, "columns of the table (the last fifth are 0/1)")
	dir := flag.String("dir", filepath.Join(os.TempDir(), "antecedent-readbench"), "where the CSV, Parquet and SQLite files are written")
	runs := flag.Int("runs", 3, "reads of each source (the best is reported)")
	withSQLite := flag.Bool("sqlite", false, "also load and read an SQLite file (slow to load)")
	only := flag.String("only", "", "comma-separated sources to read (csv, parquet, postgres, sqlite); empty: all")
	child := flag.String("child", "", "internal: read one source and report")
	cpuProfile := flag.String("cpuprofile", "", "with -child: write a CPU profile of the read here")
	flag.Parse()
	ctx := context.Background()
	if *child != "" {
		if *cpuProfile != "" {
			f, err := os.Create(*cpuProfile)
			if err != nil {
				log.Fatal(err)
			}
			pprof.StartCPUProfile(f)
			defer pprof.StopCPUProfile()
		}
		if err := readOne(ctx, *child, *dir, *rows, *cols); err != nil {
			pprof.StopCPUProfile()
			log.Fatal(err)
		}
		return
	}
	if err := os.MkdirAll(*dir, 0o755); err != nil {
		log.Fatal(err)
	}
	names := columnNames(*cols)
	if err := writeFiles(*dir, names, *rows); err != nil {
		log.Fatal(err)
	}
	sources := []string{"csv", "parquet"}
	if url := os.Getenv("ANTECEDENT_PG_URL"); url != "" {
		if err := loadPostgres(ctx, url, names, *rows); err != nil {
			log.Fatal(err)
		}
		sources = append(sources, "postgres")
	} else {
		fmt.Println("ANTECEDENT_PG_URL is not set: PostgreSQL left out")
	}
	if *withSQLite {
		if err := loadSQLite(ctx, filepath.Join(*dir, "table.db"), names, *rows); err != nil {
			log.Fatal(err)
		}
		sources = append(sources, "sqlite")
	}
	raw := float64(*rows) * float64(*cols) * 8 / (1 << 20)
	fmt.Printf("table: %d rows × %d columns; raw column store %.0f MiB\n", *rows, *cols, raw)
	fmt.Printf("%-10s %12s %14s %16s %10s\n", "source", "seconds", "rows/s", "peak RSS (MiB)", "× raw")
	for _, s := range sources {
		if *only != "" && !slices.Contains(strings.Split(*only, ","), s) {
			continue
		}
		best, peak := math.Inf(1), 0.0
		for range *runs {
			sec, rss, err := runChild(s, *dir, *rows, *cols)
			if err != nil {
				log.Fatalf("%s: %v", s, err)
			}
			best = min(best, sec)
			peak = max(peak, rss)
		}
		fmt.Printf("%-10s %12.2f %14.0f %16.0f %10.2f\n", s, best, float64(*rows)/best, peak, peak/raw)
	}
}

func columnNames(n int) []string {
	names := make([]string, n)
	for j := range names {
		names[j] = fmt.Sprintf("v%02d", j)
	}
	return names
}

// binaryFrom is the first 0/1 column.
func binaryFrom(cols int) int { return cols - cols/5 }

// cell returns the table's value at row i, column j: a number with four
// decimals, or 0/1 in the last fifth of the columns. Every value is drawn
// from a generator seeded by the row, so any reader can recompute it.
func rowValues(i, cols int, out []float64) {
	r := rand.New(rand.NewPCG(uint64(i), 7))
	for j := range cols {
		if j >= binaryFrom(cols) {
			out[j] = float64(r.IntN(2))
		} else {
			out[j] = math.Round((r.NormFloat64()*10+float64(j))*1e4) / 1e4
		}
	}
}

// writeFiles writes table.csv and table.parquet unless they exist.
func writeFiles(dir string, names []string, rows int) error {
	csvPath, pqPath := filepath.Join(dir, "table.csv"), filepath.Join(dir, "table.parquet")
	cols := len(names)
	if _, err := os.Stat(csvPath); err != nil {
		f, err := os.Create(csvPath)
		if err != nil {
			return err
		}
		w := bufio.NewWriterSize(f, 1<<20)
		w.WriteString(strings.Join(names, ",") + "\n")
		x := make([]float64, cols)
		var buf []byte
		for i := range rows {
			rowValues(i, cols, x)
			buf = buf[:0]
			for j, v := range x {
				if j > 0 {
					buf = append(buf, ',')
				}
				buf = strconv.AppendFloat(buf, v, 'g', -1, 64)
			}
			buf = append(buf, '\n')
			w.Write(buf)
		}
		if err := w.Flush(); err != nil {
			return err
		}
		if err := f.Close(); err != nil {
			return err
		}
	}
	if _, err := os.Stat(pqPath); err != nil {
		group := parquet.Group{}
		for j, n := range names {
			if j >= binaryFrom(cols) {
				group[n] = parquet.Leaf(parquet.Int64Type)
			} else {
				group[n] = parquet.Leaf(parquet.DoubleType)
			}
		}
		f, err := os.Create(pqPath)
		if err != nil {
			return err
		}
		w := parquet.NewWriter(f, parquet.NewSchema("table", group), parquet.Compression(&parquet.Snappy), parquet.MaxRowsPerRowGroup(128<<10))
		x := make([]float64, cols)
		batch := make([]parquet.Row, 0, 1024)
		for i := range rows {
			rowValues(i, cols, x)
			row := make(parquet.Row, cols)
			for j, v := range x {
				if j >= binaryFrom(cols) {
					row[j] = parquet.Int64Value(int64(v)).Level(0, 0, j)
				} else {
					row[j] = parquet.DoubleValue(v).Level(0, 0, j)
				}
			}
			batch = append(batch, row)
			if len(batch) == cap(batch) || i == rows-1 {
				if _, err := w.WriteRows(batch); err != nil {
					return err
				}
				batch = batch[:0]
			}
		}
		if err := w.Close(); err != nil {
			return err
		}
		if err := f.Close(); err != nil {
			return err
		}
	}
	return nil
}

// loadPostgres loads the table into readbench (float8 and smallint
// columns) with COPY.
func loadPostgres(ctx context.Context, url string, names []string, rows int) error {
	conn, err := pgx.Connect(ctx, url)
	if err != nil {
		return err
	}
	defer conn.Close(ctx)
	cols := len(names)
	var n int
	if err := conn.QueryRow(ctx, "SELECT count(*) FROM readbench").Scan(&n); err == nil && n == rows {
		return nil
	}
	decl := make([]string, cols)
	for j, name := range names {
		decl[j] = name + " float8"
		if j >= binaryFrom(cols) {
			decl[j] = name + " smallint"
		}
	}
	if _, err := conn.Exec(ctx, "DROP TABLE IF EXISTS readbench; CREATE TABLE readbench (row_id int PRIMARY KEY, "+strings.Join(decl, ", ")+")"); err != nil {
		return err
	}
	x := make([]float64, cols)
	i := 0
	src := pgx.CopyFromFunc(func() ([]any, error) {
		if i == rows {
			return nil, nil
		}
		rowValues(i, cols, x)
		vals := make([]any, cols+1)
		vals[0] = int32(i)
		for j, v := range x {
			if j >= binaryFrom(cols) {
				vals[j+1] = int16(v)
			} else {
				vals[j+1] = v
			}
		}
		i++
		return vals, nil
	})
	_, err = conn.CopyFrom(ctx, pgx.Identifier{"readbench"}, append([]string{"row_id"}, names...), src)
	return err
}

// loadSQLite writes the table into an SQLite file unless it is there.
func loadSQLite(ctx context.Context, path string, names []string, rows int) error {
	if _, err := os.Stat(path); err == nil {
		return nil
	}
	db, err := sql.Open("sqlite", path+".tmp")
	if err != nil {
		return err
	}
	defer db.Close()
	cols := len(names)
	decl := make([]string, cols)
	for j, name := range names {
		decl[j] = name + " REAL"
		if j >= binaryFrom(cols) {
			decl[j] = name + " INTEGER"
		}
	}
	if _, err := db.ExecContext(ctx, "PRAGMA journal_mode=OFF; PRAGMA synchronous=OFF; CREATE TABLE readbench (row_id INTEGER PRIMARY KEY, "+strings.Join(decl, ", ")+")"); err != nil {
		return err
	}
	tx, err := db.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	stmt, err := tx.PrepareContext(ctx, "INSERT INTO readbench VALUES (?"+strings.Repeat(", ?", cols)+")")
	if err != nil {
		return err
	}
	x := make([]float64, cols)
	args := make([]any, cols+1)
	for i := range rows {
		rowValues(i, cols, x)
		args[0] = i
		for j, v := range x {
			args[j+1] = v
		}
		if _, err := stmt.ExecContext(ctx, args...); err != nil {
			return err
		}
	}
	if err := tx.Commit(); err != nil {
		return err
	}
	db.Close()
	return os.Rename(path+".tmp", path)
}

// runChild reads one source in a child process and returns the seconds
// it reported and its peak resident memory in MiB.
func runChild(source, dir string, rows, cols int) (float64, float64, error) {
	cmd := exec.Command(os.Args[0], "-child", source, "-dir", dir, "-rows", strconv.Itoa(rows), "-cols", strconv.Itoa(cols))
	cmd.Stderr = os.Stderr
	out, err := cmd.Output()
	if err != nil {
		return 0, 0, err
	}
	var rep report
	if err := json.Unmarshal(out, &rep); err != nil {
		return 0, 0, fmt.Errorf("child said %q: %v", out, err)
	}
	return rep.Seconds, rep.PeakMiB, nil
}

// report is what a child process prints.
type report struct {
	Seconds float64
	PeakMiB float64 // the process's peak resident memory
}

// peakMiB returns the process's peak resident set size (VmHWM in
// /proc/self/status; getrusage would count the parent's memory at fork).
func peakMiB() (float64, error) {
	status, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0, err
	}
	for _, line := range strings.Split(string(status), "\n") {
		if rest, ok := strings.CutPrefix(line, "VmHWM:"); ok {
			kb, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(rest), "kB")), 64)
			return kb / 1024, err
		}
	}
	return 0, fmt.Errorf("no VmHWM in /proc/self/status")
}

// readOne reads one source, checks it against the table, and prints the
// time taken as JSON.
func readOne(ctx context.Context, source, dir string, rows, cols int) error {
	start := time.Now()
	var d *table.Dataset
	var err error
	switch source {
	case "csv":
		var f *os.File
		if f, err = os.Open(filepath.Join(dir, "table.csv")); err != nil {
			return err
		}
		d, err = table.ReadCSV(f, nil)
		f.Close()
	case "parquet":
		d, err = parquetfile.Read(ctx, filepath.Join(dir, "table.parquet"), nil)
	case "postgres", "sqlite":
		driver, dsn := "pgx", os.Getenv("ANTECEDENT_PG_URL")
		if source == "sqlite" {
			driver, dsn = "sqlite", filepath.Join(dir, "table.db")
		}
		var db *sql.DB
		if db, err = sql.Open(driver, dsn); err != nil {
			return err
		}
		defer db.Close()
		var r *sql.Rows
		if r, err = db.QueryContext(ctx, "SELECT "+strings.Join(columnNames(cols), ", ")+" FROM readbench ORDER BY row_id"); err != nil {
			return err
		}
		d, err = table.ReadRows(ctx, r, nil)
	default:
		return fmt.Errorf("unknown source %q", source)
	}
	if err != nil {
		return err
	}
	sec := time.Since(start).Seconds()
	peak, err := peakMiB()
	if err != nil {
		return err
	}
	if err := check(d, rows, cols); err != nil {
		return fmt.Errorf("%s: %v", source, err)
	}
	return json.NewEncoder(os.Stdout).Encode(report{sec, peak})
}

// check compares d with the table's values, and its kinds. Values are
// compared with == rather than bit for bit: SQLite stores a REAL with no
// fraction as an integer, so -0 comes back as 0.
func check(d *table.Dataset, rows, cols int) error {
	if d.Rows() != rows || len(d.Names()) != cols {
		return fmt.Errorf("%d × %d, want %d × %d", d.Rows(), len(d.Names()), rows, cols)
	}
	x := make([]float64, cols)
	data := d.Columns()
	for i := range rows {
		rowValues(i, cols, x)
		for j, v := range x {
			if data[j][i] != v {
				return fmt.Errorf("row %d column %d: %v, want %v", i, j, data[j][i], v)
			}
		}
	}
	for j, v := range d.Variables() {
		want := table.Continuous
		if j >= binaryFrom(cols) {
			want = table.Binary
		}
		if v.Kind != want || !slices.Equal(v.Levels, d.Variables()[j].Levels) {
			return fmt.Errorf("%s is %v", v.Name, v.Kind)
		}
	}
	return nil
}
