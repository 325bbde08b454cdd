package table

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// MissingColumn describes the missing values of one variable.
type MissingColumn struct {
	Name      string
	Count     int
	FirstRows []int // up to five 1-based data rows
	// FirstLines holds the file lines of FirstRows for a dataset read by
	// ReadCSV, nil otherwise.
	FirstLines []int
}

// MissingError lists every variable with missing values.
type MissingError struct {
	Columns []MissingColumn
}

// Error implements the error interface.
func (e *MissingError) Error() string {
	return "table: missing values: " + e.List() +
		"; choose the missing-value policy complete-case or available-case to proceed"
}

// List names each variable with missing values, their number and where
// the first are: file lines for a dataset read from CSV ("line 5"), else
// 1-based data rows ("data row 4").
func (e *MissingError) List() string {
	var parts []string
	for _, c := range e.Columns {
		at, word := c.FirstRows, "data row"
		if c.FirstLines != nil {
			at, word = c.FirstLines, "line"
		}
		if len(at) > 1 {
			word += "s"
		}
		nums := make([]string, len(at))
		for i, r := range at {
			nums[i] = fmt.Sprint(r)
		}
		more := ""
		if c.Count > len(at) {
			more = ", …"
		}
		values := "values"
		if c.Count == 1 {
			values = "value"
		}
		parts = append(parts, fmt.Sprintf("%q has %d missing %s (%s %s%s)", c.Name, c.Count, values, word, strings.Join(nums, ", "), more))
	}
	return strings.Join(parts, "; ")
}

// Unwrap returns ErrMissing.
func (e *MissingError) Unwrap() error { return ErrMissing }

// MissingPolicy says what a fit does with missing values.
type MissingPolicy int

const (
	// MissingRefused refuses data with missing values, naming the columns
	// and their first missing rows.
	MissingRefused MissingPolicy = iota
	// MissingCompleteCase drops every row with a missing value in any variable.
	MissingCompleteCase
	// MissingAvailableCase fits each response on the rows where it and all its
	// candidate predictors are present.
	MissingAvailableCase
)

var missingNames = []string{"error", "complete-case", "available-case"}

// String returns the policy's name.
func (m MissingPolicy) String() string {
	if m >= 0 && int(m) < len(missingNames) {
		return missingNames[m]
	}
	return fmt.Sprintf("MissingPolicy(%d)", int(m))
}

// MarshalText implements encoding.TextMarshaler.
func (m MissingPolicy) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (m *MissingPolicy) UnmarshalText(b []byte) error {
	for i, n := range missingNames {
		if n == string(b) {
			*m = MissingPolicy(i)
			return nil
		}
	}
	return fmt.Errorf("table: unknown missing-value policy %q (want error, complete-case or available-case)", b)
}

// Usable returns the rows a fit on the variables vars (indices into
// Variables) uses under policy p, nil meaning every row: under
// MissingRefused every row, or the *MissingError listing the dataset's
// missing values; under MissingCompleteCase the rows where every variable of the
// dataset is present; under MissingAvailableCase the rows where every variable of
// vars is present.
func (d *Dataset) Usable(p MissingPolicy, vars []int) ([]int, error) {
	switch p {
	case MissingRefused:
		return nil, d.Missing()
	case MissingCompleteCase:
		all := make([]int, len(d.vars))
		for v := range all {
			all[v] = v
		}
		return d.Present(all), nil
	case MissingAvailableCase:
		return d.Present(vars), nil
	}
	return nil, fmt.Errorf("%w: unknown missing-value policy %d", ErrData, int(p))
}

// Missing returns a *MissingError listing every variable with missing
// values and its first missing rows, or nil when no value is missing.
func (d *Dataset) Missing() error {
	me := &MissingError{}
	for v, cols := range d.varCols {
		var mc MissingColumn
		for i, x := range d.cols[cols[0]] {
			if math.IsNaN(x) {
				mc.Count++
				if len(mc.FirstRows) < 5 {
					mc.FirstRows = append(mc.FirstRows, i+1)
					if d.lines != nil {
						mc.FirstLines = append(mc.FirstLines, d.lines[i])
					}
				}
			}
		}
		if mc.Count > 0 {
			mc.Name = d.vars[v].Name
			me.Columns = append(me.Columns, mc)
		}
	}
	if len(me.Columns) == 0 {
		return nil
	}
	return me
}

// Present returns, in increasing order, the rows at which every variable
// in vars (indices into Variables) has a value. It returns nil when no
// value of these variables is missing, so that nil means every row, and an
// empty non-nil slice when no row is complete.
func (d *Dataset) Present(vars []int) []int {
	var gaps [][]float64
	for _, v := range vars {
		c := d.cols[d.varCols[v][0]]
		if slices.ContainsFunc(c, math.IsNaN) {
			gaps = append(gaps, c)
		}
	}
	if gaps == nil {
		return nil
	}
	rows := []int{}
	for i := range d.rows {
		ok := true
		for _, c := range gaps {
			if math.IsNaN(c[i]) {
				ok = false
				break
			}
		}
		if ok {
			rows = append(rows, i)
		}
	}
	return rows
}
