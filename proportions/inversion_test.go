package proportions

import (
	"math"
	"testing"
)

// The default analysis pairs each score test with the interval that
// inverts it. Over every table with n1, n2 ≤ 7 (0/n and n/n included) and
// some unequal and larger ones, for δ on a grid across (−1, 1) and three
// levels, this checks both pairs (Farrington–Manning with Mee,
// Miettinen–Nurminen with Miettinen–Nurminen):
//   - two-sided: the test rejects at α exactly when the 1 − α interval
//     excludes δ;
//   - one-sided: Greater rejects at α exactly when δ is below the lower
//     limit of the 1 − 2α interval, Less exactly when δ is above its upper
//     limit.
//
// The limits are computed independently of the tests (root search versus
// direct evaluation), so this can fail; δ within 1e−9 of a limit, where
// rounding may decide either way, is skipped.
func TestScoreIntervalsInvertScoreTests(t *testing.T) {
	tables := smallCountTables(7)
	tables = append(tables, Counts{5, 56, 0, 29}, Counts{56, 70, 48, 80}, Counts{1, 2, 300, 301}, Counts{0, 500, 1, 2},
		Counts{30, 1000000, 10, 1000000}, Counts{999, 1000, 1000, 1000}, Counts{0, 40, 40, 40}, Counts{17, 25, 30, 31})
	var deltas []float64
	for d := -0.98; d < 0.99; d += 0.02 {
		deltas = append(deltas, math.Round(d*100)/100)
	}
	deltas = append(deltas, -0.999, -1e-6, 1e-6, 0.999, 0.3333)
	checked := 0
	for _, pair := range []func() (TestMethod, IntervalMethod){FarringtonManningPair, MiettinenNurminenPair} {
		test, interval := pair()
		for _, level := range []float64{0.9, 0.95, 0.99} {
			two, _ := NewConfidence(level)
			one, _ := NewConfidence(1 - 2*(1-level))
			for _, c := range tables {
				lo, hi := interval.Limits(c, two)
				lo1, hi1 := interval.Limits(c, one)
				for _, delta := range deltas {
					h := Hypothesis{Null: delta, Alternative: TwoSided, Conf: two}
					if near(delta, lo, hi) {
						continue
					}
					if rej := test.Run(c, h).Reject; rej != (delta < lo || delta > hi) {
						t.Errorf("%s vs %s %v at %v, δ = %v: reject %v, interval (%v, %v)", test.Name, interval.Name, c, level, delta, rej, lo, hi)
					}
					checked++
					if near(delta, lo1, hi1) {
						continue
					}
					h.Alternative = Greater
					if rej := test.Run(c, h).Reject; rej != (delta < lo1) {
						t.Errorf("%s greater %v at α = %v, δ = %v: reject %v, lower limit %v", test.Name, c, 1-level, delta, rej, lo1)
					}
					h.Alternative = Less
					if rej := test.Run(c, h).Reject; rej != (delta > hi1) {
						t.Errorf("%s less %v at α = %v, δ = %v: reject %v, upper limit %v", test.Name, c, 1-level, delta, rej, hi1)
					}
				}
			}
		}
	}
	if checked < 300000 {
		t.Errorf("only %d comparisons", checked)
	}
}

func near(delta, lo, hi float64) bool {
	return math.Abs(delta-lo) < 1e-9 || math.Abs(delta-hi) < 1e-9
}

// smallCountTables lists every table with 1 ≤ n1, n2 ≤ maxN.
func smallCountTables(maxN int64) []Counts {
	var cs []Counts
	for n1 := int64(1); n1 <= maxN; n1++ {
		for n2 := int64(1); n2 <= maxN; n2++ {
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					cs = append(cs, Counts{x1, n1, x2, n2})
				}
			}
		}
	}
	return cs
}
