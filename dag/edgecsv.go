package dag

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// edgeColumns are the columns WriteEdgeCSV writes after "from" and "to".
var edgeColumns = []string{"coefficient", "lower", "upper", "standardized", "frequency", "sign", "required"}

// WriteEdgeCSV writes the graph as an edge list in CSV: a header "from,
// to, coefficient, lower, upper, standardized, frequency, sign, required",
// one row per edge in the graph's order with unknown values empty, then
// one row with an empty "to" per node that has no edge. Node data (tiers,
// kinds) have no place in it; GraphML and JSON carry them. ReadEdgeCSV
// reads it back.
func (g *Graph) WriteEdgeCSV(w io.Writer) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(append([]string{"from", "to"}, edgeColumns...)); err != nil {
		return err
	}
	num := func(x float64) string {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return ""
		}
		return strconv.FormatFloat(x, 'g', -1, 64)
	}
	for _, e := range g.edges {
		if err := cw.Write([]string{e.From, e.To, num(e.Coefficient), num(e.Lower), num(e.Upper), num(e.Standardized),
			num(e.Frequency), strconv.Itoa(e.Sign), strconv.FormatBool(e.Required)}); err != nil {
			return err
		}
	}
	for i, n := range g.names {
		if len(g.parents[i]) == 0 && len(g.children[i]) == 0 {
			if err := cw.Write([]string{n, "", "", "", "", "", "", "", ""}); err != nil {
				return err
			}
		}
	}
	cw.Flush()
	return cw.Error()
}

// ReadEdgeCSV reads a graph from an edge list in CSV: a header naming
// "from" and "to" columns (any case), then one edge per row. A row with
// "to" empty declares an isolated node. Nodes take the order in which they
// first appear. The columns WriteEdgeCSV writes besides (coefficient,
// lower, upper, standardized, frequency, sign, required) are read when
// present, an empty cell as unknown; other columns are ignored. Errors
// name the line and, for a bad value, the column.
func ReadEdgeCSV(r io.Reader) (*Graph, error) {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = -1
	head, err := cr.Read()
	if err != nil {
		if errors.Is(err, io.EOF) {
			return nil, fmt.Errorf("%w: empty edge list", ErrFormat)
		}
		return nil, fmt.Errorf("%w: %v", ErrFormat, err)
	}
	col := map[string]int{}
	for i, h := range head {
		k := strings.ToLower(strings.TrimSpace(strings.TrimPrefix(h, "\ufeff")))
		if _, dup := col[k]; !dup {
			col[k] = i
		}
	}
	from, okf := col["from"]
	to, okt := col["to"]
	if !okf || !okt {
		return nil, fmt.Errorf("%w: line 1: header needs columns \"from\" and \"to\", got %q", ErrFormat, head)
	}
	var names []string
	seen := map[string]bool{}
	add := func(n string) {
		if !seen[n] {
			seen[n] = true
			names = append(names, n)
		}
	}
	var edges []Edge
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("%w: %v", ErrFormat, err)
		}
		line, _ := cr.FieldPos(0)
		if from >= len(rec) || to >= len(rec) {
			return nil, fmt.Errorf("%w: line %d has %d fields", ErrFormat, line, len(rec))
		}
		a, b := strings.TrimSpace(rec[from]), strings.TrimSpace(rec[to])
		if a == "" {
			return nil, fmt.Errorf("%w: line %d has an empty \"from\"", ErrFormat, line)
		}
		add(a)
		if b == "" {
			continue
		}
		add(b)
		e := NewEdge(a, b)
		if err := readEdgeColumns(&e, rec, col); err != nil {
			return nil, fmt.Errorf("%w: line %d: %v", ErrFormat, line, err)
		}
		edges = append(edges, e)
	}
	return New(names, edges)
}

// readEdgeColumns sets the attributes whose columns the record has.
func readEdgeColumns(e *Edge, rec []string, col map[string]int) error {
	for _, name := range edgeColumns {
		i, ok := col[name]
		if !ok || i >= len(rec) {
			continue
		}
		if err := e.setAttr(name, rec[i]); err != nil {
			return fmt.Errorf("column %q: %v", name, err)
		}
	}
	return nil
}

// setAttr sets the attribute named key (a JSON key of Edge: coefficient,
// lower, upper, standardized, frequency, sign, required) from its text; an
// empty value leaves it unknown, and other keys are passed over. It returns
// an error naming the value when it is not of the attribute's type.
func (e *Edge) setAttr(key, value string) error {
	v := strings.TrimSpace(value)
	var dst *float64
	switch key {
	case "coefficient":
		dst = &e.Coefficient
	case "lower":
		dst = &e.Lower
	case "upper":
		dst = &e.Upper
	case "standardized":
		dst = &e.Standardized
	case "frequency":
		dst = &e.Frequency
	case "sign", "required":
	default:
		return nil
	}
	if v == "" {
		return nil
	}
	switch key {
	case "sign":
		x, err := strconv.Atoi(v)
		if err != nil || x < -1 || x > 1 {
			return fmt.Errorf("%q is not -1, 0 or 1", value)
		}
		e.Sign = x
	case "required":
		x, err := strconv.ParseBool(v)
		if err != nil {
			return fmt.Errorf("%q is not true or false", value)
		}
		e.Required = x
	default:
		x, err := strconv.ParseFloat(v, 64)
		if err != nil {
			return fmt.Errorf("%q is not a number", value)
		}
		*dst = x
	}
	return nil
}
