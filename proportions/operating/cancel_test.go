package operating_test

import (
	"context"
	"math"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// noGuard lifts the engine's cost guard for the cancellation tests.
var noGuard = operating.WithCostGuard(proportions.Cost{Steps: math.Inf(1), Bytes: math.Inf(1)})

// The reproducer: the outcome limits of Chan–Zhang at 200 × 200
// (hours of work; a row alone takes about a minute) returned 34 s after a
// cancel. The design is far above the engine's cost guard, raised here
// (WithCostGuard) so that the run starts.
func TestOutcomeLimitsCancelInsideRows(t *testing.T) {
	d := operating.Design{N1: 200, N2: 200, Level: 0.95}
	canceltest.Check(t, 100*time.Millisecond, func(ctx context.Context) error {
		_, err := operating.NewOutcomeLimits(ctx, proportions.ChanZhang, d, noGuard)
		return err
	})
}

// The reproducer: the type I error of Barnard's test at
// 2000 × 2000 never returned after a cancel (guard raised, as above).
func TestTypeIErrorCancelInsideRows(t *testing.T) {
	h := proportions.Hypothesis{Null: 0, Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}
	canceltest.Check(t, 100*time.Millisecond, func(ctx context.Context) error {
		_, err := operating.TypeIError(ctx, proportions.BarnardTest, 2000, 2000, h, noGuard)
		return err
	})
}
