package antecedent

import (
	"fmt"
	"math"
	"strings"
)

// MissingColumn describes the missing values of one variable.
type MissingColumn struct {
	Name      string
	Count     int
	FirstRows []int // up to five 1-based data rows
}

// MissingError lists every variable with missing values.
type MissingError struct {
	Columns []MissingColumn
}

// Error implements the error interface.
func (e *MissingError) Error() string {
	var parts []string
	for _, c := range e.Columns {
		rows := make([]string, len(c.FirstRows))
		for i, r := range c.FirstRows {
			rows[i] = fmt.Sprint(r)
		}
		more := ""
		if c.Count > len(c.FirstRows) {
			more = ", …"
		}
		parts = append(parts, fmt.Sprintf("%q has %d (rows %s%s)", c.Name, c.Count, strings.Join(rows, ", "), more))
	}
	return "antecedent: missing values: " + strings.Join(parts, "; ") +
		"; choose a missing-value policy (complete-case or available-case) to proceed"
}

// Unwrap returns ErrMissing.
func (e *MissingError) Unwrap() error { return ErrMissing }

// missingness returns, for each variable, whether each row is missing
// (nil when none is), and the error describing them.
func (d *Dataset) missingness() ([][]bool, *MissingError) {
	miss := make([][]bool, len(d.vars))
	me := &MissingError{}
	for v, cols := range d.varCols {
		var mc MissingColumn
		for i := 0; i < d.rows; i++ {
			if math.IsNaN(d.cols[cols[0]][i]) {
				if miss[v] == nil {
					miss[v] = make([]bool, d.rows)
				}
				miss[v][i] = true
				mc.Count++
				if len(mc.FirstRows) < 5 {
					mc.FirstRows = append(mc.FirstRows, i+1)
				}
			}
		}
		if mc.Count > 0 {
			mc.Name = d.vars[v].Name
			me.Columns = append(me.Columns, mc)
		}
	}
	if len(me.Columns) == 0 {
		return miss, nil
	}
	return miss, me
}
