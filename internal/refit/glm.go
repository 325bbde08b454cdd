package refit

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"

	"github.com/antecedent-lab/antecedent/lasso"
)

// isCondition reports whether err is a gonum condition warning for a
// matrix that is still usable.
func isCondition(err error) bool {
	var cond mat.Condition
	return errors.As(err, &cond) && float64(cond) < 1e14
}

// newtonGLM fits an unpenalised GLM of y on the columns x (with an
// intercept) by Newton–Raphson / Fisher scoring on the full information
// matrix, with step halving on the deviance, starting from intercept b0
// and zero slopes. It returns the intercept, the coefficients, their
// standard errors (the inverse information, dispersion 1) and a warning,
// empty when all went well.
func newtonGLM(ctx context.Context, fam lasso.Family, x [][]float64, y []float64, rows []int, b0 float64) (float64, []float64, []float64, string) {
	k := len(x)
	n := len(y)
	if rows != nil {
		n = len(rows)
	}
	beta := make([]float64, k+1) // intercept first
	beta[0] = b0
	eta := make([]float64, n)
	buf := make([]float64, k+1)
	buf[0] = 1
	// Work on predictors divided by their standard deviations, so that
	// very different scales stay well conditioned.
	scale := make([]float64, k)
	for a, c := range x {
		var s1, s2 float64
		for t := range n {
			v := c[rowAt(rows, t)]
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
		for a, c := range x {
			buf[a+1] = c[i] / scale[a]
		}
		return buf
	}
	deviance := func(b []float64) float64 {
		var d float64
		for t := range n {
			e := 0.0
			for a, v := range row(t) {
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

func rowAt(rows []int, t int) int {
	if rows == nil {
		return t
	}
	return rows[t]
}
