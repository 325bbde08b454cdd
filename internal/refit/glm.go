package refit

import (
	"context"
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/antecedent-lab/antecedent/lasso"
)

// isCondition reports whether err is a gonum condition warning for a
// matrix that is still usable.
func isCondition(err error) bool {
	var cond mat.Condition
	return errors.As(err, &cond) && float64(cond) < 1e14
}

// glm is an unpenalised GLM of y on the columns x (with an intercept),
// worked on the predictors divided by scale so that very different scales
// stay well conditioned. Coefficients are held intercept first.
type glm struct {
	fam   lasso.Family
	x     [][]float64
	y     []float64
	rows  []int
	n     int
	scale []float64
	buf   []float64 // one row of the scaled design, 1 first
	eta   []float64 // linear predictor of each row at the last deviance
	// w holds the number of rows behind each row of x and y when the
	// rows were grouped (see group); nil means one each.
	w []float64
}

func newGLM(fam lasso.Family, x [][]float64, y []float64, rows []int, sd []float64) *glm {
	g := &glm{fam: fam, x: x, y: y, rows: rows, n: len(y), scale: make([]float64, len(x)), buf: make([]float64, len(x)+1)}
	if rows != nil {
		g.n = len(rows)
	}
	if gx, gy, w, ok := group(x, y, rows); ok {
		g.x, g.y, g.rows, g.n, g.w = gx, gy, nil, len(gy), w
	}
	for a := range x {
		g.scale[a] = sd[a]
		if !(g.scale[a] > 0) {
			g.scale[a] = 1
		}
	}
	g.buf[0] = 1
	g.eta = make([]float64, g.n)
	return g
}

// row returns row t of the scaled design (shared: do not keep it).
func (g *glm) row(t int) []float64 {
	i := rowAt(g.rows, t)
	for a, c := range g.x {
		g.buf[a+1] = c[i] / g.scale[a]
	}
	return g.buf
}

// deviance returns the deviance at coefficients b and leaves the linear
// predictor in g.eta.
func (g *glm) deviance(b []float64) float64 {
	var d float64
	for t := range g.n {
		e := 0.0
		for a, v := range g.row(t) {
			e += b[a] * v
		}
		g.eta[t] = e
		d += g.weight(t) * g.fam.Deviance(g.y[rowAt(g.rows, t)], g.fam.Mean(e))
	}
	return d
}

// weight returns the number of rows behind row t.
func (g *glm) weight(t int) float64 {
	if g.w == nil {
		return 1
	}
	return g.w[t]
}

// information returns the Fisher information at g.eta and, when rhs is
// not nil, fills it with the score's working-response form X'W z. With
// exact, binomial weights are the exact variance μ(1 − μ), without the
// bound the solver's weights keep for stability, and rows fitted with a
// linear predictor beyond ±15 are counted.
func (g *glm) information(rhs *mat.VecDense, exact bool) (*mat.SymDense, int) {
	k := len(g.x)
	info := mat.NewSymDense(k+1, nil)
	_, binomial := g.fam.(lasso.Binomial)
	extreme := 0
	// Sums in plain slices: the upper triangle row by row, then rhs.
	sum := make([]float64, (k+1)*(k+1))
	right := make([]float64, k+1)
	for t := range g.n {
		xt := g.row(t)
		h, r := g.fam.Working(g.y[rowAt(g.rows, t)], g.eta[t])
		if exact && binomial {
			mu := g.fam.Mean(g.eta[t])
			h = mu * (1 - mu)
		}
		w := g.weight(t)
		if exact && math.Abs(g.eta[t]) > 15 {
			extreme += int(w)
		}
		h *= w
		for a := 0; a <= k; a++ {
			ha := h * xt[a]
			right[a] += ha * r
			row := sum[a*(k+1) : (a+1)*(k+1)]
			for c := a; c <= k; c++ {
				row[c] += ha * xt[c]
			}
		}
	}
	for a := 0; a <= k; a++ {
		for c := a; c <= k; c++ {
			info.SetSym(a, c, sum[a*(k+1)+c])
		}
		if rhs != nil {
			rhs.SetVec(a, right[a])
		}
	}
	return info, extreme
}

// maxGrouped is the most predictors whose rows group (see group) is
// asked to merge: their 0/1 patterns, and the response's, index a table
// of 2^(k+1) entries.
const maxGrouped = 16

