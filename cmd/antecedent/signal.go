package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"syscall"
)

// interruption is the cause of a context cancelled by a signal.
type interruption struct{ sig syscall.Signal }

func (i interruption) Error() string {
	return fmt.Sprintf("interrupted by %s", signalName(i.sig))
}

// status is the exit status of a command stopped by the signal: 128 plus
// its number, as shells report a process killed by it (common practice).
func (i interruption) status() int { return 128 + int(i.sig) }

func signalName(s syscall.Signal) string {
	switch s {
	case syscall.SIGINT:
		return "SIGINT"
	case syscall.SIGTERM:
		return "SIGTERM"
	}
	return s.String()
}

// interruptContext returns a context cancelled, with an interruption as
// its cause, by the first SIGINT (Ctrl-C) or SIGTERM. After that first
// signal the default handling is restored, so a second one ends the process
// at once. stop releases the handler.
func interruptContext() (ctx context.Context, stop func()) {
	ctx, cancel := context.WithCancelCause(context.Background())
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, syscall.SIGINT, syscall.SIGTERM)
	done := make(chan struct{})
	go func() {
		select {
		case s := <-ch:
			signal.Stop(ch)
			sig, _ := s.(syscall.Signal)
			cancel(interruption{sig})
		case <-done:
		}
	}()
	return ctx, func() {
		signal.Stop(ch)
		close(done)
		cancel(nil)
	}
}

// interrupted reports whether ctx was cancelled by a signal.
func interrupted(ctx context.Context) (interruption, bool) {
	var i interruption
	ok := errors.As(context.Cause(ctx), &i)
	return i, ok
}
