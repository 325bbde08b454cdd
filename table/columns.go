package table

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"
)

// read runs ReadCSV: the header, the blocks, then each column's kind.
func (rd *reader) read(r io.Reader) (*Dataset, error) {
	src := &source{r: r, size: sizeOf(r)}
	buf := src.fill(make([]byte, 0, blockSize), blockSize)
	for !src.eof && safeCut(buf) < 0 {
		if len(buf) > rd.maxLine+blockSize {
			return nil, &CSVError{Line: 1, Err: badCSV("line longer than %d bytes", rd.maxLine)}
		}
		buf = src.fill(buf, 2*len(buf))
	}
	if src.err != nil {
		return nil, src.err
	}
	pos, line := 0, 1
	for pos < len(buf) && blank(buf, pos) > 0 {
		pos += blank(buf, pos)
		line++
	}
	if pos == len(buf) {
		return nil, &CSVError{Line: 1, Err: badCSV("empty file, expected a header row")}
	}
	p := &parser{rd: rd}
	fields, next, nextLine, err := p.nextRecord(buf, pos, line)
	if err != nil {
		return nil, err
	}
	if err := rd.header(fields, buf[pos:next]); err != nil {
		return nil, err
	}
	blocks, cols, err := rd.stream(src, buf[next:], nextLine, int64(len(buf)))
	if err != nil {
		return nil, err
	}
	rows := 0
	for _, b := range blocks {
		if b.err != nil {
			return nil, b.err
		}
		if rd.o.MaxRows > 0 && rows+b.rows > rd.o.MaxRows {
			return nil, &CSVError{Line: b.lines[rd.o.MaxRows-rows], Err: badCSV("more than %d rows", rd.o.MaxRows)}
		}
		rows += b.rows
	}
	if rows == 0 {
		return nil, &CSVError{Line: nextLine, Err: badCSV("header only, no data rows")}
	}
	gaps := false
	for _, b := range blocks {
		gaps = gaps || b.rows < b.bound
	}
	for j, c := range cols {
		if gaps {
			// Blank lines or quoted line breaks: close the gaps.
			at := 0
			for _, b := range blocks {
				at += copy(c[at:], c[b.off:b.off+b.rows])
			}
		}
		cols[j] = c[:rows:rows]
	}
	d := &Dataset{rows: rows, lines: make([]int, 0, rows)}
	for _, b := range blocks {
		d.lines = append(d.lines, b.lines...)
	}
	for j := range rd.names {
		if err := rd.column(d, blocks, cols[j], j); err != nil {
			return nil, err
		}
		cols[j] = nil
	}
	return d, nil
}

// colStats sums one column's counts over the blocks and keeps its first
// odd cells of each sort.
type colStats struct {
	nNum, nText, nBool, nOdd              int
	firstText, firstNum, firstOdd, firstB []cellRef
}

