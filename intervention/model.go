package intervention

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/dag"
	"github.com/antecedent-lab/antecedent/internal/refit"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/table"
)

// Model is a discovered network read as a generative model. Every variable
// that has candidate parents gets an equation on its discovered parents,
// refitted without penalty on the rows where every variable is present:
// least squares with the residual standard deviation for a continuous
// variable, maximum-likelihood logistic regression for a binary one.
// Variables of the first tier (no candidate parents) have no equation;
// they are taken from the data as they are.
//
// A Model is not changed after New returns and is safe for concurrent use.
type Model struct {
	d     *table.Dataset
	vars  []table.Variable
	cols  [][]float64 // the dataset's design columns, shared
	graph *dag.Graph
	topo  []int      // variables, every parent before its children
	eqs   []equation // by variable
	rows  []int      // complete rows, increasing
	first []bool     // variables without candidate parents
	edges []dag.Edge
	warns []string
}

// equation is one variable's regression on its parents. The structure
// (variable, family, parents and their design columns) is fixed; the
// values come from a refit.
type equation struct {
	family  lasso.Family // nil: no equation (first tier, categorical, or an unsupported family)
	parents []int        // variables
	terms   []int        // design columns of the parents
	ycol    int          // the variable's own design column
	// Values of a fit.
	intercept float64
	coef      []float64 // by term
	sigma     float64   // residual standard deviation (gaussian)
	failed    string    // why the fit has no usable values
}

// New reads the discovered network res, with the data d it was discovered
// on, as a generative model: it refits every equation on the rows of d
// where every variable is present. The data must hold the result's
// variables, with the same kinds and, where the result records them, the
// same levels in the same coding, and no others; they need not be the
// very rows of the discovery (a warning says so when the refits differ
// from the result's effects). New never modifies res or d, and returns an
// error wrapping ErrMismatch when they do not match, or ctx.Err().
func New(ctx context.Context, res *antecedent.Result, d *table.Dataset) (*Model, error) {
	if res == nil || d == nil {
		return nil, fmt.Errorf("%w: a result and a dataset are both needed", ErrMismatch)
	}
	g, err := res.Graph()
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrMismatch, err)
	}
	m := &Model{d: d, vars: d.Variables(), cols: d.Columns(), graph: g, edges: g.Edges()}
	if err := m.match(res); err != nil {
		return nil, err
	}
	all := make([]int, len(m.vars))
	for v := range all {
		all[v] = v
	}
	m.rows = d.Present(all)
	if m.rows == nil {
		m.rows = all[:0:0]
		for i := range d.Rows() {
			m.rows = append(m.rows, i)
		}
	}
	for _, name := range g.TopologicalOrder() {
		m.topo = append(m.topo, m.index(name))
	}
	if len(m.rows) < 3 {
		return nil, fmt.Errorf("%w: only %d rows have every variable present", ErrMismatch, len(m.rows))
	}
	f := m.frame(m.rows, nil)
	m.eqs = make([]equation, len(m.vars))
	m.first = make([]bool, len(m.vars))
	for v := range m.vars {
		node, _ := res.Node(m.vars[v].Name)
		e := &m.eqs[v]
		e.ycol = d.Terms(v)[0]
		m.first[v] = len(node.Candidates) == 0
		for _, p := range node.Parents {
			q := m.index(p)
			e.parents = append(e.parents, q)
			e.terms = append(e.terms, d.Terms(q)...)
		}
		if m.first[v] || m.vars[v].Kind == table.Categorical {
			continue
		}
		switch node.Family {
		case "gaussian":
			e.family = lasso.Gaussian{}
		case "binomial":
			e.family = lasso.Binomial{}
		default:
			e.failed = fmt.Sprintf("its family %q is not one the model can run (gaussian or binomial)", node.Family)
			continue
		}
		if err := e.fit(ctx, f); err != nil {
			return nil, err
		}
		if e.failed != "" {
			m.warns = append(m.warns, fmt.Sprintf("%s: %s", m.vars[v].Name, e.failed))
		} else if len(m.rows) == d.Rows() {
			m.compare(node, e)
		}
	}
	return m, nil
}

