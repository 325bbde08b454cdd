package familytest_test

import (
	"math"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/lasso/familytest"
)

func TestBuiltIn(t *testing.T) {
	if err := familytest.Check(lasso.Gaussian{}, []float64{-2, 0, 3.5}, nil); err != nil {
		t.Error(err)
	}
	// Binomial bounds mu inside its working weight; etas stay where the
	// bound is not reached.
	if err := familytest.Check(lasso.Binomial{}, []float64{0, 1}, nil); err != nil {
		t.Error(err)
	}
}

// wrongWeight has a working weight twice the right one.
type wrongWeight struct{ lasso.Binomial }

func (w wrongWeight) Working(y, eta float64) (float64, float64) {
	h, r := w.Binomial.Working(y, eta)
	return 2 * h, r / 2
}

// wrongSign flips the residual.
type wrongSign struct{ lasso.Gaussian }

func (wrongSign) Working(y, eta float64) (float64, float64) { return 1, eta - y }

// badLink returns a link that does not invert the mean.
type badLink struct{ lasso.Gaussian }

func (badLink) Link(mu float64) float64 { return math.Exp(mu) }

func TestCatchesMistakes(t *testing.T) {
	for name, fam := range map[string]lasso.Family{
		"weight": wrongWeight{}, "sign": wrongSign{}, "link": badLink{},
	} {
		if err := familytest.Check(fam, []float64{0, 1}, nil); err == nil {
			t.Errorf("%s: a broken family passed", name)
		}
	}
}
