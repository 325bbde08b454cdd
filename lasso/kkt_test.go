package lasso_test

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// problem is a seeded random regression problem.
type problem struct {
	x       [][]float64
	y       []float64
	weights []float64
}

func randomProblem(seed uint64, n, p int, binomial, weighted bool) problem {
	rng := rand.New(rand.NewPCG(seed, 2))
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		scale := math.Exp(rng.NormFloat64()) // predictors on different scales
		shift := 3 * rng.NormFloat64()
		for i := range x[j] {
			x[j][i] = shift + scale*rng.NormFloat64()
			if j > 0 && j%3 == 0 { // some correlation
				x[j][i] += 0.5 * x[j-1][i]
			}
		}
	}
	beta := make([]float64, p)
	for j := 0; j < p; j += 2 {
		beta[j] = rng.NormFloat64() / (1 + float64(j)/4)
	}
	y := make([]float64, n)
	for i := range y {
		var eta float64
		for j := range x {
			eta += beta[j] * (x[j][i] - 0) / 3
		}
		if binomial {
			if rng.Float64() < 1/(1+math.Exp(-eta)) {
				y[i] = 1
			}
		} else {
			y[i] = eta + rng.NormFloat64()
		}
	}
	var w []float64
	if weighted {
		w = make([]float64, n)
		for i := range w {
			w[i] = rng.Float64() * 2
		}
		w[0] = 0
	}
	return problem{x, y, w}
}

// kktViolation returns the largest violation, relative to the penalty, of
// the optimality conditions of the objective in package lasso's doc
// comment at penalty index k, computed directly from the data (common
// practice: the subgradient conditions of a convex problem).
func kktViolation(path *lasso.Path, pr problem, s *lasso.Settings, k int) float64 {
	n := len(pr.y)
	a := s.Mixing
	if a == 0 {
		a = 1
	}
	fam := s.Family
	if fam == nil {
		fam = lasso.Gaussian{}
	}
	w := func(i int) float64 {
		if pr.weights == nil {
			return 1
		}
		return pr.weights[i]
	}
	var total float64
	for i := 0; i < n; i++ {
		total += w(i)
	}
	b0, b := path.Dense(k)
	lam := path.Penalties[k]
	resid := make([]float64, n)
	var sumR float64
	for i := range resid {
		eta := b0
		for j := range b {
			eta += b[j] * pr.x[j][i]
		}
		resid[i] = w(i) * (pr.y[i] - fam.Mean(eta)) / total
		sumR += resid[i]
	}
	worst := 0.0
	if !s.NoIntercept {
		worst = math.Abs(sumR) / lam
	}
	for j := range b {
		var g, m, ss float64
		for i := range resid {
			g += pr.x[j][i] * resid[i]
		}
		if !s.NoIntercept {
			for i := 0; i < n; i++ {
				m += w(i) * pr.x[j][i] / total
			}
		}
		for i := 0; i < n; i++ {
			d := pr.x[j][i] - m
			ss += w(i) * d * d / total
		}
		sd := 1.0
		if !s.NoStandardize {
			sd = math.Sqrt(ss)
		}
		v := 1.0
		if s.PenaltyScale != nil {
			v = s.PenaltyScale[j]
		}
		var viol float64
		if b[j] != 0 {
			want := lam * v * (a*sd*math.Copysign(1, b[j]) + (1-a)*sd*sd*b[j])
			viol = math.Abs(g - want)
		} else {
			viol = math.Max(0, math.Abs(g)-lam*v*a*sd)
		}
		worst = math.Max(worst, viol/(lam*sd))
	}
	return worst
}

