// Package familytest checks that an implementation of lasso.Family keeps
// the interface's contract, so the solver can trust it. Call Check from the
// tests of a custom family:
//
//	func TestPoisson(t *testing.T) {
//		if err := familytest.Check(Poisson{}, []float64{0, 1, 4}, nil); err != nil {
//			t.Fatal(err)
//		}
//	}
//
// The checks compare Working against finite differences of Deviance: the
// working weight times the working residual must be minus the derivative of
// ½·Deviance with respect to the linear predictor, and at a response equal
// to the mean the weight must be its second derivative (where observed and
// expected information agree, for any link).
package familytest

import (
	"errors"
	"fmt"
	"math"

	"github.com/antecedent-lab/antecedent/lasso"
)

// defaultEtas are the linear predictors Check uses when given none.
var defaultEtas = []float64{-3, -1, -0.25, 0, 0.5, 1.5, 3}

// Check tests fam at every valid response in ys and every linear
// predictor in etas (nil means a spread from −3 to 3). It returns nil when
// every check passes and otherwise an error listing each failure.
func Check(fam lasso.Family, ys, etas []float64) error {
	if etas == nil {
		etas = defaultEtas
	}
	var errs []error
	fail := func(format string, args ...any) {
		errs = append(errs, fmt.Errorf("%s: "+format, append([]any{fam.Name()}, args...)...))
	}
	if fam.Name() == "" {
		fail("empty name")
	}
	if len(ys) == 0 {
		fail("no response values to check")
	}
	half := func(y, eta float64) float64 { return fam.Deviance(y, fam.Mean(eta)) / 2 }
	for _, eta := range etas {
		mu := fam.Mean(eta)
		if math.IsNaN(mu) || math.IsInf(mu, 0) {
			fail("Mean(%g) = %g", eta, mu)
			continue
		}
		if back := fam.Link(mu); !near(back, eta, 1e-8) {
			fail("Link(Mean(%g)) = %g", eta, back)
		}
		// At y = mu the weight is the second derivative of ½·Deviance.
		w, r := fam.Working(mu, eta)
		if !(w > 0) || math.IsInf(w, 0) {
			fail("Working(%g, %g) weight %g, want positive and finite", mu, eta, w)
			continue
		}
		if !near(w*r, 0, 1e-10) {
			fail("Working(%g, %g) residual %g, want 0 at the mean", mu, eta, r)
		}
		h := 1e-4
		d2 := (half(mu, eta+h) - 2*half(mu, eta) + half(mu, eta-h)) / (h * h)
		if !near(d2, w, 1e-4) {
			fail("at eta %g, y = mean: weight %g, second derivative of ½·Deviance %g", eta, w, d2)
		}
	}
	for _, y := range ys {
		if err := fam.CheckResponse(y); err != nil {
			fail("CheckResponse(%g) refused a value given as valid: %v", y, err)
			continue
		}
		if d := fam.Deviance(y, y); !(math.Abs(d) <= 1e-10) && !(y == 0 || y == 1) {
			// Binary families cannot take mu = 0 or 1 in general.
			fail("Deviance(%g, %g) = %g, want 0", y, y, d)
		}
		for _, eta := range etas {
			dev := half(y, eta)
			if !(dev >= -1e-12) || math.IsInf(dev, 0) {
				fail("Deviance(%g, Mean(%g)) = %g, want finite and ≥ 0", y, eta, 2*dev)
				continue
			}
			w, r := fam.Working(y, eta)
			if !(w > 0) || math.IsNaN(r) || math.IsInf(r, 0) || math.IsInf(w, 0) {
				fail("Working(%g, %g) = (%g, %g)", y, eta, w, r)
				continue
			}
			h := 1e-6
			d1 := (half(y, eta+h) - half(y, eta-h)) / (2 * h)
			if !near(-w*r, d1, 1e-5) {
				fail("at y %g, eta %g: −weight·residual %g, derivative of ½·Deviance %g", y, eta, -w*r, d1)
			}
		}
	}
	return errors.Join(errs...)
}

func near(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}
