package proportions

// MiettinenNurminen is the score interval for π1 − π2 whose variance
// carries the factor N/(N − 1), N = n1 + n2: the δ with
//
//	|p1 − p2 − δ| / √(N/(N−1) · (π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2)) ≤ z,
//
// where (π̃1, π̃2) is the maximum-likelihood estimate under π1 − π2 = δ
// (RestrictedMLE). Miettinen O, Nurminen M (1985), "Comparative analysis of
// two rates", Statistics in Medicine 4:213–226; method 6 of Newcombe (1998).
// The factor makes the variance unbiased under the null and the interval
// slightly wider than Mee's; it inverts MiettinenNurminenTest.
//
// Limits never leave [−1, 1], contain p1 − p2 and are never NaN (0/n and
// n/n in either group included; with x1 = 0 and x2 = n2 the lower limit is
// −1, with x1 = n1 and x2 = 0 the upper limit is 1). They are found by a
// bracketed Halley search along the curve of restricted fits, where the
// fit has a closed form, from Newcombe's hybrid limits (see score.go), to
// about 1e−14 of each limit's distance from p1 − p2, in about 0.25 µs per
// interval.
var MiettinenNurminen = IntervalMethod{
	Key:        "miettinen-nurminen",
	Name:       "Miettinen–Nurminen score",
	Scale:      Difference,
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "the δ with |p1 − p2 − δ| ≤ z·√(N/(N−1)·(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2)), (π̃1, π̃2) the MLE under π1 − π2 = δ, N = n1 + n2",
	Symmetric:  true,
	Limits:     miettinenNurminenLimits,
}

func miettinenNurminenLimits(c Counts, conf Confidence) (lower, upper float64) {
	return scoreLimits(c, conf.Z, mnVarianceFactor(c))
}
