package antecedent

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/internal/refit"
	"github.com/antecedent-lab/antecedent/internal/stability"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/table"
)

// role is how a node's response is modelled; it decides the folds, the
// shortcut through shared moments, the score and the effects' scale.
type role int

const (
	gaussian role = iota // least squares
	binomial             // logistic regression
	custom               // a caller's family
)

func roleOf(f lasso.Family) role {
	switch f.(type) {
	case lasso.Gaussian:
		return gaussian
	case lasso.Binomial:
		return binomial
	}
	return custom
}

// nodePlan is everything decided about one node before it is fitted.
type nodePlan struct {
	v        int // the variable
	family   lasso.Family
	role     role
	y        []float64 // the response column
	cands    []int     // candidate parents, variables
	required []int     // required parents, variables
	peers    []int     // same-tier variables
	cols     []int     // design columns of the candidates
	owner    []int     // variable of each design column
	rows     []int     // rows used (nil: every row)
}

// nodeFit is one node's finished result: its entry of Result.Nodes (all
// but the Markov blanket, which needs every node) and what assembling the
// graph needs.
type nodeFit struct {
	node      Node
	parents   []int                // variables
	selection *stability.Selection // nil unless stability selection ran
	counted   int                  // penalised candidates, for the bound
	peers     []int                // same-tier variables selected
}

// family returns the loss of variable v as a response.
func (r *run) family(v int) lasso.Family {
	if f := r.cfg.Families[r.vars[v].Name]; f != nil {
		return f
	}
	if r.vars[v].Kind == table.Binary {
		return lasso.Binomial{}
	}
	return lasso.Gaussian{}
}

// planNode decides what node v is fitted on.
func (r *run) planNode(v int) *nodePlan {
	p := &nodePlan{
		v: v, family: r.family(v), y: r.cols[r.d.Terms(v)[0]],
		cands: r.plan.Candidates[v], required: r.plan.Required[v], peers: r.plan.Peers[v],
	}
	p.role = roleOf(p.family)
	p.cols, p.owner = r.design(p.cands)
	p.rows = r.rowsFor(v, p.cands)
	return p
}

// design returns the design columns of variables vs and the variable of
// each column.
func (r *run) design(vs []int) (cols, owner []int) {
	for _, v := range vs {
		for _, c := range r.d.Terms(v) {
			cols = append(cols, c)
			owner = append(owner, v)
		}
	}
	return cols, owner
}

// rowsFor returns the rows a node on predictors preds uses (nil: every
// row).
func (r *run) rowsFor(v int, preds []int) []int {
	if r.cfg.Missing != table.MissingAvailableCase {
		return r.baseRows
	}
	rows, _ := r.d.Usable(table.MissingAvailableCase, append([]int{v}, preds...))
	return rows
}

// penaltyScale returns the penalty factor of each design column: zero for
// a required parent's columns, one otherwise.
func (p *nodePlan) penaltyScale(owner []int) []float64 {
	scale := make([]float64, len(owner))
	for t, q := range owner {
		if !slices.Contains(p.required, q) {
			scale[t] = 1
		}
	}
	return scale
}

func (r *run) pathSettings(p *nodePlan, scale []float64) lasso.Settings {
	s := r.cfg.CV.Path
	s.Family, s.PenaltyScale = p.family, scale
	return s
}

// used returns the number of rows node p uses.
func (p *nodePlan) used() int {
	if p.rows != nil {
		return len(p.rows)
	}
	return len(p.y)
}

// newNode returns the node's entry as known before fitting.
func (r *run) newNode(p *nodePlan) Node {
	vr := r.vars[p.v]
	tier := r.plan.Tier[p.v]
	n := Node{
		Name: vr.Name, Kind: vr.Kind, Family: p.family.Name(), Tier: tier + 1,
		Candidates: r.names(p.cands), Required: r.names(p.required), Parents: r.names(p.required),
		Penalty: nan(), BestPenalty: nan(), OneSEPenalty: nan(), Rule: r.cfg.CV.Rule, Margin: nan(), RuleSE: nan(), Measure: r.cfg.CV.Measure,
		MarkovBlanket: []string{}, Warnings: []string{},
		Score: Score{Value: nan(), SE: nan()}, PenalisedScore: Score{Value: nan(), SE: nan()}, Intercept: nan(),
	}
	n.Rows = p.used()
	if vr.Kind == table.Categorical {
		n.Family = ""
	}
	if tier < len(r.plan.Labels) {
		n.TierLabel = r.plan.Labels[tier]
	}
	return n
}

