package order

import (
	"errors"
	"fmt"
	"slices"
	"strings"
)

// ErrInvalid is wrapped by every ValidationError.
var ErrInvalid = errors.New("order: invalid order")

// ValidationError lists every problem found when an order is checked
// against a dataset's variable names.
type ValidationError struct {
	Unknown     []string  // names in the order but not in the data
	Duplicated  []string  // names placed more than once
	Unplaced    []string  // data names in no tier
	EmptyTiers  []int     // tiers (0-based) with no names
	Backward    []Edge    // required edges that do not go forward in time
	Conflicting []Edge    // edges both forbidden and required
	BadEdges    []BadEdge // forbid and require lines naming unknown variables or one variable twice
	// Suggestions maps each unknown name (in a tier or an edge) to the
	// data name it most likely misspells, when one is close.
	Suggestions map[string]string
}

// BadEdge is a forbid or require line that cannot apply to the data.
type BadEdge struct {
	Edge
	Keyword string   // "forbid" or "require"
	Unknown []string // its names that are not in the data
}

// Error implements the error interface and lists every problem.
func (e *ValidationError) Error() string {
	var parts []string
	add := func(what string, items []string) {
		if len(items) > 0 {
			parts = append(parts, fmt.Sprintf("%s: %s", what, strings.Join(quoteAll(items), ", ")))
		}
	}
	if len(e.Unknown) > 0 {
		items := make([]string, len(e.Unknown))
		for i, n := range e.Unknown {
			items[i] = e.unknown(n)
		}
		parts = append(parts, "unknown names: "+strings.Join(items, ", "))
	}
	add("names placed twice", e.Duplicated)
	add("names in no tier", e.Unplaced)
	if len(e.EmptyTiers) > 0 {
		var t []string
		for _, i := range e.EmptyTiers {
			t = append(t, fmt.Sprint(i+1))
		}
		parts = append(parts, "empty tiers: "+strings.Join(t, ", "))
	}
	add("required edges not forward in time", edgeStrings(e.Backward))
	add("edges both forbidden and required", edgeStrings(e.Conflicting))
	for _, b := range e.BadEdges {
		line := fmt.Sprintf("%s %q -> %q: ", b.Keyword, b.From, b.To)
		if len(b.Unknown) == 0 {
			parts = append(parts, line+"an edge from a variable to itself")
			continue
		}
		items := make([]string, len(b.Unknown))
		for i, n := range b.Unknown {
			items[i] = e.unknown(n)
		}
		word := "unknown name "
		if len(items) > 1 {
			word = "unknown names "
		}
		parts = append(parts, line+word+strings.Join(items, " and "))
	}
	return "order: " + strings.Join(parts, "; ")
}

// unknown quotes an unknown name with its suggestion.
func (e *ValidationError) unknown(n string) string {
	if s, ok := e.Suggestions[n]; ok {
		return fmt.Sprintf("%q (did you mean %q?)", n, s)
	}
	return fmt.Sprintf("%q", n)
}

// Unwrap returns ErrInvalid.
func (e *ValidationError) Unwrap() error { return ErrInvalid }

func (e *ValidationError) empty() bool {
	return len(e.Unknown)+len(e.Duplicated)+len(e.Unplaced)+len(e.EmptyTiers)+len(e.Backward)+len(e.Conflicting)+len(e.BadEdges) == 0
}

// suggest fills Suggestions for the unknown names.
func (e *ValidationError) suggest(names []string) {
	var unknown []string
	unknown = append(unknown, e.Unknown...)
	for _, b := range e.BadEdges {
		unknown = append(unknown, b.Unknown...)
	}
	for _, n := range unknown {
		if s := Closest(n, names); s != "" {
			if e.Suggestions == nil {
				e.Suggestions = map[string]string{}
			}
			e.Suggestions[n] = s
		}
	}
}

// Closest returns the name in names that name most likely misspells: the
// one at the smallest edit distance (Levenshtein's: insertions, deletions
// and substitutions, ignoring case, a swap of neighbours counted as one),
// if that distance is at most a third of name's length and at most 3, and
// no other name is as close; or else "".
func Closest(name string, names []string) string {
	a := []rune(strings.ToLower(name))
	limit := min(3, max(1, len(a)/3))
	best, bestD, tie := "", limit+1, false
	for _, n := range names {
		d := distance(a, []rune(strings.ToLower(n)))
		switch {
		case d < bestD:
			best, bestD, tie = n, d, false
		case d == bestD:
			tie = true
		}
	}
	if tie || bestD > limit {
		return ""
	}
	return best
}

