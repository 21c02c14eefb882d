package proportions

import "math"

// MiettinenNurminenRatio is the score interval for π1/π2 of Miettinen and
// Nurminen: the set of θ with |z(θ)| ≤ z_{1−α/2}, where
//
//	z(θ) = (p1 − θ·p2) / √((N/(N−1))·(p̃1(1−p̃1)/n1 + θ²·p̃2(1−p̃2)/n2))
//
// and (p̃1, p̃2) maximise the likelihood under π1 = θπ2. Miettinen O,
// Nurminen M (1985), "Comparative analysis of two rates", Statistics in
// Medicine 4:213–226. It is Koopman's interval with the variance inflated
// by N/(N − 1), so slightly wider.
//
// Zero cells: no events in the first group gives lower limit 0; none in the
// second gives upper limit ∞; none in either gives [0, ∞] (the ratio is not
// estimable and the data say nothing about it). All trials being events
// (x = n) needs no special rule.
var MiettinenNurminenRatio = IntervalMethod{
	Key:        "mn-ratio",
	Name:       "Miettinen–Nurminen score (ratio)",
	Family:     Ratio,
	Symmetric:  true,
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "all θ with |p1 − θ·p2| ≤ z·√((N/(N−1))·(p̃1(1−p̃1)/n1 + θ²·p̃2(1−p̃2)/n2)), p̃ the maximum-likelihood estimates under π1 = θ·π2",
	Limits: func(c Counts, conf Confidence) (float64, float64) {
		return ratioScoreLimits(c, conf, mnVarianceFactor(c))
	},
}

// ratioScoreLimits inverts ratioScore with variance factor f.
func ratioScoreLimits(c Counts, conf Confidence, f float64) (lower, upper float64) {
	return ratioLimitsFrom(c, conf, func(t float64) float64 { return ratioScore(c, math.Exp(t), f) })
}

// ratioLimitsFrom inverts a decreasing ratio statistic z(log θ), applying
// the zero-event rules shared by the ratio score intervals: the side of a
// group with no events is 0 or ∞ without a search.
func ratioLimitsFrom(c Counts, conf Confidence, z func(t float64) float64) (lower, upper float64) {
	lower, upper = 0, math.Inf(1)
	if c.X1 == 0 && c.X2 == 0 {
		return lower, upper
	}
	t0, se := adjustedLogRatio(c)
	step := conf.Z * se
	lowerFn := func(t float64) float64 { return z(t) - conf.Z }
	upperFn := func(t float64) float64 { return z(t) + conf.Z }
	if c.X1 > 0 && c.X2 > 0 {
		// Start at the estimate, where the statistic is 0.
		t0 = math.Log(c.P1()) - math.Log(c.P2())
		return math.Exp(decreasingCrossingFrom(lowerFn, t0, -conf.Z, step)),
			math.Exp(decreasingCrossingFrom(upperFn, t0, conf.Z, step))
	}
	if c.X1 > 0 {
		lower = math.Exp(decreasingCrossing(lowerFn, t0, step))
	}
	if c.X2 > 0 {
		upper = math.Exp(decreasingCrossing(upperFn, t0, step))
	}
	return lower, upper
}
