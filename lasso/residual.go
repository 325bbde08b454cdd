package lasso

import "math"

// residualEngine runs coordinate descent with residual updates: each
// coefficient change costs one pass over the rows. Families other than
// Gaussian are handled by an outer reweighting loop (IRLS): at each outer
// iteration the loss is replaced by its quadratic approximation at the
// current fit and that weighted least-squares problem is solved by
// coordinate descent.
type residualEngine struct {
	r      resolved
	cols   [][]float64 // by predictor position
	rows   []int       // nil means 0..n-1
	n      int
	y      []float64 // response by row position
	omega  []float64 // weights divided by their sum, by row position
	total  float64   // sum of weights
	center []float64
	scale  []float64
	v      []float64
	excl   []bool

	beta []float64 // standardised coefficients
	b0   float64   // intercept in standardised coordinates
	eta  []float64 // linear predictor
	h    []float64 // ω times working weight
	// The weighted working residual h·(z − eta) is held as q + alpha·h:
	// centring and intercept moves change only the scalar alpha, so an
	// update of a 0/1 predictor touches only its ones.
	q     []float64
	alpha float64
	// qw holds q as formed by working (non-Gaussian): the working
	// response is z = η + qw/h, so after a descent η = z − (q + αh)/h
	// = η_old + (qw − q)/h − α.
	qw    []float64
	xv    []float64 // Σ h x̃²
	hxRaw []float64 // Σ h x (uncentred, unscaled)
	sumH  float64
	sumQ  float64 // Σ q
	// ones lists, for a 0/1 predictor, the row positions where it is 1
	// (where it is 0 when flip is set: the engine then works with 1 − x).
	ones  [][]int32
	isBin []bool
	flip  []bool
	// stale marks predictors whose xv and hxRaw predate the weights.
	stale []bool
	// version counts the working weights formed (other than Gaussian).
	version int
	// gval[j] is the gradient of predictor j when gstamp[j] == stamp;
	// stamp moves on whenever the working residuals change.
	gval   []float64
	gstamp []uint64
	stamp  uint64
	cross  crossCache
	step   activeStep
	memory pathMemory

	nullDev float64
	kktTol  float64 // bound on the scaled KKT residuals (see descend)
	fresh   bool    // h and res reflect the current eta
	active  []int
	signs   []int8
	old     []float64
	etaOld  []float64
	dev     float64 // deviance at the current eta, when devOK
	devOK   bool
	wantDev bool // working also computes the deviance, sharing its exponentials
	// ex holds e^−|η| at the eta of the last binomial working weights,
	// from which deviance forms the deviance when it is asked for (one
	// logarithm per row, not paid at reweighting steps that end up not
	// needing it); exOld holds it at etaOld during a descent.
	ex, exOld []float64
	binomial  bool
	// qSnap holds q at the last drift call; spreads[j] is the weighted
	// norm of predictor j's working column over its scale (see drift).
	qSnap   []float64
	spreads []float64
	// pool, when set, gave the per-row arrays, which release gives back.
	pool *Index
	ownY bool // y is the engine's own array, not the caller's response
}

// rowArray returns a zeroed array over the engine's rows, from the pool
// when there is one.
func (e *residualEngine) rowArray() []float64 {
	if e.pool != nil {
		return e.pool.buffer()
	}
	return make([]float64, e.n)
}

// release gives the per-row arrays back to the pool, once the path has
// ended; the engine is not used after.
func (e *residualEngine) release() {
	if e.pool == nil {
		return
	}
	y := e.y
	if !e.ownY {
		y = nil // the caller's response
	}
	e.pool.recycle(y, e.omega, e.eta, e.h, e.q, e.qw, e.etaOld, e.ex, e.exOld, e.qSnap)
	e.y, e.omega, e.eta, e.h, e.q, e.qw, e.etaOld, e.ex, e.exOld, e.qSnap = nil, nil, nil, nil, nil, nil, nil, nil, nil, nil
	e.pool = nil
}

