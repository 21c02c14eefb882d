package planning

import (
	"context"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
)

// TestExactPlanningWindowMatchesPerOutcome: the exact sample-size scan and
// power curve with Barnard's and Boschloo's tests, which decide through
// their window deciders, equal the same computations with the test run on
// every outcome (one nuisance search each: the definition), size by size.
func TestExactPlanningWindowMatchesPerOutcome(t *testing.T) {
	ctx := context.Background()
	d := NewPlan(Equality, 0.25, 0.75)
	nc := NewPlan(NonInferiority, 0.85, 0.6)
	nc.Margin = -0.1
	for _, tc := range []struct {
		plan Plan
		m    proportions.TestMethod
	}{{d, proportions.BarnardTest}, {d, proportions.BoschlooTest}, {nc, proportions.BarnardTest}} {
		slow := tc.m
		slow.Window = nil
		fast, err := ExactSampleSize(ctx, tc.plan, tc.m, Search{})
		if err != nil {
			t.Fatal(err)
		}
		ref, err := ExactSampleSize(ctx, tc.plan, slow, Search{})
		if err != nil {
			t.Fatal(err)
		}
		if fast.First != ref.First || fast.Stable != ref.Stable || len(fast.Curve.Points) != len(ref.Curve.Points) {
			t.Fatalf("%s %s: window scan first %+v stable %+v (%d sizes), per outcome %+v %+v (%d sizes)", tc.m.Key, tc.plan.Goal,
				fast.First, fast.Stable, len(fast.Curve.Points), ref.First, ref.Stable, len(ref.Curve.Points))
		}
		for i, p := range fast.Curve.Points {
			if q := ref.Curve.Points[i]; p.N1 != q.N1 || p.Power != q.Power {
				t.Errorf("%s %s at n1 = %d: window power %v, per outcome %v", tc.m.Key, tc.plan.Goal, p.N1, p.Power, q.Power)
			}
		}
		t.Logf("%s %s: n1 = %d, %d sizes compared", tc.m.Key, tc.plan.Goal, fast.First.N1, len(fast.Curve.Points))
	}
}

// ExactSampleSize with Boschloo's test (window decider) returns within
// 100 ms of a cancel, the best of three attempts.
func TestExactSampleSizeWindowCancel(t *testing.T) {
	d := NewPlan(Equality, 0.30, 0.37)
	canceltest.Check(t, 100*time.Millisecond, func(ctx context.Context) error {
		_, err := ExactSampleSize(ctx, d, proportions.BoschlooTest, Search{From: 500})
		return err
	})
}
