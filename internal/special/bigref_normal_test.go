package special

import (
	"math"
	"math/big"
)

// High-precision references for the normal tail, independent of math.Erfc
// (which NormalUpperTail uses) and of the asymptotic series it switches to.
//
// bigUpperTail sums the everywhere-convergent series of Abramowitz &
// Stegun (1964), 26.2.11,
//
//	Φ(z) = ½ + φ(z)·Σ_{n≥0} z^{2n+1} / (1·3·5···(2n+1)),
//
// in math/big arithmetic with enough bits to survive the cancellation in
// Q(z) = 1 − Φ(z) = ½ − φ(z)·Σ, about z²/(2 ln 2) bits for z > 0. The terms
// are all of one sign, so the sum itself is accurate to the working
// precision; π and e^y come from their own series below (Machin's formula
// and the Taylor series with argument halving). Cost grows like z⁴, so it is
// used up to z ≈ 40 (Q ≈ 1e−350, past where float64 underflows), and the
// continued fraction takes over beyond.
//
// cfLogUpperTail is Laplace's continued fraction for Mills' ratio (A&S
// 26.2.14), Q(z) = φ(z) / (z + 1/(z + 2/(z + 3/(z + …)))), evaluated in
// float64 from the back and returned as log Q(z). It is a different
// expansion from the asymptotic series of NormalUpperTail (it converges for
// every z > 0 rather than diverging), and the tests check it against
// bigUpperTail where both apply before trusting it beyond.

// bigPi returns π to prec bits by Machin's formula π = 16·atan(1/5) −
// 4·atan(1/239).
func bigPi(prec uint) *big.Float {
	w := prec + 32
	atanInv := func(n int64) *big.Float {
		x := new(big.Float).SetPrec(w).Quo(big.NewFloat(1).SetPrec(w), new(big.Float).SetPrec(w).SetInt64(n))
		x2 := new(big.Float).SetPrec(w).Mul(x, x)
		sum := new(big.Float).SetPrec(w).Set(x)
		pow := new(big.Float).SetPrec(w).Set(x)
		term := new(big.Float).SetPrec(w)
		for k := int64(1); ; k++ {
			pow.Mul(pow, x2)
			term.Quo(pow, new(big.Float).SetPrec(w).SetInt64(2*k+1))
			if k%2 == 1 {
				sum.Sub(sum, term)
			} else {
				sum.Add(sum, term)
			}
			if term.MantExp(nil) < sum.MantExp(nil)-int(w) {
				return sum
			}
		}
	}
	pi := new(big.Float).SetPrec(w).Mul(big.NewFloat(16), atanInv(5))
	pi.Sub(pi, new(big.Float).SetPrec(w).Mul(big.NewFloat(4), atanInv(239)))
	return pi.SetPrec(prec)
}

// bigExp returns e^y for y ≥ 0 to prec bits: the Taylor series at
// y/2^k < ½, then k squarings (each costs about a bit, paid for by k extra
// working bits).
func bigExp(y *big.Float, prec uint) *big.Float {
	k := max(0, y.MantExp(nil)+1)
	w := prec + uint(k) + 32
	r := new(big.Float).SetPrec(w).SetMantExp(y, -k)
	sum := big.NewFloat(1).SetPrec(w)
	term := big.NewFloat(1).SetPrec(w)
	for n := int64(1); ; n++ {
		term.Mul(term, r)
		term.Quo(term, new(big.Float).SetPrec(w).SetInt64(n))
		sum.Add(sum, term)
		if term.Sign() == 0 || term.MantExp(nil) < sum.MantExp(nil)-int(w) {
			break
		}
	}
	for range k {
		sum.Mul(sum, sum)
	}
	return sum.SetPrec(prec)
}

// bigUpperTail returns Q(z) = P(Z ≥ z) for a standard normal Z, given
// z² (exactly: the chi-square tail passes its x) and the sign of z, by the
// series above. z = ±√z² is formed at the working precision, since the
// cancellation in ½ − φ(z)·Σ magnifies any error in z as much as one in
// the sum. The relative error of the result is below 2^−100.
func bigUpperTail(z2 *big.Float, negative bool) *big.Float {
	zf, _ := z2.Float64()
	w := 160 + uint(zf*0.7214) // 0.7214 > 1/(2 ln 2): the bits the cancellation costs
	z := new(big.Float).SetPrec(w).Sqrt(new(big.Float).SetPrec(w).Set(z2))
	if negative {
		z.Neg(z)
	}
	sum := new(big.Float).SetPrec(w).Set(z)
	term := new(big.Float).SetPrec(w).Set(z)
	for n := int64(0); ; n++ {
		term.Mul(term, z2)
		term.Quo(term, new(big.Float).SetPrec(w).SetInt64(2*n+3))
		sum.Add(sum, term)
		if float64(n) > zf && (term.Sign() == 0 || term.MantExp(nil) < sum.MantExp(nil)-int(w)) {
			break
		}
	}
	// φ(z) = 1/(e^{z²/2}·√(2π))
	half := new(big.Float).SetPrec(w).SetMantExp(z2, -1)
	den := bigExp(half, w)
	twoPi := new(big.Float).SetPrec(w).SetMantExp(bigPi(w), 1)
	den.Mul(den, new(big.Float).SetPrec(w).Sqrt(twoPi))
	q := new(big.Float).SetPrec(w).Quo(sum, den)
	return q.Sub(big.NewFloat(0.5).SetPrec(w), q)
}

// bigUpperTailAt is bigUpperTail at a float64 z (z² formed exactly).
func bigUpperTailAt(z float64) *big.Float {
	bz := new(big.Float).SetFloat64(z)
	return bigUpperTail(new(big.Float).SetPrec(200).Mul(bz, bz), z < 0)
}

// logOfBig returns log x for x > 0 as a float64, from x = m·2^e with
// ½ ≤ m < 1: log m + e·ln 2, accurate to a few ulps of the result even
// where x is far outside the float64 range.
func logOfBig(x *big.Float) float64 {
	m := new(big.Float)
	e := x.MantExp(m)
	mf, _ := m.Float64()
	return math.Log(mf) + float64(e)*math.Ln2
}

// cfLogUpperTail returns log Q(z) for z ≥ 5 by Laplace's continued
// fraction, evaluated backward from depth 2000 (ample at z = 5; beyond, the
// tail of the fraction matters less and less). z² is split exactly into
// hi + lo (by FMA) so that −z²/2 carries no rounding of its own beyond the
// final sum.
func cfLogUpperTail(z float64) float64 {
	f := z
	for k := 2000; k >= 1; k-- {
		f = z + float64(k)/f
	}
	hi := z * z
	lo := math.FMA(z, z, -hi)
	return -hi/2 - lo/2 - 0.5*math.Log(2*math.Pi) - math.Log(f)
}
