package table_test

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

func TestReadCSVKinds(t *testing.T) {
	in := "\ufeffage,smoker,sex,site,score,flag\n" +
		"61,1,female,north,2.5,true\n" +
		"70,0,male ,south,NA,false\n" +
		"55,1,male,north,3.25,TRUE\n" +
		"48,,female,east,1,false\n" +
		"52,0, female,north,2,false\n"
	d, err := table.ReadCSV(strings.NewReader(in), nil)
	if err != nil {
		t.Fatal(err)
	}
	vars := d.Variables()
	want := []struct {
		name   string
		kind   table.Kind
		levels []string
		coding string
	}{
		{"age", table.Continuous, nil, ""},
		{"smoker", table.Binary, []string{"0", "1"}, "1 vs 0 (reference)"},
		// Three female, two male (one with a trailing space, trimmed):
		// the most common level is the reference.
		{"sex", table.Binary, []string{"female", "male"}, `"male" = 1, "female" = 0 (reference)`},
		{"site", table.Categorical, []string{"north", "east", "south"}, `"east", "south" each vs "north" (reference)`},
		{"score", table.Continuous, nil, ""},
		{"flag", table.Binary, []string{"false", "true"}, `"true" = 1, "false" = 0 (reference)`},
	}
	for i, w := range want {
		v := vars[i]
		if v.Name != w.name || v.Kind != w.kind || !slices.Equal(v.Levels, w.levels) || v.Coding() != w.coding {
			t.Errorf("variable %d: %+v coded %q, want %+v", i, v, v.Coding(), w)
		}
	}
	sex, _ := d.Column("sex")
	if !slices.Equal(sex, []float64{0, 1, 1, 0, 0}) {
		t.Errorf("sex coded %v (male is 1)", sex)
	}
	smoker, _ := d.Column("smoker")
	if !math.IsNaN(smoker[3]) {
		t.Errorf("empty cell read as %g", smoker[3])
	}
	flag, _ := d.Column("flag")
	if !slices.Equal(flag, []float64{1, 0, 1, 0, 0}) {
		t.Errorf("flag %v", flag)
	}
	if _, err := d.Column("site"); err == nil {
		t.Error("a categorical variable has no single column")
	}
	if got := []string{d.TermName(4), d.Contrast(4), d.Contrast(2), d.Contrast(0), d.Contrast(1)}; !slices.Equal(got,
		[]string{"site=south", `"south" vs "north"`, `"male" vs "female"`, "per unit", "1 vs 0"}) {
		t.Errorf("terms and contrasts %q", got)
	}
}

// TestDefaultReference checks the stated default: a level that reads as
// an absence, else the most common level (ties: the first in sorted
// order).
func TestDefaultReference(t *testing.T) {
	cases := []struct {
		name   string
		values []string
		ref    string
	}{
		{"yes/no, yes more common", []string{"yes", "yes", "no"}, "no"},
		{"case/control", []string{"case", "control", "case"}, "control"},
		{"admitted/not admitted", []string{"admitted", "not admitted", "admitted"}, "not admitted"},
		{"smoker/non-smoker", []string{"smoker", "non-smoker"}, "non-smoker"},
		{"most common", []string{"north", "east", "east", "south"}, "east"},
		{"tie goes to sorted first", []string{"b", "a", "b", "a"}, "a"},
		{"two absent words: most common", []string{"no", "none", "none", "some"}, "none"},
	}
	for _, c := range cases {
		d := &table.Dataset{}
		if err := d.AddText("x", c.values, 0); err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		if got := d.Variables()[0].Reference(); got != c.ref {
			t.Errorf("%s: reference %q, want %q", c.name, got, c.ref)
		}
	}
}