// match checks that res and the dataset describe the same variables.
func (m *Model) match(res *antecedent.Result) error {
	var problems []string
	seen := map[string]bool{}
	for _, n := range res.Nodes {
		seen[n.Name] = true
		i := m.index(n.Name)
		switch {
		case i < 0:
			problems = append(problems, fmt.Sprintf("%q is in the result but not in the data", n.Name))
		case m.vars[i].Kind != n.Kind:
			problems = append(problems, fmt.Sprintf("%q is %v in the result and %v in the data", n.Name, n.Kind, m.vars[i].Kind))
		case len(n.Levels) > 0 && !slices.Equal(n.Levels, m.vars[i].Levels):
			problems = append(problems, fmt.Sprintf("%q is coded %s in the result and %s in the data (read the data with the reference levels and codings the discovery used)",
				n.Name, n.Coding, m.vars[i].Coding()))
		}
	}
	for _, v := range m.vars {
		if !seen[v.Name] {
			problems = append(problems, fmt.Sprintf("%q is in the data but not in the result", v.Name))
		}
	}
	if len(problems) > 0 {
		return fmt.Errorf("%w: %s", ErrMismatch, strings.Join(problems, "; "))
	}
	return nil
}

// compare notes when the refit of e differs from the effects the result
// stores: the data are then not those of the discovery.
func (m *Model) compare(node *antecedent.Node, e *equation) {
	for t, c := range e.terms {
		name := m.d.TermName(c)
		for _, ef := range node.Effects {
			stored := float64(ef.Estimate)
			if ef.Term != name || math.IsNaN(stored) {
				continue
			}
			if math.Abs(stored-e.coef[t]) > 1e-6*(1+math.Abs(stored)) {
				m.warns = append(m.warns, fmt.Sprintf("%s: the refit effect of %s is %.6g on these data and %.6g in the result; are these the data the network was discovered on?",
					node.Name, name, e.coef[t], stored))
				return
			}
		}
	}
}

// index returns the variable called name, or −1.
func (m *Model) index(name string) int {
	return slices.IndexFunc(m.vars, func(v table.Variable) bool { return v.Name == name })
}

// Names returns the variables' names in the dataset's order.
func (m *Model) Names() []string { return m.d.Names() }

// Graph returns the network's graph.
func (m *Model) Graph() *dag.Graph { return m.graph }

// Edges returns the network's edges: the edges data drawn by Sample are
// generated from.
func (m *Model) Edges() []dag.Edge { return slices.Clone(m.edges) }

// Rows returns the number of rows the equations were fitted on: those
// with every variable present.
func (m *Model) Rows() int { return len(m.rows) }

// Warnings lists what a reader should know about the equations: refits
// that could not be estimated, or that differ from the result's.
func (m *Model) Warnings() []string { return slices.Clone(m.warns) }

// Equation describes one variable's fitted equation.
type Equation struct {
	Variable string `json:"variable"`
	// Family is "gaussian" or "binomial"; empty for a variable without an
	// equation (first tier or categorical).
	Family    string   `json:"family,omitempty"`
	Intercept float64  `json:"intercept"`
	Terms     []string `json:"terms"`
	// Coefficients hold the effect of each term: per unit on the
	// variable's scale, or in log odds for a binary variable.
	Coefficients []float64 `json:"coefficients"`
	// ResidualSD is the residual standard deviation of a continuous
	// variable's least-squares fit (n − k − 1 degrees of freedom); zero
	// for a binary one.
	ResidualSD float64 `json:"residual_sd"`
}

// Equation returns the fitted equation of the named variable, or an error
// wrapping ErrQuestion for an unknown name and ErrUnsupported for a
// variable without a usable equation.
func (m *Model) Equation(name string) (Equation, error) {
	v := m.index(name)
	if v < 0 {
		return Equation{}, fmt.Errorf("%w: unknown variable %q", ErrQuestion, name)
	}
	e := &m.eqs[v]
	if err := m.runnable(v); err != nil {
		return Equation{Variable: name}, err
	}
	out := Equation{Variable: name, Family: e.family.Name(), Intercept: e.intercept, Coefficients: slices.Clone(e.coef), ResidualSD: e.sigma, Terms: []string{}}
	for _, c := range e.terms {
		out.Terms = append(out.Terms, m.d.TermName(c))
	}
	return out, nil
}

// runnable returns nil when variable v's equation can generate values.
func (m *Model) runnable(v int) error {
	e := &m.eqs[v]
	switch {
	case m.first[v]:
		return fmt.Errorf("%w: %q is in the first tier and has no equation", ErrUnsupported, m.vars[v].Name)
	case e.family == nil || e.failed != "":
		return fmt.Errorf("%w: %q: %s", ErrUnsupported, m.vars[v].Name, e.failed)
	}
	return nil
}

// frame holds the design columns at a list of rows, in that order (a
// bootstrap resample repeats rows). Columns are gathered when needed.
type frame struct {
	n    int
	cols [][]float64 // by design column; nil until gathered
}

// frame gathers the design columns cols (nil: all) at rows.
func (m *Model) frame(rows, cols []int) *frame {
	f := &frame{n: len(rows), cols: make([][]float64, len(m.cols))}
	if cols == nil {
		cols = make([]int, len(m.cols))
		for c := range cols {
			cols[c] = c
		}
	}
	for _, c := range cols {
		if f.cols[c] != nil {
			continue
		}
		x := make([]float64, len(rows))
		src := m.cols[c]
		for t, i := range rows {
			x[t] = src[i]
		}
		f.cols[c] = x
	}
	return f
}

