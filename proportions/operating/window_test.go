package operating

import (
	"context"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// perOutcome is the test without its window decider: the engine then runs
// it on every outcome, one nuisance search each (the definition).
func perOutcome(m proportions.TestMethod) proportions.TestMethod {
	m.Window = nil
	return m
}

// TestWindowRegionMatchesPerOutcome: the rejection regions and the power
// the engine computes through a window decider equal those of the test run
// on every outcome, for Barnard's and Boschloo's tests, one- and two-sided,
// and an equivalence decision (two one-sided hypotheses).
func TestWindowRegionMatchesPerOutcome(t *testing.T) {
	lv := proportions.Confidence{Level: 0.95}
	cases := []struct {
		m      proportions.TestMethod
		hs     []proportions.Hypothesis
		n1, n2 int
	}{
		{proportions.BarnardTest, []proportions.Hypothesis{{Alternative: proportions.TwoSided, Conf: lv}}, 18, 24},
		{proportions.BoschlooTest, []proportions.Hypothesis{{Alternative: proportions.TwoSided, Conf: lv}}, 22, 16},
		{proportions.BoschlooDoubledTest, []proportions.Hypothesis{{Alternative: proportions.TwoSided, Conf: lv}}, 16, 16},
		{proportions.BarnardWaldTest, []proportions.Hypothesis{{Alternative: proportions.Greater, Conf: lv}}, 18, 21},
		{proportions.BarnardTest, []proportions.Hypothesis{
			{Null: -0.2, Alternative: proportions.Greater, Conf: lv}, {Null: 0.2, Alternative: proportions.Less, Conf: lv}}, 22, 22},
	}
	for _, tc := range cases {
		fast := Decision{Test: tc.m, Hypotheses: tc.hs}.Remembering()
		slow := Decision{Test: perOutcome(tc.m), Hypotheses: tc.hs}
		rf, err := NewRejectionRegion(context.Background(), fast, tc.n1, tc.n2)
		if err != nil {
			t.Fatal(err)
		}
		rs, err := NewRejectionRegion(context.Background(), slow, tc.n1, tc.n2)
		if err != nil {
			t.Fatal(err)
		}
		for x1 := 0; x1 <= tc.n1; x1++ {
			for x2 := 0; x2 <= tc.n2; x2++ {
				if rf.Contains(x1, x2) != rs.Contains(x1, x2) {
					t.Errorf("%s %v at %d/%d vs %d/%d: window %v, per outcome %v", tc.m.Key, tc.hs, x1, tc.n1, x2, tc.n2, rf.Contains(x1, x2), rs.Contains(x1, x2))
				}
			}
		}
		if rf.Outcomes() == 0 {
			t.Errorf("%s: empty region at %d vs %d", tc.m.Key, tc.n1, tc.n2)
		}
		for _, pi := range [][2]float64{{0.3, 0.6}, {0.5, 0.5}, {0.8, 0.7}} {
			pf, err := fast.PowerContext(context.Background(), tc.n1, tc.n2, pi[0], pi[1])
			if err != nil {
				t.Fatal(err)
			}
			ps, err := slow.PowerContext(context.Background(), tc.n1, tc.n2, pi[0], pi[1])
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(pf-ps) > 1e-13 {
				t.Errorf("%s %v power at %v: window %v, per outcome %v", tc.m.Key, tc.hs, pi, pf, ps)
			}
		}
	}
}

// TestWindowCancel: a cancelled context stops the window decider with the
// context's error.
func TestWindowCancel(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	d := Decision{Test: proportions.BoschlooTest, Hypotheses: []proportions.Hypothesis{{Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}}}
	if _, err := d.PowerContext(ctx, 200, 200, 0.6, 0.75); err != context.Canceled {
		t.Fatalf("got %v, want context.Canceled", err)
	}
}
