package table_test

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

func TestReadCSVKinds(t *testing.T) {
	in := "\ufeffage,smoker,sex,site,score,flag\n" +
		"61,1,female,north,2.5,true\n" +
		"70,0,male,south,NA,false\n" +
		"55,1,male,east,3.25,TRUE\n" +
		"48,,female,north,1,false\n"
	d, err := table.ReadCSV(strings.NewReader(in), nil)
	if err != nil {
		t.Fatal(err)
	}
	vars := d.Variables()
	want := []struct {
		name   string
		kind   table.Kind
		levels []string
	}{
		{"age", table.Continuous, nil},
		{"smoker", table.Binary, nil},
		{"sex", table.Binary, []string{"female", "male"}},
		{"site", table.Categorical, []string{"east", "north", "south"}},
		{"score", table.Continuous, nil},
		{"flag", table.Binary, nil},
	}
	for i, w := range want {
		if vars[i].Name != w.name || vars[i].Kind != w.kind || !slices.Equal(vars[i].Levels, w.levels) {
			t.Errorf("variable %d: %+v, want %+v", i, vars[i], w)
		}
	}
	sex, _ := d.Column("sex")
	if !slices.Equal(sex, []float64{0, 1, 1, 0}) {
		t.Errorf("sex coded %v (male, sorting last, is 1)", sex)
	}
	smoker, _ := d.Column("smoker")
	if !math.IsNaN(smoker[3]) {
		t.Errorf("empty cell read as %g", smoker[3])
	}
	flag, _ := d.Column("flag")
	if !slices.Equal(flag, []float64{1, 0, 1, 0}) {
		t.Errorf("flag %v", flag)
	}
	if _, err := d.Column("site"); err == nil {
		t.Error("a categorical variable has no single column")
	}
}

func TestReadCSVErrors(t *testing.T) {
	cases := []struct {
		name, in string
		opts     *table.CSVOptions
		line     int
		contains string
	}{
		{"empty file", "", nil, 1, "empty file"},
		{"header only", "a,b\n", nil, 2, "no data rows"},
		{"ragged row", "a,b\n1,2\n3\n4,5\n", nil, 3, "the header has 2"},
		{"duplicate header", "a,b,a\n1,2,3\n", nil, 1, "column 1"},
		{"empty header", "a,,c\n1,2,3\n", nil, 1, "empty column name"},
		{"infinite", "a,b\n1,2\n3,Inf\n", nil, 3, "infinite"},
		{"overflow", "a,b\n1,2\n3,1e999\n", nil, 3, "infinite"},
		{"bare quote", "a,b\n1,\"2\n", nil, 2, "bad CSV"},
		{"one level", "a,b\n1,x\n2,x\n", nil, 2, "needs two or more"},
		{"too many levels", "a,b\n1,p\n2,q\n3,r\n", &table.CSVOptions{MaxLevels: 2}, 2, "more than 2 distinct"},
		{"field too long", "a,b\n1," + strings.Repeat("9", 100) + "\n", &table.CSVOptions{MaxFieldBytes: 50}, 2, "longer than 50"},
		{"too many columns", "a,b,c\n1,2,3\n", &table.CSVOptions{MaxColumns: 2}, 1, "more than the limit"},
		{"too many rows", "a\n1\n2\n3\n", &table.CSVOptions{MaxRows: 2}, 4, "more than 2 rows"},
	}
	for _, c := range cases {
		_, err := table.ReadCSV(strings.NewReader(c.in), c.opts)
		var ce *table.CSVError
		if !errors.As(err, &ce) {
			t.Errorf("%s: error %v, want a CSVError", c.name, err)
			continue
		}
		if ce.Line != c.line || !strings.Contains(err.Error(), c.contains) {
			t.Errorf("%s: %v (line %d), want line %d mentioning %q", c.name, err, ce.Line, c.line, c.contains)
		}
	}
}

func TestReadCSVQuotedNewline(t *testing.T) {
	d, err := table.ReadCSV(strings.NewReader("\"first\nname\",b\n1,2\n3,4\n"), nil)
	if err != nil {
		t.Fatal(err)
	}
	if names := d.Names(); names[0] != "first\nname" || d.Rows() != 2 {
		t.Errorf("names %q rows %d", names, d.Rows())
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
