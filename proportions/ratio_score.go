package proportions

import "math"

// ratioScore returns the signed score statistic for H0: π1/π2 = θ,
//
//	z(θ) = (p1 − θ·p2) / √(f·(p̃1(1−p̃1)/n1 + θ²·p̃2(1−p̃2)/n2)),
//
// with (p̃1, p̃2) the maximum-likelihood estimates under π1 = θπ2 and f = 1
// (Farrington–Manning) or N/(N − 1) (Miettinen–Nurminen). z falls as θ
// grows. Numerator and standard deviation are both divided by max(θ, 1), so
// huge θ cannot overflow θ².
func ratioScore(c Counts, theta, f float64) float64 {
	fit := fitUnderRatio(c, theta)
	s := math.Max(theta, 1)
	ts := theta / s
	num := c.P1()/s - ts*c.P2()
	v := f * (fit.p1*fit.q1/(float64(c.N1)*s*s) + ts*ts*fit.p2*fit.q2/float64(c.N2))
	return signedScore(num, v)
}

// FarringtonManningRatio is the score test of H0: π1/π2 = ρ0 against the
// chosen alternative, the usual test for non-inferiority or superiority
// margins stated as a ratio:
//
//	z = (p1 − ρ0·p2) / √(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2),
//
// where (p̃1, p̃2) maximise the likelihood under π1 = ρ0·π2 (closed form, see
// restricted_ratio.go), with normal p-values. Farrington CP, Manning G
// (1990), "Test statistics and sample size formulae for comparative binomial
// trials with null hypothesis of non-zero risk difference or non-unity
// relative risk", Statistics in Medicine 9:1447–1454. Its square is
// Koopman's (1984) chi-square, so it inverts to the Koopman interval; at
// ρ0 = 1 it is the Pearson chi-square test. Zero events in both groups give
// z = 0 (p = 1): such data carry no information about the ratio.
var FarringtonManningRatio = TestMethod{
	Key:        "fm-ratio-test",
	Name:       "Farrington–Manning score test (ratio)",
	Citation:   "Farrington CP, Manning G (1990). Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine 9:1447–1454.",
	Definition: "z = (p1 − ρ0·p2) / √(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2), with p̃1 = ρ0·p̃2 the maximum-likelihood estimates under π1/π2 = ρ0; normal p-value",
	Family:     Ratio,
	Margins:    true,
	Run: func(c Counts, h Hypothesis) TestResult {
		return ratioScoreTest(c, h, 1, "fm-ratio-test", "Farrington–Manning score test (ratio)")
	},
}

// MiettinenNurminenRatioTest is the score test of H0: π1/π2 = ρ0 with
// Miettinen and Nurminen's variance factor N/(N − 1):
//
//	z = (p1 − ρ0·p2) / √((N/(N−1))·(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2)),
//
// with normal p-values; it inverts to the Miettinen–Nurminen ratio interval.
// Miettinen O, Nurminen M (1985), "Comparative analysis of two rates",
// Statistics in Medicine 4:213–226.
var MiettinenNurminenRatioTest = TestMethod{
	Key:        "mn-ratio-test",
	Name:       "Miettinen–Nurminen score test (ratio)",
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "z = (p1 − ρ0·p2) / √((N/(N−1))·(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2)), restricted maximum-likelihood p̃ under π1/π2 = ρ0; normal p-value",
	Family:     Ratio,
	Margins:    true,
	Run: func(c Counts, h Hypothesis) TestResult {
		return ratioScoreTest(c, h, mnVarianceFactor(c), "mn-ratio-test", "Miettinen–Nurminen score test (ratio)")
	},
}

func ratioScoreTest(c Counts, h Hypothesis, f float64, key, name string) TestResult {
	z := ratioScore(c, h.Null, f)
	return zTestResult(z, h, Ratio, key, name)
}

// zTestResult fills a TestResult for a z statistic with normal p-values.
func zTestResult(z float64, h Hypothesis, fam Family, key, name string) TestResult {
	p, logp := normalPValue(z, h.Alternative)
	crit := normalCritical(h.Alpha(), h.Alternative)
	r := TestResult{
		Method: key, Name: name, Family: fam, StatisticName: "z", Statistic: z,
		PValue: p, LogPValue: logp, CriticalValue: &crit,
	}
	r.decide(h)
	return r
}
