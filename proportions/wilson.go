package proportions

import "math"

// Wilson is the score interval for one proportion, the set of π whose score
// test |p − π|/√(π(1−π)/n) ≤ z does not reject:
//
//	(x + z²/2 ± z·√(x(n−x)/n + z²/4)) / (n + z²).
//
// Wilson EB (1927), "Probable inference, the law of succession, and
// statistical inference", Journal of the American Statistical Association
// 22:209–212; method 3 of Newcombe (1998a). Its coverage is close to nominal
// on average even for small n, and its limits never leave [0, 1].
//
// Boundary rule: the formula gives lower = 0 at x = 0 and upper = 1 at x = n
// in exact arithmetic; the limits are set to those values exactly so that
// rounding cannot put them a hair outside [0, 1].
var Wilson = RateMethod{
	Key:        "wilson-rate",
	Name:       "Wilson score",
	Citation:   "Wilson EB (1927). Probable inference, the law of succession, and statistical inference. Journal of the American Statistical Association 22:209–212.",
	Definition: "(x + z²/2 ± z·√(x(n−x)/n + z²/4)) / (n + z²): the π not rejected by the score test |p − π|/√(π(1−π)/n) ≤ z",
	Limits:     wilsonLimits,
}

func wilsonLimits(x, n int64, conf Confidence) (lower, upper float64) {
	return wilsonAt(x, n, conf.Z)
}

// wilsonAt computes the Wilson limits for the quantile z; Newcombe's hybrid
// intervals call it for each group.
func wilsonAt(x, n int64, z float64) (lower, upper float64) {
	fx, fn := float64(x), float64(n)
	z2 := z * z
	centre := fx + z2/2
	half := z * math.Sqrt(fx*(fn-fx)/fn+z2/4)
	den := fn + z2
	lower, upper = (centre-half)/den, (centre+half)/den
	if x == 0 {
		lower = 0
	}
	if x == n {
		upper = 1
	}
	return lower, upper
}