// group merges the rows (nil means all) whose predictors x and response y
// are all equal, when every predictor and the response hold only 0 and 1
// there and at most maxGrouped predictors are given, and the rows take at
// most a quarter as many distinct values as there are rows. It returns the
// distinct rows' columns, their responses and the number of rows behind
// each, in the order of first appearance. A fit to the distinct rows
// weighted by those numbers has the same likelihood, score and
// information as a fit to the rows themselves, at a fraction of the work:
// tables of 0/1 parents of a 0/1 node usually take a few dozen values.
func group(x [][]float64, y []float64, rows []int) (gx [][]float64, gy, w []float64, ok bool) {
	k := len(x)
	n := len(y)
	if rows != nil {
		n = len(rows)
	}
	if k > maxGrouped || n < 8 {
		return nil, nil, nil, false
	}
	slot := make([]int32, 1<<(k+1))
	limit := n / 4
	var keys []uint32
	for t := range n {
		i := rowAt(rows, t)
		var key uint32
		for a, c := range x {
			switch c[i] {
			case 0:
			case 1:
				key |= 1 << a
			default:
				return nil, nil, nil, false
			}
		}
		switch y[i] {
		case 0:
		case 1:
			key |= 1 << k
		default:
			return nil, nil, nil, false
		}
		if slot[key] == 0 {
			if len(keys) == limit {
				return nil, nil, nil, false
			}
			keys = append(keys, key)
			w = append(w, 0)
			slot[key] = int32(len(keys))
		}
		w[slot[key]-1]++
	}
	gx = make([][]float64, k)
	for a := range gx {
		gx[a] = make([]float64, len(keys))
		for u, key := range keys {
			gx[a][u] = float64(key >> a & 1)
		}
	}
	gy = make([]float64, len(keys))
	for u, key := range keys {
		gy[u] = float64(key >> k & 1)
	}
	return gx, gy, w, true
}

// newton runs Newton–Raphson (Fisher scoring) from beta with step halving
// on the deviance, for at most 100 steps, changing beta in place. It
// reports whether it converged, or a reason the effects cannot be
// estimated.
func (g *glm) newton(ctx context.Context, beta []float64) (converged bool, fail string, err error) {
	null := g.deviance(beta)
	dev := null
	var ch mat.Cholesky
	trial := make([]float64, len(beta))
	for iter := 0; iter < 100 && !converged; iter++ {
		if err := ctx.Err(); err != nil {
			return false, "", err
		}
		rhs := mat.NewVecDense(len(beta), nil)
		info, _ := g.information(rhs, false)
		if !ch.Factorize(info) {
			return false, "parents are collinear; effects not estimated", nil
		}
		var step mat.VecDense
		if err := ch.SolveVecTo(&step, rhs); err != nil && !isCondition(err) {
			return false, "parents are collinear; effects not estimated", nil
		}
		for scale := 1.0; ; scale /= 2 {
			for a := range trial {
				trial[a] = beta[a] + scale*step.AtVec(a)
			}
			d := g.deviance(trial)
			if d <= dev*(1+1e-14) || scale < 1e-10 {
				converged = math.Abs(dev-d) <= 1e-12*(math.Abs(d)+0.1)
				dev = d
				break
			}
		}
		copy(beta, trial)
		if null > 0 && 1-dev/null >= 0.999 {
			return false, "the parents predict this node (almost) perfectly (separation); effects not estimable", nil
		}
	}
	return converged, "", nil
}

// fitGLM fits the model from intercept b0 and zero slopes and fills f's
// intercept, coefficients and standard errors (the inverse information at
// the solution, dispersion 1), with a warning when they are unreliable.
func (f *Fit) fitGLM(ctx context.Context, fam lasso.Family, x [][]float64, y []float64, rows []int) error {
	g := newGLM(fam, x, y, rows, f.SD)
	beta := make([]float64, len(x)+1)
	beta[0] = f.Intercept
	converged, fail, err := g.newton(ctx, beta)
	if err != nil {
		return err
	}
	if fail != "" {
		f.Intercept, f.Warning = math.NaN(), fail
		for a := range f.Coef {
			f.Coef[a] = math.NaN()
		}
		return nil
	}
	f.Intercept = beta[0]
	for a := range f.Coef {
		f.Coef[a] = beta[a+1] / g.scale[a]
	}
	g.deviance(beta)
	info, extreme := g.information(nil, true)
	var ch mat.Cholesky
	var inv mat.SymDense
	if !ch.Factorize(info) {
		f.Warning = "information matrix is singular; standard errors not estimated"
		return nil
	}
	if err := ch.InverseTo(&inv); err != nil && !isCondition(err) {
		f.Warning = "information matrix is singular; standard errors not estimated"
		return nil
	}
	for a := range f.SE {
		f.SE[a] = math.Sqrt(inv.At(a+1, a+1)) / g.scale[a]
	}
	switch {
	case !converged:
		f.Warning = "unpenalised refit did not converge in 100 iterations"
	case extreme > 0:
		f.Warning = fmt.Sprintf("%d rows fitted with linear predictor beyond ±15 (near-perfect separation); standard errors unreliable", extreme)
	}
	return nil
}

func rowAt(rows []int, t int) int {
	if rows == nil {
		return t
	}
	return rows[t]
}
