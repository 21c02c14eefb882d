package proportions

import "github.com/propscope/propscope/internal/special"

// Jeffreys is the equal-tailed interval of the posterior of π under
// Jeffreys' prior Beta(½, ½), which after x events in n trials is
// Beta(x + ½, n − x + ½):
//
//	lower = B⁻¹(α/2; x + ½, n − x + ½),   upper = B⁻¹(1 − α/2; x + ½, n − x + ½).
//
// Brown LD, Cai TT, DasGupta A (2001), "Interval estimation for a binomial
// proportion", Statistical Science 16:101–133, recommend it (with Wilson's)
// for its coverage close to nominal and its equal tails.
//
// Boundary rule (theirs): lower = 0 when x = 0 and upper = 1 when x = n,
// since the posterior quantile there would exclude the observed extreme and
// coverage near π = 0 and 1 would suffer.
//
// The beta quantiles come from special.BetaLowerQuantile (betaquantile.go), to about
// 1e-15 relative precision in each limit and in its distance from 1.
// (gonum's distuv.Beta quantiles, used before, put the 99.9999% upper limit
// at x = 0 near 1 once n ≥ 60.)
var Jeffreys = RateMethod{
	Key:        "jeffreys-rate",
	Name:       "Jeffreys",
	Citation:   "Brown LD, Cai TT, DasGupta A (2001). Interval estimation for a binomial proportion. Statistical Science 16:101–133 (Jeffreys interval).",
	Definition: "quantiles α/2 and 1 − α/2 of Beta(x + ½, n − x + ½); lower 0 at x = 0 and upper 1 at x = n",
	Limits:     jeffreysLimits,
}

func jeffreysLimits(x, n int64, conf Confidence) (lower, upper float64) {
	t := special.NewBetaTail(conf.Alpha()/2, conf.Z)
	a, b := float64(x)+0.5, float64(n-x)+0.5
	lower, upper = 0, 1
	if x > 0 {
		lower, _ = special.BetaLowerQuantile(a, b, &t)
	}
	if x < n {
		// upper tail of Beta(a, b) = lower tail of Beta(b, a) at 1 − x
		_, upper = special.BetaLowerQuantile(b, a, &t)
	}
	return lower, upper
}
