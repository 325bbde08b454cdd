package table

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"strings"
)

// AddText adds a text variable. Empty strings are missing. Two distinct
// values make it Binary, more make it Categorical. The reference level
// (coded 0, or left out of the indicators) is chosen by DefaultReference;
// the other levels follow in sorted order. SetReference changes the
// choice. AddText returns an error for a bad name, a length mismatch, a
// single distinct value, or more than maxLevels levels (0 means 50).
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
	count := map[string]int{}
	for _, s := range values {
		if s != "" {
			count[s]++
			if len(count) > maxLevels {
				return fmt.Errorf("%w: column %q has more than %d distinct text values (an identifier or free text? leave it out of the table)", ErrData, name, maxLevels)
			}
		}
	}
	switch len(count) {
	case 0:
		return fmt.Errorf("%w: text column %q has no values; it needs two or more", ErrData, name)
	case 1:
		for only := range count {
			return fmt.Errorf("%w: text column %q has the single value %q; it needs two or more", ErrData, name, only)
		}
	}
	levels := orderLevels(count, DefaultReference(count))
	if len(d.vars) == 0 && d.rows == 0 {
		d.rows = len(values)
	}
	code := make(map[string]int, len(levels))
	for i, s := range levels {
		code[s] = i
	}
	idx := make([]int, len(values))
	for i, s := range values {
		idx[i] = -1
		if s != "" {
			idx[i] = code[s]
		}
	}
	kind := Categorical
	if len(levels) == 2 {
		kind = Binary
	}
	d.addVariable(Variable{Name: name, Kind: kind, Levels: levels}, indicators(idx, len(levels)))
	return nil
}

// DefaultReference returns the reference level AddText chooses among the
// levels counted in count: the one level that reads as an absence (no, n,
// none, never, absent, negative, normal, control, or a value beginning
// with "no ", "not " or "non"), or else the most common level, ties going
// to the first in sorted order.
func DefaultReference(count map[string]int) string {
	var absent []string
	for l := range count {
		if readsAbsent(l) {
			absent = append(absent, l)
		}
	}
	if len(absent) == 1 {
		return absent[0]
	}
	best := ""
	for l, n := range count {
		if best == "" || n > count[best] || n == count[best] && l < best {
			best = l
		}
	}
	return best
}

// readsAbsent reports whether a level reads as the absence of something.
func readsAbsent(l string) bool {
	l = strings.ToLower(strings.TrimSpace(l))
	switch l {
	case "no", "n", "none", "never", "absent", "negative", "neg", "normal", "control", "controls":
		return true
	}
	for _, p := range []string{"no ", "not ", "non-", "non ", "never "} {
		if strings.HasPrefix(l, p) {
			return true
		}
	}
	return false
}

// orderLevels returns the levels of count, ref first and the others in
// sorted order.
func orderLevels(count map[string]int, ref string) []string {
	levels := make([]string, 0, len(count))
	for l := range count {
		if l != ref {
			levels = append(levels, l)
		}
	}
	slices.Sort(levels)
	return append([]string{ref}, levels...)
}

// indicators returns the design columns of a variable whose row i has
// level idx[i] (-1: missing) among n levels: the variable's 0/1 code when
// n is 2, else one indicator per level after the first.
func indicators(idx []int, n int) [][]float64 {
	cols := make([][]float64, n-1)
	for k := range cols {
		cols[k] = make([]float64, len(idx))
	}
	for i, l := range idx {
		for k := range cols {
			switch {
			case l < 0:
				cols[k][i] = math.NaN()
			case l == k+1:
				cols[k][i] = 1
			}
		}
	}
	return cols
}

// SetReference makes level the reference of the binary or categorical
// text variable name: coded 0 for a binary variable (the other level is
// coded 1), left out of the indicators for a categorical one. The other
// levels keep their sorted order. It returns an error for an unknown
// variable or level, a continuous variable, and a binary variable read
// from numbers (its 0 stays 0: write the column the other way round in
// the file to model the 0s).
func (d *Dataset) SetReference(name, level string) error {
	i, err := d.lookup(name)
	if err != nil {
		return err
	}
	v := &d.vars[i]
	switch {
	case v.Kind == Continuous:
		return fmt.Errorf("%w: %q is continuous and has no reference level", ErrData, name)
	case numericLevels(v.Levels):
		if level == v.Levels[0] {
			return nil
		}
		return fmt.Errorf("%w: %q is a 0/1 column and keeps its coding (%s); to model the 0s, write the column the other way round in the file", ErrData, name, v.Coding())
	case !slices.Contains(v.Levels, level):
		return fmt.Errorf("%w: %q has no level %q (its levels: %s)", ErrData, name, level, quoteAll(v.Levels))
	case level == v.Levels[0]:
		return nil
	}
	cols := d.varCols[i]
	old := v.Levels
	idx := make([]int, d.rows)
	for r := range idx {
		for k, c := range cols {
			x := d.cols[c][r]
			if math.IsNaN(x) {
				idx[r] = -1
				break
			}
			if x == 1 {
				idx[r] = k + 1
			}
		}
	}
	count := make(map[string]int, len(old))
	for _, l := range old {
		count[l] = 1
	}
	levels := orderLevels(count, level)
	remap := make([]int, len(old))
	for k, l := range old {
		remap[k] = slices.Index(levels, l)
	}
	for r, l := range idx {
		if l >= 0 {
			idx[r] = remap[l]
		}
	}
	for k, col := range indicators(idx, len(levels)) {
		d.cols[cols[k]] = col
	}
	v.Levels = levels
	return nil
}

// SetCodedOne makes level the value coded 1 of the binary text variable
// name, the other level becoming the reference. It returns an error for an
// unknown variable or level and for a variable that is not binary.
func (d *Dataset) SetCodedOne(name, level string) error {
	i, err := d.lookup(name)
	if err != nil {
		return err
	}
	v := d.vars[i]
	if v.Kind != Binary {
		return fmt.Errorf("%w: %q is %v; only a binary variable has a level coded 1 (choose a reference level instead)", ErrData, name, v.Kind)
	}
	k := slices.Index(v.Levels, level)
	if k < 0 {
		return fmt.Errorf("%w: %q has no level %q (its levels: %s)", ErrData, name, level, quoteAll(v.Levels))
	}
	return d.SetReference(name, v.Levels[1-k])
}

// quoteAll quotes each level and joins them with commas.
func quoteAll(levels []string) string {
	q := make([]string, len(levels))
	for i, l := range levels {
		q[i] = fmt.Sprintf("%q", l)
	}
	return strings.Join(q, ", ")
}

// levelCounts returns the levels of values (empty strings are missing)
// with their counts, most common first, ties in sorted order.
func levelCounts(values []string) ([]string, map[string]int) {
	count := map[string]int{}
	for _, s := range values {
		if s != "" {
			count[s]++
		}
	}
	levels := make([]string, 0, len(count))
	for l := range count {
		levels = append(levels, l)
	}
	slices.SortFunc(levels, func(a, b string) int { return cmp.Or(count[b]-count[a], strings.Compare(a, b)) })
	return levels, count
}
