package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/special"
)

// normalPValue returns the p-value of a z statistic for the alternative:
// upper tail for Greater, lower tail for Less, twice the smaller tail
// (capped at 1) for TwoSided.
func normalPValue(z float64, a Alternative) (p, logp float64) {
	switch a {
	case Greater:
		return special.NormalUpperTail(z)
	case Less:
		return special.NormalUpperTail(-z)
	}
	p, logp = special.NormalUpperTail(math.Abs(z))
	p, logp = 2*p, logp+math.Ln2
	if p >= 1 {
		return 1, 0
	}
	return p, logp
}

// normalCritical returns the critical value of a z test at α for the
// alternative: z_{1−α/2} two-sided, z_{1−α} one-sided (negative for Less).
func normalCritical(alpha float64, a Alternative) float64 {
	switch a {
	case Greater:
		return special.NormalQuantile(1 - alpha)
	case Less:
		return -special.NormalQuantile(1 - alpha)
	}
	return special.NormalQuantile(1 - alpha/2)
}

// critical is normalCritical for the hypothesis's level and alternative;
// the two-sided value is the one its Confidence already holds, which saves
// a quantile per test (an analysis runs half a dozen tests).
func (h Hypothesis) critical() float64 {
	if h.Alternative == TwoSided && h.Conf.Z > 0 {
		return h.Conf.Z
	}
	return normalCritical(h.Alpha(), h.Alternative)
}
