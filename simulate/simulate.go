// Package simulate draws data from a known directed acyclic graph, for
// tests, demonstrations and power questions ("how many rows find an edge of
// this size?").
//
// A continuous node is linear-Gaussian,
//
//	x = intercept + Σ_k w_k·parent_k + noise·ε,   ε ~ N(0, 1)
//
// and a binary node is logistic, P(x = 1) = 1/(1 + exp(−(intercept + Σ_k
// w_k·parent_k))), or given directly by a function of its parents' values
// (a conditional probability table). For a binary node a target
// prevalence may replace the intercept: the intercept is then solved, on
// each sample, so that the mean probability equals the target.
//
// Sampling is seeded and reproducible: the same model, size and seed give
// the same data.
package simulate

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/order"
)

// ErrModel is wrapped by every error about a model's definition.
var ErrModel = errors.New("simulate: bad model")

// Node is one variable of a model.
type Node struct {
	Name string
	// Binary makes the node 0/1 and logistic; otherwise it is
	// linear-Gaussian.
	Binary bool
	// Parents and Weights give the linear predictor Σ w_k·parent_k.
	Parents []string
	Weights []float64
	// Intercept of the linear predictor.
	Intercept float64
	// Prevalence, when in (0, 1), replaces Intercept for a binary node by
	// the value that makes the sample's mean probability equal to it.
	Prevalence float64
	// NoiseSD is the noise standard deviation of a continuous node; zero
	// means 1.
	NoiseSD float64
	// Probability, when set on a binary node, gives P(x = 1) from the
	// parents' values (in the order of Parents) and replaces the logistic
	// form; Weights are then only the edges' nominal effects.
	Probability func(parents []float64) float64
}

// Model is a set of nodes forming a DAG.
type Model struct {
	Nodes []Node
}

// Graph returns the model's DAG with each edge's weight as its
// coefficient.
func (m *Model) Graph() (*dag.Graph, error) {
	names := make([]string, len(m.Nodes))
	var edges []dag.Edge
	for i, nd := range m.Nodes {
		names[i] = nd.Name
		if nd.Weights != nil && len(nd.Weights) != len(nd.Parents) {
			return nil, fmt.Errorf("%w: node %q has %d parents and %d weights", ErrModel, nd.Name, len(nd.Parents), len(nd.Weights))
		}
		for k, p := range nd.Parents {
			e := dag.NewEdge(p, nd.Name)
			if nd.Weights != nil {
				e.Coefficient = nd.Weights[k]
				e.Sign = int(math.Copysign(1, nd.Weights[k]))
				if nd.Weights[k] == 0 {
					e.Sign = 0
				}
			}
			edges = append(edges, e)
		}
	}
	g, err := dag.New(names, edges)
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrModel, err)
	}
	return g, nil
}

// Sample holds simulated data, column-major, in the model's node order.
type Sample struct {
	Names   []string
	Columns [][]float64
}

// Column returns the column of the named variable, or nil.
func (s *Sample) Column(name string) []float64 {
	for j, n := range s.Names {
		if n == name {
			return s.Columns[j]
		}
	}
	return nil
}

// Sample draws n rows with the given seed. It returns an error for a bad
// model (unknown parent, cycle, weights that do not match the parents, a
// prevalence outside (0, 1) on a continuous node) or n < 1.
func (m *Model) Sample(n int, seed uint64) (*Sample, error) {
	if n < 1 {
		return nil, fmt.Errorf("%w: %d rows", ErrModel, n)
	}
	g, err := m.Graph()
	if err != nil {
		return nil, err
	}
	idx := map[string]int{}
	for i, nd := range m.Nodes {
		idx[nd.Name] = i
		if nd.Prevalence < 0 || nd.Prevalence >= 1 {
			return nil, fmt.Errorf("%w: node %q prevalence %g outside (0, 1)", ErrModel, nd.Name, nd.Prevalence)
		}
		if !nd.Binary && (nd.Prevalence != 0 || nd.Probability != nil) {
			return nil, fmt.Errorf("%w: continuous node %q has a prevalence or probability", ErrModel, nd.Name)
		}
		if nd.NoiseSD < 0 {
			return nil, fmt.Errorf("%w: node %q noise SD %g", ErrModel, nd.Name, nd.NoiseSD)
		}
	}
	s := &Sample{Names: make([]string, len(m.Nodes)), Columns: make([][]float64, len(m.Nodes))}
	rng := rand.New(rand.NewPCG(seed, 0x73696d))
	lin := make([]float64, n)
	vals := []float64{}
	for _, name := range g.TopologicalOrder() {
		i := idx[name]
		nd := m.Nodes[i]
		col := make([]float64, n)
		for r := range lin {
			lin[r] = 0
			for k, p := range nd.Parents {
				if nd.Weights != nil {
					lin[r] += nd.Weights[k] * s.Columns[idx[p]][r]
				}
			}
		}
		switch {
		case nd.Binary && nd.Probability != nil:
			for r := range col {
				vals = vals[:0]
				for _, p := range nd.Parents {
					vals = append(vals, s.Columns[idx[p]][r])
				}
				if rng.Float64() < nd.Probability(vals) {
					col[r] = 1
				}
			}
		case nd.Binary:
			b0 := nd.Intercept
			if nd.Prevalence > 0 {
				b0 = solveIntercept(lin, nd.Prevalence)
			}
			for r := range col {
				if rng.Float64() < 1/(1+math.Exp(-(b0+lin[r]))) {
					col[r] = 1
				}
			}
		default:
			sd := nd.NoiseSD
			if sd == 0 {
				sd = 1
			}
			for r := range col {
				col[r] = nd.Intercept + lin[r] + sd*rng.NormFloat64()
			}
		}
		s.Names[i] = name
		s.Columns[i] = col
	}
	return s, nil
}

