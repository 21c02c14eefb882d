package proportions

import "math"

// WilsonCC is Wilson's score interval with a continuity correction, the
// set of π with |p − π| − 1/(2n) ≤ z·√(π(1−π)/n):
//
//	lower = (2x + z² − 1 − z·√(z² − 2 − 1/n + 4p(n(1−p) + 1))) / (2(n + z²)),
//	upper = (2x + z² + 1 + z·√(z² + 2 − 1/n + 4p(n(1−p) − 1))) / (2(n + z²)),
//
// with lower = 0 when x = 0 and upper = 1 when x = n. Method 4 of Newcombe
// RG (1998a), "Two-sided confidence intervals for the single proportion:
// comparison of seven methods", Statistics in Medicine 17:857–872. It is
// wider than Wilson's interval and errs on the conservative side; Newcombe's
// continuity-corrected hybrid interval for a difference is built from it.
//
// At x = 0 and x = n the boundary rule is the paper's (the formula is not
// used there: its square root can be negative at low levels). For
// 1 ≤ x ≤ n−1 the formula itself stays inside [0, 1] (at x = 1 the lower
// limit's numerator squared exceeds the root's square by 1 + z²/n).
var WilsonCC = RateMethod{
	Key:        "wilson-cc-rate",
	Name:       "Wilson score with continuity correction",
	Citation:   "Newcombe RG (1998). Two-sided confidence intervals for the single proportion: comparison of seven methods. Statistics in Medicine 17:857–872 (method 4).",
	Definition: "the π with |p − π| − 1/(2n) ≤ z·√(π(1−π)/n); closed form (2x + z² ∓ 1 ∓ z·√(z² ∓ 2 − 1/n + 4p(n(1−p) ± 1)))/(2(n + z²)), lower 0 at x = 0, upper 1 at x = n",
	Limits:     wilsonCCLimits,
}

func wilsonCCLimits(x, n int64, conf Confidence) (lower, upper float64) {
	return wilsonCCAt(x, n, conf.Z)
}

// wilsonCCAt computes the continuity-corrected Wilson limits for z.
func wilsonCCAt(x, n int64, z float64) (lower, upper float64) {
	fx, fn := float64(x), float64(n)
	p := fx / fn
	z2 := z * z
	den := 2 * (fn + z2)
	lower, upper = 0, 1
	if x > 0 {
		// 4p(n(1−p)+1) = 4x(n−x+1)/n ≥ 4 for x ≥ 1, so the root is real.
		lower = (2*fx + z2 - 1 - z*math.Sqrt(z2-2-1/fn+4*p*(fn*(1-p)+1))) / den
	}
	if x < n {
		// 4p(n(1−p)−1) = 4x(n−x−1)/n ≥ 0 for x ≤ n−1.
		upper = (2*fx + z2 + 1 + z*math.Sqrt(z2+2-1/fn+4*p*(fn*(1-p)-1))) / den
	}
	return lower, upper
}
