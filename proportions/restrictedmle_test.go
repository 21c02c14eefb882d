package proportions

import (
	"math"
	"testing"
)

// The closed-form restricted MLE of Farrington & Manning (1990) /
// Miettinen & Nurminen (1985) against a brute-force maximisation of the
// constrained likelihood, over tables with zero and full cells and δ across
// (−1, 1).
func TestRestrictedMLEBruteForce(t *testing.T) {
	tables := []Counts{{56, 70, 48, 80}, {0, 10, 0, 20}, {10, 10, 0, 20}, {5, 56, 0, 29}, {3, 7, 7, 7}, {1, 1, 0, 1}, {0, 3, 3, 3}, {40, 400, 1, 9}}
	for _, c := range tables {
		for delta := -0.95; delta < 0.96; delta += 0.05 {
			p1, p2 := RestrictedMLE(c, delta)
			b1, _ := bruteRestrictedMLE(c, delta)
			if math.Abs(p1-b1) > 1e-7 || math.Abs(p1-p2-delta) > 1e-15 {
				t.Errorf("%v δ=%.2f: (%v, %v), brute force π1 = %v", c, delta, p1, p2, b1)
			}
			if p1 < 0 || p1 > 1 || p2 < 0 || p2 > 1 {
				t.Errorf("%v δ=%.2f: (%v, %v) outside [0, 1]", c, delta, p1, p2)
			}
		}
	}
}

// Under δ = 0 the restricted MLE is the pooled proportion (x1+x2)/(n1+n2).
func TestRestrictedMLEPooled(t *testing.T) {
	for _, c := range propertyTables() {
		p1, p2 := RestrictedMLE(c, 0)
		pooled := float64(c.X1+c.X2) / float64(c.N1+c.N2)
		if math.Abs(p1-pooled) > 1e-12 || p1 != p2 {
			t.Fatalf("%v: (%v, %v), pooled %v", c, p1, p2, pooled)
		}
	}
}

// The slope used by the score intervals' Newton steps against a central
// difference.
func TestRestrictedMLESlope(t *testing.T) {
	for _, c := range []Counts{{56, 70, 48, 80}, {10, 10, 0, 20}, {5, 56, 0, 29}, {3, 7, 7, 7}} {
		for _, delta := range []float64{-0.9, -0.3, -0.05, 0.05, 0.4, 0.9} {
			s := fitRestricted(c, delta).slope
			const h = 1e-6
			a, _ := RestrictedMLE(c, delta+h)
			b, _ := RestrictedMLE(c, delta-h)
			if math.Abs(s-(a-b)/(2*h)) > 1e-5 {
				t.Errorf("%v δ=%v: slope %v, central difference %v", c, delta, s, (a-b)/(2*h))
			}
		}
	}
}

// Rare and near-certain events (one defect in a million, germination of
// 999 997 in a million, one event in 2^45 trials): the restricted MLE keeps
// full relative precision, checked against bisection of the likelihood
// equation x1/t − y1/(1−t) + x2/u − y2/(1−u) = 0 (u = t − δ) carried down
// to adjacent floats.
func TestRestrictedMLERareEvents(t *testing.T) {
	tables := []Counts{{3, 1000000, 1, 1000000}, {30, 1000000, 10, 1000000}, {7, 1 << 45, 3, 1 << 44},
		{999997, 1000000, 999999, 1000000}, {0, 1000000, 2, 1000000}}
	for _, c := range tables {
		for _, delta := range []float64{-3e-6, -1e-6, 0, 1e-6, 3e-6, 1e-5} {
			p1, p2 := RestrictedMLE(c, delta)
			want := bisectLikelihood(c, delta)
			q1, wq := 1-p1, 1-want
			// π̃1 is determined relative to the larger of π̃1 and π̃2 (with x1 = 0
			// it is π̃2 + δ, a difference), 1 − π̃1 relative to itself.
			if math.Abs(p1-want) > 1e-13*math.Max(want, want-delta) || math.Abs(q1-wq) > 1e-9*wq {
				t.Errorf("%v δ=%g: π̃1 = %.17g, bisection %.17g", c, delta, p1, want)
			}
			if p2 < 0 || p2 > 1 {
				t.Errorf("%v δ=%g: π̃2 = %v", c, delta, p2)
			}
		}
	}
}

func bisectLikelihood(c Counts, delta float64) float64 {
	term := func(k int64, den float64) float64 {
		if k == 0 {
			return 0
		}
		return float64(k) / den
	}
	score := func(t float64) float64 {
		u := t - delta
		return term(c.X1, t) - term(c.N1-c.X1, 1-t) + term(c.X2, u) - term(c.N2-c.X2, 1-u)
	}
	lo, hi := math.Max(0, delta), math.Min(1, 1+delta)
	for {
		m := lo + (hi-lo)/2
		if m == lo || m == hi {
			return m
		}
		if score(m) > 0 {
			lo = m
		} else {
			hi = m
		}
	}
}
