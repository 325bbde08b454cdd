package table_test

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/table"
)

// FuzzReadCSV checks that the CSV reader never panics and that whatever it
// accepts is a consistent dataset.
func FuzzReadCSV(f *testing.F) {
	f.Add([]byte("x,y\n1,2\n3,4\n"))
	f.Add([]byte("\ufeffa,b,c\nyes,1.5,NA\nno,2,3\n"))
	f.Add([]byte("a,b\n\"1\n2\",3\n4,5\n"))
	f.Add([]byte("a,b\n1,Inf\n"))
	f.Add([]byte("site,y\nnorth,1\nsouth,0\neast,1\n"))
	f.Fuzz(func(t *testing.T, in []byte) {
		d, err := table.ReadCSV(bytes.NewReader(in), &table.CSVOptions{MaxFieldBytes: 4096, MaxColumns: 200})
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