func (r *run) names(vs []int) []string {
	out := make([]string, len(vs))
	for i, v := range vs {
		out[i] = r.vars[v].Name
	}
	return out
}

// fitNode is a node's whole pipeline: the cross-validated path on its
// candidates, the parents (by the rule, or by stability selection), the
// unpenalised refit of their effects and, when asked, same-tier links. It
// reads shared state only and returns the finished node.
func (r *run) fitNode(ctx context.Context, p *nodePlan) (nodeFit, error) {
	out, err := r.crossValidate(ctx, p, p.cols, p.owner, p.rows, p.penaltyScale(p.owner), nil)
	if err != nil {
		return r.unfitted(p, err)
	}
	var chosen map[int]bool
	switch {
	case r.cfg.Stability.Pairs > 0:
		// Stability selection replaces the selection procedure: its
		// half-sample fits are plain lasso fits at the penalty chosen on
		// this plain path (a second adaptive stage's penalty lives on
		// another scale), so no second stage or refit path is run.
	case r.cfg.Selection == AdaptiveLasso:
		if out, err = r.adaptive(ctx, p, out); err != nil {
			return nodeFit{}, err
		}
		chosen = out.chosen()
	case r.cfg.Selection == RelaxedLasso:
		if chosen, err = r.relaxed(ctx, p, out); err != nil {
			return nodeFit{}, err
		}
	default:
		chosen = out.chosen()
	}
	fit := nodeFit{node: r.describe(p, out)}
	fit.node.Selection = r.cfg.Selection.String()
	if r.cfg.Stability.Pairs > 0 {
		sel, counted, err := r.stable(ctx, p, out.res.Penalty())
		if err != nil {
			return fit, err
		}
		fit.selection, fit.counted = &sel, counted
		fit.node.Selection = "stability"
		chosen = map[int]bool{}
		for q, f := range sel.Frequency {
			if f >= r.cfg.Stability.Threshold {
				chosen[q] = true
			}
		}
	}
	for _, q := range p.cands {
		if chosen[q] || slices.Contains(p.required, q) {
			fit.parents = append(fit.parents, q)
		}
	}
	fit.node.Parents = r.names(fit.parents)
	if fit.node.Intercept, fit.node.Effects, err = r.effects(ctx, p, fit.parents, &fit.node.Warnings); err != nil {
		return fit, err
	}
	if fit.node.Score, err = r.refitScore(ctx, p, fit.parents, out); err != nil {
		return fit, err
	}
	fit.peers, err = r.sameTier(ctx, p)
	return fit, err
}

// unfitted returns the node of a fit that could not run: a warning for the
// conditions that data can legitimately produce, the error otherwise.
func (r *run) unfitted(p *nodePlan, err error) (nodeFit, error) {
	if errors.Is(err, context.Canceled) || errors.Is(err, context.DeadlineExceeded) {
		return nodeFit{}, err
	}
	n := r.newNode(p)
	var few *tooFewRows
	switch {
	case errors.Is(err, cv.ErrNoFit):
		n.Warnings = append(n.Warnings, fmt.Sprintf("not fitted: %v (an unpenalised parent that separates the outcome does this; make the edge penalised)", err))
	case errors.As(err, &few):
		n.Warnings = append(n.Warnings, fmt.Sprintf("only %d usable rows, too few for %d-fold cross-validation; not fitted", few.rows, few.folds))
	case errors.Is(err, lasso.ErrConstantResponse):
		if _, v := meanVar(p.y, p.rows); v == 0 {
			n.Warnings = append(n.Warnings, "constant over the rows used; no parents estimated")
		} else {
			n.Warnings = append(n.Warnings, "too little variation to cross-validate (a training fold holds a single value); no parents estimated")
		}
	default:
		return nodeFit{}, fmt.Errorf("antecedent: node %q: %w", r.vars[p.v].Name, err)
	}
	return nodeFit{node: n, parents: slices.Clone(p.required)}, nil
}