// scaledKKT returns the largest KKT residual at penalty index k as
// Settings.Tolerance measures it, computed directly from the data: on the
// standardised scale (predictors centred with an intercept, divided by
// their weighted standard deviation unless NoStandardize), each residual
// divided by the root of its curvature Σ w·h·x̃²/W, h the working weight at
// the fit (1 for the Gaussian family, μ(1−μ) for the binomial), and the
// intercept's |Σ w·(y−μ)|/W by the root of Σ w·h/W.
func scaledKKT(path *lasso.Path, pr problem, s *lasso.Settings, k int) float64 {
	n := len(pr.y)
	a := s.Mixing
	if a == 0 {
		a = 1
	}
	fam := s.Family
	if fam == nil {
		fam = lasso.Gaussian{}
	}
	_, binomial := fam.(lasso.Binomial)
	w := make([]float64, n)
	var total float64
	for i := range w {
		w[i] = 1
		if pr.weights != nil {
			w[i] = pr.weights[i]
		}
		total += w[i]
	}
	b0, b := path.Dense(k)
	lam := path.Penalties[k]
	resid := make([]float64, n) // w·(y − μ)/W
	curv := make([]float64, n)  // w·h/W
	var sumR, sumH float64
	for i := range resid {
		eta := b0
		for j := range b {
			eta += b[j] * pr.x[j][i]
		}
		mu := fam.Mean(eta)
		h := 1.0
		if binomial {
			h = mu * (1 - mu)
		}
		resid[i] = w[i] * (pr.y[i] - mu) / total
		curv[i] = w[i] * h / total
		sumR += resid[i]
		sumH += curv[i]
	}
	worst := 0.0
	if !s.NoIntercept {
		worst = math.Abs(sumR) / math.Sqrt(sumH)
	}
	for j := range b {
		var m, ss float64
		if !s.NoIntercept {
			for i := 0; i < n; i++ {
				m += w[i] * pr.x[j][i] / total
			}
		}
		for i := 0; i < n; i++ {
			d := pr.x[j][i] - m
			ss += w[i] * d * d / total
		}
		sd := 1.0
		if !s.NoStandardize {
			sd = math.Sqrt(ss)
		}
		var g, h float64
		for i := range resid {
			xt := (pr.x[j][i] - m) / sd
			g += xt * resid[i]
			h += xt * xt * curv[i]
		}
		v := 1.0
		if s.PenaltyScale != nil {
			v = s.PenaltyScale[j]
		}
		bj := b[j] * sd // standardised coefficient
		var rho float64
		if bj != 0 {
			rho = math.Abs(g - lam*v*((1-a)*bj+a*math.Copysign(1, bj)))
		} else {
			rho = math.Max(0, math.Abs(g)-lam*v*a)
		}
		worst = math.Max(worst, rho/math.Sqrt(h))
	}
	return worst
}