// TestReadCSVCodingChoice checks Reference and CodedOne, and that the
// codes follow the choice.
func TestReadCSVCodingChoice(t *testing.T) {
	in := "outcome,region,smoker\ncase,north,1\ncontrol,south,0\ncontrol,east,1\ncase,east,0\ncontrol,north,0\n"
	cases := []struct {
		name    string
		opts    table.CSVOptions
		outcome []float64
		region  []string
		err     string
	}{
		{"defaults", table.CSVOptions{}, []float64{1, 0, 0, 1, 0}, []string{"east", "north", "south"}, ""},
		{"coded one", table.CSVOptions{CodedOne: map[string]string{"outcome": "control"}}, []float64{0, 1, 1, 0, 1}, []string{"east", "north", "south"}, ""},
		{"reference", table.CSVOptions{Reference: map[string]string{"outcome": "case", "region": "south"}}, []float64{0, 1, 1, 0, 1}, []string{"south", "east", "north"}, ""},
		{"0/1 kept", table.CSVOptions{CodedOne: map[string]string{"smoker": "1"}, Reference: map[string]string{"smoker": "0"}}, []float64{1, 0, 0, 1, 0}, []string{"east", "north", "south"}, ""},
		{"unknown column", table.CSVOptions{Reference: map[string]string{"regoin": "east"}}, nil, nil,
			`table: bad CSV: CSVOptions.Reference names "regoin", which is not a column of the file (columns: "outcome", "region", "smoker")`},
		{"unknown level", table.CSVOptions{Reference: map[string]string{"region": "west"}}, nil, nil,
			`table: CSV line 1, column 2 ("region"): "region" has no level "west" (its levels: "east", "north", "south")`},
		{"categorical has no level coded 1", table.CSVOptions{CodedOne: map[string]string{"region": "west"}}, nil, nil,
			`table: CSV line 1, column 2 ("region"): "region" is categorical; only a binary variable has a level coded 1 (choose a reference level instead)`},
		{"0/1 column cannot flip", table.CSVOptions{CodedOne: map[string]string{"smoker": "0"}}, nil, nil,
			`table: CSV line 1, column 3 ("smoker"): "smoker" is a 0/1 column and keeps its coding (1 vs 0 (reference)); to model the 0s, write the column the other way round in the file`},
		{"both ways", table.CSVOptions{CodedOne: map[string]string{"outcome": "case"}, Reference: map[string]string{"outcome": "case"}}, nil, nil,
			`table: CSV line 1, column 1 ("outcome"): "case" is given both as the reference and as the level coded 1`},
	}
	for _, c := range cases {
		d, err := table.ReadCSV(strings.NewReader(in), &c.opts)
		if c.err != "" {
			if err == nil || err.Error() != c.err {
				t.Errorf("%s: error\n%v\nwant\n%s", c.name, err, c.err)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		got, _ := d.Column("outcome")
		if !slices.Equal(got, c.outcome) {
			t.Errorf("%s: outcome coded %v, want %v", c.name, got, c.outcome)
		}
		if lv := d.Variables()[1].Levels; !slices.Equal(lv, c.region) {
			t.Errorf("%s: region levels %q, want %q", c.name, lv, c.region)
		}
		// The indicators follow the levels: row 3 is east.
		cols := d.Columns()
		terms := d.Terms(1)
		for k, tc := range terms {
			want := 0.0
			if c.region[k+1] == "east" {
				want = 1
			}
			if cols[tc][2] != want {
				t.Errorf("%s: indicator %s row 3 is %g", c.name, d.TermName(tc), cols[tc][2])
			}
		}
	}
}

// column writes a CSV of n rows with the header head, row i from row(i).
func column(head string, n int, row func(i int) string) string {
	var b strings.Builder
	b.WriteString(head + "\n")
	for i := range n {
		b.WriteString(row(i) + "\n")
	}
	return b.String()
}

// numbersWith returns a 200-row CSV "id,age" with cell values put at the
// given 0-based data rows (file line = row + 2).
func numbersWith(cells map[int]string) string {
	return column("id,age", 200, func(i int) string {
		if v, ok := cells[i]; ok {
			return fmt.Sprintf("%d,%s", i, v)
		}
		return fmt.Sprintf("%d,%d", i, 40+i%30)
	})
}

// TestReadCSVOddCells checks, with the exact message a user sees, that a
// single bad cell is named with its line, column and value, with the fix
// that fits it, and that nothing is re-typed silently (issue 13).
func TestReadCSVOddCells(t *testing.T) {
	flags := column("id,smoker", 120, func(i int) string {
		if i == 40 {
			return "40,yes"
		}
		return fmt.Sprintf("%d,%d", i, i%2)
	})
	sexes := func(odd map[int]string) string {
		return column("id,sex", 400, func(i int) string {
			if v, ok := odd[i]; ok {
				return fmt.Sprintf("%d,%s", i, v)
			}
			return fmt.Sprintf("%d,%s", i, []string{"female", "male"}[i%2])
		})
	}
	zeroOne := column("id,smoker", 500, func(i int) string {
		if i == 31 {
			return "31,2"
		}
		return fmt.Sprintf("%d,%d", i, i%2)
	})
	cases := []struct {
		name string
		in   string
		opts *table.CSVOptions
		want string
	}{
		{"letter O for zero", numbersWith(map[int]string{10: "12O"}), nil,
			`table: CSV line 12, column 2 ("age"): "12O" is not a number, and the column's other 199 values are; correct the file, or add "age" to CSVOptions.AsIs (to read the column as text)`},
		{"a dot", numbersWith(map[int]string{10: "."}), nil,
			`table: CSV line 12, column 2 ("age"): "." is not a number, and the column's other 199 values are; correct the file, or add "." to CSVOptions.MissingCodes (if it marks a missing value), or add "age" to CSVOptions.AsIs (to read the column as text)`},
		{"a dash", numbersWith(map[int]string{10: "-"}), nil,
			`table: CSV line 12, column 2 ("age"): "-" is not a number, and the column's other 199 values are; correct the file, or add "-" to CSVOptions.MissingCodes (if it marks a missing value), or add "age" to CSVOptions.AsIs (to read the column as text)`},
		{"a decimal comma", numbersWith(map[int]string{10: `"7,5"`}), nil,
			`table: CSV line 12, column 2 ("age"): "7,5" is not a number, and the column's other 199 values are; correct the file, or set CSVOptions.DecimalComma (if the file writes decimals with a comma), or add "age" to CSVOptions.AsIs (to read the column as text)`},
		{"several bad cells", numbersWith(map[int]string{10: "12O", 38: ".", 75: `"7,5"`}), nil,
			`table: CSV line 12, column 2 ("age"): 3 values are not numbers, and the column's other 197 values are: "12O" (line 12), "." (line 40), "7,5" (line 77); correct the file, or add "." to CSVOptions.MissingCodes (if it marks a missing value), or set CSVOptions.DecimalComma (if the file writes decimals with a comma), or add "age" to CSVOptions.AsIs (to read the column as text)`},
		{"declared missing code", numbersWith(map[int]string{10: "."}), &table.CSVOptions{MissingCodes: []string{"."}}, ""},
		{"numeric missing code", numbersWith(map[int]string{10: "999"}), &table.CSVOptions{MissingCodes: []string{"999"}}, ""},
		{"yes in a 0/1 column", flags, nil,
			`table: CSV line 42, column 2 ("smoker"): "yes" is not a number, and the column's other 119 values are (0 and 1); correct the file, or add "smoker" to CSVOptions.AsIs (to read the column as text)`},
		{"a stray f among female and male", sexes(map[int]string{30: "f"}), nil,
			`table: CSV line 32, column 2 ("sex"): "f" appears only once (line 32) among 400 values; the others are "female" or "male"; correct the file, or add "sex" to CSVOptions.AsIs (to keep it as a level)`},
		{"two rare values", sexes(map[int]string{30: "f", 90: "?", 91: "?"}), nil,
			`table: CSV line 32, column 2 ("sex"): rare values among 400: "f" (line 32), "?" (lines 92, 93); the others are "female" or "male"; correct the file, or add "?" to CSVOptions.MissingCodes (if it marks a missing value), or add "sex" to CSVOptions.AsIs (to keep them as levels)`},
		{"rare value accepted", sexes(map[int]string{30: "f"}), &table.CSVOptions{AsIs: []string{"sex"}}, ""},
		{"trailing space trimmed", sexes(map[int]string{30: "male ", 31: " female"}), nil, ""},
		{"levels differing in case", sexes(map[int]string{100: "Male", 102: "Male", 104: "Male", 106: "Male", 108: "Male", 110: "Male"}), nil,
			`table: CSV line 102, column 2 ("sex"): "Male" (first on line 102) and "male" (first on line 3) differ only in case; correct the file, or add "sex" to CSVOptions.AsIs (to keep them as separate levels)`},
		{"a 2 among 0s and 1s", zeroOne, nil,
			`table: CSV line 33, column 2 ("smoker"): 2 is neither 0 nor 1, and the column's other 499 values are; correct the file, or add "2" to CSVOptions.MissingCodes (if it marks a missing value), or add "smoker" to CSVOptions.AsIs (to read the column as continuous)`},
		{"true among other numbers", "x\n1.5\n2\ntrue\n", nil,
			`table: CSV line 4, column 1 ("x"): "true" is not a number, and the column's other 2 values are; correct the file, or add "x" to CSVOptions.AsIs (to read the column as text)`},
		{"a number among text", column("id,site", 100, func(i int) string {
			if i == 5 {
				return "5,3"
			}
			return fmt.Sprintf("%d,%s", i, []string{"north", "south", "east"}[i%3])
		}), nil,
			`table: CSV line 7, column 2 ("site"): "3" is a number, and the column's other 99 values are text ("north", "south", "east", …); correct the file, or add "site" to CSVOptions.AsIs (to read the column as text)`},
		{"semicolon separated", "age;sex;bmi\n61;f;27,5\n", nil,
			`table: CSV line 1: the header has no commas but 2 semicolons, so the file looks separated by semicolons; set CSVOptions.Comma to ';'`},
		{"tab separated", "age\tsex\n61\tf\n", nil,
			`table: CSV line 1: the header has no commas but 1 tab, so the file looks separated by tabs; set CSVOptions.Comma to '\t'`},
		{"comma separated, read with another separator", "age,sex\n61,f\n", &table.CSVOptions{Comma: ':'},
			`table: CSV line 1: the header has no ':' characters but 1 comma, so the file looks separated by commas; set CSVOptions.Comma to ','`},
		{"decimal commas without the option", "age;bmi\n61;27,5\n70;31,25\n", &table.CSVOptions{Comma: ';'},
			`table: CSV line 2, column 2 ("bmi"): values such as "27,5" are numbers written with a decimal comma; correct the file, or set CSVOptions.DecimalComma (if the file writes decimals with a comma)`},
		{"decimal points with the option", "age;bmi\n61;27.5\n70;31.25\n", &table.CSVOptions{Comma: ';', DecimalComma: true},
			`table: CSV line 2, column 2 ("bmi"): values such as "27.5" are numbers written with a decimal point, but DecimalComma is set`},
		{"an identifier column", column("id,y", 60, func(i int) string { return fmt.Sprintf("P%03d,%d", i, i%2) }), nil,
			`table: CSV line 2, column 1 ("id"): column "id" has more than 50 distinct text values (an identifier or free text? leave it out of the table); correct the file, or raise CSVOptions.MaxLevels (if the column is a variable with that many levels)`},
	}
	for _, c := range cases {
		_, err := table.ReadCSV(strings.NewReader(c.in), c.opts)
		got := ""
		if err != nil {
			got = err.Error()
		}
		if got != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, got, c.want)
		}
		if c.want != "" && !errors.Is(err, table.ErrData) && !errors.Is(err, table.ErrCSV) {
			t.Errorf("%s: %v is neither ErrData nor ErrCSV", c.name, err)
		}
	}
}