// describe returns the node's entry with the cross-validation's details:
// penalties, curve, coefficient paths, penalised coefficients and score.
func (r *run) describe(p *nodePlan, out cvOut) Node {
	n := r.newNode(p)
	res, full := out.res, out.res.Full
	n.Fitted = true
	n.Penalty = Number(res.Penalty())
	n.BestPenalty = Number(res.Curve[res.Best].Penalty)
	n.OneSEPenalty = Number(res.Curve[res.OneSE].Penalty)
	n.Margin = Number(res.Margin)
	n.RuleSE = Number(res.RuleSE)
	n.Measure = res.Measure
	n.Status = full.Status.String()
	if full.Status != lasso.Completed && full.Status != lasso.Stopped {
		n.Warnings = append(n.Warnings, fmt.Sprintf("path ended early (%v) after %d penalties", full.Status, full.Len()))
	}
	for _, c := range res.Curve {
		n.Curve = append(n.Curve, CurvePoint{Penalty: Number(c.Penalty), Mean: Number(c.Mean), SE: Number(c.SE), PairSE: Number(c.PairSE), NonZero: c.NonZero})
	}
	n.Path = r.coefficientPath(out)
	n.Penalised = []Term{}
	_, sel := res.Model()
	for t, x := range sel {
		if x != 0 {
			n.Penalised = append(n.Penalised, Term{Term: r.d.TermName(out.cols[t]), Variable: r.vars[out.owner[t]].Name, Value: Number(x), Weight: Number(out.scale[t])})
		}
	}
	n.PenalisedScore = r.penalisedScore(p, out)
	return n
}

// coefficientPath returns the coefficient paths of the terms that enter at
// or before the selected penalty, and of the ten largest at the path's end:
// the lines a reader can follow. Terms left out are zero up to the
// selected penalty and small after it; the result stays small for wide
// data.
func (r *run) coefficientPath(out cvOut) *CoefficientPath {
	res, full, cols := out.res, out.res.Full, out.cols
	keep := make([]bool, len(cols))
	for k := 0; k <= min(res.Selected, full.Len()-1); k++ {
		for _, t := range full.Coefficients[k].Index {
			keep[t] = true
		}
	}
	last := full.Coefficients[full.Len()-1]
	largest := slices.Clone(last.Index)
	size := make(map[int]float64, len(largest))
	for i, t := range last.Index {
		size[t] = math.Abs(last.Value[i] * r.sd(cols[t], out.rows))
	}
	slices.SortFunc(largest, func(a, b int) int {
		switch {
		case size[a] > size[b]:
			return -1
		case size[a] < size[b]:
			return 1
		}
		return a - b
	})
	for _, t := range largest[:min(10, len(largest))] {
		keep[t] = true
	}
	path := &CoefficientPath{Terms: []string{}, Values: [][]Number{}}
	slot := make([]int, len(cols))
	for t, c := range cols {
		slot[t] = -1
		if keep[t] {
			slot[t] = len(path.Terms)
			path.Terms = append(path.Terms, r.d.TermName(c))
			path.Values = append(path.Values, make([]Number, full.Len()))
		}
	}
	b := make([]float64, len(cols))
	for k := range full.Len() {
		path.Penalties = append(path.Penalties, Number(full.Penalties[k]))
		full.CoefficientsTo(b, k)
		for t := range cols {
			if slot[t] >= 0 {
				path.Values[slot[t]][k] = Number(b[t])
			}
		}
	}
	return path
}

