package lasso_test

import (
	"context"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/antecedent-lab/antecedent/lasso"
)

func TestBadInput(t *testing.T) {
	good := func() lasso.Data {
		return lasso.Data{
			Columns:  [][]float64{{1, 2, 3, 4, 5}, {2, 1, 0, 1, 3}},
			Response: []float64{1, 0, 1, 1, 0},
		}
	}
	cases := []struct {
		name     string
		edit     func(*lasso.Data, *lasso.Settings)
		want     error
		contains string
	}{
		{"short column", func(d *lasso.Data, _ *lasso.Settings) { d.Columns[1] = d.Columns[1][:4] }, lasso.ErrLength, "column 1"},
		{"NaN predictor", func(d *lasso.Data, _ *lasso.Settings) { d.Columns[0][3] = math.NaN() }, lasso.ErrNotFinite, "row 3"},
		{"Inf response", func(d *lasso.Data, _ *lasso.Settings) { d.Response[2] = math.Inf(1) }, lasso.ErrNotFinite, "response"},
		{"no rows", func(d *lasso.Data, _ *lasso.Settings) { d.Rows = []int{} }, lasso.ErrNoRows, ""},
		{"empty data", func(d *lasso.Data, _ *lasso.Settings) {
			d.Columns = [][]float64{{}}
			d.Response = []float64{}
		}, lasso.ErrNoRows, ""},
		{"row out of range", func(d *lasso.Data, _ *lasso.Settings) { d.Rows = []int{0, 7} }, lasso.ErrIndex, "row 7"},
		{"no predictors", func(d *lasso.Data, _ *lasso.Settings) { d.Predictors = []int{} }, lasso.ErrNoPredictors, ""},
		{"predictor out of range", func(d *lasso.Data, _ *lasso.Settings) { d.Predictors = []int{2} }, lasso.ErrIndex, "column 2"},
		{"constant response", func(d *lasso.Data, _ *lasso.Settings) { d.Response = []float64{3, 3, 3, 3, 3} }, lasso.ErrConstantResponse, "3"},
		{"binomial not 0/1", func(d *lasso.Data, s *lasso.Settings) {
			s.Family = lasso.Binomial{}
			d.Response[1] = 2
		}, lasso.ErrResponse, "row 1"},
		{"binomial one class", func(d *lasso.Data, s *lasso.Settings) {
			s.Family = lasso.Binomial{}
			d.Response = []float64{1, 1, 1, 1, 1}
		}, lasso.ErrConstantResponse, ""},
		{"negative weight", func(d *lasso.Data, _ *lasso.Settings) { d.Weights = []float64{1, 1, -1, 1, 1} }, lasso.ErrWeight, "row 2"},
		{"zero weights", func(d *lasso.Data, _ *lasso.Settings) { d.Weights = []float64{0, 0, 0, 0, 0} }, lasso.ErrWeight, ""},
		{"short weights", func(d *lasso.Data, _ *lasso.Settings) { d.Weights = []float64{1, 1} }, lasso.ErrLength, ""},
		{"penalties increasing", func(_ *lasso.Data, s *lasso.Settings) { s.Penalties = []float64{0.1, 0.2} }, lasso.ErrPenalty, "decrease"},
		{"penalty zero", func(_ *lasso.Data, s *lasso.Settings) { s.Penalties = []float64{0.1, 0} }, lasso.ErrPenalty, "penalty 1"},
		{"penalty NaN", func(_ *lasso.Data, s *lasso.Settings) { s.Penalties = []float64{math.NaN()} }, lasso.ErrPenalty, ""},
		{"empty penalties", func(_ *lasso.Data, s *lasso.Settings) { s.Penalties = []float64{} }, lasso.ErrPenalty, ""},
		{"negative penalty factor", func(_ *lasso.Data, s *lasso.Settings) { s.PenaltyScale = []float64{1, -1} }, lasso.ErrPenalty, "factor 1"},
		{"short penalty scale", func(_ *lasso.Data, s *lasso.Settings) { s.PenaltyScale = []float64{1} }, lasso.ErrPenalty, ""},
		{"mixing above one", func(_ *lasso.Data, s *lasso.Settings) { s.Mixing = 1.5 }, lasso.ErrSettings, "Mixing"},
		{"floor ratio", func(_ *lasso.Data, s *lasso.Settings) { s.FloorRatio = 2 }, lasso.ErrSettings, "FloorRatio"},
		{"negative tolerance", func(_ *lasso.Data, s *lasso.Settings) { s.Tolerance = -1 }, lasso.ErrSettings, ""},
		{"unknown mode", func(_ *lasso.Data, s *lasso.Settings) { s.Mode = 9 }, lasso.ErrSettings, ""},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := good()
			var s lasso.Settings
			c.edit(&d, &s)
			before := [][]float64{slices.Clone(d.Response)}
			for _, col := range d.Columns {
				before = append(before, slices.Clone(col))
			}
			_, err := lasso.Fit(context.Background(), d, &s)
			if !errors.Is(err, c.want) {
				t.Fatalf("error %v, want %v", err, c.want)
			}
			if !strings.HasPrefix(err.Error(), "lasso: ") || !strings.Contains(err.Error(), c.contains) {
				t.Errorf("message %q should start with the package name and mention %q", err, c.contains)
			}
			after := append([][]float64{d.Response}, d.Columns...)
			for j := range before {
				if !slices.EqualFunc(before[j], after[j], func(a, b float64) bool { return a == b || (a != a && b != b) }) {
					t.Errorf("input slice %d was modified", j)
				}
			}
		})
	}
}

