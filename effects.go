package antecedent

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/antecedent-lab/antecedent/lasso"
)

// z975 is the 97.5% point of the standard normal distribution.
const z975 = 1.959963984540054

// refit estimates the node's effects by an unpenalised regression on its
// parents: least squares for Gaussian nodes (standard errors from the
// residual variance with n − k − 1 degrees of freedom), maximum likelihood
// by IRLS for other families (standard errors from the inverse Fisher
// information, dispersion 1), with 95% intervals (Student's t for least
// squares, normal otherwise).
func (r *run) refit(ctx context.Context, v int, parents, rows []int, node *Node) error {
	cols, owner := r.design(parents)
	y := r.d.cols[r.d.varCols[v][0]]
	n := r.d.rows
	if rows != nil {
		n = len(rows)
	}
	local := make([][]float64, 0, len(cols)+1)
	for _, c := range cols {
		local = append(local, r.d.cols[c])
	}
	local = append(local, y)
	k := len(cols)
	m := lasso.NewMoments(lasso.ColumnMeans(local, nil, rows))
	if err := m.Accumulate(local, nil, rows); err != nil {
		return err
	}
	sd := make([]float64, k+1)
	for t := range sd {
		sd[t] = math.Sqrt(math.Max(m.Covariance(t, t), 0))
	}
	est := make([]float64, k)
	se := make([]float64, k)
	for t := range se {
		se[t] = math.NaN()
	}
	fam := r.family(v)
	gaussian := r.isGaussian(v)
	var b0 float64
	if gaussian {
		b0 = m.Mean(k)
		if k > 0 {
			// Solve on the correlation scale so that predictors on very
			// different scales stay well conditioned.
			scale := make([]float64, k)
			for a := range k {
				scale[a] = sd[a]
				if scale[a] == 0 {
					scale[a] = 1
				}
			}
			c := mat.NewSymDense(k, nil)
			rhs := mat.NewVecDense(k, nil)
			for a := range k {
				rhs.SetVec(a, m.Covariance(a, k)/scale[a])
				for b := a; b < k; b++ {
					c.SetSym(a, b, m.Covariance(a, b)/(scale[a]*scale[b]))
				}
			}
			var ch mat.Cholesky
			var b mat.VecDense
			ok := ch.Factorize(c)
			if ok {
				if err := ch.SolveVecTo(&b, rhs); err != nil {
					var cond mat.Condition
					ok = errors.As(err, &cond) && float64(cond) < 1e14
				}
			}
			if !ok {
				node.Warnings = append(node.Warnings, "parents are collinear; effects not estimated")
				for t := range est {
					est[t] = math.NaN()
				}
				b0 = math.NaN()
			} else {
				rss := m.Covariance(k, k)
				for a := range k {
					est[a] = b.AtVec(a) / scale[a]
					rss -= b.AtVec(a) * rhs.AtVec(a)
					b0 -= est[a] * m.Mean(a)
				}
				df := float64(n - k - 1)
				if df > 0 {
					sigma2 := math.Max(rss, 0) * m.Weight / df
					var inv mat.SymDense
					if err := ch.InverseTo(&inv); err == nil || isCondition(err) {
						for a := range k {
							se[a] = math.Sqrt(sigma2*inv.At(a, a)/m.Weight) / scale[a]
						}
					}
				}
			}
		}
	} else {
		b0 = fam.Link(m.Mean(k))
		if k > 0 {
			var status string
			b0, est, se, status = newtonGLM(ctx, fam, r.d.cols, cols, y, rows, b0)
			if status != "" {
				node.Warnings = append(node.Warnings, status)
			}
		}
	}
	node.Intercept = Number(b0)
	node.Effects = node.Effects[:0]
	q := z975
	if gaussian && n-k-1 > 0 {
		// Least-squares intervals use Student's t with n − k − 1 degrees
		// of freedom.
		q = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(n - k - 1)}.Quantile(0.975)
	}
	for t, c := range cols {
		e := Effect{
			Parent: r.d.vars[owner[t]].Name, Term: r.d.termName(c),
			Estimate: Number(est[t]), SE: Number(se[t]),
			Lower: Number(est[t] - q*se[t]), Upper: Number(est[t] + q*se[t]),
			OddsRatio: nan(), OddsLower: nan(), OddsUpper: nan(),
			Standardized: Number(est[t] * sd[t]),
		}
		if gaussian {
			e.Standardized = Number(est[t] * sd[t] / sd[k])
		}
		if _, ok := fam.(lasso.Binomial); ok {
			e.OddsRatio = Number(math.Exp(est[t]))
			e.OddsLower = Number(math.Exp(float64(e.Lower)))
			e.OddsUpper = Number(math.Exp(float64(e.Upper)))
		}
		node.Effects = append(node.Effects, e)
	}
	return nil
}

// newtonGLM fits an unpenalised GLM of y on cols (with an intercept) by
// Newton–Raphson / Fisher scoring on the full information matrix, with
// step halving on the deviance, starting from the null model. It returns
// the intercept, the coefficients, their standard errors (the inverse
// information, dispersion 1) and a warning, empty when all went well.
func isCondition(err error) bool {
	var cond mat.Condition
	return errors.As(err, &cond) && float64(cond) < 1e14
}

