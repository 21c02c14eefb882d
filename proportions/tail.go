package proportions

import "math"

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

// normalPValue returns the p-value of a z statistic for the alternative:
// upper tail for Greater, lower tail for Less, twice the smaller tail
// (capped at 1) for TwoSided.
func normalPValue(z float64, a Alternative) (p, logp float64) {
	switch a {
	case Greater:
		return NormalUpperTail(z)
	case Less:
		return NormalUpperTail(-z)
	}
	p, logp = NormalUpperTail(math.Abs(z))
	p, logp = 2*p, logp+math.Ln2
	if p >= 1 {
		return 1, 0
	}
	return p, logp
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

// normalCritical returns the critical value of a z test at α for the
// alternative: z_{1−α/2} two-sided, z_{1−α} one-sided (negative for Less).
func normalCritical(alpha float64, a Alternative) float64 {
	switch a {
	case Greater:
		return NormalQuantile(1 - alpha)
	case Less:
		return -NormalQuantile(1 - alpha)
	}
	return NormalQuantile(1 - alpha/2)
}

// critical is normalCritical for the hypothesis's level and alternative;
// the two-sided value is the one its Confidence already holds, which saves
// a quantile per test (an analysis runs half a dozen tests).
func (h Hypothesis) critical() float64 {
	if h.Alternative == TwoSided && h.Conf.Z > 0 {
		return h.Conf.Z
	}
	return normalCritical(h.Alpha(), h.Alternative)
}
