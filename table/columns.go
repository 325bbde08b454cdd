package table

import (
	"bytes"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// rules are the settings, common to every reader, that decide a column's
// kind, levels and coding.
type rules struct {
	reference, codedOne map[string]string
	asIs                []string
	maxLevels           int
	point               byte // the decimal separator of numbers written as text
	csv                 bool // fixes may name CSVOptions.DecimalComma
}

// naming names the rows of a source in messages by their keys: file lines
// for CSV, 0-based rows for the other readers.
type naming interface {
	row(k int) string     // "line 12"
	rows(ks []int) string // "lines 7, 19"
}

// lineNaming names the rows of a CSV file by their lines.
type lineNaming struct{}

func (lineNaming) row(k int) string { return "line " + strconv.Itoa(k) }

func (lineNaming) rows(ks []int) string {
	if len(ks) == 1 {
		return lineNaming{}.row(ks[0])
	}
	return "lines " + joinInts(ks)
}

func joinInts(ks []int) string {
	s := make([]string, len(ks))
	for i, k := range ks {
		s[i] = strconv.Itoa(k)
	}
	return strings.Join(s, ", ")
}

// noRow is the key of a problem that concerns a whole column.
const noRow = -1

// columnIn is one column's cells as a reader hands them to rules.decide.
type columnIn struct {
	name   string
	col    []float64  // the numbers, true and false as 1 and 0; NaN for missing and text cells
	texts  []*colText // the text and true/false cells, in one or more spans of rows
	textAt func(i int) string
	keys   []int // the key of each row; nil means the row's index
	naming naming
	// fail returns the reader's error at the row with key k (noRow for
	// none).
	fail func(k int, err error, fixes ...Fix) error
}

func (in *columnIn) key(i int) int {
	if in.keys == nil {
		return i
	}
	return in.keys[i]
}

// colStats sums one column's counts over the blocks and keeps its first
// odd cells of each sort.
type colStats struct {
	nNum, nText, nBool, nOdd              int
	firstText, firstNum, firstOdd, firstB []cellRef
}

func stats(in *columnIn) colStats {
	var s colStats
	for _, c := range in.texts {
		s.nText += c.nText
		s.nBool += c.nBool
		s.firstText = appendKeep(s.firstText, c.firstText)
		s.firstB = appendKeep(s.firstB, c.firstBool)
	}
	for i, x := range in.col {
		if x != x {
			continue
		}
		s.nNum++
		if len(s.firstNum) < keep {
			s.firstNum = append(s.firstNum, cellRef{in.key(i), strconv.FormatFloat(x, 'g', -1, 64)})
		}
		if x != 0 && x != 1 {
			s.nOdd++
			if len(s.firstOdd) < keep {
				s.firstOdd = append(s.firstOdd, cellRef{in.key(i), strconv.FormatFloat(x, 'g', -1, 64)})
			}
		}
	}
	return s
}

func appendKeep(a, b []cellRef) []cellRef {
	for _, c := range b {
		if len(a) == keep {
			break
		}
		a = append(a, c)
	}
	return a
}

// few reports whether k odd cells among n are few enough to be taken for
// typos: at most five and at most 1% of the column.
func few(k, n int) bool { return k > 0 && k <= 5 && 100*k <= n }

// decide decides a column's kind from its cells, checks it for odd
// cells, and adds it to d. It is the one place where every reader's
// columns get their kind, levels, coding and missing values.
func (ru *rules) decide(d *Dataset, in *columnIn) error {
	name, fail := in.name, in.fail
	s := stats(in)
	asIs := slices.Contains(ru.asIs, name)
	present := s.nNum + s.nText
	text := s.nText > 0
	if !text && s.nBool > 0 && s.nOdd > 0 {
		// true/false among numbers other than 0 and 1 are text here.
		text, s.nText, s.nNum, s.firstText = true, s.nBool, s.nNum-s.nBool, s.firstB
	}
	switch {
	case text && s.nNum > 0 && !asIs:
		return ru.mixed(s, present, in)
	case !text && few(s.nOdd, present) && s.nOdd < present && !asIs:
		first := s.firstOdd[0]
		var msg string
		if s.nOdd == 1 {
			msg = fmt.Sprintf("%s is neither 0 nor 1, and the column's other %d values are", first.value, present-1)
		} else {
			msg = fmt.Sprintf("%d values are neither 0 nor 1, and the column's other %d values are: %s", s.nOdd, present-s.nOdd, cellList(in.naming, s.firstOdd, s.nOdd, false))
		}
		return fail(first.line, badData("%s", msg), append(codeFixes(s.firstOdd, true), Fix{"AsIs", name, "to read the column as continuous"})...)
	case !text:
		// The parser refuses infinite values, and stats has counted the
		// values other than 0 and 1: no second pass over the column.
		v := Variable{Name: name, Kind: Continuous}
		switch {
		case s.nOdd > 0:
		case s.nBool > 0 && s.nBool == s.nNum:
			v.Kind, v.Levels = Binary, []string{"false", "true"}
		default:
			v.Kind, v.Levels = Binary, []string{"0", "1"}
		}
		d.addVariable(v, [][]float64{in.col})
		return ru.coding(d, in)
	}
	values := make([]string, len(in.col))
	for i, x := range in.col {
		switch t := in.textAt(i); {
		case t != "":
			values[i] = t
		case x == x:
			values[i] = strconv.FormatFloat(x, 'g', -1, 64)
		}
	}
	if err := ru.checkText(values, s, in, asIs); err != nil {
		return err
	}
	if err := d.AddText(name, values, ru.maxLevels); err != nil {
		var fixes []Fix
		if strings.Contains(err.Error(), "distinct text values") {
			fixes = append(fixes, Fix{"MaxLevels", "", "if the column is a variable with that many levels"})
		}
		return fail(s.firstText[0].line, unprefix(err), fixes...)
	}
	return ru.coding(d, in)
}

// coding applies the options Reference and CodedOne to the column, the
// last variable of d.
func (ru *rules) coding(d *Dataset, in *columnIn) error {
	name, fail := in.name, in.fail
	if l, ok := ru.reference[name]; ok {
		if err := d.SetReference(name, l); err != nil {
			return fail(noRow, unprefix(err))
		}
	}
	if l, ok := ru.codedOne[name]; ok {
		if err := d.SetCodedOne(name, l); err != nil {
			return fail(noRow, unprefix(err))
		}
		if ref, both := ru.reference[name]; both && ref == l {
			return fail(noRow, badData("%q is given both as the reference and as the level coded 1", l))
		}
	}
	return nil
}

// unprefix drops the sentinel's text from a Dataset error, keeping it
// for errors.Is, so that a CSVError does not repeat the package name.
func unprefix(err error) error {
	msg := err.Error()
	for _, s := range []error{ErrData, ErrVariable} {
		if errors.Is(err, s) {
			return &problem{s, strings.TrimPrefix(msg, s.Error()+": ")}
		}
	}
	return err
}

// mixed returns the error for a column of numbers and text.
func (ru *rules) mixed(s colStats, present int, in *columnIn) error {
	name, fail := in.name, in.fail
	asIs := Fix{"AsIs", name, "to read the column as text"}
	if s.nText <= s.nNum {
		first := s.firstText[0]
		var msg string
		if s.nText == 1 {
			msg = fmt.Sprintf("%q is not a number, and the column's other %d values are", first.value, present-1)
		} else {
			msg = fmt.Sprintf("%d values are not numbers, and the column's other %d values are", s.nText, present-s.nText)
		}
		if s.nOdd == 0 && s.nBool == 0 {
			msg += " (0 and 1)"
		}
		if s.nText > 1 {
			msg += ": " + cellList(in.naming, s.firstText, s.nText, true)
		}
		fixes := codeFixes(s.firstText, false)
		for _, c := range s.firstText {
			if ru.csv && ru.point == '.' && otherPoint(c.value, ',') {
				fixes = append(fixes, Fix{"DecimalComma", "", "if the file writes decimals with a comma"})
				break
			}
		}
		return fail(first.line, badData("%s", msg), append(fixes, asIs)...)
	}
	first := s.firstNum[0]
	var msg string
	if s.nNum == 1 {
		msg = fmt.Sprintf("%q is a number, and the column's other %d values are text", first.value, present-1)
	} else {
		msg = fmt.Sprintf("%d values are numbers, and the column's other %d values are text", s.nNum, present-s.nNum)
	}
	var levels []string
	for _, c := range s.firstText {
		if !containsString(levels, c.value) {
			levels = append(levels, c.value)
		}
	}
	msg += " (" + quoteAll(levels)
	if s.nText > len(s.firstText) {
		msg += ", …"
	}
	msg += ")"
	if s.nNum > 1 {
		msg += ": " + cellList(in.naming, s.firstNum, s.nNum, true)
	}
	return fail(first.line, badData("%s", msg), asIs)
}

func containsString(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// cellList lists cells as `"x" (line 3), "y" (line 9)`, with an ellipsis
// when there are more than listed.
func cellList(nm naming, cells []cellRef, total int, quote bool) string {
	parts := make([]string, len(cells))
	for i, c := range cells {
		v := c.value
		if quote {
			v = strconv.Quote(v)
		}
		parts[i] = fmt.Sprintf("%s (%s)", v, nm.row(c.line))
	}
	if total > len(cells) {
		parts = append(parts, "…")
	}
	return strings.Join(parts, ", ")
}

// codeFixes suggests each distinct value that reads like a missing-value
// marker (no letters or digits, or a word for unknown) as a missing-value
// code; with numbers, every distinct value.
func codeFixes(cells []cellRef, numbers bool) []Fix {
	var fixes []Fix
	seen := map[string]bool{}
	for _, c := range cells {
		if seen[c.value] || !numbers && !markerLike(c.value) {
			continue
		}
		seen[c.value] = true
		fixes = append(fixes, Fix{"MissingCodes", c.value, "if it marks a missing value"})
	}
	return fixes
}

// markerLike reports whether a text value looks like a missing-value
// marker rather than a typo: it holds no letter or digit, or is a word
// for unknown.
func markerLike(v string) bool {
	switch strings.ToLower(v) {
	case "missing", "unknown", "unk", "none", "nd", "n.d.", "not known", "not recorded", "not available", "na.":
		return true
	}
	for _, r := range v {
		if r >= '0' && r <= '9' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r > 0x7f {
			return false
		}
	}
	return true
}

// otherPoint reports whether v is a number when point is its decimal
// separator.
func otherPoint(v string, point byte) bool {
	var scratch []byte
	if point == '.' && strings.Contains(v, ",") {
		return false
	}
	_, ok := parseNumber([]byte(v), point, &scratch)
	return ok && bytes.IndexByte([]byte(v), point) >= 0
}

// checkText looks for the signs of a mistake in a text column: numbers
// with the other decimal separator, levels that differ only in case, and
// rare levels.
func (ru *rules) checkText(values []string, s colStats, in *columnIn, asIs bool) error {
	name, fail := in.name, in.fail
	other := byte(',')
	if ru.point == ',' {
		other = '.'
	}
	allNum := len(s.firstText) > 0
	for _, c := range s.firstText {
		if !otherPoint(c.value, other) {
			allNum = false
		}
	}
	if allNum {
		c := s.firstText[0]
		switch {
		case ru.point == '.' && ru.csv:
			return fail(c.line, badData("values such as %q are numbers written with a decimal comma", c.value),
				Fix{"DecimalComma", "", "if the file writes decimals with a comma"})
		case ru.point == '.':
			return fail(c.line, badData("values such as %q are numbers written with a decimal comma; convert the column to numbers at the source", c.value))
		}
		return fail(c.line, badData("values such as %q are numbers written with a decimal point, but DecimalComma is set", c.value))
	}
	if asIs {
		return nil
	}
	levels, count := levelCounts(values)
	if len(levels) > ru.maxLevels {
		return nil // AddText reports it
	}
	firstLine := map[string]int{}
	for i, v := range values {
		if _, ok := firstLine[v]; !ok && v != "" {
			firstLine[v] = in.key(i)
		}
	}
	byFold := map[string]string{}
	for _, l := range levels {
		k := strings.ToLower(l)
		if o, ok := byFold[k]; ok {
			a, b := o, l
			if firstLine[b] < firstLine[a] {
				a, b = b, a
			}
			return fail(firstLine[b], badData("%q (first on %s) and %q (first on %s) differ only in case", b, in.naming.row(firstLine[b]), a, in.naming.row(firstLine[a])),
				Fix{"AsIs", name, "to keep them as separate levels"})
		}
		byFold[k] = l
	}
	if len(levels) < 3 {
		return nil
	}
	present := s.nText
	var rare, common []string
	rareCells := 0
	for _, l := range levels {
		if few(count[l], present) {
			rare = append(rare, l)
			rareCells += count[l]
		} else {
			common = append(common, l)
		}
	}
	if len(rare) == 0 || !few(rareCells, present) || len(common) == 0 {
		return nil
	}
	// Rare levels in the order they first appear, the others sorted.
	sortByLine(rare, firstLine)
	slices.Sort(common)
	others := quoteAll(common[:min(len(common), 6)])
	if len(common) > 6 {
		others += ", …"
	} else if len(common) > 1 {
		i := strings.LastIndex(others, ", ")
		others = others[:i] + " or " + others[i+2:]
	}
	var msg string
	if len(rare) == 1 {
		l := rare[0]
		msg = fmt.Sprintf("%q appears only %s (%s) among %d values; the others are %s", l, times(count[l]), linesOf(l, values, in), present, others)
	} else {
		parts := make([]string, len(rare))
		for i, l := range rare {
			parts[i] = fmt.Sprintf("%q (%s)", l, linesOf(l, values, in))
		}
		msg = fmt.Sprintf("rare values among %d: %s; the others are %s", present, strings.Join(parts, ", "), others)
	}
	var cells []cellRef
	for _, l := range rare {
		cells = append(cells, cellRef{firstLine[l], l})
	}
	fixes := append(codeFixes(cells, false), Fix{"AsIs", name, "to keep them as levels"})
	if len(rare) == 1 {
		fixes[len(fixes)-1].When = "to keep it as a level"
	}
	return fail(firstLine[rare[0]], badData("%s", msg), fixes...)
}

func times(n int) string {
	switch n {
	case 1:
		return "once"
	case 2:
		return "twice"
	}
	return fmt.Sprintf("%d times", n)
}

// linesOf names the rows holding level l: "line 7" or "lines 7, 19".
func linesOf(l string, values []string, in *columnIn) string {
	var at []int
	for i, v := range values {
		if v == l {
			at = append(at, in.key(i))
		}
	}
	return in.naming.rows(at)
}

func sortByLine(levels []string, firstLine map[string]int) {
	for i := 1; i < len(levels); i++ {
		for k := i; k > 0 && firstLine[levels[k]] < firstLine[levels[k-1]]; k-- {
			levels[k], levels[k-1] = levels[k-1], levels[k]
		}
	}
}
