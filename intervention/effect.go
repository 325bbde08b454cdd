package intervention

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"sync"

	"github.com/antecedent-lab/antecedent/internal/pool"
	"github.com/antecedent-lab/antecedent/internal/refit"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/table"
)

// Question asks what the means of later variables would be if the cause
// were set one way (A) rather than another (B).
type Question struct {
	Cause string `json:"cause"`
	// Outcomes are the variables to report; nil means every descendant
	// of the cause in the network, in time order.
	Outcomes []string `json:"outcomes,omitempty"`
	A        Action   `json:"a"`
	B        Action   `json:"b"`
}

// Settings configure Effect. The zero value, or a nil *Settings, gives
// the defaults written on each field.
type Settings struct {
	// Resamples is the number of bootstrap resamples; zero means 200.
	Resamples int
	// Level is the intervals' coverage, in (0, 1); zero means 0.95.
	Level float64
	// Draws is the number of draws per row of each binary variable whose
	// value later regenerated variables need; zero means 20.
	Draws int
	// Seed makes resamples and draws reproducible.
	Seed uint64
	// Workers bounds the resamples computed at once; zero means
	// GOMAXPROCS. The answer does not depend on it.
	Workers int
	// Progress, when set, is called after each resample with the number
	// done and the total, from one goroutine at a time.
	Progress func(done, total int)
}

func (s *Settings) resolve() (Settings, error) {
	var r Settings
	if s != nil {
		r = *s
	}
	if r.Resamples == 0 {
		r.Resamples = 200
	}
	if r.Level == 0 {
		r.Level = 0.95
	}
	if r.Draws == 0 {
		r.Draws = 20
	}
	switch {
	case r.Resamples < 2:
		return r, fmt.Errorf("%w: %d resamples; need at least 2", ErrQuestion, r.Resamples)
	case !(r.Level > 0 && r.Level < 1):
		return r, fmt.Errorf("%w: level %g outside (0, 1)", ErrQuestion, r.Level)
	case r.Draws < 1:
		return r, fmt.Errorf("%w: %d draws", ErrQuestion, r.Draws)
	case r.Workers < 0:
		return r, fmt.Errorf("%w: %d workers", ErrQuestion, r.Workers)
	}
	return r, nil
}