// distance is the optimal string alignment distance: Levenshtein's with
// a transposition of two neighbouring characters counted as one edit.
func distance(a, b []rune) int {
	prev2 := make([]int, len(b)+1)
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
			if i > 1 && j > 1 && a[i-1] == b[j-2] && a[i-2] == b[j-1] {
				cur[j] = min(cur[j], prev2[j-2]+1)
			}
		}
		prev2, prev, cur = prev, cur, prev2
	}
	return prev[len(b)]
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, x := range s {
		out[i] = fmt.Sprintf("%q", x)
	}
	return out
}

func edgeStrings(es []Edge) []string {
	out := make([]string, len(es))
	for i, e := range es {
		out[i] = e.From + " -> " + e.To
	}
	return out
}

// Plan is an order compiled against a list of variable names; variables
// are referred to by their index in that list.
type Plan struct {
	// Names are the variables, as given to Compile.
	Names []string
	// Tier holds each variable's tier, 0 first.
	Tier []int
	// Candidates holds, for each variable, the variables of strictly
	// earlier tiers that are not forbidden as its parents, in increasing
	// index order. Required parents are among them.
	Candidates [][]int
	// Required holds, for each variable, its required parents.
	Required [][]int
	// Peers holds, for each variable, the other variables of its tier
	// that are not forbidden, for optional same-tier associations.
	Peers [][]int
	// Labels holds the tier labels (may be empty strings).
	Labels []string
}

// Compile checks o against the dataset's variable names and returns the
// plan. Every unknown, duplicated or unplaced name, empty tier, backward
// required edge and forbidden-and-required pair is reported at once in a
// *ValidationError.
func (o *Order) Compile(names []string) (*Plan, error) {
	ve := &ValidationError{}
	index := make(map[string]int, len(names))
	for i, n := range names {
		if _, dup := index[n]; dup {
			return nil, fmt.Errorf("%w: the data name %q twice", ErrInvalid, n)
		}
		index[n] = i
	}
	tier := make([]int, len(names))
	for i := range tier {
		tier[i] = -1
	}
	for t, ns := range o.Tiers {
		if len(ns) == 0 {
			ve.EmptyTiers = append(ve.EmptyTiers, t)
		}
		for _, n := range ns {
			i, ok := index[n]
			switch {
			case !ok:
				if !slices.Contains(ve.Unknown, n) {
					ve.Unknown = append(ve.Unknown, n)
				}
			case tier[i] >= 0:
				if !slices.Contains(ve.Duplicated, n) {
					ve.Duplicated = append(ve.Duplicated, n)
				}
			default:
				tier[i] = t
			}
		}
	}
	for i, n := range names {
		if tier[i] < 0 && !slices.Contains(ve.Duplicated, n) {
			ve.Unplaced = append(ve.Unplaced, n)
		}
	}
	edge := func(e Edge, keyword string) (int, int, bool) {
		a, ok1 := index[e.From]
		b, ok2 := index[e.To]
		if ok1 && ok2 && a != b {
			return a, b, true
		}
		bad := BadEdge{Edge: e, Keyword: keyword}
		if !ok1 {
			bad.Unknown = append(bad.Unknown, e.From)
		}
		if !ok2 && e.To != e.From {
			bad.Unknown = append(bad.Unknown, e.To)
		}
		ve.BadEdges = append(ve.BadEdges, bad)
		return 0, 0, false
	}
	forbidden := map[[2]int]bool{}
	for _, e := range o.Forbidden {
		if a, b, ok := edge(e, "forbid"); ok {
			forbidden[[2]int{a, b}] = true
		}
	}
	p := &Plan{
		Names:      slices.Clone(names),
		Tier:       tier,
		Candidates: make([][]int, len(names)),
		Required:   make([][]int, len(names)),
		Peers:      make([][]int, len(names)),
		Labels:     make([]string, len(o.Tiers)),
	}
	copy(p.Labels, o.Labels)
	for _, e := range o.Required {
		a, b, ok := edge(e, "require")
		if !ok {
			continue
		}
		if forbidden[[2]int{a, b}] {
			ve.Conflicting = append(ve.Conflicting, e)
			continue
		}
		if tier[a] >= 0 && tier[b] >= 0 && tier[a] >= tier[b] {
			ve.Backward = append(ve.Backward, e)
			continue
		}
		if !slices.Contains(p.Required[b], a) {
			p.Required[b] = append(p.Required[b], a)
		}
	}
	if !ve.empty() {
		ve.suggest(names)
		return nil, ve
	}
	for j := range names {
		for i := range names {
			if i == j || forbidden[[2]int{i, j}] {
				continue
			}
			switch {
			case tier[i] < tier[j]:
				p.Candidates[j] = append(p.Candidates[j], i)
			case tier[i] == tier[j]:
				p.Peers[j] = append(p.Peers[j], i)
			}
		}
		slices.Sort(p.Required[j])
	}
	return p, nil
}

// Index returns the index of name in p.Names, or −1.
func (p *Plan) Index(name string) int { return slices.Index(p.Names, name) }