func newResidualEngine(d Data, pred, rows []int, v []float64, r resolved) (*residualEngine, error) {
	// With a shared index the fit runs over the index's rows, those it
	// leaves out (in[t] false) at weight zero, so that the index's lists
	// serve it as they are.
	var in []bool
	if x := d.Index; x != nil { // its columns were checked by prepare
		var err error
		if in, err = x.members(rows, len(d.Response)); err != nil {
			return nil, err
		}
		rows = x.rows
	}
	n := len(d.Response)
	if rows != nil {
		n = len(rows)
	}
	p := len(pred)
	e := &residualEngine{
		r: r, rows: rows, n: n, v: v, pool: d.Index,
		cols:    make([][]float64, p),
		center:  make([]float64, p),
		scale:   make([]float64, p),
		excl:    make([]bool, p),
		beta:    make([]float64, p),
		xv:      make([]float64, p),
		hxRaw:   make([]float64, p),
		old:     make([]float64, p),
		ones:    make([][]int32, p),
		isBin:   make([]bool, p),
		stale:   make([]bool, p),
		flip:    make([]bool, p),
		signs:   make([]int8, p),
		gval:    make([]float64, p),
		gstamp:  make([]uint64, p),
		stamp:   1,
		spreads: make([]float64, p),
	}
	e.omega, e.eta, e.h, e.q = e.rowArray(), e.rowArray(), e.rowArray(), e.rowArray()
	for j, c := range pred {
		e.cols[j] = d.Columns[c]
	}
	// A fit over every row reads the response in place when the family
	// accepts it on every row (those of weight zero too); otherwise it
	// holds its own copy.
	shared := rows == nil && d.Index != nil && checkResponse(r.fam, d.Response, nil) == nil
	if shared {
		e.y = d.Response[:n:n]
	} else {
		e.y, e.ownY = e.rowArray(), true
	}
	first := -1 // the first row the fit uses
	for t := 0; t < n; t++ {
		i := t
		if rows != nil {
			i = rows[t]
		}
		if in != nil && !in[t] {
			continue // weight zero; its response is set below
		}
		if first < 0 {
			first = i
		}
		if !shared {
			e.y[t] = d.Response[i]
		}
		w := 1.0
		if d.Weights != nil {
			w = d.Weights[i]
		}
		e.omega[t] = w
		e.total += w
	}
	for t, x := range in {
		if !x && !shared {
			// Any value the family accepts: the row weighs nothing.
			e.y[t] = d.Response[first]
		}
	}
	var ybar float64
	for t := range e.omega {
		e.omega[t] /= e.total
		ybar += e.omega[t] * e.y[t]
	}
	// scratch receives, in the one pass of columnMoments, a 0/1
	// predictor's positions of ones from the front and of zeros from the
	// back; the rarer are then copied out at their exact size.
	var scratch []int32
	if n < math.MaxInt32 && d.Index == nil {
		scratch = make([]int32, n)
	}
	for j, c := range e.cols {
		if math.IsInf(v[j], 1) {
			// An infinite penalty factor keeps the predictor out of
			// every model, as a constant column is kept out.
			e.excl[j] = true
			e.scale[j] = 1
			e.ones[j] = nil
			continue
		}
		// A 0/1 column the shared index lists (see Index) is set up from
		// its list; any other from a pass over the column.
		var ic *indexColumn
		if d.Index != nil {
			if ic = d.Index.column(pred[j]); !ic.bin || (ic.flip && !r.intercept) {
				ic = nil // not 0/1, or its list holds zeros and no intercept absorbs the flip
			}
		}
		var m, ss float64
		var bin bool
		var count int
		if ic != nil {
			m, ss = e.listedMoments(ic)
			bin = true
		} else {
			m, ss, bin, count = e.columnMoments(c, r.intercept, scratch)
		}
		if ss == 0 || (r.intercept && isConstant(ss, m)) {
			e.excl[j] = true
			e.scale[j] = 1
			e.ones[j] = nil
			continue
		}
		e.center[j] = m
		e.scale[j] = 1
		if r.standard {
			e.scale[j] = math.Sqrt(ss)
		}
		e.spreads[j] = math.Sqrt(ss) / e.scale[j]
		e.isBin[j] = bin
		switch {
		case ic != nil:
			e.flip[j], e.ones[j] = ic.flip, ic.list
			if ic.flip {
				e.center[j] = 1 - m
			}
		case bin && r.intercept && 2*count > n:
			// Mostly ones: work with 1 − x, whose ones are fewer; the
			// intercept absorbs the constant and toOriginal turns the
			// coefficient back.
			e.flip[j] = true
			e.center[j] = 1 - m
			zeros := make([]int32, n-count)
			for k := range zeros {
				zeros[k] = scratch[n-1-k] // written from the back: reversed
			}
			e.ones[j] = zeros
		case bin:
			e.ones[j] = append(make([]int32, 0, count), scratch[:count]...)
		}
	}
	if r.intercept {
		e.b0 = r.fam.Link(ybar)
	}
	for t := range e.eta {
		e.eta[t] = e.b0
	}
	for t, w := range e.omega {
		if w > 0 { // rows of weight zero (see Index) may be anything
			e.nullDev += w * e.unitDeviance(e.y[t], e.eta[t])
		}
	}
	e.nullDev *= e.total
	e.kktTol = r.tol * math.Sqrt(e.nullDev/e.total)
	if !r.gaussian {
		e.qw = e.rowArray()
		e.etaOld = e.rowArray()
	}
	if _, ok := r.fam.(Binomial); ok {
		e.binomial = true
		e.ex = e.rowArray()
		e.exOld = e.rowArray()
	}
	e.working()
	if r.gaussian {
		// The weights never change: each Σ h x̃² is formed at the
		// predictor's first update.
		for j, x := range e.excl {
			e.stale[j] = !x
		}
	}
	return e, nil
}

