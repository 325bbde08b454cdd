package lasso

import (
	"math"

	"gonum.org/v1/gonum/floats"
)

// gramEngine runs Gaussian coordinate descent from moments: it keeps the
// gradient g = c − Gβ for every predictor, where G holds the standardised
// cross-products and c the standardised cross-products with the response.
// A column of G is formed the first time its coefficient moves, so each
// update costs O(p) whatever the number of rows.
type gramEngine struct {
	r      resolved
	m      momentSource
	resp   int
	pred   []int
	v      []float64
	center []float64
	scale  []float64
	excl   []bool
	c      []float64
	diag   []float64
	root   []float64 // √diag
	cols   [][]float64
	g      []float64
	beta   []float64
	ymean  float64
	vyy    float64
	kktTol float64
	active []int
	signs  []int8
	// The gradient g is kept current only for the screened set; others
	// are recomputed from the active columns when needed.
	inSet   []bool
	set     []int
	scratch []float64
	step    activeStep
}

func newGramEngine(m momentSource, resp int, pred []int, v []float64, r resolved) (*gramEngine, error) {
	p := len(pred)
	e := &gramEngine{
		r: r, m: m, resp: resp, pred: pred, v: v,
		center: make([]float64, p),
		scale:  make([]float64, p),
		excl:   make([]bool, p),
		c:      make([]float64, p),
		diag:   make([]float64, p),
		root:   make([]float64, p),
		cols:   make([][]float64, p),
		g:      make([]float64, p),
		beta:   make([]float64, p),
		inSet:  make([]bool, p),
		signs:  make([]int8, p),
	}
	e.vyy = e.moment(resp, resp)
	if r.intercept {
		e.ymean = m.mean(resp)
		if isConstant(e.vyy, e.ymean) {
			return nil, ErrConstantResponse
		}
	} else if !(e.vyy > 0) {
		return nil, ErrConstantResponse
	}
	for j, k := range pred {
		if math.IsInf(v[j], 1) {
			// An infinite penalty factor keeps the predictor out of
			// every model, as a constant one is kept out.
			e.excl[j] = true
			e.scale[j] = 1
			continue
		}
		vj := e.moment(k, k)
		if vj <= 0 || (r.intercept && isConstant(vj, m.mean(k))) {
			e.excl[j] = true
			e.scale[j] = 1
			continue
		}
		if r.intercept {
			e.center[j] = m.mean(k)
		}
		e.scale[j] = 1
		if r.standard {
			e.scale[j] = math.Sqrt(vj)
		}
		e.diag[j] = vj / (e.scale[j] * e.scale[j])
		e.root[j] = math.Sqrt(e.diag[j])
		e.c[j] = e.moment(k, resp) / e.scale[j]
	}
	copy(e.g, e.c)
	e.kktTol = r.tol * math.Sqrt(e.vyy)
	return e, nil
}

// moment returns the centred (with an intercept) or raw second moment of
// variables j and k per unit weight.
func (e *gramEngine) moment(j, k int) float64 {
	if e.r.intercept {
		return e.m.covariance(j, k)
	}
	return e.m.secondMoment(j, k)
}

// column returns column j of the standardised Gram, forming it on first use.
func (e *gramEngine) column(j int) []float64 {
	if col := e.cols[j]; col != nil {
		return col
	}
	col := make([]float64, len(e.pred))
	e.m.momentRow(col, e.pred[j], e.pred, e.r.intercept)
	sj := e.scale[j]
	for i := range col {
		if e.excl[i] {
			col[i] = 0
			continue
		}
		col[i] /= e.scale[i] * sj
	}
	e.cols[j] = col
	return col
}

func (e *gramEngine) sweep(lam float64, set []int) (bound, noise float64) {
	var moved, size float64 // Σ √h_j·|d_j| and Σ |u_j|/√h_j
	for _, j := range set {
		xv := e.diag[j]
		if xv <= 0 {
			continue
		}
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		old := e.beta[j]
		u := e.g[j] + xv*old
		size += math.Abs(u) / e.root[j]
		if d := soft(u, l1)/(xv+l2) - old; d != 0 {
			e.move(j, d)
			moved += e.root[j] * math.Abs(d)
		}
	}
	noise = roundoff * size
	if moved <= e.kktTol || moved <= noise {
		return moved, noise
	}
	// The gradient of the set is current: the exact residual costs one
	// pass over the set, little beside the sweep.
	return math.Min(moved, e.residual(lam, set)), noise
}

