// Command database shows the three ways into antecedent side by side
// with a database: it reads a table from a database/sql query with
// table.ReadRows, discovers the network over it, and prints the edges.
//
// Without -url it makes an SQLite database of its own (pure-Go driver
// modernc.org/sqlite) holding the shipped synthetic joint-replacement
// study, with declared column types (REAL, INTEGER, TEXT), and reads it
// back. With -url it reads any PostgreSQL table or view through pgx:
//
//	go run . -url 'postgres://analyst@db.example:5432/clinic' \
//	    -query 'SELECT * FROM study' -order study.order -complete-case
//
// The password of a URL is never printed; give it in the URL or in
// PGPASSWORD as libpq-style clients do. The drivers live in this
// example's own module, so the antecedent module itself requires none.
//
// Results are hypotheses from observational data, not findings; see the
// README's cautions.
package main

import (
	"context"
	"database/sql"
	"flag"
	"fmt"
	"io"
	"log"
	"net/url"
	"os"
	"strings"

	_ "github.com/jackc/pgx/v5/stdlib"
	_ "modernc.org/sqlite"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/demo"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

func main() {
	dbURL := flag.String("url", "", "a PostgreSQL URL (postgres://user@host:port/db); empty: an SQLite database of the demonstration study")
	query := flag.String("query", "SELECT * FROM study", "the query whose result is the table")
	ordPath := flag.String("order", "", "order file (default: the demonstration study's order)")
	completeCase := flag.Bool("complete-case", false, "use only the rows where every variable is present (NULLs are missing values)")
	flag.Parse()
	cfg := &antecedent.Config{Seed: 1}
	if *completeCase {
		cfg.Missing = table.MissingCompleteCase
	}
	if err := run(context.Background(), os.Stdout, *dbURL, *query, *ordPath, cfg); err != nil {
		log.Fatal(err)
	}
}

// run reads the query's result from the database at dbURL (or from a
// fresh SQLite copy of the demonstration study), discovers the network,
// and writes the edges to w.
func run(ctx context.Context, w io.Writer, dbURL, query, ordPath string, cfg *antecedent.Config) error {
	var db *sql.DB
	var err error
	if dbURL == "" {
		db, err = demoDatabase(ctx)
		if err != nil {
			return err
		}
		fmt.Fprintln(w, "database: SQLite, a synthetic joint-replacement study")
	} else {
		u, err := url.Parse(dbURL)
		if err != nil {
			return fmt.Errorf("-url: not a URL (%v)", redact(err.Error(), dbURL))
		}
		if db, err = sql.Open("pgx", dbURL); err != nil {
			return fmt.Errorf("%s: %s", u.Redacted(), redact(err.Error(), dbURL))
		}
		fmt.Fprintln(w, "database:", u.Redacted())
	}
	defer db.Close()

	rows, err := db.QueryContext(ctx, query)
	if err != nil {
		return fmt.Errorf("query: %s", redact(err.Error(), dbURL))
	}
	d, err := table.ReadRows(ctx, rows, nil)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "read %d rows of %d variables\n", d.Rows(), len(d.Names()))

	o := demo.Order()
	if ordPath != "" {
		f, err := os.Open(ordPath)
		if err != nil {
			return err
		}
		defer f.Close()
		if o, err = order.Parse(f); err != nil {
			return fmt.Errorf("%s: %w", ordPath, err)
		}
	}
	res, err := antecedent.DiscoverContext(ctx, d, o, cfg)
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "%d edges:\n", len(res.Edges))
	for _, e := range res.Edges {
		fmt.Fprintf(w, "  %s → %s\n", e.From, e.To)
	}
	fmt.Fprintln(w, "These edges are hypotheses from observational data, not proof of cause; check them with subject experts before any clinical use.")
	return nil
}

// redact removes the password of dbURL from a driver's message.
func redact(msg, dbURL string) string {
	u, err := url.Parse(dbURL)
	if err != nil || u.User == nil {
		return msg
	}
	if p, ok := u.User.Password(); ok && p != "" {
		msg = strings.ReplaceAll(msg, p, "xxxxx")
	}
	return msg
}

// demoDatabase returns an in-memory SQLite database whose table study
// holds the demonstration study, each column declared with the type its
// values have: REAL for continuous, INTEGER for 0/1 and TEXT for text.
func demoDatabase(ctx context.Context) (*sql.DB, error) {
	raw, err := demo.File("joint_replacement.csv")
	if err != nil {
		return nil, err
	}
	d, err := table.ReadCSV(strings.NewReader(string(raw)), nil)
	if err != nil {
		return nil, err
	}
	db, err := sql.Open("sqlite", ":memory:")
	if err != nil {
		return nil, err
	}
	db.SetMaxOpenConns(1) // one connection: one in-memory database
	vars := d.Variables()
	decl := make([]string, len(vars))
	for i, v := range vars {
		typ := "REAL"
		switch {
		case v.Kind == table.Binary && v.Levels[0] == "0":
			typ = "INTEGER"
		case v.Kind != table.Continuous:
			typ = "TEXT"
		}
		decl[i] = v.Name + " " + typ
	}
	if _, err := db.ExecContext(ctx, "CREATE TABLE study ("+strings.Join(decl, ", ")+")"); err != nil {
		db.Close()
		return nil, err
	}
	tx, err := db.BeginTx(ctx, nil)
	if err != nil {
		db.Close()
		return nil, err
	}
	insert := "INSERT INTO study VALUES (" + strings.TrimSuffix(strings.Repeat("?, ", len(vars)), ", ") + ")"
	lines := strings.Split(strings.TrimSpace(string(raw)), "\n")[1:]
	for _, line := range lines {
		cells := strings.Split(line, ",")
		args := make([]any, len(cells))
		for j, c := range cells {
			if c != "" {
				args[j] = c // SQLite stores it by the column's type affinity
			}
		}
		if _, err := tx.ExecContext(ctx, insert, args...); err != nil {
			tx.Rollback()
			db.Close()
			return nil, err
		}
	}
	if err := tx.Commit(); err != nil {
		db.Close()
		return nil, err
	}
	return db, nil
}
