package lasso_test

import (
	"context"
	"math"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

// A path fitted step by step is Fit's path; stopping it keeps the fits so
// far and says so.
func TestStepperMatchesFit(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	const n, p = 500, 8
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range y {
		if rng.Float64() < 1/(1+math.Exp(-(x[0][i]-x[1][i]))) {
			y[i] = 1
		}
	}
	ctx := context.Background()
	d := lasso.Data{Columns: x, Response: y}
	s := &lasso.Settings{Family: lasso.Binomial{}, NumPenalties: 30}
	want, err := lasso.Fit(ctx, d, s)
	if err != nil {
		t.Fatal(err)
	}
	st, err := lasso.Start(ctx, d, s)
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Penalties()) != 30 {
		t.Fatalf("%d penalties, want 30", len(st.Penalties()))
	}
	for {
		more, err := st.Next(ctx)
		if err != nil {
			t.Fatal(err)
		}
		if !more {
			break
		}
	}
	if !reflect.DeepEqual(st.Path(), want) {
		t.Error("stepped path differs from Fit's")
	}
	st, err = lasso.Start(ctx, d, s)
	if err != nil {
		t.Fatal(err)
	}
	for range 5 {
		if _, err := st.Next(ctx); err != nil {
			t.Fatal(err)
		}
	}
	st.Stop()
	if more, _ := st.Next(ctx); more {
		t.Error("Next fitted after Stop")
	}
	got := st.Path()
	if got.Len() != 5 || got.Status != lasso.Stopped || got.Intercept[4] != want.Intercept[4] {
		t.Errorf("stopped path: %d penalties, status %v, intercept %g (want 5, stopped, %g)", got.Len(), got.Status, got.Intercept[4], want.Intercept[4])
	}
}
