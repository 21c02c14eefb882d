package special

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// NormalQuantile returns Φ⁻¹(p) for the standard normal distribution.
func NormalQuantile(p float64) float64 { return distuv.UnitNormal.Quantile(p) }

// NormalUpperTail returns P(Z ≥ z) for a standard normal Z, with its natural
// log. It uses erfc, accurate to full relative precision down to about
// 1e−308; beyond z ≈ 37.5, where that underflows, p is 0 and the log comes
// from the asymptotic expansion of Mills' ratio,
// log P(Z ≥ z) = log φ(z) − log z + log(1 − 1/z² + 3/z⁴ − 15/z⁶ + 105/z⁸)
// (Abramowitz & Stegun 1964, 26.2.12), accurate to double precision there.
func NormalUpperTail(z float64) (p, logp float64) {
	if math.IsNaN(z) {
		return math.NaN(), math.NaN()
	}
	if z < 37 {
		p = 0.5 * math.Erfc(z/math.Sqrt2)
		return p, math.Log(p)
	}
	if math.IsInf(z, 1) {
		return 0, math.Inf(-1)
	}
	z2 := z * z
	series := 1 - 1/z2 + 3/(z2*z2) - 15/(z2*z2*z2) + 105/(z2*z2*z2*z2)
	logp = -z2/2 - 0.5*math.Log(2*math.Pi) - math.Log(z) + math.Log(series)
	return math.Exp(logp), logp
}

// ChiSquare1UpperTail returns P(X ≥ x) for a chi-square variable with one
// degree of freedom, P = 2·P(Z ≥ √x), with its log.
func ChiSquare1UpperTail(x float64) (p, logp float64) {
	if x <= 0 {
		return 1, 0
	}
	p, logp = NormalUpperTail(math.Sqrt(x))
	p, logp = 2*p, logp+math.Ln2
	if p > 1 {
		return 1, 0
	}
	return p, logp
}