// solveIntercept returns b with mean(logistic(b + lin)) = target, by
// bisection (the mean is increasing in b).
func solveIntercept(lin []float64, target float64) float64 {
	lo, hi := -50.0, 50.0
	for range 100 {
		mid := (lo + hi) / 2
		var m float64
		for _, l := range lin {
			m += 1 / (1 + math.Exp(-(mid + l)))
		}
		if m/float64(len(lin)) < target {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// RandomSettings describes a random tiered model.
type RandomSettings struct {
	// Variables is the number of nodes (at least 2).
	Variables int
	// Tiers is the number of tiers (at least 2); nodes are spread over
	// them as evenly as possible.
	Tiers int
	// EdgeProbability is the chance of an edge from each node to each
	// node of a later tier; zero means 2/Variables.
	EdgeProbability float64
	// BinaryShare is the share of binary nodes, in [0, 1].
	BinaryShare float64
	// MinWeight and MaxWeight bound the absolute edge weights, drawn
	// uniformly with a random sign; zero means 0.3 and 1.
	MinWeight, MaxWeight float64
}

// Random draws a random tiered model and its order: edges only go from an
// earlier tier to a later one, binary nodes have a prevalence drawn in
// [0.2, 0.5], and continuous nodes unit noise. Nodes are named v01, v02, …
func Random(s RandomSettings, seed uint64) (*Model, *order.Order, error) {
	if s.Variables < 2 || s.Tiers < 2 || s.Tiers > s.Variables {
		return nil, nil, fmt.Errorf("%w: %d variables in %d tiers", ErrModel, s.Variables, s.Tiers)
	}
	if s.BinaryShare < 0 || s.BinaryShare > 1 || s.EdgeProbability < 0 || s.EdgeProbability > 1 {
		return nil, nil, fmt.Errorf("%w: share or probability outside [0, 1]", ErrModel)
	}
	prob := s.EdgeProbability
	if prob == 0 {
		prob = 2 / float64(s.Variables)
	}
	lo, hi := s.MinWeight, s.MaxWeight
	if lo == 0 && hi == 0 {
		lo, hi = 0.3, 1
	}
	if lo < 0 || hi < lo {
		return nil, nil, fmt.Errorf("%w: weights in [%g, %g]", ErrModel, lo, hi)
	}
	rng := rand.New(rand.NewPCG(seed, 0x72616e64))
	width := len(fmt.Sprint(s.Variables))
	m := &Model{}
	o := &order.Order{Tiers: make([][]string, s.Tiers)}
	tier := make([]int, s.Variables)
	for i := range s.Variables {
		tier[i] = i * s.Tiers / s.Variables
		name := fmt.Sprintf("v%0*d", max(width, 2), i+1)
		nd := Node{Name: name, Binary: rng.Float64() < s.BinaryShare}
		if nd.Binary {
			nd.Prevalence = 0.2 + 0.3*rng.Float64()
		}
		for k := 0; k < i; k++ {
			if tier[k] < tier[i] && rng.Float64() < prob {
				w := lo + (hi-lo)*rng.Float64()
				if rng.IntN(2) == 0 {
					w = -w
				}
				nd.Parents = append(nd.Parents, m.Nodes[k].Name)
				nd.Weights = append(nd.Weights, w)
			}
		}
		m.Nodes = append(m.Nodes, nd)
		o.Tiers[tier[i]] = append(o.Tiers[tier[i]], name)
	}
	return m, o, nil
}