// columnMoments returns, in one pass over the engine's rows of column c, its
// weighted mean (0 without an intercept), its weighted sum of squares about
// that, whether it holds only 0 and 1, and then its number of ones. When
// pos is not nil (it has a place for every fitted row), it writes there
// the positions of the ones from the front and those of the zeros from the
// back, the last zero first. Sums are taken about the first value, so that
// a large mean costs no precision.
func (e *residualEngine) columnMoments(c []float64, intercept bool, pos []int32) (m, ss float64, bin bool, ones int) {
	n := e.n
	if n == 0 {
		return 0, 0, false, 0
	}
	sh := c[e.row(0)]
	var s1, s2 float64
	bin = pos != nil
	zeros := 0
	omega := e.omega[:n]
	visit := func(t int, x float64) {
		dx := x - sh
		w := omega[t]
		s1 += w * dx
		s2 += w * dx * dx
		if !bin {
			return
		}
		// Whether a row holds 1 or 0 is as good as random: the position
		// goes to both ends and only the counts move, without a branch
		// on the value. While the column is 0/1 the two slots differ
		// (ones + zeros = t < n), or coincide at the last row with the
		// same value.
		one, zero := b2i(x == 1), b2i(x == 0)
		pos[ones] = int32(t)
		pos[n-1-zeros] = int32(t)
		ones += one
		zeros += zero
		if one|zero == 0 {
			bin = false
		}
	}
	if e.rows == nil {
		for t, x := range c[:n] {
			visit(t, x)
		}
	} else {
		for t, i := range e.rows {
			visit(t, c[i])
		}
	}
	// The weights ω sum to one: Σω(x−m)² = s2 − 2(m−sh)·s1 + (m−sh)².
	if intercept {
		m = sh + s1
		ss = s2 - s1*s1
	} else {
		ss = s2 + 2*sh*s1 + sh*sh
	}
	if ss < 0 {
		ss = 0
	}
	return m, ss, bin, ones
}

