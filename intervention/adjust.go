package intervention

import (
	"fmt"
	"slices"

	"github.com/antecedent-lab/antecedent/dag"
)

// ParentSet returns the parents of cause in g. When g is the true graph,
// they form a valid adjustment set for the total effect of cause on any
// variable (Pearl 2009, Causality, 2nd ed., sec. 3.3: adjustment for
// direct causes). It returns an error for an unknown name.
func ParentSet(g *dag.Graph, cause string) ([]string, error) {
	p, err := g.Parents(cause)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrQuestion, err)
	}
	return p, nil
}

// OptimalSet returns the optimal adjustment set of Henckel, Perković &
// Maathuis (2022), "Graphical criteria for efficient total effect
// estimation via adjustment in causal linear models", JRSS-B
// 84(2):579–599, for the total effect of cause on outcome in g:
//
//	cn   = variables other than cause on a directed path from cause to outcome (outcome included)
//	forb = cause and every descendant of a variable in cn (cn included)
//	O    = parents of cn, minus forb
//
// Among the valid adjustment sets of a linear model it gives the least
// asymptotic variance. The names come in g's order. It returns an error
// wrapping ErrQuestion for an unknown name, or when outcome is not a
// descendant of cause (the total effect is then zero in g and the set is
// not defined).
func OptimalSet(g *dag.Graph, cause, outcome string) ([]string, error) {
	names := g.Names()
	x, y := slices.Index(names, cause), slices.Index(names, outcome)
	if x < 0 || y < 0 {
		return nil, fmt.Errorf("%w: unknown variable in %q → %q", ErrQuestion, cause, outcome)
	}
	de, _ := g.Descendants(cause)
	if !slices.Contains(de, outcome) {
		return nil, fmt.Errorf("%w: %q is not a descendant of %q in the network", ErrQuestion, outcome, cause)
	}
	an, _ := g.Ancestors(outcome)
	in := func(set []string) map[string]bool {
		m := make(map[string]bool, len(set))
		for _, s := range set {
			m[s] = true
		}
		return m
	}
	desc, anc := in(de), in(an)
	forb := map[string]bool{cause: true}
	var cn []string
	for _, n := range names {
		if n == outcome || (desc[n] && anc[n]) {
			cn = append(cn, n)
			forb[n] = true
			d, _ := g.Descendants(n)
			for _, s := range d {
				forb[s] = true
			}
		}
	}
	keep := map[string]bool{}
	for _, c := range cn {
		ps, _ := g.Parents(c)
		for _, p := range ps {
			if !forb[p] {
				keep[p] = true
			}
		}
	}
	out := []string{}
	for _, n := range names {
		if keep[n] {
			out = append(out, n)
		}
	}
	return out, nil
}
