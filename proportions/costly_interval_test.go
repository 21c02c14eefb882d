package proportions_test

import (
	"context"
	"errors"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
)

// costlyConditional and costlyProfile are the interval methods whose work
// grows like the square root of the counts without bound: Cornfield's
// exact and mid-p intervals, Baptista–Pike's, and the profile tail-area
// intervals. Called directly on a table of 2^50 per group they ran for 1 to
// 8 minutes (measured: Cornfield's 60–108 s, profile tails 4–21 s at the
// edges) and did not look at their context.
var costlyIntervals = []struct {
	m proportions.IntervalMethod
	// long is a table inside MaxCost on which the method takes well over
	// the cancel delay (about 0.3 to 5 s).
	long proportions.Counts
}{
	{proportions.CornfieldExact, proportions.Counts{X1: 5e11, N1: 1e12, X2: 5e11, N2: 1e12}},
	{proportions.CornfieldMidP, proportions.Counts{X1: 5e11, N1: 1e12, X2: 5e11, N2: 1e12}},
	{proportions.BaptistaPike, proportions.Counts{X1: 5e9, N1: 1e10, X2: 5e9, N2: 1e10}},
	{proportions.ProfileExactTails, proportions.Counts{X1: 5e11, N1: 1e12, X2: 5e11, N2: 1e12}},
	{proportions.ProfileMidPTails, proportions.Counts{X1: 1e12, N1: 1e12, X2: 1e12, N2: 1e12}},
}

// A direct call of a costly interval at the largest counts is refused up
// front with an error wrapping ErrTooLarge (not run for minutes).
func TestCostlyIntervalsRefuseTheLargestTables(t *testing.T) {
	m := proportions.MaxTrials
	for _, tc := range costlyIntervals {
		for _, c := range []proportions.Counts{{X1: m / 2, N1: m, X2: m / 2, N2: m}, {X1: m / 100, N1: m, X2: m / 50, N2: m}} {
			ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
			_, err := tc.m.IntervalContext(ctx, c, 0.95)
			cancel()
			if !errors.Is(err, proportions.ErrTooLarge) {
				t.Errorf("%s at %v: got %v, want an error wrapping ErrTooLarge", tc.m.Key, c, err)
			}
		}
	}
}

// A costly interval returns within 100 ms of a cancel on a table it may
// compute but that takes it seconds.
func TestCostlyIntervalsStopOnCancel(t *testing.T) {
	for _, tc := range costlyIntervals {
		t.Run(tc.m.Key, func(t *testing.T) {
			canceltest.Check(t, 30*time.Millisecond, func(ctx context.Context) error {
				_, err := tc.m.IntervalContext(ctx, tc.long, 0.95)
				return err
			})
		})
	}
}

// The cancellable forms give the very limits of the plain ones.
func TestCostlyIntervalsSameLimitsWithContext(t *testing.T) {
	conf, err := proportions.NewConfidence(0.95)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range costlyIntervals {
		for _, c := range []proportions.Counts{{X1: 0, N1: 7, X2: 3, N2: 9}, {X1: 5, N1: 40, X2: 17, N2: 33}, {X1: 12, N1: 12, X2: 0, N2: 5}, {X1: 4000, N1: 10000, X2: 4300, N2: 9000}} {
			lo, hi := tc.m.Limits(c, conf)
			clo, chi, err := tc.m.LimitsContext(context.Background(), c, conf)
			if err != nil || clo != lo || chi != hi {
				t.Errorf("%s at %v: (%v, %v, %v) with a context, (%v, %v) without", tc.m.Key, c, clo, chi, err, lo, hi)
			}
		}
	}
}
