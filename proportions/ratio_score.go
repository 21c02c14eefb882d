package proportions

import (
	"math"

	"github.com/propscope/propscope/internal/root"
)

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

// FarringtonManningRatioTest is the score test of H0: π1/π2 = ρ0 against the
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
var FarringtonManningRatioTest = TestMethod{
	Key:        "farrington-manning-ratio-test",
	Name:       "Farrington–Manning score test (ratio)",
	Citation:   "Farrington CP, Manning G (1990). Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine 9:1447–1454.",
	Definition: "z = (p1 − ρ0·p2) / √(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2), with p̃1 = ρ0·p̃2 the maximum-likelihood estimates under π1/π2 = ρ0; normal p-value",
	Scale:      Ratio,
	Margins:    true,
	Run: func(c Counts, h Hypothesis) TestResult {
		return ratioScoreTest(c, h, 1, "farrington-manning-ratio-test", "Farrington–Manning score test (ratio)")
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
	Key:        "miettinen-nurminen-ratio-test",
	Name:       "Miettinen–Nurminen score test (ratio)",
	Citation:   "Miettinen O, Nurminen M (1985). Comparative analysis of two rates. Statistics in Medicine 4:213–226.",
	Definition: "z = (p1 − ρ0·p2) / √((N/(N−1))·(p̃1(1−p̃1)/n1 + ρ0²·p̃2(1−p̃2)/n2)), restricted maximum-likelihood p̃ under π1/π2 = ρ0; normal p-value",
	Scale:      Ratio,
	Margins:    true,
	Run: func(c Counts, h Hypothesis) TestResult {
		return ratioScoreTest(c, h, mnVarianceFactor(c), "miettinen-nurminen-ratio-test", "Miettinen–Nurminen score test (ratio)")
	},
}

func ratioScoreTest(c Counts, h Hypothesis, f float64, key, name string) TestResult {
	z := ratioScore(c, h.Null, f)
	return zTestResult(z, h, Ratio, key, name)
}

// zTestResult fills a TestResult for a z statistic with normal p-values.
func zTestResult(z float64, h Hypothesis, fam Scale, key, name string) TestResult {
	p, logp := normalPValue(z, h.Alternative)
	crit := h.critical()
	r := TestResult{
		Method: key, MethodName: name, Scale: fam, StatisticName: "z", Statistic: z,
		PValue: p, LogPValue: logp, CriticalValue: &crit,
	}
	r.decide(h)
	return r
}

// ratioScoreLimits returns the ratio score interval {θ : U(θ) ≤ z²f}, U
// Koopman's chi-square (the square of the Farrington–Manning z) and f the
// variance factor (1 for Koopman, N/(N − 1) for Miettinen–Nurminen), with
// the zero-event rules of both intervals: the side of a group with no
// events is 0 or ∞ without a search, and no events at all give [0, ∞]. The
// upper limit is the reciprocal of the lower limit of the table with the
// groups exchanged, so exchanging the groups inverts the interval exactly.
//
// The limits need no restricted fit at trial values of θ: the fit can be
// written in closed form along the curve of its own likelihood equation.
// Setting ∂/∂π2 of the log-likelihood under π1 = θπ2 to zero and
// multiplying by π2 gives
//
//	(x1 − n1p̃1)/(1 − p̃1) = −(x2 − n2p̃2)/(1 − p̃2) = k,
//
// and solving each side for its p̃,
//
//	p̃1 = (x1 − k)/(n1 − k),  p̃2 = (x2 + k)/(n2 + k),  θ = p̃1/p̃2.
//
// Substituted into Koopman's Pearson terms, (x − np̃)²/(np̃(1 − p̃)) becomes
// k²q1/(x1 − k) and k²q2/(x2 + k), qᵢ = (nᵢ − xᵢ)/nᵢ, so that
//
//	U(k) = k²·(q1/(x1 − k) + q2/(x2 + k)),
//
// which rises from 0 at k = 0 (θ at the estimate) to ∞ as k → x1 while θ
// falls to 0. The lower limit is θ at the root of U(k) = z²f in (0, x1)
// (see ratioLowerLimit), and θ is formed from the exact counts shifted
// by k.
func ratioScoreLimits(c Counts, conf Confidence, f float64) (lower, upper float64) {
	lower, upper = 0, math.Inf(1)
	z2f := conf.Z * conf.Z * f
	x1, n1, x2, n2 := float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2)
	if c.X1 > 0 {
		num, den := ratioLowerLimit(x1, n1, x2, n2, z2f)
		lower = num / den
	}
	if c.X2 > 0 {
		num, den := ratioLowerLimit(x2, n2, x1, n1, z2f)
		upper = den / num
	}
	return lower, upper
}

