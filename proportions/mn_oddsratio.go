package proportions

import "math"

// oddsRatioScore returns the signed score statistic for H0: OR = ψ,
//
//	z(ψ) = (x1 − n1p̃1) · √((1/(n1p̃1(1−p̃1)) + 1/(n2p̃2(1−p̃2))) / f),
//
// with (p̃1, p̃2) the maximum-likelihood estimates under OR = ψ, which keep
// the observed number of events (so x2 − n2p̃2 = −(x1 − n1p̃1)), and f = 1
// or Miettinen and Nurminen's N/(N − 1). Its square with f = 1 is the
// Pearson chi-square of the table against the fitted counts. z falls as ψ
// grows.
func oddsRatioScore(c Counts, psi, f float64) float64 {
	fit := fitUnderOddsRatio(c, psi)
	n1, n2 := float64(c.N1), float64(c.N2)
	num := fit.residual1(c)
	v1, v2 := n1*fit.p1*fit.q1, n2*fit.p2*fit.q2
	if num == 0 {
		return 0
	}
	if v1 <= 0 || v2 <= 0 {
		return math.Copysign(math.Inf(1), num)
	}
	// The variance of x1 − n1p̃1 is f / (1/v1 + 1/v2) = f·v1·v2/(v1 + v2).
	return signedScore(num, f*v1*v2/(v1+v2))
}

// MiettinenNurminenOddsRatio is the score interval for the odds ratio of
// Miettinen and Nurminen: the set of ψ with |z(ψ)| ≤ z_{1−α/2}, where
//
//	z(ψ) = (x1 − n1p̃1) · √(((N−1)/N)·(1/(n1p̃1(1−p̃1)) + 1/(n2p̃2(1−p̃2))))
//
// and (p̃1, p̃2) maximise the likelihood under OR = ψ. Miettinen O, Nurminen
// M (1985), "Comparative analysis of two rates", Statistics in Medicine
// 4:213–226.
//
// Zero cells: lower limit 0 when the crude odds ratio is 0 (x1 = 0 or
// x2 = n2), upper limit ∞ when it is ∞ (x2 = 0 or x1 = n1); [0, ∞] when no
// trial or every trial is an event (not estimable: the table's margins
// carry no information about ψ).
var MiettinenNurminenOddsRatio = IntervalMethod{
	Key:        "mn-odds-ratio",
	Name:       "Miettinen–Nurminen score (odds ratio)",
	Family:     OddsRatio,
	Symmetric:  true,
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "all ψ with (x1 − n1p̃1)²·((N−1)/N)·(1/(n1p̃1(1−p̃1)) + 1/(n2p̃2(1−p̃2))) ≤ z², p̃ the maximum-likelihood estimates under odds ratio ψ",
	Limits:     mnOddsRatioLimits,
}

func mnOddsRatioLimits(c Counts, conf Confidence) (lower, upper float64) {
	f := mnVarianceFactor(c)
	return oddsRatioLimitsFrom(c, conf, func(t float64) float64 { return oddsRatioScore(c, math.Exp(t), f) })
}

// oddsRatioLimitsFrom inverts a decreasing odds-ratio statistic z(log ψ),
// applying the zero-cell rules shared by the odds-ratio score intervals:
// the side where the crude odds ratio is 0 or ∞ needs no search.
func oddsRatioLimitsFrom(c Counts, conf Confidence, z func(t float64) float64) (lower, upper float64) {
	lower, upper = 0, math.Inf(1)
	m := c.X1 + c.X2
	if m == 0 || m == c.N1+c.N2 {
		return lower, upper
	}
	t0, se := adjustedLogOddsRatio(c)
	step := conf.Z * se
	lowerFn := func(t float64) float64 { return z(t) - conf.Z }
	upperFn := func(t float64) float64 { return z(t) + conf.Z }
	hasLower, hasUpper := c.X1 > 0 && c.X2 < c.N2, c.X2 > 0 && c.X1 < c.N1
	if hasLower && hasUpper {
		// Start at the estimate, where the statistic is 0.
		a, b := float64(c.X1), float64(c.N1-c.X1)
		cc, d := float64(c.X2), float64(c.N2-c.X2)
		t0 = math.Log(a) + math.Log(d) - math.Log(b) - math.Log(cc)
		return math.Exp(decreasingCrossingFrom(lowerFn, t0, -conf.Z, step)),
			math.Exp(decreasingCrossingFrom(upperFn, t0, conf.Z, step))
	}
	if hasLower {
		lower = math.Exp(decreasingCrossing(lowerFn, t0, step))
	}
	if hasUpper {
		upper = math.Exp(decreasingCrossing(upperFn, t0, step))
	}
	return lower, upper
}

// MiettinenNurminenOddsRatioTest is the score test of H0: OR = ψ0 of
// Miettinen and Nurminen, with normal p-values:
//
//	z = (x1 − n1p̃1) · √(((N−1)/N)·(1/(n1p̃1(1−p̃1)) + 1/(n2p̃2(1−p̃2)))),
//
// (p̃1, p̃2) the maximum-likelihood estimates under OR = ψ0. At ψ0 = 1, z² is
// (N−1)/N times the Pearson chi-square. It inverts to the
// Miettinen–Nurminen odds-ratio interval. Miettinen O, Nurminen M (1985),
// "Comparative analysis of two rates", Statistics in Medicine 4:213–226.
// With no events at all, or only events, z = 0 (p = 1).
var MiettinenNurminenOddsRatioTest = TestMethod{
	Key:        "mn-odds-ratio-test",
	Name:       "Miettinen–Nurminen score test (odds ratio)",
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "z = (x1 − n1p̃1)·√(((N−1)/N)·(1/(n1p̃1(1−p̃1)) + 1/(n2p̃2(1−p̃2)))), p̃ the maximum-likelihood estimates under odds ratio ψ0; normal p-value",
	Family:     OddsRatio,
	Margins:    true,
	Run: func(c Counts, h Hypothesis) TestResult {
		z := oddsRatioScore(c, h.Null, mnVarianceFactor(c))
		return zTestResult(z, h, OddsRatio, "mn-odds-ratio-test", "Miettinen–Nurminen score test (odds ratio)")
	},
}