func (rd *reader) stats(blocks []*block, col []float64, lines []int, j int) colStats {
	var s colStats
	for _, b := range blocks {
		if b.text == nil {
			continue
		}
		c := &b.text[j]
		s.nText += c.nText
		s.nBool += c.nBool
		s.firstText = appendKeep(s.firstText, c.firstText)
		s.firstB = appendKeep(s.firstB, c.firstBool)
	}
	for i, x := range col {
		if x != x {
			continue
		}
		s.nNum++
		if len(s.firstNum) < keep {
			s.firstNum = append(s.firstNum, cellRef{lines[i], strconv.FormatFloat(x, 'g', -1, 64)})
		}
		if x != 0 && x != 1 {
			s.nOdd++
			if len(s.firstOdd) < keep {
				s.firstOdd = append(s.firstOdd, cellRef{lines[i], strconv.FormatFloat(x, 'g', -1, 64)})
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

// column decides column j's kind from its cells and adds it to d.
func (rd *reader) column(d *Dataset, blocks []*block, col []float64, j int) error {
	name := rd.names[j]
	s := rd.stats(blocks, col, d.lines, j)
	asIs := rd.asIs(j)
	fail := func(line int, err error, fixes ...Fix) error {
		return &CSVError{Line: line, Column: j + 1, Name: name, Err: err, Fixes: fixes}
	}
	present := s.nNum + s.nText
	text := s.nText > 0
	if !text && s.nBool > 0 && s.nOdd > 0 {
		// true/false among numbers other than 0 and 1 are text here.
		text, s.nText, s.nNum, s.firstText = true, s.nBool, s.nNum-s.nBool, s.firstB
	}
	switch {
	case text && s.nNum > 0 && !asIs:
		return rd.mixed(s, present, j, fail)
	case !text && few(s.nOdd, present) && s.nOdd < present && !asIs:
		first := s.firstOdd[0]
		var msg string
		if s.nOdd == 1 {
			msg = fmt.Sprintf("%s is neither 0 nor 1, and the column's other %d values are", first.value, present-1)
		} else {
			msg = fmt.Sprintf("%d values are neither 0 nor 1, and the column's other %d values are: %s", s.nOdd, present-s.nOdd, cellList(s.firstOdd, s.nOdd, false))
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
		d.addVariable(v, [][]float64{col})
		return rd.coding(d, j, fail)
	}
	values := make([]string, 0, d.rows)
	for _, b := range blocks {
		for i := range b.rows {
			x := col[len(values)]
			switch t := b.textAt(j, i); {
			case t != "":
				values = append(values, t)
			case math.IsNaN(x):
				values = append(values, "")
			default:
				values = append(values, strconv.FormatFloat(x, 'g', -1, 64))
			}
		}
	}
	if err := rd.checkText(values, d.lines, s, j, asIs, fail); err != nil {
		return err
	}
	if err := d.AddText(name, values, rd.o.MaxLevels); err != nil {
		var fixes []Fix
		if strings.Contains(err.Error(), "distinct text values") {
			fixes = append(fixes, Fix{"MaxLevels", "", "if the column is a variable with that many levels"})
		}
		return fail(s.firstText[0].line, unprefix(err), fixes...)
	}
	return rd.coding(d, j, fail)
}

// coding applies the options Reference and CodedOne to column j, the
// last variable of d.
func (rd *reader) coding(d *Dataset, j int, fail func(int, error, ...Fix) error) error {
	name := rd.names[j]
	if l, ok := rd.o.Reference[name]; ok {
		if err := d.SetReference(name, l); err != nil {
			return fail(1, unprefix(err))
		}
	}
	if l, ok := rd.o.CodedOne[name]; ok {
		if err := d.SetCodedOne(name, l); err != nil {
			return fail(1, unprefix(err))
		}
		if ref, both := rd.o.Reference[name]; both && ref == l {
			return fail(1, badData("%q is given both as the reference and as the level coded 1", l))
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
func (rd *reader) mixed(s colStats, present, j int, fail func(int, error, ...Fix) error) error {
	name := rd.names[j]
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
			msg += ": " + cellList(s.firstText, s.nText, true)
		}
		fixes := codeFixes(s.firstText, false)
		for _, c := range s.firstText {
			if rd.point == '.' && otherPoint(c.value, ',') {
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
		msg += ": " + cellList(s.firstNum, s.nNum, true)
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
func cellList(cells []cellRef, total int, quote bool) string {
	parts := make([]string, len(cells))
	for i, c := range cells {
		v := c.value
		if quote {
			v = strconv.Quote(v)
		}
		parts[i] = fmt.Sprintf("%s (line %d)", v, c.line)
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
func (rd *reader) checkText(values []string, lines []int, s colStats, j int, asIs bool, fail func(int, error, ...Fix) error) error {
	name := rd.names[j]
	other := byte(',')
	if rd.point == ',' {
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
		if rd.point == '.' {
			return fail(c.line, badData("values such as %q are numbers written with a decimal comma", c.value),
				Fix{"DecimalComma", "", "if the file writes decimals with a comma"})
		}
		return fail(c.line, badData("values such as %q are numbers written with a decimal point, but DecimalComma is set", c.value))
	}
	if asIs {
		return nil
	}
	levels, count := levelCounts(values)
	if len(levels) > rd.o.MaxLevels {
		return nil // AddText reports it
	}
	firstLine := map[string]int{}
	for i, v := range values {
		if _, ok := firstLine[v]; !ok && v != "" {
			firstLine[v] = lines[i]
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
			return fail(firstLine[b], badData("%q (first on line %d) and %q (first on line %d) differ only in case", b, firstLine[b], a, firstLine[a]),
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
		msg = fmt.Sprintf("%q appears only %s (%s) among %d values; the others are %s", l, times(count[l]), linesOf(l, values, lines), present, others)
	} else {
		parts := make([]string, len(rare))
		for i, l := range rare {
			parts[i] = fmt.Sprintf("%q (%s)", l, linesOf(l, values, lines))
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

// linesOf names the lines holding level l: "line 7" or "lines 7, 19".
func linesOf(l string, values []string, lines []int) string {
	var at []string
	for i, v := range values {
		if v == l {
			at = append(at, strconv.Itoa(lines[i]))
		}
	}
	if len(at) == 1 {
		return "line " + at[0]
	}
	return "lines " + strings.Join(at, ", ")
}

func sortByLine(levels []string, firstLine map[string]int) {
	for i := 1; i < len(levels); i++ {
		for k := i; k > 0 && firstLine[levels[k]] < firstLine[levels[k-1]]; k-- {
			levels[k], levels[k-1] = levels[k-1], levels[k]
		}
	}
}