// listedMoments returns what columnMoments returns of a 0/1 column, its
// weighted mean (0 without an intercept) and sum of squares about that
// over the fit's rows, from its shared listing c: the weight of the listed
// rows is the mean of the listed value. Without an intercept c lists ones.
func (e *residualEngine) listedMoments(c *indexColumn) (m, ss float64) {
	pz := sumAt(e.omega[:e.n], c.list)
	if !e.r.intercept {
		return 0, pz
	}
	m = pz
	if c.flip {
		m = 1 - pz
	}
	return m, max(pz*(1-pz), 0)
}

// b2i returns 1 for true and 0 for false.
func b2i(b bool) int {
	var i int
	if b {
		i = 1
	}
	return i
}

func (e *residualEngine) row(t int) int {
	if e.rows == nil {
		return t
	}
	return e.rows[t]
}

func (e *residualEngine) unitDeviance(y, eta float64) float64 {
	if _, ok := e.r.fam.(Binomial); ok {
		return binomialDevianceEta(y, eta)
	}
	return e.r.fam.Deviance(y, e.r.fam.Mean(eta))
}

// working forms the working weights and residuals at the current eta.
func (e *residualEngine) working() {
	if e.fresh {
		return
	}
	e.stamp++
	e.sumH, e.sumQ, e.alpha = 0, 0, 0
	if e.r.gaussian {
		copy(e.h, e.omega)
		for t, y := range e.y {
			e.q[t] = e.h[t] * (y - e.eta[t])
			e.sumQ += e.q[t]
		}
		e.sumH = 1
	} else if _, ok := e.r.fam.(Binomial); ok {
		e.workingBinomial()
	} else {
		fam := e.r.fam
		var dev float64
		wantDev := e.wantDev && !e.devOK
		for t, y := range e.y {
			eta := e.eta[t]
			w := e.omega[t]
			if w == 0 {
				// A row of weight zero (see Index): nothing, whatever
				// the family makes of it.
				e.h[t], e.q[t], e.qw[t] = 0, 0, 0
				continue
			}
			hw, rr := fam.Working(y, eta)
			if wantDev {
				dev += w * e.unitDeviance(y, eta)
			}
			e.h[t] = w * hw
			e.q[t] = e.h[t] * rr
			e.qw[t] = e.q[t]
			e.sumH += e.h[t]
			e.sumQ += e.q[t]
		}
		if wantDev {
			e.dev, e.devOK = dev*e.total, true
		}
	}
	if !e.r.gaussian {
		e.version++
		// New weights: each predictor's Σ h x̃² is formed again at its
		// next update.
		for j, x := range e.excl {
			e.stale[j] = !x
		}
	}
	e.fresh = true
}

// workingBinomial is working for the binomial family, where one
// exponential per row gives the mean, the weight and (with one logarithm)
// the deviance. With d = 1/(1+e^−|η|), the weight μ(1−μ) equals e^−|η|·d²
// without cancellation; it is bounded below as Binomial.Working bounds μ.
// The weighted residual h·(z−η) is ω·(y−μ) exactly.
func (e *residualEngine) workingBinomial() {
	const hMin = ProbabilityBound * (1 - ProbabilityBound)
	n := e.n
	ys, etas, omega := e.y[:n], e.eta[:n], e.omega[:n]
	h, q, qw, exs := e.h[:n], e.q[:n], e.qw[:n], e.ex[:n]
	// Two simple loops run faster than one long one, whose chain of
	// dependent operations stalls each row.
	expNegAbs(exs, etas)
	var sumH, sumQ float64
	for t, y := range ys {
		eta, ex := etas[t], exs[t]
		// neg is all ones for negative eta: the selection is branch-free,
		// as the sign of eta is unpredictable.
		neg := uint64(int64(math.Float64bits(eta)) >> 63)
		d := 1 / (1 + ex)
		mu := math.Float64frombits(math.Float64bits(ex*d)&neg | math.Float64bits(d)&^neg)
		hw := max(ex*d*d, hMin)
		w := omega[t]
		ht := w * hw
		qt := w * (y - mu)
		h[t] = ht
		q[t] = qt
		qw[t] = qt
		sumH += ht
		sumQ += qt
	}
	e.sumH, e.sumQ = sumH, sumQ
}

