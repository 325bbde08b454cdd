package table_test

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

// FuzzReadCSV checks that the CSV reader never panics, that whatever it
// accepts is a consistent dataset, and that the fast path for rows
// without quotes agrees with the general one (forced by a missing-value
// code that reads as a number, which no seed holds).
func FuzzReadCSV(f *testing.F) {
	f.Add([]byte("x,y\n1,2\n3,4\n"))
	f.Add([]byte("\ufeffa,b,c\nyes,1.5,NA\nno,2,3\n"))
	f.Add([]byte("a,b\n\"1\n2\",3\n4,5\n"))
	f.Add([]byte("a,b\n1,Inf\n"))
	f.Add([]byte("site,y\nnorth,1\nsouth,0\neast,1\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		d, err := table.ReadCSV(bytes.NewReader(in), &table.CSVOptions{MaxFieldBytes: 4096, MaxColumns: 200})
		slow, serr := table.ReadCSV(bytes.NewReader(in), &table.CSVOptions{MaxFieldBytes: 4096, MaxColumns: 200, MissingCodes: []string{"-8.125e-99"}})
		if !bytes.Contains(in, []byte("e-99")) {
			if (err == nil) != (serr == nil) || err != nil && err.Error() != serr.Error() {
				t.Fatalf("fast path: %v; general path: %v", err, serr)
			}
			if err == nil && !sameData(d, slow) {
				t.Fatalf("fast and general paths read different data")
			}
		}
		if err != nil {
			if !strings.HasPrefix(err.Error(), "table: ") {
				t.Fatalf("error without the package prefix: %v", err)
			}
			return
		}
		if d.Rows() < 1 {
			t.Fatalf("accepted a dataset with %d rows", d.Rows())
		}
		for _, v := range d.Variables() {
			if v.Kind == table.Categorical {
				continue
			}
			c, err := d.Column(v.Name)
			if err != nil || len(c) != d.Rows() {
				t.Fatalf("column %q: %v, %d values for %d rows", v.Name, err, len(c), d.Rows())
			}
			for _, x := range c {
				if math.IsInf(x, 0) {
					t.Fatalf("column %q holds an infinite value", v.Name)
				}
			}
		}
	})
}

func sameData(a, b *table.Dataset) bool {
	ca, cb := a.Columns(), b.Columns()
	if a.Rows() != b.Rows() || len(ca) != len(cb) || fmt.Sprint(a.Variables()) != fmt.Sprint(b.Variables()) {
		return false
	}
	for j := range ca {
		for i := range ca[j] {
			if math.Float64bits(ca[j][i]) != math.Float64bits(cb[j][i]) && !(math.IsNaN(ca[j][i]) && math.IsNaN(cb[j][i])) {
				return false
			}
		}
	}
	for i := range a.Rows() {
		if a.Line(i) != b.Line(i) {
			return false
		}
	}
	return true
}

// FuzzBuilderMatchesCSV feeds the cells of a simple CSV text (no quotes,
// no blank lines, the same number of fields on every line) to ReadCSV
// and, as text cells, to a Builder: both accept it or both refuse it, and
// what they accept is the same data. The Builder never panics.
func FuzzBuilderMatchesCSV(f *testing.F) {
	f.Add("x,y\n1,2\n3,4\n")
	f.Add("arm,y\ncontrol,1\ndrug,0\nplacebo,1\n")
	f.Add("a,b\ntrue,NA\nfalse,2\n")
	f.Add("a\n1\n2\n7\n0\n1\n0\n")
	f.Fuzz(func(t *testing.T, in string) {
		in = strings.TrimSuffix(in, "\n")
		if strings.ContainsAny(in, "\"\r\ufeff") {
			return
		}
		lines := strings.Split(in, "\n")
		if len(lines) < 2 {
			return
		}
		var cells [][]string
		for _, l := range lines {
			if l == "" {
				return
			}
			cells = append(cells, strings.Split(l, ","))
			if len(cells[len(cells)-1]) != len(cells[0]) {
				return
			}
		}
		if len(cells[0]) == 1 && strings.ContainsAny(lines[0], ";\t|") {
			return // ReadCSV's hint about the separator is CSV's own
		}
		opts := &table.CSVOptions{MaxFieldBytes: 4096, MaxColumns: 200}
		want, werr := table.ReadCSV(strings.NewReader(in+"\n"), opts)
		names := make([]string, len(cells[0]))
		for j, n := range cells[0] {
			names[j] = strings.TrimSpace(n)
		}
		got, gerr := func() (*table.Dataset, error) {
			b, err := table.NewBuilder(names, &table.ReadOptions{MaxFieldBytes: 4096, MaxColumns: 200}, "row")
			if err != nil {
				return nil, err
			}
			for _, r := range cells[1:] {
				for j, c := range r {
					if err := b.Text(j, c); err != nil {
						return nil, err
					}
				}
			}
			return b.Dataset()
		}()
		if (werr == nil) != (gerr == nil) {
			t.Fatalf("ReadCSV: %v; Builder: %v", werr, gerr)
		}
		if werr != nil {
			return
		}
		gv, wv := got.Variables(), want.Variables()
		if fmt.Sprint(gv) != fmt.Sprint(wv) || got.Rows() != want.Rows() {
			t.Fatalf("Builder %v (%d rows), ReadCSV %v (%d rows)", gv, got.Rows(), wv, want.Rows())
		}
		gc, wc := got.Columns(), want.Columns()
		for j := range gc {
			for i := range gc[j] {
				if math.Float64bits(gc[j][i]) != math.Float64bits(wc[j][i]) && !(math.IsNaN(gc[j][i]) && math.IsNaN(wc[j][i])) {
					t.Fatalf("column %d row %d: %v, ReadCSV %v", j, i, gc[j][i], wc[j][i])
				}
			}
		}
	})
}