func TestCancelled(t *testing.T) {
	pr := randomProblem(3, 100, 5, false, false)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := lasso.Fit(ctx, lasso.Data{Columns: pr.x, Response: pr.y}, nil)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want context.Canceled", err)
	}
}

// TestSeparation checks that a perfectly separated binomial response ends
// the path with status Saturated instead of diverging.
func TestSeparation(t *testing.T) {
	x := [][]float64{{-3, -2, -1, -0.5, 0.5, 1, 2, 3}, {1, 0, 1, 0, 1, 0, 1, 0}}
	y := []float64{0, 0, 0, 0, 1, 1, 1, 1}
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: x, Response: y},
		&lasso.Settings{Family: lasso.Binomial{}, FloorRatio: 1e-8})
	if err != nil {
		t.Fatal(err)
	}
	if path.Status != lasso.Saturated {
		t.Fatalf("status %v, want saturated", path.Status)
	}
	last := path.Len() - 1
	if path.Explained[last] < 0.999 || path.Len() >= 100 {
		t.Errorf("ended at penalty %d with %.4f explained", last, path.Explained[last])
	}
	for k := range path.Len() {
		_, b := path.Dense(k)
		if math.IsNaN(b[0]) || math.Abs(b[0]) > 1e3 {
			t.Fatalf("penalty %d: coefficient %g", k, b[0])
		}
	}
}

func TestConstantPredictorExcluded(t *testing.T) {
	pr := randomProblem(4, 80, 3, false, false)
	pr.x = append(pr.x, make([]float64, 80))
	for i := range pr.x[3] {
		pr.x[3][i] = 2.5
	}
	for _, mode := range []lasso.Mode{lasso.GramMode, lasso.ResidualMode} {
		path, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y}, &lasso.Settings{Mode: mode})
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(path.Excluded, []int{3}) {
			t.Errorf("%v: excluded %v, want [3]", mode, path.Excluded)
		}
		_, b := path.Dense(path.Len() - 1)
		if b[3] != 0 || math.IsNaN(b[0]) {
			t.Errorf("%v: coefficients %v", mode, b)
		}
	}
}

func TestAt(t *testing.T) {
	pr := randomProblem(5, 100, 4, false, false)
	path, err := lasso.Fit(context.Background(), lasso.Data{Columns: pr.x, Response: pr.y}, &lasso.Settings{NumPenalties: 10})
	if err != nil {
		t.Fatal(err)
	}
	b0, b, err := path.At(path.Penalties[4])
	if err != nil {
		t.Fatal(err)
	}
	c0, c := path.Dense(4)
	if b0 != c0 || !slices.Equal(b, c) {
		t.Errorf("At a fitted penalty differs from Dense")
	}
	mid := math.Sqrt(path.Penalties[4] * path.Penalties[5])
	_, m, err := path.At(mid)
	if err != nil {
		t.Fatal(err)
	}
	_, d := path.Dense(5)
	for j := range m {
		if want := (c[j] + d[j]) / 2; math.Abs(m[j]-want) > 1e-12 {
			t.Errorf("interpolated %g, want %g", m[j], want)
		}
	}
	if _, _, err := path.At(path.Penalties[9] / 2); !errors.Is(err, lasso.ErrPenalty) {
		t.Errorf("below the path: %v", err)
	}
	if _, _, err := path.At(path.Penalties[0] * 10); err != nil {
		t.Errorf("above an automatic path: %v", err)
	}
}