// dotQ returns Σ x_j·q.
func (e *residualEngine) dotQ(j int) float64 {
	if e.isBin[j] {
		return sumAt(e.q[:e.n], e.ones[j])
	}
	if e.rows == nil {
		return dot(e.cols[j][:e.n], e.q)
	}
	return dotIndexed(e.cols[j], e.rows, e.q)
}

// grad returns Σ h x̃_j r = (Σ x·(q + αh) − m·Σ(q + αh))/s, using Σ h x
// as squareGrad last formed it.
func (e *residualEngine) grad(j int) float64 {
	sumR := e.sumQ + e.alpha*e.sumH
	return (e.dotQ(j) + e.alpha*e.hxRaw[j] - e.center[j]*sumR) / e.scale[j]
}

// flush folds alpha into q, so that gradients need no Σ h x.
func (e *residualEngine) flush() {
	if e.alpha == 0 {
		return
	}
	a := e.alpha
	for t, h := range e.h {
		e.q[t] += a * h
	}
	e.sumQ += a * e.sumH
	e.alpha = 0
}

// shift subtracts d·x̃_j from the working residuals: q −= (d/s)·h·x and
// alpha += (d/s)·m.
func (e *residualEngine) shift(j int, d float64) {
	f := d / e.scale[j]
	q, h := e.q[:e.n], e.h[:e.n]
	switch {
	case e.isBin[j]:
		subScaledAt(q, h, e.ones[j], f)
	case e.rows == nil:
		c := e.cols[j][:e.n]
		for t, x := range c {
			q[t] -= f * h[t] * x
		}
	default:
		c := e.cols[j]
		for t, i := range e.rows {
			q[t] -= f * h[t] * c[i]
		}
	}
	e.alpha += f * e.center[j]
	e.sumQ -= f * e.hxRaw[j]
	e.stamp++
}

// dotIndexed returns Σ_t c[rows[t]]·v[t].
func dotIndexed(c []float64, rows []int, v []float64) float64 {
	v = v[:len(rows)]
	var s0, s1 float64
	t := 0
	for ; t+2 <= len(rows); t += 2 {
		s0 += c[rows[t]] * v[t]
		s1 += c[rows[t+1]] * v[t+1]
	}
	if t < len(rows) {
		s0 += c[rows[t]] * v[t]
	}
	return s0 + s1
}

// squareGrad returns Σ h x̃_j² and the gradient of j, forming the
// former and Σ h x_j first when the weights changed since they were
// last formed; both come from one pass over the column. The gradient is
// kept until the working residuals change, so a KKT check followed by a
// Newton step from the same fit reads each column once.
func (e *residualEngine) squareGrad(j int) (float64, float64) {
	if !e.stale[j] {
		if e.gstamp[j] != e.stamp {
			e.gval[j], e.gstamp[j] = e.grad(j), e.stamp
		}
		return e.xv[j], e.gval[j]
	}
	e.stale[j] = false
	c, m, s := e.cols[j], e.center[j], e.scale[j]
	h, q := e.h[:e.n], e.q[:e.n]
	var raw, sq, dq float64
	switch {
	case e.isBin[j]:
		raw, dq = sumAt2(h, q, e.ones[j])
		sq = raw
	case e.rows == nil:
		for t, x := range c[:e.n] {
			hx := h[t] * x
			raw += hx
			sq += hx * x
			dq += q[t] * x
		}
	default:
		for t, i := range e.rows {
			x := c[i]
			hx := h[t] * x
			raw += hx
			sq += hx * x
			dq += q[t] * x
		}
	}
	// Σ h (x−m)² = Σ h x² − 2m Σ h x + m² Σ h.
	e.xv[j] = (sq - 2*m*raw + m*m*e.sumH) / (s * s)
	e.hxRaw[j] = raw
	sumR := e.sumQ + e.alpha*e.sumH
	e.gval[j], e.gstamp[j] = (dq+e.alpha*raw-m*sumR)/s, e.stamp
	return e.xv[j], e.gval[j]
}

