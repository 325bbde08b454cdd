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
