package order

import (
	"bufio"
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"sort"
	"strings"
	"unicode"
)

// Edge is a directed pair of variable names.
type Edge struct {
	From, To string
}

// Order is a temporal order of variables with edge constraints.
type Order struct {
	// Tiers lists variable names by tier, earliest first.
	Tiers [][]string
	// Labels optionally names each tier; nil or shorter than Tiers is
	// allowed.
	Labels []string
	// Forbidden edges are never considered.
	Forbidden []Edge
	// Required edges are always in the graph, unpenalised.
	Required []Edge
}

// ErrNotText is returned by WriteText for an order the text form cannot
// carry; MarshalJSON writes every order.
var ErrNotText = errors.New("order: cannot be written in the text form (use the JSON form)")

// ErrSyntax is wrapped by every ParseError.
var ErrSyntax = errors.New("order: syntax error")

// ParseError reports a problem at a line of the text form (Line ≥ 1) or in
// the JSON form (Line 0 when the decoder gives no position).
type ParseError struct {
	Line int
	Msg  string
}

// Error implements the error interface.
func (e *ParseError) Error() string {
	if e.Line > 0 {
		return fmt.Sprintf("order: line %d: %s", e.Line, e.Msg)
	}
	return "order: " + e.Msg
}

// Unwrap returns ErrSyntax.
func (e *ParseError) Unwrap() error { return ErrSyntax }

// MaxInput bounds the size of an order file Parse accepts (4 MiB).
const MaxInput = 4 << 20

// Parse reads an order in either form: JSON when the first non-space
// character is '{', the text form otherwise. It checks the syntax only;
// Compile checks the names against a dataset.
func Parse(r io.Reader) (*Order, error) {
	b, err := io.ReadAll(io.LimitReader(r, MaxInput+1))
	if err != nil {
		return nil, fmt.Errorf("order: %w", err)
	}
	if len(b) > MaxInput {
		return nil, &ParseError{Msg: fmt.Sprintf("input larger than %d bytes", MaxInput)}
	}
	if t := bytes.TrimLeftFunc(b, unicode.IsSpace); len(t) > 0 && t[0] == '{' {
		return parseJSON(b)
	}
	return parseText(b)
}

type jsonOrder struct {
	Tiers     [][]string  `json:"tiers"`
	Labels    []string    `json:"labels,omitempty"`
	Forbidden [][2]string `json:"forbidden,omitempty"`
	Required  [][2]string `json:"required,omitempty"`
}

func parseJSON(b []byte) (*Order, error) {
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	var j jsonOrder
	if err := dec.Decode(&j); err != nil {
		line := 0
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line = 1 + bytes.Count(b[:min(int(se.Offset), len(b))], []byte("\n"))
		}
		return nil, &ParseError{Line: line, Msg: "JSON: " + err.Error()}
	}
	if dec.More() {
		return nil, &ParseError{Msg: "JSON: data after the order object"}
	}
	if j.Tiers == nil {
		return nil, &ParseError{Msg: `JSON: no "tiers"`}
	}
	for t, names := range j.Tiers {
		for _, n := range names {
			if n == "" {
				return nil, &ParseError{Msg: fmt.Sprintf("JSON: empty name in tier %d", t+1)}
			}
		}
	}
	for _, e := range append(append([][2]string{}, j.Forbidden...), j.Required...) {
		if e[0] == "" || e[1] == "" {
			return nil, &ParseError{Msg: "JSON: empty name in an edge"}
		}
	}
	o := &Order{Tiers: j.Tiers, Labels: j.Labels}
	for _, e := range j.Forbidden {
		o.Forbidden = append(o.Forbidden, Edge{e[0], e[1]})
	}
	for _, e := range j.Required {
		o.Required = append(o.Required, Edge{e[0], e[1]})
	}
	return o, nil
}

// MarshalJSON writes the JSON form.
func (o *Order) MarshalJSON() ([]byte, error) {
	j := jsonOrder{Tiers: o.Tiers, Labels: o.Labels}
	if j.Tiers == nil {
		j.Tiers = [][]string{}
	}
	for _, e := range o.Forbidden {
		j.Forbidden = append(j.Forbidden, [2]string{e.From, e.To})
	}
	for _, e := range o.Required {
		j.Required = append(j.Required, [2]string{e.From, e.To})
	}
	return json.Marshal(j)
}