func TestKKT(t *testing.T) {
	unpen := func(p int) []float64 {
		v := make([]float64, p)
		for j := range v {
			v[j] = 1 + float64(j%3)/2
		}
		v[1] = 0
		return v
	}
	cases := []struct {
		name     string
		binomial bool
		weighted bool
		settings lasso.Settings
		n, p     int
		zeroOne  bool // make every other predictor 0/1 (the sparse path)
	}{
		{"gaussian 0/1 predictors", false, true, lasso.Settings{Mode: lasso.ResidualMode}, 200, 10, true},
		{"binomial 0/1 predictors", true, false, lasso.Settings{Family: lasso.Binomial{}}, 300, 10, true},
		{"binomial 0/1 weighted mixing", true, true, lasso.Settings{Family: lasso.Binomial{}, Mixing: 0.6}, 300, 8, true},
		{"binomial 0/1 no intercept", true, false, lasso.Settings{Family: lasso.Binomial{}, NoIntercept: true}, 250, 6, true},
		{"gaussian gram", false, false, lasso.Settings{Mode: lasso.GramMode}, 200, 12, false},
		{"gaussian residual", false, false, lasso.Settings{Mode: lasso.ResidualMode}, 200, 12, false},
		{"gaussian weighted", false, true, lasso.Settings{}, 150, 10, false},
		{"gaussian weighted residual", false, true, lasso.Settings{Mode: lasso.ResidualMode}, 150, 10, false},
		{"gaussian mixing", false, false, lasso.Settings{Mixing: 0.3}, 120, 15, false},
		{"gaussian unpenalised", false, true, lasso.Settings{PenaltyScale: unpen(10)}, 100, 10, false},
		{"gaussian no intercept", false, false, lasso.Settings{NoIntercept: true}, 100, 8, false},
		{"gaussian raw scale", false, false, lasso.Settings{NoStandardize: true, Mode: lasso.ResidualMode}, 100, 8, false},
		{"gaussian p > n", false, false, lasso.Settings{}, 30, 60, false},
		{"binomial", true, false, lasso.Settings{Family: lasso.Binomial{}}, 300, 10, false},
		{"binomial weighted", true, true, lasso.Settings{Family: lasso.Binomial{}}, 300, 10, false},
		{"binomial mixing unpenalised", true, true, lasso.Settings{Family: lasso.Binomial{}, Mixing: 0.5, PenaltyScale: unpen(8)}, 250, 8, false},
		{"binomial no intercept", true, false, lasso.Settings{Family: lasso.Binomial{}, NoIntercept: true}, 200, 6, false},
		{"binomial p > n", true, false, lasso.Settings{Family: lasso.Binomial{}}, 40, 60, false},
	}
	for seed, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			pr := randomProblem(uint64(seed+1), c.n, c.p, c.binomial, c.weighted)
			if c.zeroOne {
				for j := 0; j < len(pr.x); j += 2 {
					med := slices.Clone(pr.x[j])
					slices.Sort(med)
					for i, v := range pr.x[j] {
						if v > med[len(med)/3] {
							pr.x[j][i] = 1
						} else {
							pr.x[j][i] = 0
						}
					}
				}
			}
			s := c.settings
			s.NumPenalties = 30
			// At a tolerance of 1e-22 the fits are exact to rounding:
			// 1e-5 of the penalty is far above rounding, far below any
			// real violation.
			s.Tolerance = 1e-22
			path, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y, Weights: pr.weights}, &s)
			if err != nil {
				t.Fatal(err)
			}
			if path.Len() < 2 {
				t.Fatalf("path has %d penalties (%v)", path.Len(), path.Status)
			}
			for k := range path.Len() {
				if v := kktViolation(path, pr, &s, k); v > 1e-5 {
					t.Errorf("penalty %d (λ=%g, %d non-zero): KKT violation %g", k, path.Penalties[k], path.NonZero[k], v)
				}
			}
			// At the default tolerance the scaled residuals are at most
			// 1e-7 times the root of the null deviance per unit weight,
			// the contract of Settings.Tolerance; a factor 2 covers the
			// exit after a small first sweep, exact to second order.
			// The largest seen is 0.8 of the bound; the
			// coefficient-change rule used before broke it fivefold.
			s.Tolerance = 0
			def, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y, Weights: pr.weights}, &s)
			if err != nil {
				t.Fatal(err)
			}
			bound := 2 * 1e-7 * math.Sqrt(def.NullDeviance/def.Weight)
			for k := range def.Len() {
				if v := scaledKKT(def, pr, &s, k); v > bound {
					t.Errorf("default tolerance, penalty %d (λ=%g): scaled KKT residual %g, bound %g", k, def.Penalties[k], v, bound)
				}
			}
			if s.PenaltyScale != nil {
				for k := range path.Len() {
					_, b := path.Dense(k)
					if b[1] == 0 {
						t.Errorf("penalty %d: unpenalised predictor is zero", k)
					}
				}
			} else if path.NonZero[0] != 0 {
				t.Errorf("first penalty has %d non-zero coefficients, want 0", path.NonZero[0])
			}
		})
	}
}

// TestModesAgree checks that the Gram and residual back ends give the same
// path, with weights and a row subset.
func TestModesAgree(t *testing.T) {
	pr := randomProblem(7, 300, 9, false, true)
	for i, v := range pr.x[2] {
		pr.x[2][i] = float64(int(v*7) % 2 & 1) // a 0/1 predictor takes the sparse path
		if pr.x[2][i] < 0 {
			pr.x[2][i] = 0
		}
	}
	rows := make([]int, 0, 200)
	for i := 0; i < 300; i += 3 {
		rows = append(rows, i, i+1)
	}
	var paths [2]*lasso.Path
	for m, mode := range []lasso.Mode{lasso.GramMode, lasso.ResidualMode} {
		var err error
		paths[m], err = lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y, Weights: pr.weights, Rows: rows},
			&lasso.Settings{Mode: mode, Tolerance: 1e-16, NumPenalties: 20})
		if err != nil {
			t.Fatal(err)
		}
		if paths[m].Mode != mode {
			t.Fatalf("mode %v, want %v", paths[m].Mode, mode)
		}
	}
	samePath(t, "gram vs residual", paths[0], paths[1], 1e-8)
	for k := range paths[0].Len() {
		if d := math.Abs(paths[0].Explained[k] - paths[1].Explained[k]); d > 1e-10 {
			t.Errorf("penalty %d: deviance explained differs by %g", k, d)
		}
	}
}