func newtonGLM(ctx context.Context, fam lasso.Family, all [][]float64, cols []int, y []float64, rows []int, b0 float64) (float64, []float64, []float64, string) {
	k := len(cols)
	n := len(y)
	if rows != nil {
		n = len(rows)
	}
	beta := make([]float64, k+1) // intercept first
	beta[0] = b0
	eta := make([]float64, n)
	x := make([]float64, k+1)
	x[0] = 1
	// Work on predictors divided by their standard deviations, so that
	// very different scales stay well conditioned.
	scale := make([]float64, k)
	for a, c := range cols {
		var s1, s2 float64
		for t := range n {
			v := all[c][rowAt(rows, t)]
			s1 += v
			s2 += v * v
		}
		m := s1 / float64(n)
		scale[a] = math.Sqrt(math.Max(s2/float64(n)-m*m, 0))
		if !(scale[a] > 0) {
			scale[a] = 1
		}
	}
	row := func(t int) []float64 {
		i := rowAt(rows, t)
		for a, c := range cols {
			x[a+1] = all[c][i] / scale[a]
		}
		return x
	}
	deviance := func(b []float64) float64 {
		var d float64
		for t := range n {
			xt := row(t)
			e := 0.0
			for a, v := range xt {
				e += b[a] * v
			}
			eta[t] = e
			d += fam.Deviance(y[rowAt(rows, t)], fam.Mean(e))
		}
		return d
	}
	nanAll := func(msg string) (float64, []float64, []float64, string) {
		est := make([]float64, k)
		se := make([]float64, k)
		for a := range est {
			est[a], se[a] = math.NaN(), math.NaN()
		}
		return math.NaN(), est, se, msg
	}
	null := deviance(beta)
	dev := null
	info := mat.NewSymDense(k+1, nil)
	rhs := mat.NewVecDense(k+1, nil)
	var ch mat.Cholesky
	converged := false
	for iter := 0; iter < 100 && !converged; iter++ {
		if ctx.Err() != nil {
			return nanAll("cancelled")
		}
		info.Zero()
		rhs.Zero()
		for t := range n {
			xt := row(t)
			h, r := fam.Working(y[rowAt(rows, t)], eta[t])
			for a := 0; a <= k; a++ {
				rhs.SetVec(a, rhs.AtVec(a)+h*r*xt[a])
				for c := a; c <= k; c++ {
					info.SetSym(a, c, info.At(a, c)+h*xt[a]*xt[c])
				}
			}
		}
		if !ch.Factorize(info) {
			return nanAll("parents are collinear; effects not estimated")
		}
		var step mat.VecDense
		if err := ch.SolveVecTo(&step, rhs); err != nil && !isCondition(err) {
			return nanAll("parents are collinear; effects not estimated")
		}
		trial := make([]float64, k+1)
		for scale := 1.0; ; scale /= 2 {
			for a := range trial {
				trial[a] = beta[a] + scale*step.AtVec(a)
			}
			d := deviance(trial)
			if d <= dev*(1+1e-14) || scale < 1e-10 {
				converged = math.Abs(dev-d) <= 1e-12*(math.Abs(d)+0.1)
				dev = d
				break
			}
		}
		copy(beta, trial)
		if null > 0 && 1-dev/null >= 0.999 {
			return nanAll("the parents predict this node (almost) perfectly (separation); effects not estimable")
		}
	}
	// Information at the solution for the standard errors.
	deviance(beta)
	info.Zero()
	extreme := 0
	for t := range n {
		xt := row(t)
		if math.Abs(eta[t]) > 15 {
			extreme++
		}
		h, _ := fam.Working(y[rowAt(rows, t)], eta[t])
		if _, ok := fam.(lasso.Binomial); ok {
			// The exact variance, without the bound the solver's
			// weights keep for stability.
			mu := fam.Mean(eta[t])
			h = mu * (1 - mu)
		}
		for a := 0; a <= k; a++ {
			for c := a; c <= k; c++ {
				info.SetSym(a, c, info.At(a, c)+h*xt[a]*xt[c])
			}
		}
	}
	est := slices.Clone(beta[1:])
	for a := range est {
		est[a] /= scale[a]
	}
	se := make([]float64, k)
	var inv mat.SymDense
	if !ch.Factorize(info) {
		for a := range se {
			se[a] = math.NaN()
		}
		return beta[0], est, se, "information matrix is singular; standard errors not estimated"
	}
	if err := ch.InverseTo(&inv); err != nil && !isCondition(err) {
		for a := range se {
			se[a] = math.NaN()
		}
		return beta[0], est, se, "information matrix is singular; standard errors not estimated"
	}
	for a := range se {
		se[a] = math.Sqrt(inv.At(a+1, a+1)) / scale[a]
	}
	msg := ""
	switch {
	case !converged:
		msg = "unpenalised refit did not converge in 100 iterations"
	case extreme > 0:
		msg = fmt.Sprintf("%d rows fitted with linear predictor beyond ±15 (near-perfect separation); standard errors unreliable", extreme)
	}
	return beta[0], est, se, msg
}
