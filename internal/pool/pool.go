// Package pool runs independent tasks on a bounded number of goroutines.
// Results are written by the tasks themselves, by index, so the outcome
// never depends on scheduling.
package pool

import (
	"context"
	"errors"
	"runtime"
	"sync"
	"sync/atomic"
)

// Workers returns n when positive and GOMAXPROCS otherwise.
func Workers(n int) int {
	if n > 0 {
		return n
	}
	return runtime.GOMAXPROCS(0)
}

// Run calls task(ctx, i) for i in [0, n) on at most workers goroutines (0
// means GOMAXPROCS). It stops handing out tasks at the first error or when
// ctx is cancelled, waits for running tasks to return, and returns ctx's
// error when the caller's context ended, otherwise the error of the
// lowest-numbered failed task that did not merely see the cancellation
// the first failure caused. It leaks no goroutine.
func Run(ctx context.Context, workers, n int, task func(ctx context.Context, i int) error) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	w := min(Workers(workers), n)
	parent := ctx
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	errs := make([]error, n)
	var next atomic.Int64
	var failed atomic.Bool
	var wg sync.WaitGroup
	for range w {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for {
				i := int(next.Add(1) - 1)
				if i >= n || failed.Load() || ctx.Err() != nil {
					return
				}
				if err := task(ctx, i); err != nil {
					errs[i] = err
					failed.Store(true)
					cancel()
					return
				}
			}
		}()
	}
	wg.Wait()
	// A task that failed because another task's failure cancelled the
	// shared context reports that cancellation; the cause is the error to
	// return, unless the caller's own context ended.
	if err := parent.Err(); err != nil {
		return err
	}
	var first error
	for _, err := range errs {
		switch {
		case err == nil:
		case !errors.Is(err, context.Canceled) && !errors.Is(err, context.DeadlineExceeded):
			return err
		case first == nil:
			first = err
		}
	}
	if first != nil {
		return first
	}
	return ctx.Err()
}
