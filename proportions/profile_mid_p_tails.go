package proportions

import "context"

// ProfileMidPTails is the mid-p interval for π1 − π2 from profile-
// likelihood tail areas: as ProfileExactTails, but the tables tied with
// the observed difference count half, so the lower limit is the δ with
//
//	P(D > d | π̃1(δ), π̃2(δ)) + ½·P(D = d | π̃1(δ), π̃2(δ)) = α/2
//
// and the upper limit the δ with P(D < d) + ½·P(D = d) = α/2, the
// binomials at the restricted maximum-likelihood fit (RestrictedMLE).
// Method 9 of Newcombe RG (1998), "Interval estimation for the difference
// between independent proportions: comparison of eleven methods",
// Statistics in Medicine 17:873–890.
//
// Zero cells: with x1 = x2 = 0 each limit is a mid-p limit of one group
// (MidPRate); the interval never collapses to a point, and a limit is ±1
// only at p1 − p2 = ±1. Limits stay in [−1, 1], never NaN. Symmetric, and
// costly like ProfileExactTails (same computation and TrialLimit).
var ProfileMidPTails = IntervalMethod{
	Key:        "profile-mid-p-tails",
	Name:       "Profile-likelihood tail areas (mid-p)",
	Scale:      Difference,
	Citation:   "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 9).",
	Definition: "lower: the δ with P(D > d) + ½P(D = d) = α/2, upper: the δ with P(D < d) + ½P(D = d) = α/2, D = X1/n1 − X2/n2 for binomials at the MLE (π̃1, π̃2) under π1 − π2 = δ",
	Symmetric:  true,
	TrialLimit: profileTailTrialLimit,
	LimitsContext: func(ctx context.Context, c Counts, conf Confidence) (float64, float64, error) {
		return profileTailLimitsContext(ctx, c, conf, 0.5)
	},
	Cost:   profileTailCost,
	Limits: profileMidPTailsLimits,
}

func profileMidPTailsLimits(c Counts, conf Confidence) (lower, upper float64) {
	return profileTailLimits(c, conf, 0.5)
}

// profileTailTrialLimit is the TrialLimit of the profile tail-area
// intervals (n1 + n2).
const profileTailTrialLimit = 1_000_000