func (e *residualEngine) sweep(lam float64, set []int) (bound, noise float64) {
	var moved, size float64 // Σ √h_j·|d_j| and Σ |u_j|/√h_j
	for _, j := range set {
		xv, g := e.squareGrad(j)
		if xv <= 0 {
			continue
		}
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		old := e.beta[j]
		u := g + xv*old
		root := math.Sqrt(xv)
		size += math.Abs(u) / root
		if d := soft(u, l1)/(xv+l2) - old; d != 0 {
			e.beta[j] = old + d
			e.shift(j, d)
			moved += root * math.Abs(d)
		}
	}
	if e.r.intercept && !e.r.gaussian && e.sumH > 0 {
		// The intercept is a coordinate of curvature Σh, updated last.
		sumR := e.sumQ + e.alpha*e.sumH
		root := math.Sqrt(e.sumH)
		size += math.Abs(sumR)/root + root*math.Abs(e.b0)
		if d := sumR / e.sumH; d != 0 {
			e.b0 += d
			e.alpha -= d
			e.stamp++
			moved += root * math.Abs(d)
		}
	}
	return moved, roundoff * size
}

func (e *residualEngine) coefficients() []float64 { return e.beta }

func (e *residualEngine) solve(lam float64, set []int) (int, bool) {
	if e.r.gaussian {
		// Residuals stay current through sweep; eta is not needed.
		sweeps, ok, _ := descend(e, lam, set, e.kktTol, false, e.r.maxSweeps, e.active, e.signs)
		return sweeps, ok
	}
	e.predict(lam, set)
	sweeps, ok := e.reweigh(lam, set)
	if ok {
		e.record(lam)
	}
	return sweeps, ok
}

// reweigh solves penalty lam by reweighted least squares.
func (e *residualEngine) reweigh(lam float64, set []int) (int, bool) {
	sweeps := 0
	for outer := 0; outer < e.r.maxReweigh; outer++ {
		// The deviance shares the weights' exponentials; the path
		// records it once the fit is done.
		e.wantDev = true
		e.working()
		e.wantDev = false
		// At weights formed at the current fit the weighted working
		// residuals are the negative gradient of the loss itself, so
		// the KKT residuals of the penalised problem follow exactly, in
		// one pass over the set whose weighted squares the next sweep
		// reuses.
		if e.residual(lam, set) <= e.kktTol {
			return sweeps, true
		}
		copy(e.old, e.beta)
		copy(e.etaOld, e.eta)
		oldB0 := e.b0
		oldDev, oldDevOK := e.dev, e.devOK
		if e.binomial && !oldDevOK {
			// Keep the exponentials at etaOld: the deviance there is
			// formed only if the step must be halved.
			e.ex, e.exOld = e.exOld, e.ex
		}
		sw, ok, first := descend(e, lam, set, e.kktTol, true, e.r.maxSweeps-sweeps, e.active, e.signs)
		sweeps += sw
		step := e.updateEta()
		e.fresh, e.devOK = false, false
		if !ok {
			return sweeps, false
		}
		if first <= e.kktTol {
			// The first sweep at weights formed at the current point
			// ended the descent. There the working residuals are the
			// negative gradient of the loss itself, so its bound holds
			// for the penalised problem, to second order in a step
			// that small.
			return sweeps, true
		}
		// A full Newton step can overshoot far from the optimum. Steps
		// that move no linear predictor by more than 1 stay where the
		// quadratic model is good; larger ones are halved until the
		// penalised objective does not increase.
		if step > 1 {
			if e.binomial && !oldDevOK {
				oldDev, oldDevOK = e.binomialDeviance(e.exOld, e.etaOld), true
			}
			fOld := e.objectiveAt(lam, set, e.etaOld, e.old, oldDev, oldDevOK)
			fNew := e.objective(lam, set)
			for halvings := 0; fNew > fOld+1e-13*math.Abs(fOld); halvings++ {
				if halvings == 40 {
					// No decrease along the step: the fit is at the
					// optimum to rounding. Keep the previous point.
					copy(e.beta, e.old)
					copy(e.eta, e.etaOld)
					e.b0 = oldB0
					e.fresh, e.devOK = false, false
					return sweeps, true
				}
				for _, j := range set {
					e.beta[j] = (e.beta[j] + e.old[j]) / 2
				}
				e.b0 = (e.b0 + oldB0) / 2
				for t := range e.eta {
					e.eta[t] = (e.eta[t] + e.etaOld[t]) / 2
				}
				e.fresh, e.devOK = false, false
				fNew = e.objective(lam, set)
			}
			if e.saturated() {
				// A saturated fit has no finite optimum; the path reports it.
				return sweeps, true
			}
		}
	}
	return sweeps, false
}

