package antecedent_test

import (
	"context"
	"errors"
	"runtime"
	"testing"
	"time"

	"github.com/antecedent-lab/antecedent"
	"github.com/antecedent-lab/antecedent/simulate"
)

// TestCancelMidRun cancels a discovery while it runs: it must return
// ctx.Err() and leave no goroutine behind. The 30-second bound only
// detects a hang; it is not a speed assertion.
func TestCancelMidRun(t *testing.T) {
	m, o, err := simulate.Random(simulate.RandomSettings{Variables: 30, Tiers: 5, BinaryShare: 0.5}, 4)
	if err != nil {
		t.Fatal(err)
	}
	d := sampled(t, m, 20_000, 5)
	before := runtime.NumGoroutine()
	for _, delay := range []time.Duration{5 * time.Millisecond, 60 * time.Millisecond, 300 * time.Millisecond} {
		ctx, cancel := context.WithCancel(context.Background())
		done := make(chan error, 1)
		go func() {
			_, err := antecedent.DiscoverContext(ctx, d, o, &antecedent.Config{Workers: 4, Stability: antecedent.Stability{Pairs: 20}})
			done <- err
		}()
		time.Sleep(delay)
		cancel()
		select {
		case err := <-done:
			if !errors.Is(err, context.Canceled) {
				t.Fatalf("after %v: error %v, want context.Canceled", delay, err)
			}
		case <-time.After(30 * time.Second):
			t.Fatalf("after %v: Discover did not return after cancellation", delay)
		}
	}
	deadline := time.Now().Add(5 * time.Second)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(20 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		buf := make([]byte, 1<<16)
		t.Errorf("%d goroutines before, %d after:\n%s", before, n, buf[:runtime.Stack(buf, true)])
	}
}

// TestDeadline checks that a deadline ends the run with
// context.DeadlineExceeded.
func TestDeadline(t *testing.T) {
	d, o, _ := smallProblem(t, 8)
	ctx, cancel := context.WithTimeout(context.Background(), time.Microsecond)
	defer cancel()
	time.Sleep(time.Millisecond)
	if _, err := antecedent.DiscoverContext(ctx, d, o, nil); !errors.Is(err, context.DeadlineExceeded) {
		t.Fatalf("error %v", err)
	}
}
