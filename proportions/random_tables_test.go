package proportions

import (
	"math"
	"math/rand/v2"
	"testing"
)

// randomTables draws tables with group sizes from 1 to 2^45 (log-uniform),
// mixing arbitrary counts, rare events (at most 5) and near-certain events
// in the first group; the seed is fixed so failures reproduce.
func randomTables(n int, seed uint64) []Counts {
	r := rand.New(rand.NewPCG(seed, seed+1))
	out := make([]Counts, 0, n)
	for range n {
		n1 := 1 + r.Int64N(1<<uint(r.IntN(45)+1))
		n2 := 1 + r.Int64N(1<<uint(r.IntN(45)+1))
		var x1, x2 int64
		switch r.IntN(3) {
		case 0:
			x1, x2 = r.Int64N(n1+1), r.Int64N(n2+1)
		case 1:
			x1, x2 = min(r.Int64N(6), n1), min(r.Int64N(6), n2)
		default:
			x1, x2 = n1-min(r.Int64N(6), n1), r.Int64N(n2+1)
		}
		out = append(out, Counts{X1: x1, N1: n1, X2: x2, N2: n2})
	}
	return out
}

// The restricted MLE against bisection of the likelihood equation on
// random tables and δ, including δ within 1e−6 of p1 − p2 and tiny δ.
func TestRestrictedMLERandomTables(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	for _, c := range randomTables(5000, 3) {
		var delta float64
		switch r.IntN(3) {
		case 0:
			delta = r.Float64()*1.98 - 0.99
		case 1:
			delta = (r.Float64()*2 - 1) * math.Pow(10, -r.Float64()*14)
		default:
			delta = math.Max(-0.999, math.Min(0.999, c.P1()-c.P2()+(r.Float64()*2-1)*1e-6))
		}
		p1, _ := RestrictedMLE(c, delta)
		want := bisectLikelihood(c, delta)
		if d := math.Abs(p1 - want); d > 1e-9*math.Max(want, want-delta) && d > 1e-12 {
			t.Errorf("%v δ=%g: π̃1 = %.17g, bisection %.17g", c, delta, p1, want)
		}
	}
}

// Mee's and Miettinen–Nurminen's limits against bisection on random tables:
// no NaN, the estimate inside, and agreement to 1e−8 of the width.
func TestScoreLimitsRandomTables(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range randomTables(1000, 5) {
		for _, m := range scorePairs {
			lo, hi := m.iv.Limits(c, conf)
			d := c.P1() - c.P2()
			wantLo, wantHi := bisectedScoreLimits(c, m.z, conf)
			tol := 1e-8 * (wantHi - wantLo)
			if math.IsNaN(lo) || math.IsNaN(hi) || lo > d || hi < d || math.Abs(lo-wantLo) > tol || math.Abs(hi-wantHi) > tol {
				t.Errorf("%s %v: (%.17g, %.17g), bisection (%.17g, %.17g)", m.iv.Name, c, lo, hi, wantLo, wantHi)
			}
		}
	}
}

// scorePairs are the score intervals with the statistics they invert.
var scorePairs = []struct {
	iv IntervalMethod
	z  func(Counts, float64) float64
}{{Mee, FarringtonManningZ}, {MiettinenNurminen, MiettinenNurminenZ}}

// bisectedScoreLimits finds the score interval's limits by plain bisection
// of the statistic z against ±z_{α/2}, an independent check of the fast
// root search.
func bisectedScoreLimits(c Counts, z func(Counts, float64) float64, conf Confidence) (lo, hi float64) {
	d := c.P1() - c.P2()
	lo, hi = -1, 1
	if d > -1 {
		lo = bisectScore(func(x float64) bool { return z(c, x) > conf.Z }, -1, d)
	}
	if d < 1 {
		hi = bisectScore(func(x float64) bool { return z(c, x) > -conf.Z }, d, 1)
	}
	return lo, hi
}