// TestReadCSVDecimalComma reads a semicolon-separated file with decimal
// commas, and a comma-separated one with quoted decimal commas.
func TestReadCSVDecimalComma(t *testing.T) {
	for _, c := range []struct {
		in   string
		opts table.CSVOptions
	}{
		{"age;bmi\n61;27,5\n70;-3,25e1\n", table.CSVOptions{Comma: ';', DecimalComma: true}},
		{"age,bmi\n61,\"27,5\"\n70,\"-3,25e1\"\n", table.CSVOptions{DecimalComma: true}},
		{"age\tbmi\n61\t27.5\n70\t-32.5\n", table.CSVOptions{Comma: '\t'}},
	} {
		d, err := table.ReadCSV(strings.NewReader(c.in), &c.opts)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		bmi, _ := d.Column("bmi")
		if !slices.Equal(bmi, []float64{27.5, -32.5}) {
			t.Errorf("%q: bmi %v", c.in, bmi)
		}
	}
}

func TestReadCSVErrors(t *testing.T) {
	cases := []struct {
		name string
		in   string
		opts *table.CSVOptions
		want string
	}{
		{"empty file", "", nil, "table: CSV line 1: empty file, expected a header row"},
		{"header only", "a,b\n", nil, "table: CSV line 2: header only, no data rows"},
		{"ragged row", "a,b\n1,2\n3\n4,5\n", nil, "table: CSV line 3: row has 1 field(s), the header has 2"},
		{"long row", "a,b\n1,2\n3,4,5\n", nil, "table: CSV line 3: row has 3 field(s), the header has 2"},
		{"duplicate header", "a,b,a\n1,2,3\n", nil, `table: CSV line 1, column 3 ("a"): name also used by column 1`},
		{"empty header", "a,,c\n1,2,3\n", nil, "table: CSV line 1, column 2: empty column name"},
		{"infinite", "a,b\n1,2\n3,Inf\n", nil, `table: CSV line 3, column 2 ("b"): "Inf" is infinite`},
		{"overflow", "a,b\n1,2\n3,1e999\n", nil, `table: CSV line 3, column 2 ("b"): "1e999" is infinite`},
		{"unclosed quote", "a,b\n1,\"2\n", nil, "table: CSV line 2, column 2: a quoted field is not closed"},
		{"bare quote", "a,b\n1,2\"\n", nil, "table: CSV line 2, column 2: a quote inside a field that does not start with one"},
		{"text after a closing quote", "a,b\n1,\"2\"x\n", nil, "table: CSV line 2, column 2: extraneous or missing \" in a quoted field"},
		{"one level", "a,b\n1,x\n2,x\n", nil, `table: CSV line 2, column 2 ("b"): text column "b" has the single value "x"; it needs two or more`},
		{"too many levels", "a,b\n1,p\n2,q\n3,r\n", &table.CSVOptions{MaxLevels: 2},
			`table: CSV line 2, column 2 ("b"): column "b" has more than 2 distinct text values (an identifier or free text? leave it out of the table); correct the file, or raise CSVOptions.MaxLevels (if the column is a variable with that many levels)`},
		{"field too long", "a,b\n1," + strings.Repeat("9", 100) + "\n", &table.CSVOptions{MaxFieldBytes: 50}, `table: CSV line 2, column 2 ("b"): field longer than 50 bytes`},
		{"line too long", "a,b\n1," + strings.Repeat("9,", 150) + "\n", &table.CSVOptions{MaxFieldBytes: 50}, `table: CSV line 2: line longer than 200 bytes`},
		{"too many columns", "a,b,c\n1,2,3\n", &table.CSVOptions{MaxColumns: 2}, "table: CSV line 1: 3 columns, more than the limit of 2"},
		{"too many rows", "a\n1\n2\n3\n", &table.CSVOptions{MaxRows: 2}, "table: CSV line 4: more than 2 rows"},
		{"bad separator", "a\n1\n", &table.CSVOptions{Comma: '"'}, `table: bad CSV: separator '"' is not supported; use a single-byte character other than a quote, a space or a line break`},
	}
	for _, c := range cases {
		_, err := table.ReadCSV(strings.NewReader(c.in), c.opts)
		if err == nil || err.Error() != c.want {
			t.Errorf("%s:\n got %v\nwant %s", c.name, err, c.want)
		}
	}
}