// ratioLowerLimit returns the lower limit of the ratio score interval as a
// quotient num/den (both positive) for x1 > 0 and z2f = z²f ≥ 0 (see
// ratioScoreLimits). For x1 < n1 it solves
//
//	F(k) = (x1 − k)·(U(k) − z²f) = q1k² + (x1 − k)·(q2k²/(x2 + k) − z²f) = 0,
//
// which has the root of U(k) = z²f but no pole in [0, x1], F(0) = −z²f·x1 < 0
// and F(x1) = q1x1² > 0, by root.BracketedHalley from
//
//	k0 = k1k2/√(k1² + k2²),
//
// where k1 and k2 solve each group's term alone, q1k²/(x1 − k) = z²f and
// q2k²/(x2 + k) = z²f (quadratics; k2 = ∞ when q2 = 0). k0 is the root
// when both terms are proportional to k² and is usually within 10⁻² of
// it. At levels from 0.8 to 0.999 the search needs 1.5 evaluations of F
// on average over random tables from 1 to 2^45 trials per group, 2.1 over
// all tables up to 30 trials per group, and at most 3.
//
// All events in the first group (x1 = n1, q1 = 0) put the fit on its
// boundary p̃1 = 1 all along the curve, which reaches U = K =
// n1²q2/(x2 + n1) at k = n1, θ = N/(x2 + n1). For smaller θ the fit is
// p̃2 = (x2 + n1)/N, p̃1 = θp̃2 and U(θ) = n1(1/p̃1 − 1) + K. So the limit is
// θ = (n2 + k)/(x2 + k) at the root of q2k² = z²f·(x2 + k) when z²f ≤ K,
// and θ = n1N / ((x2 + n1)(n1 + z²f − K)) otherwise.
func ratioLowerLimit(x1, n1, x2, n2, z2f float64) (num, den float64) {
	q1, q2 := (n1-x1)/n1, (n2-x2)/n2
	if q1 == 0 {
		k := n1 * n1 * q2 / (x2 + n1)
		if q2 == 0 || z2f > k {
			return n1 * (n1 + n2), (x2 + n1) * (n1 + (z2f - k))
		}
		k = (z2f + math.Sqrt(z2f*z2f+4*q2*z2f*x2)) / (2 * q2)
		return n2 + k, x2 + k
	}
	k := ratioLowerRoot(x1, x2, q1, q2, z2f)
	return (x1 - k) * (n2 + k), (n1 - k) * (x2 + k)
}

// ratioLowerRoot returns the root of F (see ratioLowerLimit) for
// 0 < x1 < n1.
func ratioLowerRoot(x1, x2, q1, q2, z2f float64) float64 {
	if z2f == 0 {
		return 0
	}
	k := 2 * z2f * x1 / (z2f + math.Sqrt(z2f*z2f+4*q1*z2f*x1))
	if q2 > 0 {
		k2 := (z2f + math.Sqrt(z2f*z2f+4*q2*z2f*x2)) / (2 * q2)
		k = k * k2 / math.Sqrt(k*k+k2*k2)
	}
	// With g(k) = q2k²/(x2 + k): g′ = q2(1 − x2²/(x2 + k)²), g″ =
	// 2q2x2²/(x2 + k)³; F = q1k² + (x1 − k)(g − z²f).
	return root.BracketedHalley(func(k float64) (f, d1, d2 float64) {
		u, iw := x1-k, 1/(x2+k)
		r := x2 * iw
		g := q2 * k * k * iw
		g1 := q2 * (1 - r*r)
		g2 := 2 * q2 * r * r * iw
		return q1*k*k + u*(g-z2f), 2*q1*k - (g - z2f) + u*g1, 2*q1 - 2*g1 + u*g2
	}, k, 0, x1)
}
