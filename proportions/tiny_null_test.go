package proportions_test

import (
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// The score tests on the difference agree with their intervals at a null
// a hair from 0: with every trial alike (no events, or only events) and a
// null of ±5e−324 the restricted variance, of order |δ|/n, underflowed to 0
// while the numerator −δ did not, so z was ∓Inf and the test rejected
// (p = 0) a null that its paired interval contains. The true z is about
// √(|δ|·n), so p is 1 to many digits.
func TestScoreTestsAtATinyNull(t *testing.T) {
	m := proportions.MaxTrials
	tables := []proportions.Counts{{X1: 0, N1: 10, X2: 0, N2: 10}, {X1: 10, N1: 10, X2: 10, N2: 10}, {X1: 0, N1: m, X2: 0, N2: m}, {X1: m, N1: m, X2: m, N2: m}, {X1: 0, N1: 1, X2: 0, N2: 7}}
	for _, tc := range []struct {
		test proportions.TestMethod
		iv   proportions.IntervalMethod
	}{{proportions.FarringtonManningTest, proportions.Mee}, {proportions.MiettinenNurminenTest, proportions.MiettinenNurminen}} {
		for _, c := range tables {
			for _, null := range []float64{5e-324, -5e-324, 1e-310, -1e-300, 1e-280} {
				r, err := tc.test.Test(c, proportions.WithNull(null))
				if err != nil {
					t.Fatalf("%s at %v, null %v: %v", tc.test.Key, c, null, err)
				}
				iv, err := tc.iv.Interval(c, 0.95)
				if err != nil {
					t.Fatal(err)
				}
				if r.Reject || !(r.PValue > 0.999) || !iv.Contains(null) {
					t.Errorf("%s at %v, null %v: z = %v, p = %v, reject %v; %s contains the null: %v", tc.test.Key, c, null, r.Statistic, r.PValue, r.Reject, tc.iv.Key, iv.Contains(null))
				}
			}
		}
	}
}

// TestRatioNullsAtTheirEdges: on the ratio and odds-ratio scales a null
// beyond [10⁻¹², 10¹²] is refused with ErrNull; at 1.7·10³⁰⁸ (and
// 5·10⁻³²⁴ for the odds ratio) the Miettinen–Nurminen score tests rejected
// with z = +∞ a null their own intervals contained. At the accepted edges
// the tests agree with the Miettinen–Nurminen intervals of their scale
// (a two-sided 95% test rejects exactly when the 95% interval leaves the
// null out), on tables where every trial is alike or one group is empty.
func TestRatioNullsAtTheirEdges(t *testing.T) {
	tables := []proportions.Counts{{X1: 1, N1: 10, X2: 0, N2: 10}, {X1: 10, N1: 10, X2: 10, N2: 10}, {X1: 0, N1: 10, X2: 3, N2: 10}, {X1: 5, N1: 10, X2: 5, N2: 10}}
	for _, tc := range []struct {
		test proportions.TestMethod
		iv   proportions.IntervalMethod
	}{
		{proportions.MiettinenNurminenRatioTest, proportions.MiettinenNurminenRatio},
		{proportions.MiettinenNurminenOddsRatioTest, proportions.MiettinenNurminenOddsRatio},
	} {
		for _, null := range []float64{1.7e308, 1e300, 1e12 * 1.0001, 1e-12 / 1.0001, 1e-300, 5e-324} {
			if _, err := tc.test.Test(tables[0], proportions.WithNull(null)); !errors.Is(err, proportions.ErrNull) {
				t.Errorf("%s, null %v: %v, want an error wrapping ErrNull", tc.test.Key, null, err)
			}
		}
		for _, c := range tables {
			iv, err := tc.iv.Interval(c, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			for _, null := range []float64{1e-12, 1e12} {
				r, err := tc.test.Test(c, proportions.WithNull(null))
				if err != nil {
					t.Fatalf("%s at %v, null %v: %v", tc.test.Key, c, null, err)
				}
				if r.Reject == iv.Contains(null) || math.IsInf(r.Statistic, 0) && iv.Contains(null) {
					t.Errorf("%s at %v, null %v: z = %v, p = %v, reject %v; %s [%v, %v] contains the null: %v",
						tc.test.Key, c, null, r.Statistic, r.PValue, r.Reject, tc.iv.Key, iv.Lower, iv.Upper, iv.Contains(null))
				}
			}
		}
	}
}