// stable runs stability selection for node p at penalty lam and returns
// the selection and the number of penalised candidates.
func (r *run) stable(ctx context.Context, p *nodePlan, lam float64) (stability.Selection, int, error) {
	var counted []int
	for _, q := range p.cands {
		if !slices.Contains(p.required, q) {
			counted = append(counted, q)
		}
	}
	s := r.pathSettings(p, p.penaltyScale(p.owner))
	s.Penalties = []float64{lam}
	sel, err := stability.Select(ctx, stability.Problem{
		Data:  lasso.Data{Columns: r.cols, Response: p.y, Rows: p.rows, Predictors: p.cols, Index: r.listsFor(p.rows)},
		Group: p.owner, Counted: counted, Settings: s,
		Pairs: r.cfg.Stability.Pairs, Seed: r.cfg.Seed, Stream: uint64(p.v),
	})
	return sel, len(counted), err
}

// effects refits node p on its parents without penalty and returns the
// intercept and the parents' effects, adding any warning to warnings.
func (r *run) effects(ctx context.Context, p *nodePlan, parents []int, warnings *[]string) (Number, []Effect, error) {
	cols, owner := r.design(parents)
	x := make([][]float64, len(cols))
	for t, c := range cols {
		x[t] = r.cols[c]
	}
	f, err := refit.Regress(ctx, p.family, x, p.y, p.rows)
	if err != nil {
		return nan(), nil, err
	}
	if f.Warning != "" {
		*warnings = append(*warnings, f.Warning)
	}
	k := len(cols)
	effects := []Effect{}
	for t, c := range cols {
		est, se := f.Coef[t], f.SE[t]
		e := Effect{
			Parent: r.vars[owner[t]].Name, Term: r.d.TermName(c),
			Estimate: Number(est), SE: Number(se),
			Lower: Number(est - f.Quantile*se), Upper: Number(est + f.Quantile*se),
			OddsRatio: nan(), OddsLower: nan(), OddsUpper: nan(),
			Contrast: r.d.Contrast(c), Standardized: Number(est * r.perSD(owner[t], f.SD[t])),
			NotEstimable: f.NotEstimable[t],
		}
		if e.NotEstimable != "" {
			*warnings = append(*warnings, fmt.Sprintf("effect of %s not estimable (%s)", e.Term, e.NotEstimable))
		}
		switch p.role {
		case gaussian:
			e.Standardized = Number(est * r.perSD(owner[t], f.SD[t]) / f.SD[k])
		case binomial:
			e.OddsRatio = Number(math.Exp(est))
			e.OddsLower = Number(math.Exp(float64(e.Lower)))
			e.OddsUpper = Number(math.Exp(float64(e.Upper)))
		}
		effects = append(effects, e)
	}
	return Number(f.Intercept), effects, nil
}

// perSD returns the factor that puts the effect of a term of variable v
// with standard deviation sd on the standardised scale: sd for a
// continuous variable, 1 for a binary or categorical one, whose effect is
// the contrast itself (a 0/1 change has no meaningful standard deviation).
func (r *run) perSD(v int, sd float64) float64 {
	if r.vars[v].Kind == table.Continuous {
		return sd
	}
	return 1
}

// sameTier returns the same-tier variables selected when node p is
// regressed on its candidates and its tier's other variables together.
func (r *run) sameTier(ctx context.Context, p *nodePlan) ([]int, error) {
	if !r.cfg.SameTier || len(p.peers) == 0 {
		return nil, nil
	}
	all := slices.Concat(p.cands, p.peers)
	slices.Sort(all)
	cols, owner := r.design(all)
	out, err := r.crossValidate(ctx, p, cols, owner, r.rowsFor(p.v, all), p.penaltyScale(owner), nil)
	if errors.Is(err, lasso.ErrConstantResponse) {
		return nil, nil
	}
	if err != nil {
		return nil, fmt.Errorf("antecedent: node %q (same tier): %w", r.vars[p.v].Name, err)
	}
	var peers []int
	for q := range out.chosen() {
		if slices.Contains(p.peers, q) {
			peers = append(peers, q)
		}
	}
	slices.Sort(peers)
	return peers, nil
}
