// Package opendata loads the small open datasets and reference values that
// ship in the repository's testdata folder, for the project's own tests.
package opendata

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
)

// Dir returns the repository's testdata folder.
func Dir() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..", "testdata")
}

// Table is a numeric CSV file read column-major.
type Table struct {
	Names   []string
	Columns [][]float64
}

// Column returns the column with the given name.
func (t *Table) Column(name string) []float64 {
	for j, n := range t.Names {
		if n == name {
			return t.Columns[j]
		}
	}
	panic("opendata: no column " + name)
}

// Rows returns the number of rows.
func (t *Table) Rows() int { return len(t.Columns[0]) }

// ReadCSV reads a numeric CSV file with a header from testdata.
func ReadCSV(name string) (*Table, error) {
	f, err := os.Open(filepath.Join(Dir(), name))
	if err != nil {
		return nil, err
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		return nil, err
	}
	t := &Table{Names: recs[0], Columns: make([][]float64, len(recs[0]))}
	for i, r := range recs[1:] {
		for j, s := range r {
			x, err := strconv.ParseFloat(s, 64)
			if err != nil {
				return nil, fmt.Errorf("opendata: %s line %d column %d: %v", name, i+2, j+1, err)
			}
			t.Columns[j] = append(t.Columns[j], x)
		}
	}
	return t, nil
}

// ReadJSON decodes a JSON file from testdata into v.
func ReadJSON(name string, v any) error {
	b, err := os.ReadFile(filepath.Join(Dir(), name))
	if err != nil {
		return err
	}
	return json.Unmarshal(b, v)
}

// Standardize returns copies of cols centred and divided by the population
// standard deviation.
func Standardize(cols [][]float64) [][]float64 {
	out := make([][]float64, len(cols))
	for j, c := range cols {
		var m, s float64
		for _, x := range c {
			m += x
		}
		m /= float64(len(c))
		for _, x := range c {
			s += (x - m) * (x - m)
		}
		sd := sqrt(s / float64(len(c)))
		out[j] = make([]float64, len(c))
		for i, x := range c {
			out[j][i] = (x - m) / sd
		}
	}
	return out
}

// UnitNorm returns copies of cols centred and scaled to unit Euclidean norm.
func UnitNorm(cols [][]float64) [][]float64 {
	out := Standardize(cols)
	for _, c := range out {
		f := 1 / sqrt(float64(len(c)))
		for i := range c {
			c[i] *= f
		}
	}
	return out
}

func sqrt(x float64) float64 { return math.Sqrt(x) }

// Refit holds the unpenalised regression references written by
// testdata/reference/refit_reference.py (statsmodels OLS on the diabetes
// data, Logit on the breast cancer data).
type Refit struct {
	Tool  string       `json:"tool"`
	OLS   Coefficients `json:"ols"`
	Logit Coefficients `json:"logit"`
}

// Coefficients are one model's terms (intercept first) with estimates,
// standard errors and 95% interval bounds.
type Coefficients struct {
	Terms  []string  `json:"terms"`
	Params []float64 `json:"params"`
	BSE    []float64 `json:"bse"`
	Lower  []float64 `json:"lower"`
	Upper  []float64 `json:"upper"`
}

// ReadRefit reads the stored refit references.
func ReadRefit() (*Refit, error) {
	var r Refit
	if err := ReadJSON("reference/refit.json", &r); err != nil {
		return nil, err
	}
	return &r, nil
}