// UnmarshalJSON reads the JSON form.
func (o *Order) UnmarshalJSON(b []byte) error {
	p, err := parseJSON(b)
	if err != nil {
		return err
	}
	*o = *p
	return nil
}

func parseText(b []byte) (*Order, error) {
	o := &Order{}
	sc := bufio.NewScanner(bytes.NewReader(b))
	sc.Buffer(make([]byte, 0, 64*1024), MaxInput)
	line := 0
	for sc.Scan() {
		line++
		text := sc.Text()
		if line == 1 {
			text = strings.TrimPrefix(text, "\ufeff")
		}
		words, err := split(text)
		if err != nil {
			return nil, &ParseError{Line: line, Msg: err.Error()}
		}
		if len(words) == 0 {
			continue
		}
		head := words[0]
		switch {
		case head == "tier" || strings.HasPrefix(head, "tier:"):
			label, names, err := tierLine(text)
			if err != nil {
				return nil, &ParseError{Line: line, Msg: err.Error()}
			}
			o.Tiers = append(o.Tiers, names)
			for len(o.Labels) < len(o.Tiers)-1 {
				o.Labels = append(o.Labels, "")
			}
			o.Labels = append(o.Labels, label)
		case head == "forbid" || head == "require":
			if len(words) != 4 || words[2] != "->" {
				return nil, &ParseError{Line: line, Msg: fmt.Sprintf("want %q, got %q", head+" FROM -> TO", strings.TrimSpace(text))}
			}
			e := Edge{words[1], words[3]}
			if head == "forbid" {
				o.Forbidden = append(o.Forbidden, e)
			} else {
				o.Required = append(o.Required, e)
			}
		default:
			return nil, &ParseError{Line: line, Msg: fmt.Sprintf("unknown keyword %q (want tier, forbid or require)", head)}
		}
	}
	if err := sc.Err(); err != nil {
		return nil, &ParseError{Line: line + 1, Msg: err.Error()}
	}
	if len(o.Tiers) == 0 {
		return nil, &ParseError{Msg: "no tier lines"}
	}
	if allEmpty(o.Labels) {
		o.Labels = nil
	}
	return o, nil
}

func allEmpty(s []string) bool {
	for _, x := range s {
		if x != "" {
			return false
		}
	}
	return true
}

// tierLine parses "tier LABEL: names" or "tier: names".
func tierLine(text string) (string, []string, error) {
	text = stripComment(text)
	rest := strings.TrimSpace(text)
	rest = strings.TrimPrefix(rest, "\ufeff")
	rest = strings.TrimPrefix(rest, "tier")
	colon := indexUnquoted(rest, ':')
	if colon < 0 {
		return "", nil, errors.New(`tier line needs a ':' before its names, as in "tier baseline: a b"`)
	}
	label := strings.TrimSpace(rest[:colon])
	if strings.ContainsAny(label, `"`) {
		return "", nil, errors.New("tier label may not be quoted")
	}
	names, err := splitNames(rest[colon+1:])
	if err != nil {
		return "", nil, err
	}
	return label, names, nil
}

func stripComment(s string) string {
	if i := indexUnquoted(s, '#'); i >= 0 {
		return s[:i]
	}
	return s
}

func indexUnquoted(s string, c rune) int {
	quoted := false
	for i, r := range s {
		if r == '"' {
			quoted = !quoted
		} else if r == c && !quoted {
			return i
		}
	}
	return -1
}

// split breaks a line into words at white space, honouring double quotes
// and dropping a '#' comment.
func split(s string) ([]string, error) {
	return fields(stripComment(s), false)
}

// splitNames breaks a tier's names at white space or commas.
func splitNames(s string) ([]string, error) {
	return fields(s, true)
}

