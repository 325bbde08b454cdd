package lasso

import "math"

// pathMemory holds the fits at the two penalties solved last, for the
// predictor of reweighting solves.
type pathMemory struct {
	count      int
	lam, lamPr float64   // the last penalty and the one before
	cur, prev  []float64 // standardised coefficients at them
	b0, b0Pr   float64
}

// record notes the fit at penalty lam after a solve.
func (e *residualEngine) record(lam float64) {
	m := &e.memory
	if m.cur == nil {
		m.cur = make([]float64, len(e.beta))
		m.prev = make([]float64, len(e.beta))
	}
	if m.count == 0 || lam != m.lam {
		m.cur, m.prev = m.prev, m.cur
		m.lamPr, m.b0Pr = m.lam, m.b0
		m.count++
	}
	m.lam, m.b0 = lam, e.b0
	copy(m.cur, e.beta)
}

// predict moves a reweighting fit to the next penalty lam along the path
// before it is solved: each non-zero coefficient of set, and the intercept,
// is extrapolated linearly in the penalty from the fits at the two
// previous penalties, and one that would cross zero is set to zero. The
// first reweighting step then starts closer to the optimum, and its
// quadratic model is better; the prediction is kept only if it lowers the
// penalised objective at lam.
func (e *residualEngine) predict(lam float64, set []int) {
	m := &e.memory
	if m.count < 2 || !(lam < m.lam) || math.IsInf(m.lamPr, 0) || !(m.lamPr > m.lam) {
		return
	}
	ratio := (m.lam - lam) / (m.lamPr - m.lam)
	before := e.objective(lam, set)
	copy(e.etaOld, e.eta)
	copy(e.old, e.beta)
	oldB0 := e.b0
	var shift float64
	moved := false
	for _, j := range set {
		b := e.beta[j]
		if b == 0 {
			continue
		}
		nb := b + ratio*(b-m.prev[j])
		if nb == 0 || (nb > 0) != (b > 0) {
			nb = 0
		}
		if d := nb - b; d != 0 {
			e.beta[j] = nb
			f := d / e.scale[j]
			e.addColumn(e.eta, j, f)
			shift -= f * e.center[j]
			moved = true
		}
	}
	if e.r.intercept {
		d := ratio * (e.b0 - m.b0Pr)
		e.b0 += d
		shift += d
		moved = moved || d != 0
	}
	if !moved {
		return
	}
	keep, decided := false, false
	if e.binomial && e.fresh {
		keep, decided = e.shiftBounded(lam, set, shift, before)
	} else {
		for t := range e.eta {
			e.eta[t] += shift
		}
	}
	e.fresh, e.devOK = false, false
	if !decided {
		e.wantDev = true
		e.working()
		e.wantDev = false
		keep = e.objective(lam, set) <= before
	}
	if keep {
		return
	}
	copy(e.eta, e.etaOld)
	copy(e.beta, e.old)
	e.b0 = oldB0
	e.fresh, e.devOK = false, false
}

// shiftBounded adds shift to every linear predictor, completing the
// prediction from etaOld, and in the same pass bounds the penalised
// objective there; before is the objective at etaOld, where the working
// weights were formed. It reports whether the prediction lowers the
// objective to at most before, and whether the bounds decided it (when
// not, the deviance must be formed).
//
// With ℓ the half unit deviance, L = Σ ω ℓ(η) and q = ω(y − μ) = −∂L/∂η
// at etaOld, convexity and ℓ″ = μ(1−μ) ≤ ¼ give, for Δ = η − η_old,
//
//	L(η_old) − q·Δ ≤ L(η) ≤ L(η_old) − q·Δ + ⅛ Σ ω Δ².
//
// The bounds decide only when they clear before by far more than the
// rounding of the sums (n·ε times the size of their terms), so that the
// decision is the one the formed deviance would give.
func (e *residualEngine) shiftBounded(lam float64, set []int, shift, before float64) (keep, decided bool) {
	n := e.n
	etas, etaOld, qw, omega := e.eta[:n], e.etaOld[:n], e.qw[:n], e.omega[:n]
	var lin, quad, size float64 // Σ q·Δ, Σ ω·Δ², and Σ |q·Δ| + ω·(|η| + |η_old|)
	for t, w := range omega {
		eta := etas[t] + shift
		etas[t] = eta
		old := etaOld[t]
		d := eta - old
		g := qw[t] * d
		lin += g
		quad += w * d * d
		size += math.Abs(g) + w*(math.Abs(eta)+math.Abs(old))
	}
	penOld := e.penalty(lam, set, e.old)
	penNew := e.penalty(lam, set, e.beta)
	lower := before - penOld + penNew - lin
	upper := lower + quad/8
	slack := 8 * float64(n+8) * 0x1p-52 * (math.Abs(before) + size + quad + penOld + penNew)
	switch {
	case upper+slack < before:
		return true, true
	case lower-slack > before:
		return false, true
	}
	return false, false
}

// addColumn adds f times the working column of predictor j (the column
// itself, or the indicator of the listed positions of a 0/1 predictor) to
// dst, by row position.
func (e *residualEngine) addColumn(dst []float64, j int, f float64) {
	switch {
	case e.isBin[j]:
		addAt(dst, e.ones[j], f)
	case e.rows == nil:
		for t, x := range e.cols[j][:e.n] {
			dst[t] += f * x
		}
	default:
		c := e.cols[j]
		for t, i := range e.rows {
			dst[t] += f * c[i]
		}
	}
}
