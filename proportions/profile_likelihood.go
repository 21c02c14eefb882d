package proportions

import "github.com/propscope/propscope/internal/root"

// ProfileLikelihood is the true profile-likelihood interval for π1 − π2:
// the set of δ whose profile likelihood-ratio statistic does not exceed z²,
//
//	2·[ℓ(p1, p2) − ℓ(π̃1(δ), π̃2(δ))] ≤ z²,
//
// where ℓ is the two-binomial log-likelihood and (π̃1, π̃2) its maximum
// under π1 − π2 = δ (RestrictedMLE). Method 7 of Newcombe RG (1998),
// "Interval estimation for the difference between independent proportions:
// comparison of eleven methods", Statistics in Medicine 17:873–890. It
// inverts the likelihood-ratio (G²) test of δ.
//
// The profile log-likelihood is concave in δ, so each limit is the one
// crossing of z² on its side of p1 − p2, found by Brent's method on
// [−1, p1 − p2] and [p1 − p2, 1] to about 1e−11 (the statistic is a sum of
// binomialDeviance terms, accurate at any n). Limits stay in [−1, 1],
// contain p1 − p2 and are never NaN. Zero cells: it never collapses to a
// point; a limit is ±1 exactly when p1 − p2 = ±1 (x1 = n1 and x2 = 0 for
// the upper limit), where the statistic is 0. Symmetric: the likelihood is
// unchanged by exchanging the groups or events and non-events.
var ProfileLikelihood = IntervalMethod{
	Key:        "profile-likelihood",
	Name:       "Profile likelihood",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 7).",
	Definition: "the δ with 2[ℓ(p1, p2) − ℓ(π̃1, π̃2)] ≤ z², ℓ the binomial log-likelihood and (π̃1, π̃2) its maximum under π1 − π2 = δ",
	Symmetric:  true,
	Limits:     profileLikelihoodLimits,
	TrialLimit: anyTrials, // tens of microseconds: not in the quick scope
}

func profileLikelihoodLimits(c Counts, conf Confidence) (lower, upper float64) {
	zz := conf.Z * conf.Z
	g := func(delta float64) float64 {
		f := fitRestricted(c, delta)
		return binomialDeviance(c.X1, c.N1, f.p1, f.q1) + binomialDeviance(c.X2, c.N2, f.p2, f.q2) - zz
	}
	d := c.P1() - c.P2()
	lower, upper = d, d
	if d > -1 {
		if gl := g(-1); gl <= 0 {
			lower = -1
		} else {
			lower = root.Brent(g, -1, d, gl, -zz)
		}
	}
	if d < 1 {
		if gu := g(1); gu <= 0 {
			upper = 1
		} else {
			upper = root.Brent(g, d, 1, -zz, gu)
		}
	}
	return lower, upper
}