// residual returns the largest KKT residual of the intercept and of the
// coordinates of set at the current working weights, each scaled by
// 1/√h_j (see descend). The weighted squares it forms serve the next
// sweep.
func (e *residualEngine) residual(lam float64, set []int) float64 {
	var worst float64
	if e.r.intercept && !e.r.gaussian && e.sumH > 0 {
		worst = math.Abs(e.sumQ+e.alpha*e.sumH) / math.Sqrt(e.sumH)
	}
	for _, j := range set {
		xv, g := e.squareGrad(j)
		if xv <= 0 {
			continue
		}
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		worst = math.Max(worst, kktResidual(g, e.beta[j], l1, l2)/math.Sqrt(xv))
	}
	return worst
}

// updateEta sets the linear predictor from the working residuals after a
// descent from etaOld, η = η_old + (qw − q)/h − α, and returns the largest
// change.
func (e *residualEngine) updateEta() float64 {
	n := e.n
	etas, etaOld, qw, q, h := e.eta[:n], e.etaOld[:n], e.qw[:n], e.q[:n], e.h[:n]
	alpha := e.alpha
	var step float64
	for t := range etas {
		d := (qw[t] - q[t]) / h[t]
		if h[t] == 0 {
			d = 0 // a row of weight zero (see Index): 0/0
		}
		eta := etaOld[t] + d - alpha
		etas[t] = eta
		if d := math.Abs(eta - etaOld[t]); d > step || d != d {
			step = d
		}
	}
	return step
}

// saturated reports whether the deviance explained has reached the
// saturation limit.
func (e *residualEngine) saturated() bool {
	return e.nullDev > 0 && 1-e.deviance()/e.nullDev >= e.r.saturation
}

// objectiveAt returns the penalised objective at linear predictor eta and
// standardised coefficients beta, reusing dev when known.
func (e *residualEngine) objectiveAt(lam float64, set []int, eta, beta []float64, dev float64, known bool) float64 {
	if !known {
		dev = 0
		for t, w := range e.omega {
			if w > 0 {
				dev += w * e.unitDeviance(e.y[t], eta[t])
			}
		}
		dev *= e.total
	}
	f := dev / (2 * e.total)
	for _, j := range set {
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		b := beta[j]
		f += l1*math.Abs(b) + l2/2*b*b
	}
	return f
}

// objective returns the penalised objective at the current fit:
// (1/W) Σ w·½·Deviance + λ Σ v_j (a|β_j| + (1−a)/2·β_j²) over set.
func (e *residualEngine) objective(lam float64, set []int) float64 {
	f := e.deviance() / (2 * e.total)
	for _, j := range set {
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		b := e.beta[j]
		f += l1*math.Abs(b) + l2/2*b*b
	}
	return f
}