// fit refits e on the frame f, replacing its values; a fit that cannot be
// estimated sets e.failed. It returns only ctx.Err() or an internal error.
func (e *equation) fit(ctx context.Context, f *frame) error {
	x := make([][]float64, len(e.terms))
	for t, c := range e.terms {
		x[t] = f.cols[c]
	}
	y := f.cols[e.ycol]
	r, err := refit.Regress(ctx, e.family, x, y, nil)
	if err != nil {
		return err
	}
	e.intercept, e.coef, e.failed = r.Intercept, r.Coef, ""
	if math.IsNaN(r.Intercept) || slices.ContainsFunc(r.Coef, math.IsNaN) {
		e.failed = "its refit could not be estimated (" + r.Warning + ")"
		return nil
	}
	e.sigma = 0
	if _, ok := e.family.(lasso.Gaussian); ok {
		var rss float64
		for t := range f.n {
			d := y[t] - e.eta(f.cols, t)
			rss += d * d
		}
		if df := f.n - len(e.terms) - 1; df > 0 {
			e.sigma = math.Sqrt(rss / float64(df))
		}
	}
	return nil
}

// eta returns the linear predictor at row t of the design columns cols.
func (e *equation) eta(cols [][]float64, t int) float64 {
	s := e.intercept
	for k, c := range e.terms {
		s += e.coef[k] * cols[c][t]
	}
	return s
}

// refitted returns a copy of e refitted on f.
func (e *equation) refitted(ctx context.Context, f *frame) (equation, error) {
	c := *e
	c.coef = nil
	err := c.fit(ctx, f)
	return c, err
}

// Sample draws n rows from the model with the given seed: the variables
// without candidate parents (the first tier) are drawn together, as whole
// rows of the data with replacement, so their joint distribution is the
// data's; every other variable is generated in time order from its
// equation, a continuous one as its fitted mean plus normal noise with the
// residual standard deviation, a binary one as a draw with its fitted
// probability. The same n and seed give the same data. The dataset's
// numeric variables come first, in the original order, then any
// categorical ones. Sample returns an error wrapping ErrUnsupported when
// a variable has no runnable equation, and ErrQuestion for n < 1.
func (m *Model) Sample(n int, seed uint64) (*table.Dataset, error) {
	if n < 1 {
		return nil, fmt.Errorf("%w: %d rows", ErrQuestion, n)
	}
	for v := range m.vars {
		if !m.first[v] {
			if err := m.runnable(v); err != nil {
				return nil, err
			}
		}
	}
	rng := rand.New(rand.NewPCG(seed, 0x67656e))
	pick := make([]int, n)
	for t := range pick {
		pick[t] = m.rows[rng.IntN(len(m.rows))]
	}
	var firstCols []int
	for v := range m.vars {
		if m.first[v] {
			firstCols = append(firstCols, m.d.Terms(v)...)
		}
	}
	f := m.frame(pick, firstCols)
	for _, v := range m.topo {
		if m.first[v] {
			continue
		}
		e := &m.eqs[v]
		y := make([]float64, n)
		for t := range y {
			eta := e.eta(f.cols, t)
			if _, ok := e.family.(lasso.Binomial); ok {
				if rng.Float64() < e.family.Mean(eta) {
					y[t] = 1
				}
				continue
			}
			y[t] = eta + e.sigma*rng.NormFloat64()
		}
		f.cols[e.ycol] = y
	}
	var names []string
	var cols [][]float64
	for v, vr := range m.vars {
		if vr.Kind != table.Categorical {
			names = append(names, vr.Name)
			cols = append(cols, f.cols[m.d.Terms(v)[0]])
		}
	}
	out, err := table.NewDataset(names, cols)
	if err != nil {
		return nil, err
	}
	for v, vr := range m.vars {
		if vr.Kind == table.Continuous {
			if err := out.SetKind(vr.Name, table.Continuous); err != nil {
				return nil, err
			}
		}
		if vr.Kind != table.Categorical {
			continue
		}
		text := make([]string, n)
		terms := m.d.Terms(v)
		for t := range text {
			text[t] = vr.Levels[0]
			for k, c := range terms {
				if f.cols[c][t] == 1 {
					text[t] = vr.Levels[k+1]
				}
			}
		}
		if err := out.AddText(vr.Name, text, len(vr.Levels)); err != nil {
			return nil, fmt.Errorf("intervention: drawing %q: %w", vr.Name, err)
		}
	}
	return out, nil
}
