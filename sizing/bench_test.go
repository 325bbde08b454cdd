package sizing_test

import (
	"context"
	"testing"

	"github.com/antecedent-lab/antecedent/sizing"
)

func BenchmarkRunSingleParent(b *testing.B) { benchRun(b, []int{100, 400}, 10) }

// benchRun times a plan over the single-parent network on one worker.
func benchRun(b *testing.B, sizes []int, reps int) {
	g, err := sizing.FromModel(singleParent(0.2))
	if err != nil {
		b.Fatal(err)
	}
	s := &sizing.Settings{Sizes: sizes, Replicates: reps, Seed: 1, Workers: 1}
	for b.Loop() {
		if _, err := sizing.Run(context.Background(), g, singleOrder, nil, s); err != nil {
			b.Fatal(err)
		}
	}
}
