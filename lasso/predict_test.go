package lasso

import (
	"math/rand/v2"
	"testing"
)

// TestShiftBounded checks that whenever the deviance bounds of the
// extrapolated start decide, they decide as the formed deviance does: the
// bounds are convexity and the binomial curvature μ(1−μ) ≤ ¼ (common
// practice), checked here against the objective itself.
func TestShiftBounded(t *testing.T) {
	const n = 2_000
	rng := rand.New(rand.NewPCG(3, 4))
	x := make([]float64, n)
	y := make([]float64, n)
	for i := range x {
		if rng.Float64() < 0.4 {
			x[i] = 1
		}
		if rng.Float64() < 0.3+0.2*x[i] {
			y[i] = 1
		}
	}
	r, err := resolve(&Settings{Family: Binomial{}}, n, 1)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name  string
		step  float64 // along the negative gradient, per unit weight
		shift float64
		// newton adds that many Newton steps of the intercept alone
		// (Σq/Σh) to the shift: 3 overshoots, so that the objective rises
		// although the step starts downhill.
		newton float64
	}{
		{"small descent", 0.05, 0, 0},
		{"tiny descent", 1e-9, 0, 0},
		{"small ascent", -0.05, 0, 0},
		{"large descent", 20, 0, 0},
		{"shift up", 0, 0.3, 0},
		{"shift down", 0, -0.3, 0},
		{"descent and shift", 0.5, 0.01, 0},
		{"intercept step", 0, 0, 1},
		{"intercept overshoot", 0, 0, 3},
	}
	decided := 0
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			e, err := newResidualEngine(Data{Columns: [][]float64{x}, Response: y}, []int{0}, nil, []float64{1}, r)
			if err != nil {
				t.Fatal(err)
			}
			for i := range e.eta {
				e.eta[i] = 0.5 * rng.NormFloat64()
			}
			e.fresh, e.devOK = false, false
			e.working()
			before := e.objective(0, nil)
			copy(e.etaOld, e.eta)
			copy(e.old, e.beta)
			for i := range e.eta {
				e.eta[i] += tc.step * e.qw[i] / e.omega[i]
			}
			shift := tc.shift + tc.newton*e.sumQ/e.sumH
			keep, ok := e.shiftBounded(0, nil, shift, before)
			e.fresh, e.devOK = false, false
			e.working()
			want := e.objective(0, nil) <= before
			if ok {
				decided++
				if keep != want {
					t.Errorf("bounds keep %v, the deviance says %v", keep, want)
				}
			}
		})
	}
	if decided == 0 {
		t.Error("the bounds decided no case")
	}
}
