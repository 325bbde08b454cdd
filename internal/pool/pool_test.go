package pool

import (
	"context"
	"errors"
	"runtime"
	"sync/atomic"
	"testing"
	"time"
)

func TestRunAll(t *testing.T) {
	for _, w := range []int{0, 1, 3, 50} {
		out := make([]int, 100)
		if err := Run(context.Background(), w, len(out), func(_ context.Context, i int) error {
			out[i] = i * i
			return nil
		}); err != nil {
			t.Fatal(err)
		}
		for i, v := range out {
			if v != i*i {
				t.Fatalf("workers %d: out[%d] = %d", w, i, v)
			}
		}
	}
}

func TestRunError(t *testing.T) {
	bad := errors.New("bad")
	var ran atomic.Int64
	err := Run(context.Background(), 2, 1000, func(_ context.Context, i int) error {
		ran.Add(1)
		if i == 5 {
			return bad
		}
		return nil
	})
	if !errors.Is(err, bad) {
		t.Fatalf("error %v", err)
	}
	if ran.Load() > 100 {
		t.Errorf("%d tasks ran after an early failure", ran.Load())
	}
}

func TestRunCancel(t *testing.T) {
	before := runtime.NumGoroutine()
	ctx, cancel := context.WithCancel(context.Background())
	done := make(chan error)
	go func() {
		done <- Run(ctx, 4, 1_000_000, func(ctx context.Context, i int) error {
			time.Sleep(time.Millisecond)
			return nil
		})
	}()
	time.Sleep(20 * time.Millisecond)
	cancel()
	select {
	case err := <-done:
		if !errors.Is(err, context.Canceled) {
			t.Fatalf("error %v", err)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("Run did not return after cancellation")
	}
	deadline := time.Now().Add(2 * time.Second)
	for runtime.NumGoroutine() > before && time.Now().Before(deadline) {
		time.Sleep(10 * time.Millisecond)
	}
	if n := runtime.NumGoroutine(); n > before {
		t.Errorf("%d goroutines before, %d after", before, n)
	}
}

// TestRunReportsTheCause checks that when one task fails and the others
// stop because the failure cancelled their context, Run returns the
// failure, not the cancellation a lower-numbered task saw.
func TestRunReportsTheCause(t *testing.T) {
	cause := errors.New("bad order")
	for range 20 {
		err := Run(context.Background(), 2, 2, func(ctx context.Context, i int) error {
			if i == 1 {
				return cause
			}
			<-ctx.Done()
			return ctx.Err()
		})
		if !errors.Is(err, cause) {
			t.Fatalf("error %v, want %v", err, cause)
		}
	}
}
