package antecedent_test

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/simulate"
	"github.com/antecedent-lab/antecedent/table"
)

// TestChanceLevel checks that a node whose model has no parents scores
// exactly chance (AUC ½, R² 0) with a note, not the slightly worse value
// that pooling an intercept-only model's out-of-fold predictions gives.
func TestChanceLevel(t *testing.T) {
	m := &simulate.Model{Nodes: []simulate.Node{
		{Name: "a"}, {Name: "b", Binary: true, Prevalence: 0.3},
		{Name: "flag", Binary: true, Prevalence: 0.2}, {Name: "level"},
	}}
	s, err := m.Sample(1500, 9)
	if err != nil {
		t.Fatal(err)
	}
	d, err := table.NewDataset(s.Names, s.Columns)
	if err != nil {
		t.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"a", "b"}, {"flag", "level"}}}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		want float64
	}{{"flag", 0.5}, {"level", 0}} {
		n, _ := res.Node(c.name)
		if len(n.Parents) != 0 {
			t.Fatalf("%s has parents %v; the test needs none", c.name, n.Parents)
		}
		if float64(n.Score.Value) != c.want || n.Score.Note == "" {
			t.Errorf("%s: score %v (%q), want %g with a note", c.name, n.Score.Value, n.Score.Note, c.want)
		}
	}
}

// TestRefitScore checks that a continuous node's score is that of its
// refitted model: ordinary least squares on the parents, refitted on each
// training fold and scored on the held-out fold, computed here directly
// from the rows with gonum's QR solver over the same folds (cv.Random with
// the run's seed, as Discover documents for shared moments).
func TestRefitScore(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 5))
	n := 1200
	x1, x2, y := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range n {
		x1[i], x2[i] = rng.NormFloat64(), rng.NormFloat64()
		y[i] = 0.8*x1[i] - 0.5*x2[i] + rng.NormFloat64()
	}
	d, err := table.NewDataset([]string{"x1", "x2", "y"}, [][]float64{x1, x2, y})
	if err != nil {
		t.Fatal(err)
	}
	o := &order.Order{Tiers: [][]string{{"x1", "x2"}, {"y"}}}
	res, err := antecedent.DiscoverContext(context.Background(), d, o, &antecedent.Config{Seed: 6})
	if err != nil {
		t.Fatal(err)
	}
	node, _ := res.Node("y")
	if len(node.Parents) != 2 {
		t.Fatalf("parents %v", node.Parents)
	}
	folds, err := cv.Random(n, 10, 6)
	if err != nil {
		t.Fatal(err)
	}
	var sse, ss, mean float64
	for _, v := range y {
		mean += v / float64(n)
	}
	for f := range folds.K {
		train, held := folds.Split(f, nil)
		a := mat.NewDense(len(train), 3, nil)
		b := mat.NewVecDense(len(train), nil)
		for r, i := range train {
			a.SetRow(r, []float64{1, x1[i], x2[i]})
			b.SetVec(r, y[i])
		}
		var qr mat.QR
		qr.Factorize(a)
		var beta mat.VecDense
		if err := qr.SolveVecTo(&beta, false, b); err != nil {
			t.Fatal(err)
		}
		for _, i := range held {
			e := y[i] - beta.AtVec(0) - beta.AtVec(1)*x1[i] - beta.AtVec(2)*x2[i]
			sse += e * e
		}
	}
	for _, v := range y {
		ss += (v - mean) * (v - mean)
	}
	// Folds of equal size: the mean of fold MSEs equals the pooled MSE.
	want := 1 - sse/ss
	if got := float64(node.Score.Value); math.Abs(got-want) > 1e-9 {
		t.Errorf("refit R² %.12f, direct computation %.12f", got, want)
	}
	if math.IsNaN(float64(node.PenalisedScore.Value)) || node.PenalisedScore.Value == node.Score.Value {
		t.Errorf("penalised score %v should be reported apart from the refit score %v", node.PenalisedScore.Value, node.Score.Value)
	}
}
