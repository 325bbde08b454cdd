package table

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strconv"
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
	// enter as indicator columns, one per level other than the reference,
	// and they cannot be responses.
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
	// Levels holds the values of a binary or categorical variable, the
	// reference first; nil for a continuous one. A binary variable is
	// coded 0 for Levels[0] and 1 for Levels[1]; one read from numbers has
	// the levels "0" and "1" ("false" and "true" when written so). A
	// categorical variable enters a model as one indicator per level after
	// the first.
	Levels []string
}

// Reference returns the level a binary or categorical variable's effects
// are measured against ("" for a continuous variable).
func (v Variable) Reference() string {
	if len(v.Levels) == 0 {
		return ""
	}
	return v.Levels[0]
}

// Coding says in words how the variable enters a model: for a binary
// variable which value is coded 1 and which 0, for a categorical one which
// levels are compared with which reference; "" for a continuous variable.
// For example `"yes" = 1, "no" = 0 (reference)` and
// `"north", "south" each vs "east" (reference)`.
func (v Variable) Coding() string {
	switch {
	case len(v.Levels) < 2:
		return ""
	case v.Kind == Binary && v.Levels[0] == "0" && v.Levels[1] == "1":
		return "1 vs 0 (reference)"
	case v.Kind == Binary:
		return fmt.Sprintf("%q = 1, %q = 0 (reference)", v.Levels[1], v.Levels[0])
	case v.Kind == Categorical:
		q := make([]string, len(v.Levels)-1)
		for i, l := range v.Levels[1:] {
			q[i] = strconv.Quote(l)
		}
		return fmt.Sprintf("%s each vs %q (reference)", strings.Join(q, ", "), v.Levels[0])
	}
	return ""
}

// Contrast says what an effect of design column c compares, as a phrase
// to follow a number: "per unit" for a continuous variable, `"yes" vs
// "no"` for a binary one, `"north" vs "east"` for a categorical
// indicator.
func (d *Dataset) Contrast(c int) string {
	vi := d.colVar[c]
	v := d.vars[vi]
	switch {
	case v.Kind == Continuous || len(v.Levels) < 2:
		return "per unit"
	case v.Kind == Binary:
		return fmt.Sprintf("%s vs %s", quoteLevel(v.Levels[1]), quoteLevel(v.Levels[0]))
	}
	k := slices.Index(d.varCols[vi], c)
	return fmt.Sprintf("%q vs %q", v.Levels[k+1], v.Levels[0])
}

// quoteLevel quotes a text level; the numeric levels 0 and 1 stay bare.
func quoteLevel(l string) string {
	if l == "0" || l == "1" {
		return l
	}
	return strconv.Quote(l)
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
	lines   []int // file line of each row, when read from a file
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
			return fmt.Errorf("%w: column %q %s is %g", ErrData, name, d.where(i), x)
		}
		if !math.IsNaN(x) && x != 0 && x != 1 {
			kind = Continuous
		}
	}
	v := Variable{Name: name, Kind: kind}
	if kind == Binary {
		v.Levels = []string{"0", "1"}
	}
	d.addVariable(v, [][]float64{c})
	return nil
}

// where names row i (0-based) for a message: its file line when the
// dataset was read from a file, else its 1-based data row.
func (d *Dataset) where(i int) string {
	if i < len(d.lines) {
		return fmt.Sprintf("line %d", d.lines[i])
	}
	return fmt.Sprintf("data row %d", i+1)
}

// Line returns the file line of row i (0-based) of a dataset read by
// ReadCSV, and 0 for a dataset built otherwise or a row out of range.
func (d *Dataset) Line(i int) int {
	if i < 0 || i >= len(d.lines) {
		return 0
	}
	return d.lines[i]
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
// present value to be 0 or 1; Continuous is allowed for a variable read
// from numbers (or true/false), not for one read from text. Categorical
// variables keep their kind.
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
	if k == v.Kind {
		return nil
	}
	if k == Binary {
		for r, x := range d.cols[d.varCols[i][0]] {
			if !math.IsNaN(x) && x != 0 && x != 1 {
				return fmt.Errorf("%w: %q cannot be binary: %s is %g", ErrData, name, d.where(r), x)
			}
		}
		v.Levels = []string{"0", "1"}
	}
	if k == Continuous && !numericLevels(v.Levels) {
		return fmt.Errorf("%w: %q holds the text values %q and %q and cannot be continuous", ErrData, name, v.Levels[0], v.Levels[1])
	}
	if k == Continuous {
		v.Levels = nil
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

// numericLevels reports whether a binary variable's levels are numbers
// ("0", "1") or truth values ("false", "true"), not text.
func numericLevels(l []string) bool {
	return len(l) == 2 && (l[0] == "0" && l[1] == "1" || l[0] == "false" && l[1] == "true")
}