func TestReadCSVQuoted(t *testing.T) {
	in := "\"first\r\nname\",b\r\n\r\n\"1\",\"a \"\"b\"\"\"\r\n\"3\",\"c,\nd\"\n5,e\n"
	d, err := table.ReadCSV(strings.NewReader(in), &table.CSVOptions{MaxLevels: 5})
	if err != nil {
		t.Fatal(err)
	}
	if names := d.Names(); names[0] != "first\nname" || d.Rows() != 3 {
		t.Errorf("names %q rows %d", names, d.Rows())
	}
	// The data rows start on lines 4, 5 and 7: a blank line is skipped and
	// a quoted field holds a line break.
	for i, want := range []int{4, 5, 7} {
		if got := d.Line(i); got != want {
			t.Errorf("row %d on line %d, want %d", i, got, want)
		}
	}
	if lv := d.Variables()[1].Levels; !slices.Equal(lv, []string{"a \"b\"", "c,\nd", "e"}) {
		t.Errorf("levels %q", lv)
	}
}

// TestReadCSVMissingLines checks that the missing-value message names file
// lines for a file and data rows for a dataset built in memory.
func TestReadCSVMissingLines(t *testing.T) {
	d, err := table.ReadCSV(strings.NewReader("\"a\nb\",y\n1,2\n\n3,\n4,NA\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	want := `table: missing values: "y" has 2 missing values (lines 5, 6); choose the missing-value policy complete-case or available-case to proceed`
	if err := d.Missing(); err == nil || err.Error() != want {
		t.Errorf("got  %v\nwant %s", err, want)
	}
	m, _ := table.NewDataset([]string{"y"}, [][]float64{{1, math.NaN()}})
	want = `table: missing values: "y" has 1 missing value (data row 2); choose the missing-value policy complete-case or available-case to proceed`
	if err := m.Missing(); err == nil || err.Error() != want {
		t.Errorf("got  %v\nwant %s", err, want)
	}
}

// TestReadCSVBlocks checks that a file cut into many blocks, with quoted
// line breaks near the cuts, reads the same for 1, 2 and 4 workers,
// whether its length is known or not, and as the values written.
func TestReadCSVBlocks(t *testing.T) {
	if testing.Short() {
		t.Skip("writes a 10 MB file")
	}
	var b strings.Builder
	b.WriteString("x,note,y\n")
	n := 200_000
	for i := range n {
		note := "plain"
		if i%997 == 0 {
			note = "\"two\nlines\""
		}
		fmt.Fprintf(&b, "%d.%03d,%s,%d\n", i, i%1000, note, i%2)
	}
	in := b.String()
	var first *table.Dataset
	for _, w := range []int{1, 4, 2} {
		var r io.Reader = strings.NewReader(in)
		if w == 2 {
			r = struct{ io.Reader }{r} // length unknown: the columns grow
		}
		d, err := table.ReadCSV(r, &table.CSVOptions{Workers: w, AsIs: []string{"note"}})
		if err != nil {
			t.Fatal(err)
		}
		x, _ := d.Column("x")
		if d.Rows() != n || x[n-1] != float64(n-1)+float64((n-1)%1000)/1000 {
			t.Fatalf("%d workers: %d rows, last x %v", w, d.Rows(), x[n-1])
		}
		if first == nil {
			first = d
			continue
		}
		for i := range n {
			if first.Line(i) != d.Line(i) {
				t.Fatalf("row %d: line %d and %d", i, first.Line(i), d.Line(i))
			}
		}
		y0, _ := first.Column("y")
		y1, _ := d.Column("y")
		if !slices.Equal(y0, y1) {
			t.Fatal("y differs between worker counts")
		}
	}
	if first.Line(n-1) != n+1+(n-1)/997+1 {
		t.Errorf("last row on line %d", first.Line(n-1))
	}
}

func BenchmarkReadCSV20kP50(b *testing.B) {
	var sb strings.Builder
	for j := range 50 {
		if j > 0 {
			sb.WriteByte(',')
		}
		fmt.Fprintf(&sb, "v%d", j)
	}
	sb.WriteByte('\n')
	for i := range 20_000 {
		for j := range 50 {
			if j > 0 {
				sb.WriteByte(',')
			}
			if j%3 == 0 {
				fmt.Fprintf(&sb, "%d", (i*j)%2)
			} else {
				fmt.Fprintf(&sb, "%.4f", float64((i*7919+j*104729)%100000)/1000)
			}
		}
		sb.WriteByte('\n')
	}
	in := sb.String()
	b.SetBytes(int64(len(in)))
	b.ResetTimer()
	for range b.N {
		if _, err := table.ReadCSV(strings.NewReader(in), nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkReadCSVFile reads the file named by ANTECEDENT_BENCH_CSV (for
// example one written by "antecedent simulate"); it is skipped without it.
func BenchmarkReadCSVFile(b *testing.B) {
	path := os.Getenv("ANTECEDENT_BENCH_CSV")
	if path == "" {
		b.Skip("set ANTECEDENT_BENCH_CSV to a CSV file")
	}
	st, err := os.Stat(path)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(st.Size())
	for range b.N {
		f, err := os.Open(path)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := table.ReadCSV(f, nil); err != nil {
			b.Fatal(err)
		}
		f.Close()
	}
}
