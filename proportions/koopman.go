package proportions

import "math"

// Koopman is the asymptotic score interval for π1/π2 of Koopman (1984): the
// set of θ whose Pearson chi-square, with expected counts from the maximum-
// likelihood fit under π1 = θπ2, does not exceed χ²_{1,1−α} = z²_{1−α/2}:
//
//	U(θ) = (x1 − n1p̃1)² / (n1p̃1(1−p̃1)) + (x2 − n2p̃2)² / (n2p̃2(1−p̃2)) ≤ z²,
//
// with p̃1 = θ·p̃2 (closed form in restricted_ratio.go). Koopman PAR (1984),
// "Confidence intervals for the ratio of two binomial proportions",
// Biometrics 40:513–517. U(θ) equals the square of the Farrington–Manning
// statistic, so this interval and that test agree.
//
// Zero cells: no events in the first group gives lower limit 0; none in the
// second gives upper limit ∞; none in either gives [0, ∞] (not estimable,
// no information about the ratio).
//
// The limits solve U = z² through a parametrisation of the restricted fit
// along its likelihood equation, in which U is a rational function with a
// cubic numerator (see ratioScoreLimits in ratio_score.go): a safeguarded
// Halley search finds them in two or three steps.
var Koopman = IntervalMethod{
	Key:        "koopman-ratio",
	Name:       "Koopman asymptotic score",
	Scale:      Ratio,
	Symmetric:  true,
	Citation:   "Koopman PAR (1984). Confidence intervals for the ratio of two binomial proportions. Biometrics 40:513–517.",
	Definition: "all θ with (x1 − n1p̃1)²/(n1p̃1(1−p̃1)) + (x2 − n2p̃2)²/(n2p̃2(1−p̃2)) ≤ z², p̃ the maximum-likelihood estimates under π1 = θ·π2",
	Limits:     koopmanLimits,
}

func koopmanLimits(c Counts, conf Confidence) (lower, upper float64) {
	return ratioScoreLimits(c, conf, 1)
}

// koopmanSigned returns ±√U(θ), signed like p1 − θ·p2 (positive when θ is
// below the estimate), so that it falls as θ grows. The sign is not taken
// from x1 − n1p̃1, which is 0 when p̃1 = 1 while the second term is not.
func koopmanSigned(c Counts, theta float64) float64 {
	f := fitUnderRatio(c, theta)
	n1, n2 := float64(c.N1), float64(c.N2)
	u := pearsonTerm(f.residual1(c), n1*f.p1*f.q1) + pearsonTerm(f.residual2(c), n2*f.p2*f.q2)
	s := math.Max(theta, 1)
	return math.Copysign(math.Sqrt(u), c.P1()/s-(theta/s)*c.P2())
}
