package proportions

// Mee is the score interval for π1 − π2 that inverts the
// Farrington–Manning score test: the δ with
//
//	|p1 − p2 − δ| / √(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2) ≤ z,
//
// where (π̃1, π̃2) is the maximum-likelihood estimate under π1 − π2 = δ
// (RestrictedMLE). Mee RW (1984), "Confidence bounds for the difference
// between two probabilities" (letter), Biometrics 40:1175–1176; method 5 of
// Newcombe (1998). Unlike Miettinen–Nurminen it has no N/(N − 1) factor, so
// it excludes δ exactly when the two-sided Farrington–Manning test
// (FarringtonManning) rejects at the same level.
//
// Limits never leave [−1, 1], contain p1 − p2 and are never NaN (0/n and
// n/n in either group included; with x1 = 0 and x2 = n2 the lower limit is
// −1, with x1 = n1 and x2 = 0 the upper limit is 1). They are found by a
// bracketed Halley search along the curve of restricted fits, where the
// fit has a closed form, from Newcombe's hybrid limits (see score.go), to
// about 1e−14 of each limit's distance from p1 − p2, in about 0.25 µs per
// interval.
var Mee = IntervalMethod{
	Key:        "mee",
	Name:       "Mee score",
	Scale:      Difference,
	Citation:   "Mee RW (1984). Confidence bounds for the difference between two probabilities. Biometrics 40:1175–1176.",
	Definition: "the δ with |p1 − p2 − δ| ≤ z·√(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2), (π̃1, π̃2) the MLE under π1 − π2 = δ; inverts the Farrington–Manning score test",
	Symmetric:  true,
	Limits:     meeLimits,
}

func meeLimits(c Counts, conf Confidence) (lower, upper float64) {
	return scoreLimits(c, conf.Z, 1)
}
