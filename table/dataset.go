package table

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
)

// Kind is how a variable is measured.
type Kind int

const (
	// Continuous variables are modelled as linear-Gaussian responses.
	Continuous Kind = iota
	// Binary variables take 0 and 1 and are modelled as logistic
	// responses.
	Binary
	// Categorical variables take a few text levels; as predictors they
	// enter as indicator columns (the first level is the reference), and
	// they cannot be responses.
	Categorical
)

var kindNames = []string{"continuous", "binary", "categorical"}

// String returns the kind's name.
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// MarshalText implements encoding.TextMarshaler.
func (k Kind) MarshalText() ([]byte, error) { return []byte(k.String()), nil }

// UnmarshalText implements encoding.TextUnmarshaler.
func (k *Kind) UnmarshalText(b []byte) error {
	i := slices.Index(kindNames, string(b))
	if i < 0 {
		return fmt.Errorf("table: unknown kind %q", b)
	}
	*k = Kind(i)
	return nil
}

// Sentinel errors that callers can test with errors.Is.
var (
	ErrData     = errors.New("table: bad data")
	ErrMissing  = errors.New("table: missing values")
	ErrVariable = errors.New("table: unknown variable")
	ErrCSV      = errors.New("table: bad CSV")
)

// Variable describes one variable of a Dataset.
type Variable struct {
	Name string
	Kind Kind
	// Levels holds a categorical variable's levels, reference first, or
	// a binary text variable's two levels (the second is coded 1).
	Levels []string
}

// Dataset is a table of named variables stored column-major. Numeric
// columns given to NewDataset are used in place, never copied or changed;
// do not change them while the dataset is in use. Missing values are NaN.
type Dataset struct {
	vars    []Variable
	cols    [][]float64 // design columns
	varCols [][]int     // design columns of each variable
	colVar  []int       // variable of each design column
	rows    int
}

// NewDataset returns a dataset of numeric columns, one per name. A column
// whose present values are all 0 or 1 is Binary, any other Continuous; NaN
// marks a missing value. It returns an error naming the column for an
// empty or duplicate name, a length mismatch or an infinite value.
func NewDataset(names []string, columns [][]float64) (*Dataset, error) {
	if len(names) != len(columns) {
		return nil, fmt.Errorf("%w: %d names for %d columns", ErrData, len(names), len(columns))
	}
	d := &Dataset{}
	if len(columns) > 0 {
		d.rows = len(columns[0])
	}
	for j, c := range columns {
		if err := d.addNumeric(names[j], c); err != nil {
			return nil, err
		}
	}
	return d, nil
}

func (d *Dataset) checkName(name string) error {
	if strings.TrimSpace(name) == "" {
		return fmt.Errorf("%w: variable %d has an empty name", ErrData, len(d.vars)+1)
	}
	for _, v := range d.vars {
		if v.Name == name {
			return fmt.Errorf("%w: variable %q appears twice", ErrData, name)
		}
	}
	return nil
}

func (d *Dataset) addNumeric(name string, c []float64) error {
	if err := d.checkName(name); err != nil {
		return err
	}
	if len(d.vars) == 0 && d.rows == 0 {
		d.rows = len(c)
	}
	if len(c) != d.rows {
		return fmt.Errorf("%w: column %q has %d rows, expected %d", ErrData, name, len(c), d.rows)
	}
	kind := Binary
	for i, x := range c {
		if math.IsInf(x, 0) {
			return fmt.Errorf("%w: column %q row %d is %g", ErrData, name, i+1, x)
		}
		if !math.IsNaN(x) && x != 0 && x != 1 {
			kind = Continuous
		}
	}
	d.addVariable(Variable{Name: name, Kind: kind}, [][]float64{c})
	return nil
}

func (d *Dataset) addVariable(v Variable, cols [][]float64) {
	vi := len(d.vars)
	d.vars = append(d.vars, v)
	var idx []int
	for _, c := range cols {
		idx = append(idx, len(d.cols))
		d.cols = append(d.cols, c)
		d.colVar = append(d.colVar, vi)
	}
	d.varCols = append(d.varCols, idx)
}