// Effect answers q by g-computation over the model's rows (Robins 1986,
// "A new approach to causal inference in mortality studies with a
// sustained exposure period", Mathematical Modelling 7:1393–1512). Each
// row keeps its values of every variable that is not a descendant of the
// cause; the cause takes its value under the action; the cause's
// descendants are regenerated in time order from their equations:
//
//	continuous: fitted mean at the new parent values + the row's own residual
//	binary:     fitted probability at the new parent values
//
// A binary variable's reported mean averages its fitted probabilities
// (no draw noise). When later variables need a binary variable's value,
// it is drawn: a latent uniform u consistent with the row's observed value
// (u below the observed fitted probability p exactly when the value is 1)
// gives the value 1 when u < p' at the new probability p'. Averaging the
// probabilities would feed later equations a value the variable never
// takes; the coupled draw keeps each row's own position, so the setting
// "as observed" reproduces the data exactly and both settings share the
// same draws. Settings.Draws draws per row are averaged.
//
// Intervals come from a percentile bootstrap over the rows: each resample
// refits every regenerated equation and the adjustment regressions,
// keeping the discovered parent sets fixed, so the intervals leave out
// the uncertainty of discovery itself. The same model, question and seed
// give the same answer for any number of workers.
//
// Effect returns an error wrapping ErrQuestion for a bad question or
// settings, ErrUnsupported when a descendant cannot be regenerated, and
// ctx.Err() when ctx is cancelled.
func (m *Model) Effect(ctx context.Context, q Question, s *Settings) (*Answer, error) {
	set, err := s.resolve()
	if err != nil {
		return nil, err
	}
	p, err := m.compile(q, set)
	if err != nil {
		return nil, err
	}
	ans := &Answer{
		Cause: q.Cause, A: q.A, B: q.B, Rows: len(m.rows), Resamples: set.Resamples,
		Level: set.Level, Draws: p.draws, Seed: set.Seed, Cautions: slices.Clone(Cautions),
		Warnings: p.warnings,
	}
	point, fail, err := p.evaluate(ctx, m.rows, p.rng(set.Seed, 0))
	if err != nil {
		return nil, err
	}
	if fail != "" {
		return nil, fmt.Errorf("%w: %s", ErrUnsupported, fail)
	}
	boot := make([][]float64, set.Resamples)
	var mu sync.Mutex
	done := 0
	err = pool.Run(ctx, set.Workers, set.Resamples, func(ctx context.Context, b int) error {
		rng := p.rng(set.Seed, b+1)
		rows := make([]int, len(m.rows))
		for t := range rows {
			rows[t] = m.rows[rng.IntN(len(m.rows))]
		}
		stats, _, err := p.evaluate(ctx, rows, rng)
		if err != nil {
			return err
		}
		boot[b] = stats
		if set.Progress != nil {
			mu.Lock()
			done++
			set.Progress(done, set.Resamples)
			mu.Unlock()
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	for _, st := range boot {
		if st == nil {
			ans.Failed++
		}
	}
	if ans.Failed > 0 {
		ans.Warnings = append(ans.Warnings, fmt.Sprintf("%d of %d resamples could not refit an equation (for example separation in a small resample) and were left out", ans.Failed, set.Resamples))
	}
	if err := p.fill(ctx, ans, point, boot, set.Level); err != nil {
		return nil, err
	}
	ans.Method = []string{
		"g-computation over the rows: non-descendants of the cause kept as observed, descendants regenerated in time order (continuous: fitted mean plus the row's own residual; binary: fitted probability, drawn with a latent uniform consistent with the observed value when later variables need it)",
		fmt.Sprintf("intervals: %g%% percentile bootstrap over %d resamples of the rows; every regenerated equation and adjustment regression refitted on each resample with the discovered parent sets held fixed (discovery itself is not repeated)", 100*set.Level, set.Resamples),
	}
	return ans, nil
}

// plan is a question compiled against the model.
type plan struct {
	m        *Model
	q        Question
	cause    int
	causeCol int
	regen    []int  // descendants of the cause that are outcomes or lead to one, in time order
	draw     []bool // by variable: binary, regenerated and needed by a regenerated child
	varies   []bool // by variable: a parent is drawn or varies, so it changes from draw to draw
	draws    int
	outcomes []outcomePlan
	cols     []int // design columns to gather
	width    int   // length of the statistics vector
	warnings []string
}

type outcomePlan struct {
	v      int
	down   bool
	binary bool
	off    int // offset of meanA, meanB, difference, ratio
	// linear decomposition
	linear    bool
	note      string
	mediators []int // variables between the cause and the outcome, in time order
	pathOff   int   // offset of total, direct, then each mediator
	adjust    []adjustPlan
}

type adjustPlan struct {
	name  string
	set   []int // variables
	terms []int // design columns: the cause's first, then the set's
	off   int
	same  int // index of an earlier set of the outcome with the same variables, or −1
}

// compile checks q and works out everything that does not depend on the
// rows.
func (m *Model) compile(q Question, set Settings) (*plan, error) {
	p := &plan{m: m, q: q, cause: m.index(q.Cause)}
	if p.cause < 0 {
		return nil, fmt.Errorf("%w: unknown cause %q", ErrQuestion, q.Cause)
	}
	cv := m.vars[p.cause]
	if cv.Kind == table.Categorical {
		return nil, fmt.Errorf("%w: cause %q is categorical; only continuous and binary causes can be set", ErrQuestion, q.Cause)
	}
	p.causeCol = m.d.Terms(p.cause)[0]
	if q.A == q.B {
		return nil, fmt.Errorf("%w: settings A and B are the same (%v)", ErrQuestion, q.A)
	}
	for _, a := range []Action{q.A, q.B} {
		if a.Kind < Observed || a.Kind > Shift || math.IsNaN(a.Value) || math.IsInf(a.Value, 0) {
			return nil, fmt.Errorf("%w: action %v with value %g", ErrQuestion, a.Kind, a.Value)
		}
		if cv.Kind == table.Binary && (a.Kind == Shift || (a.Kind == Set && a.Value != 0 && a.Value != 1)) {
			return nil, fmt.Errorf("%w: cause %q is binary; it can be set to 0 or 1, not %v", ErrQuestion, q.Cause, a)
		}
	}
	p.warnings = append(p.warnings, m.warns...)
	p.warnings = append(p.warnings, m.rangeWarnings(p, q)...)
	de, _ := m.graph.Descendants(q.Cause)
	isDown := make([]bool, len(m.vars))
	for _, n := range de {
		isDown[m.index(n)] = true
	}
	names := q.Outcomes
	if names == nil {
		if len(de) == 0 {
			return nil, fmt.Errorf("%w: %q has no descendants in the network; under the model no later variable changes", ErrQuestion, q.Cause)
		}
		for _, v := range m.topo {
			if isDown[v] {
				names = append(names, m.vars[v].Name)
			}
		}
	}
	if len(names) == 0 {
		return nil, fmt.Errorf("%w: no outcomes", ErrQuestion)
	}
	// Regenerate the descendants that are outcomes or lead to one.
	needed := make([]bool, len(m.vars))
	for _, name := range names {
		if v := m.index(name); v >= 0 {
			needed[v] = true
			an, _ := m.graph.Ancestors(name)
			for _, a := range an {
				needed[m.index(a)] = true
			}
		}
	}
	for _, v := range m.topo {
		if isDown[v] && needed[v] {
			if err := m.runnable(v); err != nil {
				return nil, err
			}
			p.regen = append(p.regen, v)
		}
	}
	cols := map[int]bool{p.causeCol: true}
	p.draw = make([]bool, len(m.vars))
	for _, v := range p.regen {
		e := &m.eqs[v]
		cols[e.ycol] = true
		for _, c := range e.terms {
			cols[c] = true
		}
		if _, ok := e.family.(lasso.Binomial); ok {
			for _, w := range p.regen {
				if slices.Contains(m.eqs[w].parents, v) {
					p.draw[v] = true
				}
			}
		}
	}
	p.varies = make([]bool, len(m.vars))
	for _, v := range p.regen {
		for _, q := range m.eqs[v].parents {
			if p.draw[q] || p.varies[q] {
				p.varies[v] = true
			}
		}
	}
	p.draws = 1
	if slices.Contains(p.draw, true) {
		p.draws = set.Draws
	}
	for _, name := range names {
		v := m.index(name)
		switch {
		case v < 0:
			return nil, fmt.Errorf("%w: unknown outcome %q", ErrQuestion, name)
		case v == p.cause:
			return nil, fmt.Errorf("%w: %q is the cause; choose later variables as outcomes", ErrQuestion, name)
		case m.vars[v].Kind == table.Categorical:
			return nil, fmt.Errorf("%w: outcome %q is categorical; only continuous and binary outcomes have means", ErrQuestion, name)
		case slices.ContainsFunc(p.outcomes, func(o outcomePlan) bool { return o.v == v }):
			return nil, fmt.Errorf("%w: outcome %q is given twice", ErrQuestion, name)
		}
		o := outcomePlan{v: v, down: isDown[v], binary: m.vars[v].Kind == table.Binary, off: p.width}
		p.width += 4
		cols[m.d.Terms(v)[0]] = true
		if o.down {
			p.linearPaths(&o)
			if o.linear {
				o.pathOff = p.width
				p.width += 2 + len(o.mediators)
			}
		} else {
			o.note = fmt.Sprintf("%s is not a descendant of %s in the network", name, q.Cause)
		}
		if err := p.adjustments(&o, cols); err != nil {
			return nil, err
		}
		p.outcomes = append(p.outcomes, o)
	}
	for c := range cols {
		p.cols = append(p.cols, c)
	}
	slices.Sort(p.cols)
	return p, nil
}

// linearPaths decides whether the effect of the cause on o is linear:
// every variable between them, and o, continuous.
func (p *plan) linearPaths(o *outcomePlan) {
	m := p.m
	name := m.vars[o.v].Name
	an, _ := m.graph.Ancestors(name)
	for _, v := range p.regen {
		if v != o.v && !slices.Contains(an, m.vars[v].Name) {
			continue
		}
		if m.vars[v].Kind != table.Continuous {
			o.note = fmt.Sprintf("%s is binary (logistic), so effects along paths through it are not products of coefficients", m.vars[v].Name)
			if v == o.v {
				o.note = fmt.Sprintf("%s is binary (logistic), so its effects are not products of coefficients", name)
			}
			return
		}
		if v != o.v {
			o.mediators = append(o.mediators, v)
		}
	}
	o.linear = true
}

// adjustments adds the adjustment sets of the cause's effect on o: its
// parents and, for a descendant, the optimal set.
func (p *plan) adjustments(o *outcomePlan, cols map[int]bool) error {
	m := p.m
	sets := []struct {
		name  string
		names []string
	}{}
	pa, err := ParentSet(m.graph, p.q.Cause)
	if err != nil {
		return err
	}
	sets = append(sets, struct {
		name  string
		names []string
	}{"parents of the cause", pa})
	if o.down {
		opt, err := OptimalSet(m.graph, p.q.Cause, m.vars[o.v].Name)
		if err != nil {
			return err
		}
		sets = append(sets, struct {
			name  string
			names []string
		}{"optimal", opt})
	}
	for _, s := range sets {
		a := adjustPlan{name: s.name, terms: []int{p.causeCol}, off: p.width, same: -1}
		p.width++
		for _, n := range s.names {
			v := m.index(n)
			a.set = append(a.set, v)
			a.terms = append(a.terms, m.d.Terms(v)...)
		}
		for j, b := range o.adjust {
			if slices.Equal(b.set, a.set) {
				a.same = j
			}
		}
		for _, c := range a.terms {
			cols[c] = true
		}
		o.adjust = append(o.adjust, a)
	}
	return nil
}

// rangeWarnings notes actions that move the cause outside its observed
// range: the answer then extrapolates the equations.
func (m *Model) rangeWarnings(p *plan, q Question) []string {
	x := m.cols[p.causeCol]
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, i := range m.rows {
		lo, hi = math.Min(lo, x[i]), math.Max(hi, x[i])
	}
	var out []string
	for _, a := range []Action{q.A, q.B} {
		switch a.Kind {
		case Set:
			if a.Value < lo || a.Value > hi {
				out = append(out, fmt.Sprintf("%s %v lies outside its observed range [%g, %g]: the answer extrapolates the fitted equations", q.Cause, a, lo, hi))
			}
		case Shift:
			outside := 0
			for _, i := range m.rows {
				if y := x[i] + a.Value; y < lo || y > hi {
					outside++
				}
			}
			if outside > 0 {
				out = append(out, fmt.Sprintf("%s %v leaves its observed range [%.4g, %.4g] in %d of %d rows: the answer extrapolates there", q.Cause, a, lo, hi, outside, len(m.rows)))
			}
		}
	}
	return out
}

// rng returns the random stream of resample b (0: the point estimate).
func (p *plan) rng(seed uint64, b int) *rand.Rand {
	return rand.New(rand.NewPCG(seed, 0x672d636f6d70^uint64(b)<<20))
}

// evaluate runs the question on the given rows and returns the statistics
// vector, or a reason the rows could not be used (an equation that could
// not be refitted). Adjustment regressions that fail leave NaN.
func (p *plan) evaluate(ctx context.Context, rows []int, rng *rand.Rand) ([]float64, string, error) {
	m := p.m
	f := m.frame(rows, p.cols)
	eqs := make([]equation, len(m.vars))
	for _, v := range p.regen {
		e, err := m.eqs[v].refitted(ctx, f)
		if err != nil {
			return nil, "", err
		}
		if e.failed != "" {
			return nil, fmt.Sprintf("%s: %s", m.vars[v].Name, e.failed), nil
		}
		eqs[v] = e
	}
	n := f.n
	resid := make([][]float64, len(m.vars))
	latent := make([][][]float64, len(m.vars))
	for _, v := range p.regen {
		e := &eqs[v]
		y := f.cols[e.ycol]
		switch {
		case m.vars[v].Kind == table.Continuous:
			r := make([]float64, n)
			for t := range r {
				r[t] = y[t] - e.eta(f.cols, t)
			}
			resid[v] = r
		case p.draw[v]:
			latent[v] = make([][]float64, p.draws)
			for d := range latent[v] {
				u := make([]float64, n)
				for t := range u {
					pr := e.family.Mean(e.eta(f.cols, t))
					if y[t] == 1 {
						u[t] = pr * rng.Float64()
					} else {
						u[t] = pr + (1-pr)*rng.Float64()
					}
				}
				latent[v][d] = u
			}
		}
	}
	stats := make([]float64, p.width)
	meanA := p.means(f, eqs, resid, latent, p.q.A)
	meanB := p.means(f, eqs, resid, latent, p.q.B)
	for k, o := range p.outcomes {
		a, b := meanA[k], meanB[k]
		ratio := math.NaN()
		if o.binary {
			ratio = a / b
		}
		copy(stats[o.off:], []float64{a, b, a - b, ratio})
		if o.linear {
			fromCause := totals(m, eqs, p.regen, p.cause)
			stats[o.pathOff] = fromCause[o.v]
			stats[o.pathOff+1] = coefOf(m, &eqs[o.v], p.cause)
			for j, med := range o.mediators {
				stats[o.pathOff+2+j] = fromCause[med] * totals(m, eqs, p.regen, med)[o.v]
			}
		}
		for _, a := range o.adjust {
			if a.same >= 0 {
				stats[a.off] = stats[o.adjust[a.same].off]
				continue
			}
			d, _, err := p.adjusted(ctx, f, o, a)
			if err != nil {
				return nil, "", err
			}
			stats[a.off] = d
		}
	}
	return stats, "", nil
}

// means returns each outcome's mean over the frame with the cause under
// action a. Variables whose parents do not depend on a drawn variable are
// computed once and kept across draws.
func (p *plan) means(f *frame, eqs []equation, resid [][]float64, latent [][][]float64, a Action) []float64 {
	m, n := p.m, f.n
	work := slices.Clone(f.cols)
	x := make([]float64, n)
	for t := range x {
		x[t] = a.apply(f.cols[p.causeCol][t])
	}
	work[p.causeCol] = x
	out := make([]float64, len(p.outcomes))
	slot := make([]int, len(m.vars))
	for v := range slot {
		slot[v] = -1
	}
	for k, o := range p.outcomes {
		slot[o.v] = k
		if !o.down {
			out[k] = mean(f.cols[m.d.Terms(o.v)[0]])
		}
	}
	vals := make(map[int][]float64, len(p.regen))
	probs := make(map[int][]float64, len(p.regen))
	for _, v := range p.regen {
		vals[v] = make([]float64, n)
		if m.vars[v].Kind == table.Binary {
			probs[v] = make([]float64, n)
		}
	}
	for d := range p.draws {
		for _, v := range p.regen {
			e := &eqs[v]
			y, pr := vals[v], probs[v]
			fresh := d == 0 || p.varies[v]
			switch {
			case pr == nil && fresh:
				for t := range y {
					y[t] = e.eta(work, t) + resid[v][t]
				}
			case pr != nil && fresh:
				for t := range y {
					pr[t] = e.family.Mean(e.eta(work, t))
				}
			}
			if pr != nil {
				if p.draw[v] {
					u := latent[v][d]
					for t := range y {
						y[t] = 0
						if u[t] < pr[t] {
							y[t] = 1
						}
					}
				} else if fresh {
					copy(y, pr)
				}
			}
			work[e.ycol] = y
			if k := slot[v]; k >= 0 && fresh {
				src, w := y, 1.0
				if pr != nil {
					src = pr
				}
				if p.varies[v] {
					w = 1 / float64(p.draws)
				}
				out[k] += w * mean(src)
			}
		}
	}
	return out
}

// totals returns the total effect of a unit change in variable src on
// each variable, by the path rule over the linear equations eqs of the
// variables regen (in time order). Entries of variables not downstream of
// src are zero.
func totals(m *Model, eqs []equation, regen []int, src int) []float64 {
	te := make([]float64, len(m.vars))
	te[src] = 1
	for _, v := range regen {
		if v == src {
			continue
		}
		e := &eqs[v]
		var s float64
		for _, q := range e.parents {
			if te[q] != 0 {
				s += e.coef[slices.Index(e.terms, m.d.Terms(q)[0])] * te[q]
			}
		}
		te[v] = s
	}
	return te
}

// coefOf returns the coefficient of variable q in e, or 0 when q is not a
// parent.
func coefOf(m *Model, e *equation, q int) float64 {
	c := m.d.Terms(q)[0]
	if k := slices.Index(e.terms, c); k >= 0 {
		return e.coef[k]
	}
	return 0
}

// adjusted regresses o on the cause and the set of a over the frame and
// returns the regression's difference between the settings and its fit.
func (p *plan) adjusted(ctx context.Context, f *frame, o outcomePlan, a adjustPlan) (float64, refit.Fit, error) {
	x := make([][]float64, len(a.terms))
	for t, c := range a.terms {
		x[t] = f.cols[c]
	}
	var fam lasso.Family = lasso.Gaussian{}
	if o.binary {
		fam = lasso.Binomial{}
	}
	fit, err := refit.Regress(ctx, fam, x, f.cols[p.m.d.Terms(o.v)[0]], nil)
	if err != nil {
		return math.NaN(), fit, err
	}
	var sum float64
	for t := range f.n {
		rest := fit.Intercept
		for k := 1; k < len(x); k++ {
			rest += fit.Coef[k] * x[k][t]
		}
		xa, xb := p.q.A.apply(x[0][t]), p.q.B.apply(x[0][t])
		sum += fam.Mean(rest+fit.Coef[0]*xa) - fam.Mean(rest+fit.Coef[0]*xb)
	}
	return sum / float64(f.n), fit, nil
}

// fill writes the point estimates and bootstrap intervals into ans.
func (p *plan) fill(ctx context.Context, ans *Answer, point []float64, boot [][]float64, level float64) error {
	m := p.m
	est := func(i int) Estimate {
		vals := make([]float64, 0, len(boot))
		for _, b := range boot {
			if b != nil && !math.IsNaN(b[i]) && !math.IsInf(b[i], 0) {
				vals = append(vals, b[i])
			}
		}
		e := unknown()
		e.Value = Number(point[i])
		if len(vals) >= 2 && len(vals) >= len(boot)/2 {
			sort.Float64s(vals)
			e.SE = Number(sd(vals))
			e.Lower = Number(quantile(vals, (1-level)/2))
			e.Upper = Number(quantile(vals, 1-(1-level)/2))
		}
		return e
	}
	full := m.frame(m.rows, p.cols)
	for _, o := range p.outcomes {
		out := Outcome{
			Name: m.vars[o.v].Name, Binary: o.binary, Downstream: o.down,
			MeanA: est(o.off), MeanB: est(o.off + 1), Difference: est(o.off + 2), Ratio: unknown(),
			PathsNote: o.note, Adjusted: []Adjusted{},
		}
		if o.binary {
			out.Ratio = est(o.off + 3)
		}
		if o.linear {
			out.Paths = p.paths(o, est)
		}
		for _, a := range o.adjust {
			adj := Adjusted{Name: a.name, Set: []string{}, Difference: est(a.off)}
			for _, v := range a.set {
				adj.Set = append(adj.Set, m.vars[v].Name)
			}
			_, fit, err := p.adjusted(ctx, full, o, a)
			if err != nil {
				return err
			}
			c, se := fit.Coef[0], fit.SE[0]
			adj.Coefficient, adj.SE = Number(c), Number(se)
			adj.Lower, adj.Upper = Number(c-fit.Quantile*se), Number(c+fit.Quantile*se)
			if fit.Warning != "" {
				ans.Warnings = append(ans.Warnings, fmt.Sprintf("%s adjusted for the %s: %s", out.Name, a.name, fit.Warning))
			}
			out.Adjusted = append(out.Adjusted, adj)
		}
		ans.Outcomes = append(ans.Outcomes, out)
	}
	return nil
}

// paths fills the decomposition of outcome o from the statistics.
func (p *plan) paths(o outcomePlan, est func(int) Estimate) *Paths {
	m := p.m
	ps := &Paths{Total: est(o.pathOff), Direct: est(o.pathOff + 1), Mediators: []Mediator{}, Routes: []Route{}}
	total := float64(ps.Total.Value)
	for j, v := range o.mediators {
		e := est(o.pathOff + 2 + j)
		ps.Mediators = append(ps.Mediators, Mediator{Name: m.vars[v].Name, Effect: e, Share: Number(float64(e.Value) / total)})
	}
	// Routes: every directed path from the cause to the outcome through
	// the mediators, with the full-data coefficients.
	on := map[int]bool{o.v: true}
	for _, v := range o.mediators {
		on[v] = true
	}
	var routes []Route
	var walk func(v int, path []int, prod float64)
	walk = func(v int, path []int, prod float64) {
		if len(routes) >= 1000 {
			return
		}
		if v == o.v {
			names := make([]string, len(path))
			for i, u := range path {
				names[i] = m.vars[u].Name
			}
			routes = append(routes, Route{Path: names, Product: Number(prod)})
			return
		}
		for _, w := range p.regen {
			if on[w] && slices.Contains(m.eqs[w].parents, v) {
				walk(w, append(slices.Clone(path), w), prod*coefOf(m, &m.eqs[w], v))
			}
		}
	}
	walk(p.cause, []int{p.cause}, 1)
	slices.SortStableFunc(routes, func(a, b Route) int {
		x, y := math.Abs(float64(a.Product)), math.Abs(float64(b.Product))
		switch {
		case x > y:
			return -1
		case x < y:
			return 1
		}
		return 0
	})
	ps.Routes = routes[:min(len(routes), 20)]
	return ps
}

func mean(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	return s / float64(len(x))
}

// sd returns the sample standard deviation (n − 1 divisor).
func sd(x []float64) float64 {
	mu := mean(x)
	var s float64
	for _, v := range x {
		s += (v - mu) * (v - mu)
	}
	return math.Sqrt(s / float64(len(x)-1))
}

// quantile returns the q-quantile of sorted x by linear interpolation
// between order statistics (Hyndman & Fan 1996, definition 7).
func quantile(x []float64, q float64) float64 {
	h := q * float64(len(x)-1)
	lo := int(math.Floor(h))
	if lo >= len(x)-1 {
		return x[len(x)-1]
	}
	return x[lo] + (h-float64(lo))*(x[lo+1]-x[lo])
}
