package sizing

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"sync"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// ErrSettings is wrapped by every error about a Generator, Settings or a
// question asked of a Plan.
var ErrSettings = errors.New("sizing: bad settings")

// Cautions are printed with every plan.
var Cautions = []string{
	"These shares treat the network the studies are drawn from as the truth: an edge it lacks is never simulated, and its effect sizes carry their own uncertainty.",
	"They are planning figures from simulation, not a guarantee; a study's design needs review by a licensed statistician.",
}

// Generator draws studies from a known network.
type Generator interface {
	// Sample returns n rows drawn with seed; the same n and seed must
	// give the same data. Run calls it from several goroutines at once.
	Sample(n int, seed uint64) (*table.Dataset, error)
	// Edges returns the edges of the network the rows are drawn from:
	// what discovery should find.
	Edges() []dag.Edge
}

// FromModel returns a Generator over a model written by hand. Its edges
// carry the model's weights as coefficients; an edge of weight zero is
// an edge of no effect, whose share of studies shows how often discovery
// finds an edge that does nothing. A node's Probability function, when
// set, must be safe for concurrent use.
func FromModel(m *simulate.Model) (Generator, error) {
	if m == nil {
		return nil, fmt.Errorf("%w: no model", ErrSettings)
	}
	g, err := m.Graph()
	if err != nil {
		return nil, err
	}
	return modelGenerator{m: m, edges: g.Edges()}, nil
}

type modelGenerator struct {
	m     *simulate.Model
	edges []dag.Edge
}

func (g modelGenerator) Edges() []dag.Edge { return slices.Clone(g.edges) }

func (g modelGenerator) Sample(n int, seed uint64) (*table.Dataset, error) {
	s, err := g.m.Sample(n, seed)
	if err != nil {
		return nil, err
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		return nil, err
	}
	for _, nd := range g.m.Nodes {
		if !nd.Binary {
			if err := d.SetKind(nd.Name, table.Continuous); err != nil {
				return nil, err
			}
		}
	}
	return d, nil
}

// Settings configure Run.
type Settings struct {
	// Sizes are the numbers of rows of the simulated studies, increasing,
	// each at least twice the number of folds.
	Sizes []int
	// Replicates is the number of studies of each size; zero means 50.
	Replicates int
	// Seed makes the studies reproducible.
	Seed uint64
	// Workers bounds the studies run at once, each on one goroutine;
	// zero means GOMAXPROCS. The plan does not depend on it.
	Workers int
	// Progress, when set, is called after each study with the number
	// done and the total, from one goroutine at a time.
	Progress func(done, total int)
}

// Plan is the outcome of Run.
type Plan struct {
	Sizes      []int  `json:"sizes"`
	Replicates int    `json:"replicates"`
	Seed       uint64 `json:"seed"`
	// Edges holds every edge of the generating network with the share of
	// studies of each size that found it.
	Edges []EdgeRate `json:"edges"`
	// False holds, for each size, the edges found that the generating
	// network lacks.
	False []FalseRate `json:"extraedges"`
	// Pairs is the number of pairs the order lets discovery consider
	// (a variable and a candidate parent) that are not edges of the
	// generating network: the denominator of the false-edge rate.
	Pairs    int      `json:"pairs"`
	Warnings []string `json:"warnings,omitempty"`
	Cautions []string `json:"cautions"`
}

// EdgeRate is how often one edge was found.
type EdgeRate struct {
	From string `json:"from"`
	To   string `json:"to"`
	// Coefficient is the edge's effect in the generating network (per
	// unit; log odds for a binary child).
	Coefficient antecedent.Number `json:"coefficient"`
	// Allowed is false when the order does not let discovery consider the
	// edge (its share is then zero at every size).
	Allowed bool `json:"allowed"`
	// Found holds, per size, the share of studies that found the edge.
	Found []Rate `json:"found"`
}

// Rate is a share of studies with its Monte Carlo standard error.
type Rate struct {
	Rows  int     `json:"rows"`
	Value float64 `json:"value"`
	SE    float64 `json:"se"`
}

// FalseRate counts the edges found that the generating network lacks.
type FalseRate struct {
	Rows int `json:"rows"`
	// Mean is the expected number of false edges per study and SE its
	// Monte Carlo standard error.
	Mean float64 `json:"mean"`
	SE   float64 `json:"se"`
	// PerPair is Mean divided by Plan.Pairs: the chance that a pair
	// without an edge gets one.
	PerPair   float64 `json:"per_pair"`
	PerPairSE float64 `json:"per_pair_se"`
}

// study is what one simulated study contributes.
type study struct {
	found []bool // by generating edge
	extra int
	pairs int
	allow []bool
}

