package main

import (
	"context"
	"fmt"
	"log"
	"math"

	"github.com/antecedent-lab/antecedent/cv"
	"github.com/antecedent-lab/antecedent/lasso"
	"github.com/antecedent-lab/antecedent/simulate"
)

// windows fits whole cross-validated binomial paths (every node of
// all-binary networks on all earlier variables, 10 stratified folds, 100
// penalties) and reports, for several windows, on how many nodes the rise
// rule of cv (stop once the mean held-out loss rose at each of the last w
// penalties, and past the minimum by 0.3 of its standard error) would
// have moved the minimum, and the penalties it keeps.
func windows(n, p, networks int) {
	ws := []int{3, 5, 10, 15}
	moved := make([]int, len(ws))
	kept := make([]int, len(ws))
	nodes, total := 0, 0
	for seed := uint64(1); seed <= uint64(networks); seed++ {
		m, o, err := simulate.Random(simulate.RandomSettings{Variables: p, Tiers: 5, BinaryShare: 1}, seed)
		if err != nil {
			log.Fatal(err)
		}
		s, err := m.Sample(n, seed)
		if err != nil {
			log.Fatal(err)
		}
		idx := map[string]int{}
		for i, name := range s.Names {
			idx[name] = i
		}
		var earlier []int
		for ti, tier := range o.Tiers {
			for _, name := range tier {
				v := idx[name]
				if ti == 0 {
					continue
				}
				folds, err := cv.Stratified(s.Columns[v], 10, seed*1000+uint64(v))
				if err != nil {
					log.Fatal(err)
				}
				res, err := cv.Fit(context.Background(), lasso.Data{Columns: s.Columns, Response: s.Columns[v], Predictors: earlier}, folds,
					&cv.Settings{Path: lasso.Settings{Family: lasso.Binomial{}}, WholePath: true})
				if err != nil {
					log.Fatal(err)
				}
				mean := make([]float64, len(res.Curve))
				se := make([]float64, len(res.Curve))
				for k, c := range res.Curve {
					mean[k], se[k] = c.Mean, c.SE
				}
				nodes++
				total += len(mean)
				for i, w := range ws {
					k := stopWith(mean, se, w)
					kept[i] += k
					if argmin(mean[:k]) != res.Best {
						moved[i]++
					}
				}
			}
			for _, name := range tier {
				earlier = append(earlier, idx[name])
			}
		}
	}
	fmt.Printf("n %d, p %d, %d networks: %d nodes, %d penalties on whole paths\n", n, p, networks, nodes, total)
	for i, w := range ws {
		fmt.Printf("window %2d: minimum moved on %d nodes; penalties kept %d (%.0f%%)\n", w, moved[i], kept[i], 100*float64(kept[i])/float64(total))
	}
}

// stopWith returns the penalties kept by the rise rule with window w and
// cv's least rise (0.3 of the minimum's standard error).
func stopWith(mean, se []float64, w int) int {
	for k := w + 1; k <= len(mean); k++ {
		best := argmin(mean[:k])
		rose := mean[k-1]-mean[best] >= 0.3*se[best]
		for t := k - w; t < k; t++ {
			if !(mean[t] > mean[t-1]) {
				rose = false
				break
			}
		}
		if rose {
			return k
		}
	}
	return len(mean)
}

func argmin(x []float64) int {
	best := 0
	for k, v := range x {
		if v < x[best] || math.IsNaN(x[best]) {
			best = k
		}
	}
	return best
}
