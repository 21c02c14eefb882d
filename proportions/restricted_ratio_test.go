package proportions

import (
	"math"
	"math/big"
	"testing"
)

// bigQuadraticRoots returns both roots of a·p² + b·p + c = 0 in 400-bit
// arithmetic, smaller first (a ≠ 0, real roots).
func bigQuadraticRoots(a, b, c *big.Float) (lo, hi *big.Float) {
	const prec = 400
	nf := func() *big.Float { return new(big.Float).SetPrec(prec) }
	disc := nf().Sub(nf().Mul(b, b), nf().Mul(nf().Mul(big.NewFloat(4).SetPrec(prec), a), c))
	if disc.Sign() < 0 {
		disc.SetInt64(0)
	}
	root := nf().Sqrt(disc)
	two := nf().Mul(big.NewFloat(2).SetPrec(prec), a)
	r1 := nf().Quo(nf().Sub(nf().Neg(b), root), two)
	r2 := nf().Quo(nf().Add(nf().Neg(b), root), two)
	if r1.Cmp(r2) > 0 {
		r1, r2 = r2, r1
	}
	return r1, r2
}

func bf(v float64) *big.Float { return new(big.Float).SetPrec(400).SetFloat64(v) }

// relErr returns |got − want| / |want| with want in high precision (0 when
// both are 0).
func relErr(got float64, want *big.Float) float64 {
	w, _ := want.Float64()
	if w == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-w) / math.Abs(w)
}

// TestRestrictedFitHighPrecision compares the restricted fits, p̃ and
// 1 − p̃ for both groups, with the roots of the same likelihood equations
// solved in 400-bit arithmetic (math/big), on tables with rates within
// 1e−9 of 0 or 1 and up to 10¹³ trials, where double-precision roots of
// nearly coinciding quadratic roots would lose half their digits, and at
// θ and ψ = 10^±17, where a complement taken from the other group's fit
// would keep none.
func TestRestrictedFitHighPrecision(t *testing.T) {
	tables := []Counts{
		{999999997, 1e9, 999999990, 1e9}, {1e12 - 3, 1e12, 1e12 - 10, 1e12}, {5, 1 << 40, 1 << 40, 1 << 40},
		{3, 1e9, 7, 1e9}, {36, 40, 16, 80}, {1e13, 1e13, 1e13 - 10, 1e13}, {0, 1e6, 999999, 1e6}, {2, 6, 3, 7},
	}
	one := bf(1)
	for _, c := range tables {
		x1, n1, x2, n2 := bf(float64(c.X1)), bf(float64(c.N1)), bf(float64(c.X2)), bf(float64(c.N2))
		n := new(big.Float).SetPrec(400).Add(n1, n2)
		m := new(big.Float).SetPrec(400).Add(x1, x2)
		for _, theta := range []float64{1e-17, 0.3, 0.999999999, 1, 1.000000003, 1.7, 40, 1e17} {
			th := bf(theta)
			mul := func(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(400).Mul(a, b) }
			add := func(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(400).Add(a, b) }
			sub := func(a, b *big.Float) *big.Float { return new(big.Float).SetPrec(400).Sub(a, b) }
			// Ratio: N·θ·p² − (n1θ + x1 + n2 + x2θ)·p + (x1 + x2) = 0, smaller root.
			p2, _ := bigQuadraticRoots(mul(n, th), new(big.Float).Neg(add(add(mul(n1, th), x1), add(n2, mul(x2, th)))), m)
			p1 := mul(th, p2)
			f := fitUnderRatio(c, theta)
			for i, pair := range []struct {
				got  float64
				want *big.Float
			}{{f.p1, p1}, {f.q1, sub(one, p1)}, {f.p2, p2}, {f.q2, sub(one, p2)}} {
				if e := relErr(pair.got, pair.want); e > 1e-12 {
					t.Errorf("ratio %v θ=%v: component %d = %.17g, 400-bit %s (relative error %.2g)", c, theta, i, pair.got, pair.want.Text('g', 20), e)
				}
			}
			// Odds ratio: n2(ψ−1)·p² + (n1ψ + n2 − m(ψ−1))·p − m = 0, root in [0, 1].
			if theta == 1 {
				continue
			}
			psi1 := sub(th, one)
			lo, hi := bigQuadraticRoots(mul(n2, psi1), sub(add(mul(n1, th), n2), mul(m, psi1)), new(big.Float).Neg(m))
			q := hi
			if lo.Sign() >= 0 && lo.Cmp(one) <= 0 {
				q = lo
			}
			// p̃1 = ψp̃2 / (1 − p̃2 + ψp̃2)
			den := add(sub(one, q), mul(th, q))
			o1 := new(big.Float).SetPrec(400).Quo(mul(th, q), den)
			g := fitUnderOddsRatio(c, theta)
			for i, pair := range []struct {
				got  float64
				want *big.Float
			}{{g.p1, o1}, {g.q1, sub(one, o1)}, {g.p2, q}, {g.q2, sub(one, q)}} {
				if e := relErr(pair.got, pair.want); e > 1e-12 {
					t.Errorf("odds ratio %v ψ=%v: component %d = %.17g, 400-bit %s (relative error %.2g)", c, theta, i, pair.got, pair.want.Text('g', 20), e)
				}
			}
		}
	}
}
