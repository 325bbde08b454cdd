// Package sqltest checks table.ReadRows against real databases: a
// PostgreSQL server (started by testdata/pg.sh, found through the
// ANTECEDENT_PG_URL environment variable) and SQLite through a pure-Go
// driver. It also reads one table through all three readers — CSV, a
// database and Parquet — and compares the datasets bit for bit.
//
// It is a module of its own so that the database drivers stay out of the
// core module's dependencies; its go.mod requires the core with a replace
// of ../. The command antecedent-sql (cmd/antecedent-sql) reads a table
// from a database URL.
package sqltest