// penalty returns λ Σ v_j (a|β_j| + (1−a)/2·β_j²) over set.
func (e *residualEngine) penalty(lam float64, set []int, beta []float64) float64 {
	var f float64
	for _, j := range set {
		l1, l2 := penaltyTerms(lam, e.r.a, e.v[j])
		b := beta[j]
		f += l1*math.Abs(b) + l2/2*b*b
	}
	return f
}

func (e *residualEngine) gradient(g []float64, skip []bool) {
	// The path records the deviance after each penalty: form it in the
	// same pass as the weights.
	e.wantDev = true
	e.working()
	e.wantDev = false
	e.flush()
	for j := range g {
		if skip != nil && skip[j] {
			continue
		}
		if e.excl[j] {
			g[j] = 0
			continue
		}
		g[j] = (e.dotQ(j) - e.center[j]*e.sumQ) / e.scale[j]
	}
}

func (e *residualEngine) toOriginal(b []float64) float64 {
	b0 := unstandardize(b, e.beta, e.scale, e.center, e.b0)
	// A flipped predictor enters as b·(1 − x) = b − b·x.
	for j, f := range e.flip {
		if f {
			b0 += b[j]
			b[j] = -b[j]
		}
	}
	return b0
}

func (e *residualEngine) deviance() float64 {
	var d float64
	if e.r.gaussian {
		for t, w := range e.omega {
			if w > 0 {
				r := e.q[t] + e.alpha*e.h[t]
				d += r * r / w
			}
		}
		return d * e.total
	}
	if e.devOK {
		return e.dev
	}
	if e.binomial && e.fresh {
		e.dev, e.devOK = e.binomialDeviance(e.ex, e.eta), true
		return e.dev
	}
	for t, w := range e.omega {
		if w > 0 {
			d += w * e.unitDeviance(e.y[t], e.eta[t])
		}
	}
	e.dev, e.devOK = d*e.total, true
	return e.dev
}

func (e *residualEngine) nullDeviance() float64 { return e.nullDev }
func (e *residualEngine) excluded() []bool      { return e.excl }
func (e *residualEngine) mode() Mode            { return ResidualMode }
func (e *residualEngine) weight() float64       { return e.total }

// binomialDeviance returns the binomial deviance at linear predictor eta
// from ex = e^−|η|: ½·deviance = log1p(e^−|η|) + max(η, 0) − y·η.
func (e *residualEngine) binomialDeviance(ex, eta []float64) float64 {
	return 2 * halfDevianceSum(ex[:e.n], eta, e.y, e.omega) * e.total
}

// drift bounds the change of every gradient since its last call, in one
// pass over the rows. At working weights formed at the fit and with α
// folded into q, g_j = Σ_t (x_jt − m_j)·q_t / s_j, so by Cauchy–Schwarz
// with the weights ω, |Δg_j| ≤ √(Σ ω (x_j − m_j)²)/s_j · √(Σ Δq_t²/ω_t):
// spread(j) times the value returned. The first call returns 0.
func (e *residualEngine) drift() float64 {
	e.working()
	e.flush()
	n := e.n
	q, om := e.q[:n], e.omega[:n]
	if e.qSnap == nil {
		e.qSnap = e.rowArray()
		copy(e.qSnap, q)
		return 0
	}
	qs := e.qSnap[:n]
	var sum float64
	for t, w := range om {
		if w > 0 { // q stays zero on rows of weight zero (see Index)
			d := q[t] - qs[t]
			sum += d * d / w
		}
	}
	copy(qs, q)
	// The factor and the term below cover rounding in the sums: the
	// gradients use Σ q as tracked through the updates.
	return math.Sqrt(sum)*(1+1e-8) + 1e-12
}

func (e *residualEngine) spread(j int) float64 { return e.spreads[j] }
