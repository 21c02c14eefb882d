package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/root"
)

// LikelihoodRate is the likelihood-based interval for one proportion: the
// π whose likelihood-ratio statistic does not exceed z²,
//
//	2·[x·log(p/π) + (n − x)·log((1 − p)/(1 − π))] ≤ z²,   p = x/n.
//
// Method 7 of Newcombe RG (1998), "Two-sided confidence intervals for the
// single proportion: comparison of seven methods", Statistics in Medicine
// 17:857–872. It inverts the binomial likelihood-ratio test.
//
// At x = 0 the upper limit is 1 − exp(−z²/(2n)) and the lower limit 0; at
// x = n the lower limit is exp(−z²/(2n)) and the upper 1 (closed forms).
// Otherwise each limit is the crossing on its side of p, found on the
// logit scale t = log(π/(1 − π)) (root.DecreasingCrossingFrom, to about
// 1e−11 relative in π and 1 − π), with the statistic from
// binomialDeviance, accurate at any n. Limits lie in [0, 1], contain x/n
// and are never NaN.
var LikelihoodRate = RateMethod{
	Key:        "likelihood-rate",
	Name:       "Likelihood",
	Citation:   "Newcombe RG (1998). Two-sided confidence intervals for the single proportion: comparison of seven methods. Statistics in Medicine 17:857–872 (method 7, likelihood-based).",
	Definition: "the π with 2[x·log(p/π) + (n−x)·log((1−p)/(1−π))] ≤ z², p = x/n",
	Limits:     likelihoodRateLimits,
	TrialLimit: anyTrials, // tens of microseconds: not in the quick scope
}

func likelihoodRateLimits(x, n int64, conf Confidence) (lower, upper float64) {
	zz := conf.Z * conf.Z
	fn := float64(n)
	if x == 0 {
		return 0, -math.Expm1(-zz / (2 * fn))
	}
	if x == n {
		return math.Exp(-zz / (2 * fn)), 1
	}
	dev := func(t float64) float64 {
		// π = 1/(1 + e^−t), 1 − π = 1/(1 + e^t), each to full precision.
		return binomialDeviance(x, n, 1/(1+math.Exp(-t)), 1/(1+math.Exp(t)))
	}
	fx := float64(x)
	t0 := math.Log(fx / (fn - fx))
	step := conf.Z / math.Sqrt(fx*(fn-fx)/fn) // a standard error of t, times z
	tl := root.DecreasingCrossingFrom(func(t float64) float64 { return dev(t) - zz }, t0, -zz, step)
	tu := root.DecreasingCrossingFrom(func(t float64) float64 { return zz - dev(t) }, t0, zz, step)
	return 1 / (1 + math.Exp(-tl)), 1 / (1 + math.Exp(-tu))
}
