package strata

import (
	"context"
	"errors"
	"fmt"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
)

// evenRows returns k strata of n units per group with n/2 events in each.
func evenRows(k int, n int64) [][4]int64 {
	rows := make([][4]int64, k)
	for i := range rows {
		rows[i] = [4]int64{n / 2, n, n/2 + int64(i%3), n}
	}
	return rows
}

// Above the analysis guard the exact conditional methods are left out with
// a warning; a direct call above its guard is refused with ErrTooLarge.
func TestExactCostGuard(t *testing.T) {
	rows := evenRows(40, 20000)
	a := analyze(t, rows)
	if !hasWarning(a, proportions.WarnSkipped) {
		t.Fatalf("40 strata of 20000 per group: no %s warning; cost %v", proportions.WarnSkipped, exactCost(usable(breakdownOf(t, rows))))
	}
	for _, x := range a.Tests {
		if x.Key == ExactTestKey {
			t.Errorf("the exact test ran above the guard")
		}
	}
	_, _, err := exactMethods(context.Background(), usable(breakdownOf(t, rows)), proportions.TwoSided, proportions.Confidence{Level: 0.95, Z: 1.96}, 0.95, 0, proportions.MaxCost)
	if !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("direct call above MaxCost: %v, want ErrTooLarge", err)
	}
	if c := ExactCost(breakdownOf(t, rows)); c.Within(proportions.MaxCost) {
		t.Errorf("40 strata of 20000: cost %v within MaxCost", c)
	}
	mid := evenRows(20, 600) // above AnalysisCost, within MaxCost
	if c := ExactCost(breakdownOf(t, mid)); c.Within(proportions.AnalysisCost) || !c.Within(proportions.MaxCost) {
		t.Fatalf("20 strata of 600: cost %v, want between the two guards", c)
	}
	if !hasWarning(analyze(t, mid), proportions.WarnSkipped) {
		t.Errorf("20 strata of 600, quick scope: exact methods not skipped")
	}
	small := analyze(t, evenRows(8, 50))
	if hasWarning(small, proportions.WarnSkipped) {
		t.Errorf("8 strata of 50: exact methods skipped")
	}
}

// The estimate of the cost follows the work within a small factor: the
// convolution of k supports of length l is about Σ (i·l)·l pairs.
func TestExactCostGrows(t *testing.T) {
	c1 := exactCost(usable(breakdownOf(t, evenRows(4, 200))))
	c2 := exactCost(usable(breakdownOf(t, evenRows(8, 200))))
	if r := c2.Steps / c1.Steps; r < 3 || r > 5 {
		t.Errorf("doubling the strata multiplies the steps by %.2g, want about 4 (the pairs of the convolution)", r)
	}
}

// A cancel stops the exact conditional methods inside the convolution:
// cancelled 30 ms in, they must return within canceltest.Bound.
func TestExactCancel(t *testing.T) {
	ts := usable(breakdownOf(t, evenRows(10, 3000)))
	canceltest.Check(t, 30*time.Millisecond, func(ctx context.Context) error {
		_, _, err := exactMethods(ctx, ts, proportions.TwoSided, proportions.Confidence{Level: 0.95, Z: 1.96}, 0.95, 0, proportions.Cost{Steps: 1e12, Bytes: 1 << 30})
		return err
	})
}

// BenchmarkAnalyze times the whole stratified analysis. Target: under
// 5 ms for 8 blocks of 100 units per group (a field trial), printed beside.
func BenchmarkAnalyze(b *testing.B) {
	for _, c := range []struct {
		k int
		n int64
	}{{8, 100}, {20, 500}} {
		b.Run(fmt.Sprintf("%d strata of %d", c.k, c.n), func(b *testing.B) {
			rows := evenRows(c.k, c.n)
			var rs []proportions.BreakdownRow
			for i, r := range rows {
				rs = append(rs, proportions.BreakdownRow{Value: fmt.Sprint(i), Counts: proportions.Counts{X1: r[0], N1: r[1], X2: r[2], N2: r[3]}})
			}
			bd, err := proportions.NewBreakdown("block", proportions.Labels{}, rs)
			if err != nil {
				b.Fatal(err)
			}
			for b.Loop() {
				if _, err := Analyze(bd); err != nil {
					b.Fatal(err)
				}
			}
			if c.k == 8 {
				b.ReportMetric(5, "target-ms")
			}
		})
	}
}

// A cancel stops the stratified score interval inside its search: with
// 300,000 strata every bisection step fits each stratum, and the whole
// analysis took about 3.6 s without looking at its context; cancelled
// 300 ms in (past the checks of the rows, in the search), it must return
// within canceltest.Bound.
func TestManyStrataCancel(t *testing.T) {
	b := breakdownOf(t, evenRows(300_000, 40))
	canceltest.Check(t, 300*time.Millisecond, func(ctx context.Context) error {
		_, err := AnalyzeContext(ctx, b, proportions.WithScope(proportions.ScopeLargeSample))
		return err
	})
}
