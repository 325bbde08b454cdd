package intervention_test

import (
	"context"
	"testing"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/intervention"
)

// TestCoverage measures how often the 95% bootstrap intervals hold the
// true interventional means of mixedModel: the truth is the mean of the
// outcome in 2,000,000 rows drawn from the true model with X set to 1 or
// to 0; each run draws a study of 1,000 rows, fits the network on it and
// answers the question with 100 resamples. A 95% interval should hold the
// truth in about 95% of runs (the definition of a confidence interval);
// percentile bootstrap intervals are known to run slightly short in
// moderate samples (Efron & Tibshirani 1993, An Introduction to the
// Bootstrap, ch. 13–14, from memory). The test runs twice: with the true
// parent sets (the bootstrap's own coverage) and with the parent sets
// discovered on each study (which adds discovery's errors, not covered by
// the intervals).
func TestCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("long: 300 studies with 100 resamples each")
	}
	const rows, resamples = 1000, 100
	m := mixedModel()
	outcomes := list("Y", "Z")
	truth := map[string]float64{}
	for _, o := range outcomes {
		a := trueMean(t, intervened(t, m, "X", intervention.SetTo(1)), o, 2_000_000, 101)
		b := trueMean(t, intervened(t, m, "X", intervention.SetTo(0)), o, 2_000_000, 102)
		truth[o+" set to 1"], truth[o+" set to 0"], truth[o+" difference"] = a, b, a-b
	}
	q := intervention.Question{Cause: "X", Outcomes: outcomes, A: intervention.SetTo(1), B: intervention.SetTo(0)}
	for _, discover := range []bool{false, true} {
		name, runs := "true parent sets", 200
		if discover {
			name, runs = "discovered parent sets", 100
		}
		t.Run(name, func(t *testing.T) {
			held := map[string]int{}
			for r := range runs {
				d := sample(t, m, rows, uint64(1000+r))
				res := trueResult(t, m, mixedOrder)
				if discover {
					var err error
					if res, err = antecedent.DiscoverContext(context.Background(), d, mixedOrder, &antecedent.Config{Seed: uint64(r)}); err != nil {
						t.Fatal(err)
					}
				}
				im, err := intervention.New(context.Background(), res, d)
				if err != nil {
					t.Fatal(err)
				}
				ans, err := im.Effect(context.Background(), q, &intervention.Settings{Resamples: resamples, Seed: uint64(r)})
				if err != nil {
					t.Fatal(err)
				}
				for _, o := range ans.Outcomes {
					for label, e := range map[string]intervention.Estimate{"set to 1": o.MeanA, "set to 0": o.MeanB, "difference": o.Difference} {
						key := o.Name + " " + label
						if float64(e.Lower) <= truth[key] && truth[key] <= float64(e.Upper) {
							held[key]++
						}
					}
				}
			}
			total := 0
			for _, o := range outcomes {
				for _, label := range []string{"set to 1", "set to 0", "difference"} {
					key := o + " " + label
					total += held[key]
					t.Logf("%-16s truth %8.4f  coverage %.3f", key, truth[key], float64(held[key])/float64(runs))
				}
			}
			all := float64(total) / float64(6*runs)
			// One coverage over 200 runs has a binomial SE of 1.5
			// points at 95%; the six intervals of a run are correlated.
			t.Logf("overall coverage %.3f over %d intervals", all, 6*runs)
			if !discover && (all < 0.90 || all > 0.99) {
				t.Errorf("overall coverage %.3f, want about 0.95", all)
			}
			if !discover {
				for key, n := range held {
					if c := float64(n) / float64(runs); c < 0.86 {
						t.Errorf("%s: coverage %.3f", key, c)
					}
				}
			}
		})
	}
}