// Run draws Replicates studies of each size from g, discovers each with
// the order o and the configuration cfg (nil: defaults; its Progress and
// Workers are not used, each study runs on one goroutine), and counts the
// edges found. Study k of size index s is drawn with a seed derived from
// Settings.Seed, s and k, so the plan is the same for any number of
// workers. Run returns an error wrapping ErrSettings for bad settings, the
// first error of a study's sampling or discovery, or ctx.Err().
func Run(ctx context.Context, g Generator, o *order.Order, cfg *antecedent.Config, s *Settings) (*Plan, error) {
	if g == nil || o == nil {
		return nil, fmt.Errorf("%w: a generator and an order are both needed", ErrSettings)
	}
	var set Settings
	if s != nil {
		set = *s
	}
	if set.Replicates == 0 {
		set.Replicates = 50
	}
	var c antecedent.Config
	if cfg != nil {
		c = *cfg
	}
	if err := c.Validate(); err != nil {
		return nil, err
	}
	c.Progress, c.Workers = nil, 1
	folds := c.Folds
	if folds == 0 {
		folds = 10
	}
	switch {
	case set.Replicates < 2:
		return nil, fmt.Errorf("%w: %d replicates; need at least 2", ErrSettings, set.Replicates)
	case len(set.Sizes) == 0:
		return nil, fmt.Errorf("%w: no study sizes", ErrSettings)
	case set.Workers < 0:
		return nil, fmt.Errorf("%w: %d workers", ErrSettings, set.Workers)
	}
	for i, n := range set.Sizes {
		if n < 2*folds {
			return nil, fmt.Errorf("%w: a study of %d rows is too small for %d-fold cross-validation (need %d or more)", ErrSettings, n, folds, 2*folds)
		}
		if i > 0 && n <= set.Sizes[i-1] {
			return nil, fmt.Errorf("%w: sizes must increase (%d after %d)", ErrSettings, n, set.Sizes[i-1])
		}
	}
	edges := g.Edges()
	R := set.Replicates
	studies := make([]study, len(set.Sizes)*R)
	var mu sync.Mutex
	done := 0
	err := pool.Run(ctx, set.Workers, len(studies), func(ctx context.Context, i int) error {
		k, r := i/R, i%R
		n := set.Sizes[k]
		d, err := g.Sample(n, seedOf(set.Seed, k, r))
		if err != nil {
			return fmt.Errorf("sizing: drawing study %d of %d rows: %w", r+1, n, err)
		}
		res, err := antecedent.DiscoverContext(ctx, d, o, &c)
		if err != nil {
			if ctx.Err() != nil {
				return ctx.Err()
			}
			return fmt.Errorf("sizing: study %d of %d rows: %w", r+1, n, err)
		}
		studies[i] = count(res, edges)
		if set.Progress != nil {
			mu.Lock()
			done++
			set.Progress(done, len(studies))
			mu.Unlock()
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	return summarise(set, edges, studies), nil
}

// seedOf derives the seed of study r of size index k (splitmix64 steps,
// Steele, Lea & Flood 2014, OOPSLA, "Fast splittable pseudorandom number
// generators").
func seedOf(seed uint64, k, r int) uint64 {
	z := seed
	for _, x := range []uint64{uint64(k), uint64(r)} {
		z += 0x9e3779b97f4a7c15 + x
		z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
		z = (z ^ (z >> 27)) * 0x94d049bb133111eb
		z ^= z >> 31
	}
	return z
}

// count compares one study's result with the generating edges.
func count(res *antecedent.Result, edges []dag.Edge) study {
	type pair struct{ from, to string }
	truth := make(map[pair]bool, len(edges))
	for _, e := range edges {
		truth[pair{e.From, e.To}] = true
	}
	found := make(map[pair]bool, len(res.Edges))
	for _, e := range res.Edges {
		found[pair{e.From, e.To}] = true
	}
	st := study{found: make([]bool, len(edges)), allow: make([]bool, len(edges))}
	cands := map[pair]bool{}
	for _, n := range res.Nodes {
		for _, c := range n.Candidates {
			cands[pair{c, n.Name}] = true
			if !truth[pair{c, n.Name}] {
				st.pairs++
			}
		}
	}
	for i, e := range edges {
		st.found[i] = found[pair{e.From, e.To}]
		st.allow[i] = cands[pair{e.From, e.To}]
	}
	for p := range found {
		if !truth[p] {
			st.extra++
		}
	}
	return st
}

// summarise turns the studies into a plan.
func summarise(set Settings, edges []dag.Edge, studies []study) *Plan {
	R := set.Replicates
	p := &Plan{Sizes: slices.Clone(set.Sizes), Replicates: R, Seed: set.Seed, Pairs: studies[0].pairs, Edges: []EdgeRate{}, Cautions: slices.Clone(Cautions)}
	for i, e := range edges {
		er := EdgeRate{From: e.From, To: e.To, Coefficient: antecedent.Number(e.Coefficient), Allowed: studies[0].allow[i]}
		for k, n := range set.Sizes {
			hits := 0
			for _, st := range studies[k*R : (k+1)*R] {
				if st.found[i] {
					hits++
				}
			}
			v := float64(hits) / float64(R)
			er.Found = append(er.Found, Rate{Rows: n, Value: v, SE: math.Sqrt(v * (1 - v) / float64(R))})
		}
		if !er.Allowed {
			p.Warnings = append(p.Warnings, fmt.Sprintf("%s → %s is not allowed by the order; discovery cannot find it", e.From, e.To))
		}
		p.Edges = append(p.Edges, er)
	}
	for k, n := range set.Sizes {
		var sum, sq float64
		for _, st := range studies[k*R : (k+1)*R] {
			x := float64(st.extra)
			sum += x
			sq += x * x
		}
		mean := sum / float64(R)
		sd := math.Sqrt(math.Max(sq-float64(R)*mean*mean, 0) / float64(R-1))
		fr := FalseRate{Rows: n, Mean: mean, SE: sd / math.Sqrt(float64(R))}
		if p.Pairs > 0 {
			fr.PerPair, fr.PerPairSE = fr.Mean/float64(p.Pairs), fr.SE/float64(p.Pairs)
		}
		p.False = append(p.False, fr)
	}
	return p
}

// Edge returns the named edge's rates, or an error wrapping ErrSettings
// when the generating network has no such edge.
func (p *Plan) Edge(from, to string) (EdgeRate, error) {
	for _, e := range p.Edges {
		if e.From == from && e.To == to {
			return e, nil
		}
	}
	return EdgeRate{}, fmt.Errorf("%w: %s → %s is not an edge of the generating network", ErrSettings, from, to)
}
