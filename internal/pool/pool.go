// Package pool runs independent tasks on a bounded number of goroutines.
// Results are written by the tasks themselves, by index, so the outcome
// never depends on scheduling.
package pool

import (
	"context"
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
// ctx is cancelled, waits for running tasks to return, and returns the
// error of the lowest-numbered failed task, or ctx.Err(). It leaks no
// goroutine.
func Run(ctx context.Context, workers, n int, task func(ctx context.Context, i int) error) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	w := min(Workers(workers), n)
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
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return ctx.Err()
}
