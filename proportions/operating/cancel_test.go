package operating_test

import (
	"context"
	"errors"
	"testing"
	"time"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// cancelReturn starts run, cancels its context after delay and returns the
// time from the cancel to run's return, and run's error. It fails the test
// when run returns before the cancel.
func cancelReturn(t *testing.T, delay time.Duration, run func(ctx context.Context) error) (time.Duration, error) {
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

// checkCancel runs cancelReturn up to three times and requires the best
// return time to be within 100 ms of the cancel (the bound, scaled
// under the race detector): one scheduling stall on a loaded machine does
// not fail it, a computation that looks at ctx only between rows does.
func checkCancel(t *testing.T, delay time.Duration, run func(ctx context.Context) error) {
	t.Helper()
	bound := 100 * time.Millisecond * raceSlowdown
	best := time.Hour
	for range 3 {
		took, err := cancelReturn(t, delay, run)
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

// The reproducer: the outcome limits of Chan–Zhang at 200 × 200
// (hours of work; a row alone takes about a minute) returned 34 s after a
// cancel.
func TestOutcomeLimitsCancelInsideRows(t *testing.T) {
	d := operating.Design{N1: 200, N2: 200, Level: 0.95}
	checkCancel(t, 100*time.Millisecond, func(ctx context.Context) error {
		_, err := operating.NewOutcomeLimits(ctx, proportions.ChanZhang, d)
		return err
	})
}

// The reproducer: the type I error of Barnard's test at
// 2000 × 2000 never returned after a cancel.
func TestTypeIErrorCancelInsideRows(t *testing.T) {
	h := proportions.Hypothesis{Null: 0, Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}
	checkCancel(t, 100*time.Millisecond, func(ctx context.Context) error {
		_, err := operating.TypeIError(ctx, proportions.BarnardTest, 2000, 2000, h)
		return err
	})
}
