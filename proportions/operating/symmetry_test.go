package operating

import (
	"context"
	"errors"
	"math"
	"slices"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// TestSymmetricClaims checks the Symmetric declaration of every registered
// interval method by direct computation on small designs: exchanging the
// groups (n1 = n2) and counting non-events (difference and odds ratio) must
// mirror the interval, to within 1e-8 (the accuracy of the score
// intervals' root searches) on the difference scale and on the log scale
// for ratios.
func TestSymmetricClaims(t *testing.T) {
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range slices.Concat(proportions.EnumerableIntervalMethods(proportions.Difference), proportions.EnumerableIntervalMethods(proportions.Ratio), proportions.EnumerableIntervalMethods(proportions.OddsRatio)) {
		if !m.Symmetric {
			continue
		}
		tab := &OutcomeLimits{method: m}
		far := func(a, b float64) bool {
			if a == b {
				return false
			}
			if m.Scale != proportions.Difference {
				a, b = math.Log(a), math.Log(b)
			}
			return !(math.Abs(a-b) <= 1e-8)
		}
		for _, n := range [][2]int{{8, 8}, {13, 13}, {6, 11}} {
			limits := func(x1, x2, n1, n2 int) (float64, float64) {
				return m.Limits(proportions.Counts{X1: int64(x1), N1: int64(n1), X2: int64(x2), N2: int64(n2)}, conf)
			}
			for x1 := 0; x1 <= n[0]; x1++ {
				for x2 := 0; x2 <= n[1]; x2++ {
					lo, hi := limits(x1, x2, n[0], n[1])
					if n[0] == n[1] {
						if a, b := tab.mirror(limits(x2, x1, n[1], n[0])); far(a, lo) || far(b, hi) {
							t.Errorf("%s: exchanging the groups of %d/%d vs %d/%d gives (%v, %v), not the mirror of (%v, %v)", m.Key, x1, n[0], x2, n[1], a, b, lo, hi)
						}
					}
					if m.Scale != proportions.Ratio {
						if a, b := tab.mirror(limits(n[0]-x1, n[1]-x2, n[0], n[1])); far(a, lo) || far(b, hi) {
							t.Errorf("%s: counting non-events at %d/%d vs %d/%d gives (%v, %v), not the mirror of (%v, %v)", m.Key, x1, n[0], x2, n[1], a, b, lo, hi)
						}
					}
				}
			}
		}
	}
}

// TestTableLimitsMatchMethod: the stored limits (computed or mirrored)
// agree with a direct call of the method, and outcomes outside the design
// are errors, not panics.
func TestTableLimitsMatchMethod(t *testing.T) {
	conf, _ := proportions.NewConfidence(0.9)
	for _, d := range []Design{{N1: 9, N2: 9, Level: 0.9}, {N1: 8, N2: 13, Level: 0.9}} {
		for _, m := range proportions.EnumerableIntervalMethods(proportions.Difference) {
			tab, err := NewOutcomeLimits(context.Background(), m, d)
			if err != nil {
				t.Fatal(err)
			}
			for x1 := 0; x1 <= d.N1; x1++ {
				for x2 := 0; x2 <= d.N2; x2++ {
					lo, hi, err := tab.Limits(x1, x2)
					if err != nil {
						t.Fatal(err)
					}
					wlo, whi := m.Limits(proportions.Counts{X1: int64(x1), N1: int64(d.N1), X2: int64(x2), N2: int64(d.N2)}, conf)
					if math.Abs(lo-wlo) > 1e-8 || math.Abs(hi-whi) > 1e-8 {
						t.Errorf("%s %v at (%d, %d): table (%v, %v), method (%v, %v)", m.Key, d, x1, x2, lo, hi, wlo, whi)
					}
				}
			}
			if _, _, err := tab.Limits(d.N1+1, 0); !errors.Is(err, proportions.ErrEventsExceedTrials) {
				t.Errorf("outcome outside the design: %v", err)
			}
		}
	}
}