// TestMomentsSubtract checks that a training set's moments formed as total
// minus the held-out rows give the same fit as the training rows directly.
func TestMomentsSubtract(t *testing.T) {
	pr := randomProblem(9, 500, 6, false, false)
	cols := append(append([][]float64{}, pr.x...), pr.y)
	var train, test []int
	for i := range pr.y {
		if i%5 == 2 {
			test = append(test, i)
		} else {
			train = append(train, i)
		}
	}
	shift := lasso.ColumnMeans(cols, nil, nil)
	total := lasso.NewMoments(shift)
	held := lasso.NewMoments(shift)
	if err := total.Accumulate(cols, nil, nil); err != nil {
		t.Fatal(err)
	}
	if err := held.Accumulate(cols, nil, test); err != nil {
		t.Fatal(err)
	}
	s := &lasso.Settings{NumPenalties: 15, Tolerance: 1e-16}
	// The difference read entry by entry, as cross-validation does.
	lazy, err := lasso.FitMomentsExcluding(context.Background(), total, held, 6, []int{0, 1, 2, 3, 4, 5}, s)
	if err != nil {
		t.Fatal(err)
	}
	if err := total.Subtract(held); err != nil {
		t.Fatal(err)
	}
	a, err := lasso.FitMoments(context.Background(), total, 6, []int{0, 1, 2, 3, 4, 5}, s)
	if err != nil {
		t.Fatal(err)
	}
	samePath(t, "excluding", a, lazy, 1e-12)
	b, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y, Rows: train}, s)
	if err != nil {
		t.Fatal(err)
	}
	samePath(t, "rows", a, b, 1e-9)
}

// samePath reports every intercept or coefficient where two paths differ
// by more than tol.
func samePath(t *testing.T, label string, a, b *lasso.Path, tol float64) {
	t.Helper()
	for k := range a.Len() {
		x0, x := a.Dense(k)
		y0, y := b.Dense(k)
		if math.Abs(x0-y0) > tol {
			t.Errorf("%s, penalty %d: intercept %g vs %g", label, k, x0, y0)
		}
		for j := range x {
			if math.Abs(x[j]-y[j]) > tol {
				t.Errorf("%s, penalty %d predictor %d: %g vs %g", label, k, j, x[j], y[j])
			}
		}
	}
}

// A 0/1 predictor that is mostly ones is fitted internally as 1 − x.
// Doubling it makes it an ordinary column with the same standardised
// problem, so the two paths agree once its coefficient is halved (common
// practice: standardisation makes the lasso scale-free).
func TestMostlyOnesPredictor(t *testing.T) {
	for _, binomial := range []bool{false, true} {
		for _, weighted := range []bool{false, true} {
			pr := randomProblem(41, 400, 5, binomial, weighted)
			rng := rand.New(rand.NewPCG(42, 43))
			ones, twos := make([]float64, 400), make([]float64, 400)
			for i := range ones {
				if rng.Float64() < 0.8 {
					ones[i], twos[i] = 1, 2
				}
			}
			if !binomial {
				for i := range pr.y {
					pr.y[i] += 0.7 * ones[i]
				}
			}
			fit := func(col []float64) *lasso.Path {
				cols := append(append([][]float64{}, pr.x...), col)
				s := &lasso.Settings{Mode: lasso.ResidualMode}
				if binomial {
					s.Family = lasso.Binomial{}
				}
				path, err := lasso.Fit(context.Background(), lasso.Data{Columns: cols, Response: pr.y, Weights: pr.weights}, s)
				if err != nil {
					t.Fatal(err)
				}
				return path
			}
			a, b := fit(ones), fit(twos)
			last := len(pr.x)
			for k := range b.Coefficients {
				for i, j := range b.Coefficients[k].Index {
					if j == last {
						b.Coefficients[k].Value[i] *= 2
					}
				}
			}
			samePath(t, fmt.Sprintf("binomial=%v weighted=%v", binomial, weighted), a, b, 1e-6)
		}
	}
}
