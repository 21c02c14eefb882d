package proportions

import (
	"fmt"
	"math"
	"testing"
)

// BenchmarkSupremumBound: the cost of the proven bound beside today's
// search, on the nuisance search alone (the region is built once, outside
// the loop, as it is shared by both). "search" is the grid plus Brent
// refinement the p-value always had; "proven" is that search with
// rounding allowances plus the branch and bound of unconditional_bound.go.
// Metrics: tail evaluations per run and, for "proven", the relative gap
// (bound − p)/p achieved, in units of 1e−9 (the tolerance). Tables: x1 = ⌊0.3n+½⌋, x2 = ⌊0.45n+½⌋ as in
// benchTest, plus a margin case (δ0 = −0.1, greater).
//
//	go test ./proportions -run '^$' -bench SupremumBound
func BenchmarkSupremumBound(b *testing.B) {
	type bcase struct {
		name  string
		stat  OrderingStatistic
		side  regionSide
		delta float64
	}
	cases := []bcase{
		{"barnard-two-sided", PooledScore, sideBoth, 0},
		{"boschloo-two-sided", FisherPValue, sideBoth, 0},
		{"barnard-greater-margin-0.1", PooledScore, sideGreater, -0.1},
	}
	for _, n := range []int64{15, 30, 100, 400, 800} {
		c := Counts{X1: (3*n + 5) / 10, N1: n, X2: (45*n + 50) / 100, N2: n}
		for _, bc := range cases {
			if bc.stat == FisherPValue && n > 400 {
				continue
			}
			var reg region
			if bc.stat == FisherPValue {
				reg, _ = fisherRegion(c, bc.side)
			} else {
				reg, _ = zRegion(c, bc.delta, true, bc.side)
			}
			a, hi := nuisanceRange(c, bc.delta, 0)
			for _, proven := range []bool{false, true} {
				name := fmt.Sprintf("n%d/%s/search", n, bc.name)
				if proven {
					name = fmt.Sprintf("n%d/%s/proven", n, bc.name)
				}
				b.Run(name, func(b *testing.B) {
					evals, gap := 0, 0.0
					for b.Loop() {
						s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, delta: bc.delta, a: a, b: hi}
						if proven {
							lv, _, lb := s.provenSupremum()
							gap = math.Expm1(lb - lv)
						} else {
							s.supremum()
						}
						evals = s.work.evals
					}
					b.ReportMetric(float64(evals), "evals/op")
					if proven {
						b.ReportMetric(gap*1e9, "gap-in-1e-9")
					}
				})
			}
		}
	}
}