func fields(s string, commas bool) ([]string, error) {
	var out []string
	var cur strings.Builder
	inWord, quoted := false, false
	flush := func() {
		if inWord {
			out = append(out, cur.String())
			cur.Reset()
			inWord = false
		}
	}
	for _, r := range s {
		switch {
		case r == '"':
			if quoted {
				quoted = false
				out = append(out, cur.String())
				cur.Reset()
				inWord = false
				continue
			}
			flush()
			quoted = true
		case quoted:
			cur.WriteRune(r)
		case unicode.IsSpace(r) || (commas && r == ','):
			flush()
		default:
			cur.WriteRune(r)
			inWord = true
		}
	}
	if quoted {
		return nil, errors.New("unclosed quote")
	}
	flush()
	for _, w := range out {
		if w == "" {
			return nil, errors.New("empty quoted name")
		}
	}
	return out, nil
}

// WriteText writes the text form of o to w; Parse reads it back equal. It
// writes nothing and returns an error wrapping ErrNotText when o holds what
// the text form cannot carry: an empty name or one with a double quote or a
// line break, or a tier label with one of `:#"`, a line break or white
// space at either end, or more non-empty labels than tiers.
func (o *Order) WriteText(w io.Writer) error {
	if err := o.textable(); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	for t, names := range o.Tiers {
		label := ""
		if t < len(o.Labels) {
			label = o.Labels[t]
		}
		fmt.Fprintf(bw, "tier %s:", label)
		for _, n := range names {
			bw.WriteString(" " + quote(n))
		}
		bw.WriteString("\n")
	}
	for _, e := range o.Forbidden {
		fmt.Fprintf(bw, "forbid %s -> %s\n", quote(e.From), quote(e.To))
	}
	for _, e := range o.Required {
		fmt.Fprintf(bw, "require %s -> %s\n", quote(e.From), quote(e.To))
	}
	return bw.Flush()
}

func (o *Order) textable() error {
	names := func(ns ...string) error {
		for _, n := range ns {
			if n == "" || strings.ContainsAny(n, "\"\n\r") {
				return fmt.Errorf("%w: name %q", ErrNotText, n)
			}
		}
		return nil
	}
	for _, t := range o.Tiers {
		if err := names(t...); err != nil {
			return err
		}
	}
	for _, e := range append(append([]Edge{}, o.Forbidden...), o.Required...) {
		if err := names(e.From, e.To); err != nil {
			return err
		}
	}
	for i, l := range o.Labels {
		switch {
		case i >= len(o.Tiers) && l != "":
			return fmt.Errorf("%w: label %q without a tier", ErrNotText, l)
		case l != strings.TrimSpace(l) || strings.ContainsAny(l, ":#\"\n\r"):
			return fmt.Errorf("%w: tier label %q", ErrNotText, l)
		}
	}
	return nil
}

func quote(s string) string {
	if s == "->" || strings.ContainsAny(s, ",#:\"") || strings.ContainsFunc(s, unicode.IsSpace) {
		return `"` + s + `"`
	}
	return s
}

// FromTimes builds an order from each variable's typical time of
// occurrence (for example the mean age at diagnosis): variables are sorted
// by time and a new tier starts whenever a time exceeds the first time of
// the current tier by more than tolerance. It returns an error for
// mismatched lengths, a NaN time, a negative tolerance or a duplicate name.
func FromTimes(names []string, times []float64, tolerance float64) (*Order, error) {
	if len(names) != len(times) {
		return nil, fmt.Errorf("order: %d names and %d times", len(names), len(times))
	}
	if !(tolerance >= 0) {
		return nil, fmt.Errorf("order: tolerance %g must be ≥ 0", tolerance)
	}
	seen := map[string]bool{}
	idx := make([]int, len(names))
	for i, n := range names {
		if math.IsNaN(times[i]) {
			return nil, fmt.Errorf("order: time of %q is NaN", n)
		}
		if seen[n] {
			return nil, fmt.Errorf("order: %q given twice", n)
		}
		seen[n] = true
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return times[idx[a]] < times[idx[b]] })
	o := &Order{}
	start := math.Inf(-1)
	for _, i := range idx {
		if len(o.Tiers) == 0 || times[i]-start > tolerance {
			o.Tiers = append(o.Tiers, nil)
			start = times[i]
		}
		t := len(o.Tiers) - 1
		o.Tiers[t] = append(o.Tiers[t], names[i])
	}
	return o, nil
}