// AddText adds a text variable. Empty strings are missing. Two distinct
// values make it Binary (the value that sorts last is coded 1), more make
// it Categorical with levels in sorted order, the first the reference.
// It returns an error for a bad name, a length mismatch, a single distinct
// value, or more than maxLevels levels (0 means 50).
func (d *Dataset) AddText(name string, values []string, maxLevels int) error {
	if err := d.checkName(name); err != nil {
		return err
	}
	if (len(d.vars) > 0 || d.rows > 0) && len(values) != d.rows {
		return fmt.Errorf("%w: column %q has %d rows, expected %d", ErrData, name, len(values), d.rows)
	}
	if maxLevels <= 0 {
		maxLevels = 50
	}
	set := map[string]bool{}
	for _, s := range values {
		if s != "" {
			set[s] = true
			if len(set) > maxLevels {
				return fmt.Errorf("%w: column %q has more than %d distinct text values", ErrData, name, maxLevels)
			}
		}
	}
	levels := make([]string, 0, len(set))
	for s := range set {
		levels = append(levels, s)
	}
	slices.Sort(levels)
	if len(levels) < 2 {
		return fmt.Errorf("%w: text column %q has %d distinct values; it needs two or more", ErrData, name, len(levels))
	}
	if len(d.vars) == 0 && d.rows == 0 {
		d.rows = len(values)
	}
	code := make(map[string]int, len(levels))
	for i, s := range levels {
		code[s] = i
	}
	kind := Categorical
	first := 1
	if len(levels) == 2 {
		kind = Binary
	}
	cols := make([][]float64, len(levels)-first)
	for k := range cols {
		cols[k] = make([]float64, len(values))
	}
	for i, s := range values {
		for k := range cols {
			switch {
			case s == "":
				cols[k][i] = math.NaN()
			case code[s] == k+first:
				cols[k][i] = 1
			}
		}
	}
	d.addVariable(Variable{Name: name, Kind: kind, Levels: levels}, cols)
	return nil
}

// Rows returns the number of rows.
func (d *Dataset) Rows() int { return d.rows }

// Variables returns a copy of the variables' descriptions.
func (d *Dataset) Variables() []Variable {
	out := slices.Clone(d.vars)
	for i := range out {
		out[i].Levels = slices.Clone(out[i].Levels)
	}
	return out
}

// Names returns the variable names in order.
func (d *Dataset) Names() []string {
	out := make([]string, len(d.vars))
	for i, v := range d.vars {
		out[i] = v.Name
	}
	return out
}

func (d *Dataset) lookup(name string) (int, error) {
	for i, v := range d.vars {
		if v.Name == name {
			return i, nil
		}
	}
	return 0, fmt.Errorf("%w: %q", ErrVariable, name)
}

// Column returns the values of a numeric (continuous or binary) variable,
// shared with the dataset: do not change them.
func (d *Dataset) Column(name string) ([]float64, error) {
	i, err := d.lookup(name)
	if err != nil {
		return nil, err
	}
	if d.vars[i].Kind == Categorical {
		return nil, fmt.Errorf("%w: %q is categorical", ErrData, name)
	}
	return d.cols[d.varCols[i][0]], nil
}

// SetKind overrides the kind of a numeric variable: Binary requires every
// present value to be 0 or 1; Continuous is always allowed for a numeric
// variable. Categorical variables keep their kind.
func (d *Dataset) SetKind(name string, k Kind) error {
	i, err := d.lookup(name)
	if err != nil {
		return err
	}
	v := &d.vars[i]
	if v.Kind == Categorical || k == Categorical {
		if k == v.Kind {
			return nil
		}
		return fmt.Errorf("%w: %q cannot change between %v and %v", ErrData, name, v.Kind, k)
	}
	if k == Binary {
		for r, x := range d.cols[d.varCols[i][0]] {
			if !math.IsNaN(x) && x != 0 && x != 1 {
				return fmt.Errorf("%w: %q cannot be binary: row %d is %g", ErrData, name, r+1, x)
			}
		}
	}
	v.Kind = k
	return nil
}

// Columns returns the design columns, shared with the dataset: one per
// numeric variable and one indicator per non-reference level of a
// categorical variable, in variable order. Do not change them.
func (d *Dataset) Columns() [][]float64 { return d.cols }

// Terms returns the indices in Columns of variable v's design columns.
func (d *Dataset) Terms(v int) []int { return slices.Clone(d.varCols[v]) }

// TermName returns the name of design column c: the variable's name, or
// "variable=level" for an indicator.
func (d *Dataset) TermName(c int) string {
	vi := d.colVar[c]
	v := d.vars[vi]
	if v.Kind != Categorical {
		return v.Name
	}
	k := slices.Index(d.varCols[vi], c)
	return v.Name + "=" + v.Levels[k+1]
}
