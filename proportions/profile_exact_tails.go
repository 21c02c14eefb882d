package proportions

import "context"

// ProfileExactTails is the "exact" interval for π1 − π2 from profile-
// likelihood tail areas: the nuisance parameter is set to its restricted
// maximum-likelihood value rather than maximised over, and the lower limit
// is the δ with
//
//	P(D ≥ d | π̃1(δ), π̃2(δ)) = α/2,
//
// the upper the δ with P(D ≤ d | π̃1(δ), π̃2(δ)) = α/2, where D = X1/n1 −
// X2/n2 for independent binomials at the restricted fit (RestrictedMLE)
// and d the observed difference. Method 8 of Newcombe RG (1998), "Interval
// estimation for the difference between independent proportions:
// comparison of eleven methods", Statistics in Medicine 17:873–890.
// Despite the name its coverage is not guaranteed (Exact is false): the
// exact unconditional intervals (ChanZhang, AgrestiMin) take the supremum
// over the nuisance parameter instead.
//
// See profile_tail_area.go for the computation. Zero cells: with
// x1 = x2 = 0 each limit is a Clopper–Pearson limit of one group (the
// restricted fit puts the other group's rate at 0); the interval never
// collapses to a point, and a limit is ±1 only at p1 − p2 = ±1. Limits
// stay in [−1, 1] and are never NaN. Symmetric: exchanging the groups or
// events and non-events mirrors D and the restricted fit.
//
// Cost: O(√n) per tail evaluation; about 40 µs per interval at 20 per
// group, 0.1 ms at 100, 0.4–0.6 ms at 1000 and 3 ms at 10⁴ per group on a
// shared 2-core machine (BenchmarkProfileTailIntervals), so
// it carries a TrialLimit: the default analysis leaves it out and
// WithScope(ScopeAll) runs it up to profileTailTrialLimit trials in all.
// The coverage engine enumerates it like any other method.
var ProfileExactTails = IntervalMethod{
	Key:        "profile-exact-tails",
	Name:       "Profile-likelihood tail areas (“exact”)",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 8).",
	Definition: "lower: the δ with P(D ≥ d) = α/2, upper: the δ with P(D ≤ d) = α/2, D = X1/n1 − X2/n2 for binomials at the MLE (π̃1, π̃2) under π1 − π2 = δ, d the observed difference",
	Symmetric:  true,
	TrialLimit: profileTailTrialLimit,
	LimitsContext: func(ctx context.Context, c Counts, conf Confidence) (float64, float64, error) {
		return profileTailLimitsContext(ctx, c, conf, 1)
	},
	Cost:   profileTailCost,
	Limits: profileExactTailsLimits,
}

func profileExactTailsLimits(c Counts, conf Confidence) (lower, upper float64) {
	return profileTailLimits(c, conf, 1)
}
