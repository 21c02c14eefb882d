package proportions

// The confidence levels the library accepts (see ValidateLevel).
//
// Every registered method is correct, with ordered limits that are not
// NaN and results that marshal, for every level in [MinLevel, MaxLevel];
// FuzzLevels checks that over levels and tables. Outside the range
// floating point, not statistics, decides the answer:
//   - Near 1, α = 1 − level is known only to the spacing of doubles below
//     1 (1.1e−16): at 1 − 1e−15 it is off by 10 %, and 0.9999999999999999
//     makes (1 + level)/2 round to 1, so z = +∞ (Wilson, Newcombe and Katz
//     then gave NaN limits and the critical value did not marshal). At
//     MaxLevel = 1 − 1e−12, α carries four significant digits and z ≈ 7.13.
//   - Near 0, an interval shrinks to a point, and the rounding of a root
//     search or of a quantile can put the lower limit above the upper one
//     (Baptista–Pike from about 1e−30, Cornfield's mid-p and Jeffreys at
//     1e−100). Levels that small answer no question; MinLevel = 1e−6
//     keeps nine orders of magnitude between the range and the first
//     failure seen.
const (
	// MinLevel is the smallest accepted confidence level.
	MinLevel = 1e-6
	// MaxLevel is the largest accepted confidence level, 1 − 10⁻¹².
	MaxLevel = 1 - 1e-12
)