// newtonCost is the cost of a Newton step in sweeps over active: a
// factorisation of k³/3 against k updates of p entries.
func (e *gramEngine) newtonCost(active []int) float64 {
	k := float64(len(active))
	return 1 + k*k/(3*float64(len(e.pred)))
}

// newton takes a Newton step on active (see newtoner); the columns of G
// it needs are formed, as the coefficients have moved.
func (e *gramEngine) newton(lam float64, active []int) (moved, full bool) {
	k := len(active)
	if k == 0 {
		return false, false
	}
	st := &e.step
	st.reset(k)
	for a, j := range active {
		col := e.column(j)
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		for b, i := range active {
			st.h[a*k+b] = col[i]
		}
		st.h[a*k+a] += l2
		st.r[a] = newtonRHS(e.g[j], e.beta[j], l1, l2)
	}
	if !st.solve() {
		return false, false
	}
	t, hit := st.fraction(e.beta, active)
	for a, j := range active {
		d := t * st.dx[a]
		if a == hit {
			d = -e.beta[j]
		}
		if d != 0 {
			e.move(j, d)
		}
	}
	return true, hit < 0
}

// move adds d to coefficient j and updates the kept gradient.
func (e *gramEngine) move(j int, d float64) {
	e.beta[j] += d
	col := e.column(j)
	if 4*len(e.set) > len(col) {
		// Updating every entry runs as one vector operation; entries
		// outside the set are recomputed before use.
		floats.AddScaled(e.g, -d, col)
		return
	}
	g := e.g[:len(col)]
	for _, i := range e.set {
		g[i] -= col[i] * d
	}
}

// residual returns the largest KKT residual over set, each scaled by
// 1/√h_j, from the kept gradient.
func (e *gramEngine) residual(lam float64, set []int) float64 {
	var worst float64
	for _, j := range set {
		if e.diag[j] <= 0 {
			continue
		}
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		worst = math.Max(worst, kktResidual(e.g[j], e.beta[j], l1, l2)/e.root[j])
	}
	return worst
}

func (e *gramEngine) coefficients() []float64 { return e.beta }

func (e *gramEngine) solve(lam float64, set []int) (int, bool) {
	for _, j := range set {
		if !e.inSet[j] {
			e.inSet[j] = true
			e.g[j] = e.fresh(j)
		}
	}
	e.set = set
	sweeps, ok, _ := descend(e, lam, set, e.kktTol, false, e.r.maxSweeps, e.active, e.signs)
	return sweeps, ok
}

// fresh returns c_j − Σ_k G_jk β_k over the non-zero β_k, whose columns
// of G are formed.
func (e *gramEngine) fresh(j int) float64 {
	g := e.c[j]
	for k, b := range e.beta {
		if b != 0 {
			g -= e.cols[k][j] * b
		}
	}
	return g
}

// gradient copies the kept gradient of the screened set and recomputes
// the others, costing O(p·|active|).
func (e *gramEngine) gradient(g []float64, skip []bool) {
	var act []int
	for k, b := range e.beta {
		if b != 0 {
			act = append(act, k)
		}
	}
	// Entries outside the set are c − Σ_k G_·k β_k, accumulated column
	// by column as vector operations (the columns of active predictors
	// are formed).
	full := e.scratch[:0]
	if len(act) > 0 {
		full = append(full, e.c...)
		for _, k := range act {
			floats.AddScaled(full, -e.beta[k], e.cols[k])
		}
		e.scratch = full
	}
	for j := range g {
		switch {
		case e.inSet[j]:
			g[j] = e.g[j]
		case skip != nil && skip[j]:
		case e.excl[j]:
			g[j] = 0
		case len(act) == 0:
			g[j] = e.c[j]
		default:
			g[j] = full[j]
		}
	}
}

func (e *gramEngine) toOriginal(b []float64) float64 {
	return unstandardize(b, e.beta, e.scale, e.center, e.ymean)
}

// deviance returns W·(vyy − 2c'β + β'Gβ) = W·(vyy − Σ β_j (c_j + g_j)).
func (e *gramEngine) deviance() float64 {
	d := e.vyy
	for j, b := range e.beta {
		if b != 0 {
			d -= b * (e.c[j] + e.g[j])
		}
	}
	return math.Max(d, 0) * e.m.weight()
}

func (e *gramEngine) nullDeviance() float64 { return e.vyy * e.m.weight() }
func (e *gramEngine) excluded() []bool      { return e.excl }
func (e *gramEngine) mode() Mode            { return GramMode }
func (e *gramEngine) weight() float64       { return e.m.weight() }
