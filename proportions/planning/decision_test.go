package planning

import (
	"errors"
	"testing"

	"github.com/propscope/propscope/proportions"
)

func TestDesignTestHypotheses(t *testing.T) {
	ni := NewPlan(NonInferiority, 0.8, 0.8)
	ni.Margin = -0.1
	equiv := NewPlan(Equivalence, 0.5, 0.5)
	equiv.Scale, equiv.Margin = proportions.Ratio, 0.8 // read as 0.8 to 1.25
	sup := NewPlan(Superiority, 0.3, 0.2)
	cases := []struct {
		d    Plan
		m    proportions.TestMethod
		want []proportions.Hypothesis
	}{
		{NewPlan(Equality, 0.6, 0.75), proportions.FarringtonManningRatioTest, []proportions.Hypothesis{{Null: 1, Alternative: proportions.TwoSided}}},
		{equiv, proportions.FarringtonManningRatioTest, []proportions.Hypothesis{{Null: 0.8, Alternative: proportions.Greater}, {Null: 1.25, Alternative: proportions.Less}}},
		// A no-effect margin may be tested on another scale.
		{sup, proportions.MiettinenNurminenRatioTest, []proportions.Hypothesis{{Null: 1, Alternative: proportions.Greater}}},
	}
	for _, tc := range cases {
		hs, err := tc.d.TestHypotheses(tc.m)
		if err != nil {
			t.Fatalf("%v: %v", tc.d, err)
		}
		if len(hs) != len(tc.want) {
			t.Fatalf("%v: %d hypotheses", tc.d, len(hs))
		}
		for i, h := range hs {
			if h.Null != tc.want[i].Null || h.Alternative != tc.want[i].Alternative || h.Conf.Level != 1-tc.d.Alpha {
				t.Errorf("%v: hypothesis %d = %+v, want null %v %v at level %v", tc.d, i, h, tc.want[i].Null, tc.want[i].Alternative, 1-tc.d.Alpha)
			}
		}
	}
	if _, err := ni.TestHypotheses(proportions.FarringtonManningRatioTest); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("difference margin with a ratio test: %v", err)
	}
	if _, err := ni.TestHypotheses(proportions.FisherTest); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("margin with a test of no effect only: %v", err)
	}
	if got := (Plan{Allocation: 1.5}).SecondGroupSize(11); got != 17 {
		t.Errorf("⌈1.5·11⌉ = %d", got)
	}
	if got := (Plan{Dropout: 0.2}).Enrolled(100); got != 125 {
		t.Errorf("100/(1 − 0.2) = %d", got)
	}
}
