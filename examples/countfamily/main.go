// Command countfamily shows how to plug a loss of your own into the lasso
// solver: a Poisson family for counts with the log link, about twenty
// lines, with no change to the solver. It fits a penalised path to
// simulated yearly counts of clinic visits and prints the sparse model at a
// few penalties.
//
// The data are invented by the program for this demonstration.
package main

import (
	"context"
	"fmt"
	"log"
	"math"
	"math/rand/v2"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/order"
	"github.com/antecedent-lab/antecedent/table"
)

// Poisson is the loss for counts with the log link, mean exp(eta).
type Poisson struct{}

var _ lasso.Family = Poisson{}

// Name returns "poisson".
func (Poisson) Name() string { return "poisson" }

// CheckResponse accepts non-negative whole numbers.
func (Poisson) CheckResponse(y float64) error {
	if y < 0 || y != math.Floor(y) {
		return fmt.Errorf("poisson: response %g is not a count", y)
	}
	return nil
}

// Mean returns exp(eta).
func (Poisson) Mean(eta float64) float64 { return math.Exp(eta) }

// Link returns log(mu).
func (Poisson) Link(mu float64) float64 { return math.Log(mu) }

// Working returns the weight mu and the residual (y − mu)/mu.
func (Poisson) Working(y, eta float64) (float64, float64) {
	mu := math.Exp(eta)
	return mu, (y - mu) / mu
}

// Deviance returns 2·(y·log(y/mu) − (y − mu)).
func (Poisson) Deviance(y, mu float64) float64 {
	d := mu - y
	if y > 0 {
		d += y * math.Log(y/mu)
	}
	return 2 * d
}

// simulateVisits returns n rows of p predictors and counts whose log mean
// depends on the first three predictors only.
func simulateVisits(n, p int, seed uint64) ([][]float64, []float64, []float64) {
	rng := rand.New(rand.NewPCG(seed, 1))
	truth := make([]float64, p)
	truth[0], truth[1], truth[2] = 0.5, -0.3, 0.2
	x := make([][]float64, p)
	for j := range x {
		x[j] = make([]float64, n)
		for i := range x[j] {
			x[j][i] = rng.NormFloat64()
		}
	}
	y := make([]float64, n)
	for i := range y {
		eta := 0.7
		for j := range truth {
			eta += truth[j] * x[j][i]
		}
		y[i] = poissonDraw(rng, math.Exp(eta))
	}
	return x, y, truth
}

// poissonDraw draws a Poisson count by inversion (fine for small means).
func poissonDraw(rng *rand.Rand, mean float64) float64 {
	u := rng.Float64()
	k, p := 0.0, math.Exp(-mean)
	for cum := p; u > cum; cum += p {
		k++
		p *= mean / k
	}
	return k
}

func run(ctx context.Context) (*lasso.Path, error) {
	x, y, _ := simulateVisits(2000, 8, 11)
	return lasso.Fit(ctx, lasso.Data{Columns: x, Response: y}, &lasso.Settings{Family: Poisson{}, NumPenalties: 40})
}

// discover uses the same family through antecedent.Discover: the count
// variable is given the Poisson loss, and its parents are found among the
// earlier predictors.
func discover(ctx context.Context) (*antecedent.Result, error) {
	x, y, _ := simulateVisits(2000, 8, 12)
	names := []string{"x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8", "visits"}
	d, err := table.NewDataset(names, append(x, y))
	if err != nil {
		return nil, err
	}
	o := &order.Order{Tiers: [][]string{names[:8], {"visits"}}}
	cfg := &antecedent.Config{Seed: 3, Families: map[string]lasso.Family{"visits": Poisson{}}}
	return antecedent.DiscoverContext(ctx, d, o, cfg)
}

func main() {
	path, err := run(context.Background())
	if err != nil {
		log.Fatal(err)
	}
	fmt.Printf("Poisson path: %d penalties, status %v\n", path.Len(), path.Status)
	for _, k := range []int{5, 15, 39} {
		b0, b := path.Dense(k)
		fmt.Printf("λ=%.4f  explained %.3f  intercept %.3f  coefficients", path.Penalties[k], path.Explained[k], b0)
		for _, v := range b {
			fmt.Printf(" %6.3f", v)
		}
		fmt.Println()
	}
	res, err := discover(context.Background())
	if err != nil {
		log.Fatal(err)
	}
	n, _ := res.Node("visits")
	fmt.Printf("through Discover: visits (%s) has parents %v, %s %.3f\n", n.Family, n.Parents, n.Score.Measure, n.Score.Value)
}
