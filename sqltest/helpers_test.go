package sqltest

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

// The clinic table: synthetic rows written as CSV and Parquet by another
// tool (apache-arrow and parquet-wasm under node; see
// ../table/parquetfile/testdata/write_fixtures.mjs).
const (
	clinicCSV     = "../table/parquetfile/testdata/clinic.csv"
	clinicParquet = "../table/parquetfile/testdata/clinic.parquet"
)

// clinicColumns are the clinic table's columns in file order.
const clinicColumns = "age, dose, treated, site, arm, relapse, smoker"

// csvAndParquet reads the clinic table from CSV and from Parquet.
func csvAndParquet(t *testing.T) (*table.Dataset, *table.Dataset) {
	t.Helper()
	f, err := os.Open(clinicCSV)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	fromCSV, err := table.ReadCSV(f, nil)
	if err != nil {
		t.Fatal(err)
	}
	fromParquet, err := parquetfile.Read(context.Background(), clinicParquet, nil)
	if err != nil {
		t.Fatal(err)
	}
	return fromCSV, fromParquet
}

// clinicRecords returns the clinic CSV's header and records.
func clinicRecords(t *testing.T) ([]string, [][]string) {
	t.Helper()
	f, err := os.Open(clinicCSV)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	all, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return all[0], all[1:]
}

// sameDataset compares two datasets' variables and columns bit for bit.
func sameDataset(t *testing.T, what string, got, want *table.Dataset) {
	t.Helper()
	if got.Rows() != want.Rows() {
		t.Fatalf("%s: %d rows, want %d", what, got.Rows(), want.Rows())
	}
	gv, wv := got.Variables(), want.Variables()
	if len(gv) != len(wv) {
		t.Fatalf("%s: %d variables, want %d", what, len(gv), len(wv))
	}
	for i := range gv {
		if gv[i].Name != wv[i].Name || gv[i].Kind != wv[i].Kind || strings.Join(gv[i].Levels, "|") != strings.Join(wv[i].Levels, "|") {
			t.Errorf("%s: variable %d: %+v, want %+v", what, i, gv[i], wv[i])
		}
	}
	gc, wc := got.Columns(), want.Columns()
	if len(gc) != len(wc) {
		t.Fatalf("%s: %d design columns, want %d", what, len(gc), len(wc))
	}
	for c := range gc {
		for i := range gc[c] {
			if math.Float64bits(gc[c][i]) != math.Float64bits(wc[c][i]) {
				t.Fatalf("%s: column %s row %d: %v, want %v", what, got.TermName(c), i, gc[c][i], wc[c][i])
			}
		}
	}
}

// variables maps each variable's name to its kind and levels, as
// "binary false/true".
func variables(d *table.Dataset) map[string]string {
	out := map[string]string{}
	for _, v := range d.Variables() {
		out[v.Name] = strings.TrimSpace(v.Kind.String() + " " + strings.Join(v.Levels, "/"))
	}
	return out
}
