package proportions

import "math"

// FarringtonManningTest is the score test of H0: π1 − π2 = δ against the chosen
// alternative, for any δ in (−1, 1) (δ ≠ 0: non-inferiority, superiority or
// equivalence margins):
//
//	z = (p1 − p2 − δ) / √(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2),
//
// where (π̃1, π̃2) maximise the likelihood under π1 − π2 = δ
// (RestrictedMLE), with normal p-values: upper tail for Greater, lower tail
// for Less, both tails for TwoSided. Farrington CP, Manning G (1990), "Test
// statistics and sample size formulae for comparative binomial trials with
// null hypothesis of non-zero risk difference or non-unity relative risk",
// Statistics in Medicine 9:1447–1454. At δ = 0 the restricted MLE is the
// pooled proportion and z is the pooled two-proportion z, whose square is
// Pearson's chi-square. Mee's interval is the set of δ this test does not
// reject, so the two always agree (see FarringtonManningPair).
//
// Degenerate case: when every unit in both groups has the same outcome and
// δ = 0 the statistic is 0/0; it is defined as z = 0, p = 1 (the data give
// no evidence of a difference).
var FarringtonManningTest = TestMethod{
	Key:        "farrington-manning-test",
	Name:       "Farrington–Manning score test",
	Citation:   "Farrington CP, Manning G (1990). Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine 9:1447–1454.",
	Definition: "z = (p1 − p2 − δ) / √(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2), (π̃1, π̃2) the maximum-likelihood estimates under π1 − π2 = δ; normal p-value. At δ = 0 the pooled z test.",
	Scale:      Difference,
	Margins:    true,
	Run:        farringtonManningRun,
}

func farringtonManningRun(c Counts, h Hypothesis) TestResult {
	return zTestResult(scoreTestZ(c, h.Null, 1), h, Difference, "farrington-manning-test", "Farrington–Manning score test")
}

// scoreTestZ is the score tests' statistic, z(δ) with variance factor k.
// At δ = 0 the restricted MLE is the pooled rate, so z is the pooled z,
// whose square is Pearson's X² = (O − E)²·Σ 1/E: it is computed that way
// (tableDeviation), without a restricted fit, which also makes z² = X²
// hold to rounding. The degenerate all-or-none table gives 0, as
// documented on FarringtonManning.
func scoreTestZ(c Counts, delta, k float64) float64 {
	if delta != 0 {
		return scoreZ(c, delta, k)
	}
	d, recip := tableDeviation(c)
	return math.Copysign(math.Sqrt(d*d*recip/k), d)
}

// MiettinenNurminenTest is the score test of H0: π1 − π2 = δ with
// Miettinen and Nurminen's variance factor N/(N − 1), N = n1 + n2:
//
//	z = (p1 − p2 − δ) / √(N/(N−1) · (π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2)),
//
// with (π̃1, π̃2) the restricted MLE under π1 − π2 = δ and normal p-values.
// Miettinen O, Nurminen M (1985), "Comparative analysis of two rates",
// Statistics in Medicine 4:213–226. The factor makes the variance
// unbiased under the null; the test is slightly more conservative than
// FarringtonManning and inverts to the MiettinenNurminen interval. The
// degenerate case is as for FarringtonManning (z = 0, p = 1).
var MiettinenNurminenTest = TestMethod{
	Key:        "miettinen-nurminen-test",
	Name:       "Miettinen–Nurminen score test",
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "z = (p1 − p2 − δ) / √(N/(N−1)·(π̃1(1−π̃1)/n1 + π̃2(1−π̃2)/n2)), (π̃1, π̃2) the maximum-likelihood estimates under π1 − π2 = δ, N = n1 + n2; normal p-value",
	Scale:      Difference,
	Margins:    true,
	Run:        miettinenNurminenRun,
}

func miettinenNurminenRun(c Counts, h Hypothesis) TestResult {
	return zTestResult(scoreTestZ(c, h.Null, mnVarianceFactor(c)), h, Difference, "miettinen-nurminen-test", "Miettinen–Nurminen score test")
}

// FarringtonManningPair returns the Farrington–Manning score test and Mee's
// interval, which inverts it: at the same level the interval excludes δ
// exactly when the two-sided test of π1 − π2 = δ rejects, and the lower
// (upper) limit of the interval at level 1 − 2α is the one-sided bound
// matching the Greater (Less) test at α.
func FarringtonManningPair() (TestMethod, IntervalMethod) { return FarringtonManningTest, Mee }

// MiettinenNurminenPair returns the Miettinen–Nurminen score test and the
// Miettinen–Nurminen interval, which inverts it (as for
// FarringtonManningPair).
func MiettinenNurminenPair() (TestMethod, IntervalMethod) {
	return MiettinenNurminenTest, MiettinenNurminen
}
