package operating

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// Truth returns the true value of a scale's parameter at success rates
// (π1, π2), and whether it is defined:
//
//   - difference: π1 − π2, always defined;
//   - ratio: π1/π2, which is +Inf when π2 = 0 < π1 and undefined (0/0) at
//     π1 = π2 = 0;
//   - odds ratio: π1(1−π2) / (π2(1−π1)), which is 0 when only the numerator
//     vanishes, +Inf when only the denominator vanishes, and undefined (0/0)
//     at π1 = π2 = 0 and π1 = π2 = 1;
//   - proportion: π1.
//
// Coverage at an undefined truth is not defined: surfaces mark those grid
// points and leave them out of every summary. An infinite truth is covered
// exactly when the interval reaches +∞ (and a truth of 0 when it reaches 0).
func Truth(f proportions.Scale, pi1, pi2 float64) (theta float64, defined bool) {
	switch f {
	case proportions.Difference:
		return pi1 - pi2, true
	case proportions.Ratio:
		return quotient(pi1, pi2)
	case proportions.OddsRatio:
		return quotient(pi1*(1-pi2), pi2*(1-pi1))
	}
	return pi1, true
}

func quotient(num, den float64) (float64, bool) {
	switch {
	case num == 0 && den == 0:
		return math.NaN(), false
	case den == 0:
		return math.Inf(1), true
	}
	return num / den, true
}
