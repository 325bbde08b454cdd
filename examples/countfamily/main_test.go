package main

import (
	"context"
	"math"
	"slices"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/lasso/familytest"
)

func TestPoissonConforms(t *testing.T) {
	if err := familytest.Check(Poisson{}, []float64{0, 1, 2, 7}, nil); err != nil {
		t.Fatal(err)
	}
}

// TestPoissonPath checks the optimality (KKT) conditions of the Poisson
// path computed directly from the data, and that the least-penalised fit
// recovers the simulated coefficients (common practice).
func TestPoissonPath(t *testing.T) {
	x, y, truth := simulateVisits(2000, 8, 11)
	s := &lasso.Settings{Family: Poisson{}, NumPenalties: 20, Tolerance: 1e-20}
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: x, Response: y}, s)
	if err != nil {
		t.Fatal(err)
	}
	if path.Status != lasso.Completed {
		t.Fatalf("status %v", path.Status)
	}
	n := float64(len(y))
	for k := range path.Len() {
		b0, b := path.Dense(k)
		lam := path.Penalties[k]
		g := make([]float64, len(b))
		var gi float64
		sd := make([]float64, len(b))
		for j := range b {
			var m, ss float64
			for _, v := range x[j] {
				m += v / n
			}
			for _, v := range x[j] {
				ss += (v - m) * (v - m) / n
			}
			sd[j] = math.Sqrt(ss)
		}
		for i := range y {
			eta := b0
			for j := range b {
				eta += b[j] * x[j][i]
			}
			r := (y[i] - math.Exp(eta)) / n
			gi += r
			for j := range b {
				g[j] += x[j][i] * r
			}
		}
		if math.Abs(gi) > 1e-6*lam {
			t.Errorf("penalty %d: intercept gradient %g", k, gi)
		}
		for j := range b {
			var viol float64
			if b[j] != 0 {
				viol = math.Abs(g[j] - lam*sd[j]*math.Copysign(1, b[j]))
			} else {
				viol = math.Max(0, math.Abs(g[j])-lam*sd[j])
			}
			if viol > 1e-6*lam {
				t.Errorf("penalty %d predictor %d: KKT violation %g", k, j, viol)
			}
		}
	}
	_, b := path.Dense(path.Len() - 1)
	for j := range b {
		if math.Abs(b[j]-truth[j]) > 0.06 { // about 4 standard errors at n = 2000
			t.Errorf("coefficient %d = %.3f, simulated %.3f", j, b[j], truth[j])
		}
	}
}

func TestRun(t *testing.T) {
	if _, err := run(context.Background()); err != nil {
		t.Fatal(err)
	}
}

// TestDiscoverWithFamily checks that Discover uses the Poisson family for
// the count node and finds its three simulated parents.
func TestDiscoverWithFamily(t *testing.T) {
	res, err := discover(context.Background())
	if err != nil {
		t.Fatal(err)
	}
	n, err := res.Node("visits")
	if err != nil {
		t.Fatal(err)
	}
	if n.Family != "poisson" || n.Score.Measure != "deviance explained" || !(n.Score.Value > 0.3) {
		t.Errorf("node %s family %s score %+v", n.Name, n.Family, n.Score)
	}
	for _, p := range []string{"x1", "x2", "x3"} {
		if !slices.Contains(n.Parents, p) {
			t.Errorf("parents %v miss %s", n.Parents, p)
		}
	}
	for _, e := range n.Effects {
		if e.Parent == "x1" && math.Abs(float64(e.Estimate)-0.5) > 4*float64(e.SE) {
			t.Errorf("x1 effect %g ± %g, simulated 0.5", e.Estimate, e.SE)
		}
	}
}
