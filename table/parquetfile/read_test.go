package parquetfile_test

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
	"github.com/antecedent-lab/antecedent/table/parquetfile"
)

// The files in testdata were written by another tool: apache-arrow 21.2.0
// and parquet-wasm 0.8.0 under node (testdata/write_fixtures.mjs;
// testdata/versions.json records the versions), with snappy, zstd and
// gzip compression, dictionary-encoded strings and several row groups.

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
	if len(gc) != len(wc) {
		t.Fatalf("%d design columns, want %d", len(gc), len(wc))
	}
	for c := range gc {
		for i := range gc[c] {
			if math.Float64bits(gc[c][i]) != math.Float64bits(wc[c][i]) {
				t.Fatalf("column %s row %d: %v, want %v", got.TermName(c), i, gc[c][i], wc[c][i])
			}
		}
	}
}

func readCSV(t *testing.T, path string) *table.Dataset {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	d, err := table.ReadCSV(f, nil)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// TestReadMatchesCSV reads the same table written as Parquet (one file in
// three row groups, and three parts in a directory) and as CSV by the
// same script, and compares the datasets bit for bit.
func TestReadMatchesCSV(t *testing.T) {
	want := readCSV(t, "testdata/clinic.csv")
	for _, path := range []string{"testdata/clinic.parquet", "testdata/clinic-parts"} {
		t.Run(path, func(t *testing.T) {
			got, err := parquetfile.Read(context.Background(), path, nil)
			if err != nil {
				t.Fatal(err)
			}
			sameDataset(t, got, want)
		})
	}
	// What the table holds, as the script wrote it.
	d, err := parquetfile.Read(context.Background(), "testdata/clinic.parquet", nil)
	if err != nil {
		t.Fatal(err)
	}
	kinds := map[string]string{}
	for _, v := range d.Variables() {
		kinds[v.Name] = v.Kind.String() + " " + strings.Join(v.Levels, "/")
	}
	for name, want := range map[string]string{
		"age": "continuous ", "dose": "continuous ", "treated": "binary false/true",
		"site": "categorical east/north/south", "arm": "categorical control/drug/placebo",
		"relapse": "binary 0/1", "smoker": "binary no/yes",
	} {
		if kinds[name] != want {
			t.Errorf("%s: %q, want %q", name, kinds[name], want)
		}
	}
}

// TestReadTypes reads logical types beyond the main table (8-bit and
// unsigned 32-bit integers, 32-bit floats, a 64-bit integer beyond 2^53,
// large strings, booleans, all with nulls) and compares them with the
// values the writing script recorded in typed.json.
func TestReadTypes(t *testing.T) {
	raw, err := os.ReadFile("testdata/typed.json")
	if err != nil {
		t.Fatal(err)
	}
	var written map[string][]any
	if err := json.Unmarshal(raw, &written); err != nil {
		t.Fatal(err)
	}
	d, err := parquetfile.Read(context.Background(), "testdata/typed.parquet", nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"small", "unsigned", "single", "large"} {
		col, err := d.Column(name)
		if err != nil {
			t.Fatal(err)
		}
		for i, w := range written[name] {
			want := math.NaN()
			switch w := w.(type) {
			case float64:
				want = w
			case string: // a 64-bit integer, written as its digits
				want, _ = strconv.ParseFloat(w, 64)
			}
			if math.Float64bits(col[i]) != math.Float64bits(want) && !(math.IsNaN(want) && math.IsNaN(col[i])) {
				t.Errorf("%s row %d: %v, want %v", name, i+1, col[i], want)
			}
		}
	}
	vars := map[string]table.Variable{}
	for _, v := range d.Variables() {
		vars[v.Name] = v
	}
	if v := vars["label"]; v.Kind != table.Categorical || strings.Join(v.Levels, ",") != "alpha,beta,gamma" {
		t.Errorf("label: %v %v", v.Kind, v.Levels)
	}
	flag, _ := d.Column("flag")
	for i, w := range written["flag"] {
		want := math.NaN()
		if b, ok := w.(bool); ok && b {
			want = 1
		} else if ok {
			want = 0
		}
		if flag[i] != want && !(math.IsNaN(want) && math.IsNaN(flag[i])) {
			t.Errorf("flag row %d: %v, want %v", i+1, flag[i], want)
		}
	}
	if v := vars["flag"]; v.Kind != table.Binary || v.Levels[1] != "true" {
		t.Errorf("flag: %v %v", v.Kind, v.Levels)
	}
}

func TestReadErrors(t *testing.T) {
	for _, tc := range []struct {
		path string
		want []string
		is   error
	}{
		{"testdata/date.parquet", []string{"date.parquet", `column "visit"`, "not read"}, parquetfile.ErrFile},
		{"testdata/list.parquet", []string{"list.parquet", `column "doses"`, "nested group or list"}, parquetfile.ErrFile},
		{"testdata/mixed.parquet", []string{`row 58 of mixed.parquet, column 1 ("level")`, `"-" is not a number`, `add "-" to ReadOptions.MissingCodes`}, table.ErrData},
		{"testdata/no-such.parquet", []string{"no-such.parquet"}, os.ErrNotExist},
		{"testdata", []string{"no files ending in .parquet"}, parquetfile.ErrFile},
	} {
		t.Run(tc.path, func(t *testing.T) {
			path := tc.path
			if path == "testdata" {
				path = t.TempDir()
			}
			_, err := parquetfile.Read(context.Background(), path, nil)
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

// TestReadBadBytes cuts and damages a good file: every truncation and
// every damaged stretch gives an error naming the file, never a panic.
func TestReadBadBytes(t *testing.T) {
	good, err := os.ReadFile("testdata/clinic.parquet")
	if err != nil {
		t.Fatal(err)
	}
	read := func(b []byte) error {
		_, err := parquetfile.ReadFrom(context.Background(), bytes.NewReader(b), int64(len(b)), "clinic.parquet", nil)
		return err
	}
	wrongMagic := append([]byte("PK\x03\x04"), good[4:]...)
	for _, tc := range []struct {
		name string
		data []byte
		want string
	}{
		{"wrong magic", wrongMagic, `clinic.parquet: not a Parquet file (it does not begin with "PAR1")`},
		{"truncated", good[:len(good)-100], `clinic.parquet: the file does not end with "PAR1": truncated`},
		{"too short", good[:7], "clinic.parquet: 7 bytes, too short"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			err := read(tc.data)
			if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, parquetfile.ErrFile) {
				t.Fatalf("error %v, want %q", err, tc.want)
			}
		})
	}
	// Every cut: the file no longer ends with its magic bytes.
	for n := 0; n < len(good); n += 61 {
		if err := read(good[:n]); err == nil || !strings.Contains(err.Error(), "clinic.parquet") {
			t.Fatalf("cut at %d: error %v", n, err)
		}
	}
	// Damaged stretches inside: an error or, where the damage falls on
	// bytes that do not matter (padding, statistics), the right data.
	want, err := parquetfile.ReadFrom(context.Background(), bytes.NewReader(good), int64(len(good)), "clinic.parquet", nil)
	if err != nil {
		t.Fatal(err)
	}
	for at := 4; at+8 < len(good)-8; at += 37 {
		bad := bytes.Clone(good)
		for k := range 8 {
			bad[at+k] ^= 0x5a
		}
		d, err := parquetfile.ReadFrom(context.Background(), bytes.NewReader(bad), int64(len(bad)), "clinic.parquet", nil)
		if err != nil {
			continue
		}
		if d.Rows() != want.Rows() {
			t.Errorf("damage at %d: %d rows read without an error", at, d.Rows())
		}
	}
}

// TestReadPartsDiffer: parts with other columns than the first are
// refused, naming the part.
func TestReadPartsDiffer(t *testing.T) {
	dir := t.TempDir()
	for name, from := range map[string]string{"part-0000.parquet": "testdata/clinic.parquet", "part-0001.parquet": "testdata/typed.parquet", "notes.txt": "testdata/typed.json"} {
		b, err := os.ReadFile(from)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	_, err := parquetfile.Read(context.Background(), dir, nil)
	if want := "parquetfile: part-0001.parquet has 6 columns, the first part 7"; err == nil || err.Error() != want || !errors.Is(err, parquetfile.ErrFile) {
		t.Fatalf("error %v, want %s", err, want)
	}
}

func TestReadContext(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := parquetfile.Read(ctx, "testdata/clinic.parquet", nil); !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want context.Canceled", err)
	}
}

func BenchmarkReadClinic(b *testing.B) {
	data, err := os.ReadFile("testdata/clinic.parquet")
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	for range b.N {
		if _, err := parquetfile.ReadFrom(context.Background(), bytes.NewReader(data), int64(len(data)), "clinic.parquet", nil); err != nil {
			b.Fatal(err)
		}
	}
}
