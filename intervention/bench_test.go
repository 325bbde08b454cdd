package intervention_test

import (
	"context"
	"testing"

	"github.com/antecedent-lab/antecedent/intervention"
)

func BenchmarkEffectLinearN2k(b *testing.B) { benchEffect(b, false, 2000) }
func BenchmarkEffectMixedN2k(b *testing.B)  { benchEffect(b, true, 2000) }

// benchEffect times one question with 20 resamples on one worker.
func benchEffect(b *testing.B, mixed bool, n int) {
	m, o, q := pathModel(), pathOrder, intervention.Question{Cause: "X", A: intervention.SetTo(1), B: intervention.SetTo(0)}
	if mixed {
		m, o = mixedModel(), mixedOrder
	}
	im := model(b, m, o, sample(b, m, n, 1))
	s := &intervention.Settings{Resamples: 20, Seed: 1, Workers: 1}
	for b.Loop() {
		if _, err := im.Effect(context.Background(), q, s); err != nil {
			b.Fatal(err)
		}
	}
}
