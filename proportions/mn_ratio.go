package proportions

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
//
// The limits are the roots of a cubic in a parametrisation of the
// restricted fit (see ratioScoreLimits in ratio_score.go), found by a
// safeguarded Halley search in two or three steps.
var MiettinenNurminenRatio = IntervalMethod{
	Key:        "miettinen-nurminen-ratio",
	Name:       "Miettinen–Nurminen score (ratio)",
	Scale:      Ratio,
	Symmetric:  true,
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "all θ with |p1 − θ·p2| ≤ z·√((N/(N−1))·(p̃1(1−p̃1)/n1 + θ²·p̃2(1−p̃2)/n2)), p̃ the maximum-likelihood estimates under π1 = θ·π2",
	Limits: func(c Counts, conf Confidence) (float64, float64) {
		return ratioScoreLimits(c, conf, mnVarianceFactor(c))
	},
}
