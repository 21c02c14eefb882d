package proportions

import (
	"math"
	"testing"
)

// The cost model counts what the nuisance search really does: on designs
// of every shape, the number of tail evaluations done stays within the
// model's count, and no binomial window is wider than the model's bound
// (each checked by running the search and reading its counters, and by
// filling the windows at the search's own cutoff floor).
func TestCostModelBoundsTheWork(t *testing.T) {
	for _, tc := range []struct {
		c     Counts
		delta float64
	}{
		{Counts{X1: 3, N1: 20, X2: 9, N2: 25}, 0},
		{Counts{X1: 10, N1: 300, X2: 20, N2: 300}, 0.1},
		{Counts{X1: 0, N1: 1, X2: 1, N2: 20000}, -0.3},
		{Counts{X1: 40, N1: 60, X2: 2, N2: 900}, -0.2},
	} {
		reg, _ := zRegion(tc.c, tc.delta, true, sideBoth)
		a, b := nuisanceRange(tc.c, tc.delta, 0)
		s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, delta: tc.delta, a: a, b: b}
		s.supremum()
		if s.logScale {
			continue // the log-space search is sized on its own (unconditionalLogCost)
		}
		if e, model := float64(s.work.evals), supEvaluations(tc.c.N1, tc.c.N2); e > model {
			t.Errorf("%v δ=%v: %v evaluations, the model counts %v", tc.c, tc.delta, e, model)
		}
	}
	work := newTailWork(100000, 100000)
	for _, n := range []int{10, 1000, 100000} {
		for _, p := range []float64{0.001, 0.3, 0.5, 0.97} {
			cutoff := 1e-13 * linearFloor / float64(2*n+2)
			lo, hi := fillBinomial(work.b2, n, p, cutoff, work.recip)
			if w := float64(hi - lo + 1); w > binomialWindowWidth(int64(n)) {
				t.Errorf("Binomial(%d, %v) at the smallest cutoff keeps %v terms, the model's bound is %v", n, p, w, binomialWindowWidth(int64(n)))
			}
			if math.IsNaN(work.b2[lo]) {
				t.Fatal("NaN term")
			}
		}
	}
}
