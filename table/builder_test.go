package table_test

import (
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

// buildText feeds the cells of a CSV text (header, then rows without
// quotes) to a Builder as text cells, as a reader of a text-only source
// would.
func buildText(t testing.TB, text string, opts *table.ReadOptions) (*table.Dataset, error) {
	t.Helper()
	records, err := csv.NewReader(strings.NewReader(text)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	b, err := table.NewBuilder(records[0], opts, "result row")
	if err != nil {
		return nil, err
	}
	for _, r := range records[1:] {
		for j, c := range r {
			if err := b.Text(j, c); err != nil {
				return nil, err
			}
		}
	}
	return b.Dataset()
}

// csvMessage turns a ReadCSV message into the Builder's: lines become
// result rows (the file's line 2 is the first row; line 1, the header,
// is no row), and the fixes name ReadOptions.
func csvMessage(msg string) string {
	msg = strings.NewReplacer("CSV line", "result row", "correct the file", "correct the source", "CSVOptions", "ReadOptions").Replace(msg)
	shift := func(s string) string {
		n, _ := strconv.Atoi(s)
		return strconv.Itoa(n - 1)
	}
	msg = regexp.MustCompile(`(result row|line|lines) ([0-9]+(?:, [0-9]+)*)`).ReplaceAllStringFunc(msg, func(m string) string {
		sub := regexp.MustCompile(`^(result row|lines?) (.*)$`).FindStringSubmatch(m)
		word := map[string]string{"result row": "result row", "line": "result row", "lines": "result rows"}[sub[1]]
		nums := strings.Split(sub[2], ", ")
		for i, n := range nums {
			nums[i] = shift(n)
		}
		return word + " " + strings.Join(nums, ", ")
	})
	// The header's line: a problem of no one row.
	return strings.Replace(msg, "result row 0, ", "", 1)
}

// TestBuilderDecidesAsReadCSV feeds the same cells to ReadCSV and to a
// Builder: the datasets are equal bit for bit, and the errors say the
// same with result rows for lines.
func TestBuilderDecidesAsReadCSV(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	column := func(header string, n int, cell func(i int) string) string {
		var b strings.Builder
		b.WriteString(header + "\n")
		for i := range n {
			b.WriteString(cell(i) + "\n")
		}
		return b.String()
	}
	for _, tc := range []struct {
		name string
		text string
		opts *table.ReadOptions
	}{
		{"numbers, 0/1, true/false, text, missing", "x,y,z,arm,site\n1.5,0,true,control,north\n2,1,false,drug,south\nNA,,TRUE,control,\n-3e2,1,false,drug,east\n", nil},
		{"stray number among 0/1", column("y", 200, func(i int) string {
			if i == 150 {
				return "7"
			}
			return strconv.Itoa(i % 2)
		}), nil},
		{"text in numbers", column("x", 200, func(i int) string {
			if i == 33 || i == 80 {
				return "?"
			}
			return strconv.FormatFloat(rng.NormFloat64(), 'g', -1, 64)
		}), nil},
		{"text in numbers, declared missing", column("x", 200, func(i int) string {
			if i == 33 || i == 80 {
				return "?"
			}
			return strconv.FormatFloat(rng.NormFloat64(), 'g', -1, 64)
		}), &table.ReadOptions{MissingCodes: []string{"?"}}},
		{"numbers in text", column("arm", 200, func(i int) string {
			if i == 5 {
				return "12"
			}
			return []string{"control", "drug"}[i%2]
		}), nil},
		{"rare level", column("site", 300, func(i int) string {
			if i == 250 {
				return "nroth"
			}
			return []string{"north", "south", "east"}[i%3]
		}), nil},
		{"rare level kept", column("site", 300, func(i int) string {
			if i == 250 {
				return "nroth"
			}
			return []string{"north", "south", "east"}[i%3]
		}), &table.ReadOptions{AsIs: []string{"site"}}},
		{"levels differing in case", column("arm", 50, func(i int) string { return []string{"Drug", "drug", "control"}[i%3] }), nil},
		{"too many levels", column("id", 60, func(i int) string { return fmt.Sprintf("p%02d", i) }), nil},
		{"coding options", column("arm", 40, func(i int) string { return []string{"control", "drug", "placebo"}[i%3] }),
			&table.ReadOptions{Reference: map[string]string{"arm": "drug"}}},
		{"coded one", column("arm", 40, func(i int) string { return []string{"yes", "no"}[i%2] }),
			&table.ReadOptions{CodedOne: map[string]string{"arm": "no"}}},
		{"unknown reference level", column("arm", 40, func(i int) string { return []string{"yes", "no"}[i%2] }),
			&table.ReadOptions{Reference: map[string]string{"arm": "maybe"}}},
		{"decimal commas", column("x", 20, func(i int) string { return fmt.Sprintf("%d,5", i) }), nil},
		{"infinite", "x\n1\ninf\n", nil},
		{"single level", "x\na\na\n", nil},
		{"duplicate names", "x,x\n1,2\n", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			text := tc.text
			if tc.name == "decimal commas" {
				// Quoted for CSV: the cells hold the separator.
				text = regexp.MustCompile(`(?m)^([0-9]+,5)$`).ReplaceAllString(text, `"$1"`)
			}
			var copts *table.CSVOptions
			if o := tc.opts; o != nil {
				copts = &table.CSVOptions{MissingCodes: o.MissingCodes, Reference: o.Reference, CodedOne: o.CodedOne, AsIs: o.AsIs}
			}
			want, werr := table.ReadCSV(strings.NewReader(text), copts)
			got, gerr := buildText(t, text, tc.opts)
			switch {
			case werr != nil && gerr != nil:
				w := csvMessage(werr.Error())
				if tc.name == "decimal commas" {
					// The Builder has no DecimalComma option to offer.
					w = "table: result row 1, column 1 (\"x\"): values such as \"0,5\" are numbers written with a decimal comma; convert the column to numbers at the source"
				}
				if gerr.Error() != w {
					t.Errorf("Builder:\n%v\nReadCSV, lines as rows:\n%s", gerr, w)
				}
			case werr != nil || gerr != nil:
				t.Fatalf("ReadCSV: %v; Builder: %v", werr, gerr)
			default:
				sameDataset(t, got, want)
			}
		})
	}
}

func TestBuilderTypedCells(t *testing.T) {
	b, err := table.NewBuilder([]string{"n", "flag", "label"}, nil, "row")
	if err != nil {
		t.Fatal(err)
	}
	b.Part("part-0000.parquet")
	for i := range 4 {
		must(t, b.Number(0, float64(i)))
		must(t, b.Bool(1, i%2 == 0))
		must(t, b.Text(2, []string{"no", "yes"}[i%2]))
	}
	b.Part("part-0001.parquet")
	must(t, b.Numbers(0, []float64{4, 5}))
	must(t, b.Missing(1))
	must(t, b.Bool(1, true))
	must(t, b.Text(2, " yes "))
	must(t, b.Text(2, "NA"))
	d, err := b.Dataset()
	if err != nil {
		t.Fatal(err)
	}
	want, err := table.ReadCSV(strings.NewReader("n,flag,label\n0,true,no\n1,false,yes\n2,true,no\n3,false,yes\n4,,yes\n5,true,NA\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	sameDataset(t, d, want)

	// Messages name the row of its part.
	b, _ = table.NewBuilder([]string{"x"}, &table.ReadOptions{MaxRows: 3}, "row")
	b.Part("a.parquet")
	must(t, b.Numbers(0, []float64{1, 2}))
	b.Part("b.parquet")
	must(t, b.Number(0, 3))
	err = b.Number(0, 4)
	if want := `table: row 2 of b.parquet, column 1 ("x"): more than 3 rows`; err == nil || err.Error() != want {
		t.Errorf("error %v, want %s", err, want)
	}
	b, _ = table.NewBuilder([]string{"x", "y"}, nil, "row")
	must(t, b.Number(0, 1))
	if _, err := b.Dataset(); err == nil || !strings.Contains(err.Error(), `column 2 ("y"): 0 values, but column 1 ("x") has 1`) {
		t.Errorf("error %v", err)
	}
	b, _ = table.NewBuilder([]string{"x"}, &table.ReadOptions{MaxFieldBytes: 4}, "result row")
	if err := b.Text(0, "abcdef"); err == nil || err.Error() != `table: result row 1, column 1 ("x"): text longer than 4 bytes` {
		t.Errorf("error %v", err)
	}
	if _, err := table.NewBuilder(make([]string, 3), &table.ReadOptions{MaxColumns: 2}, "row"); err == nil || err.Error() != "table: 3 columns, more than the limit of 2" {
		t.Errorf("error %v", err)
	}
}

func must(t *testing.T, err error) {
	t.Helper()
	if err != nil {
		t.Fatal(err)
	}
}

func BenchmarkBuilderNumbers1MP50(b *testing.B) { benchBuilder(b, 1_000_000, 50) }

// benchBuilder feeds rows × cols numbers, one cell at a time, as ReadRows
// does, and decides the columns.
func benchBuilder(b *testing.B, rows, cols int) {
	names := make([]string, cols)
	for j := range names {
		names[j] = fmt.Sprintf("v%d", j)
	}
	b.SetBytes(int64(rows * cols * 8))
	for range b.N {
		bl, err := table.NewBuilder(names, nil, "row")
		if err != nil {
			b.Fatal(err)
		}
		for i := range rows {
			for j := range cols {
				if err := bl.Number(j, float64(i%97)+float64(j)/8); err != nil {
					b.Fatal(err)
				}
			}
		}
		if _, err := bl.Dataset(); err != nil {
			b.Fatal(err)
		}
	}
}
