// Package canceltest measures, for the tests of every package, how soon a
// long call returns after its context is cancelled: the library promises
// within Bound, checked inside rows rather than between them.
package canceltest

import (
	"context"
	"errors"
	"testing"
	"time"
)

// Bound is the promised return time after a cancel (several times that
// under the race detector, which slows the code down; see raceSlowdown).
const Bound = 100 * time.Millisecond

// Check starts run, cancels its context after delay and requires run to
// return context.Canceled within Bound of the cancel. The best of three
// attempts counts, so one scheduling stall on a loaded machine does not
// fail it, while a computation that looks at its context only between long
// steps does. Returning before the cancel fails the test: the call was too
// short to show anything.
func Check(t testing.TB, delay time.Duration, run func(ctx context.Context) error) {
	t.Helper()
	bound := Bound * raceSlowdown
	best := time.Hour
	for range 3 {
		took, err := returnAfterCancel(t, delay, run)
		if !errors.Is(err, context.Canceled) {
			t.Fatalf("got %v, want context.Canceled", err)
		}
		best = min(best, took)
		if best <= bound {
			break
		}
	}
	t.Logf("returned %v after the cancel", best)
	if best > bound {
		t.Errorf("returned %v after the cancel, want within %v", best, bound)
	}
}

// returnAfterCancel runs one attempt: the time from the cancel to run's
// return, and run's error.
func returnAfterCancel(t testing.TB, delay time.Duration, run func(ctx context.Context) error) (time.Duration, error) {
	t.Helper()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	done := make(chan error, 1)
	go func() { done <- run(ctx) }()
	select {
	case err := <-done:
		t.Fatalf("returned before the cancel (after less than %v), with %v: the call is too short to test cancellation", delay, err)
	case <-time.After(delay):
	}
	cancel()
	at := time.Now()
	err := <-done
	return time.Since(at), err
}
