package proportions

import "math"

// Katz is the log (Wald on the log scale) interval for π1/π2:
//
//	exp(log(p1/p2) ± z·√(1/x1 − 1/n1 + 1/x2 − 1/n2)).
//
// Katz D, Baptista J, Azen SP, Pike MC (1978), "Obtaining confidence
// intervals for the risk ratio in cohort studies", Biometrics 34:469–474.
//
// Zero cells: when a group has no events the log ratio and its variance are
// undefined and the formula carries no information, so the interval is
// reported as the whole range [0, ∞]; use the zero-adjusted, Koopman or Miettinen–Nurminen
// interval there. When every trial in both groups is an event the variance
// is 0 and the interval collapses to the point 1 (the same collapse as the
// Wald interval for a difference).
var Katz = IntervalMethod{
	Key:        "katz-ratio",
	Name:       "Katz log",
	Scale:      Ratio,
	Symmetric:  true,
	Citation:   "Katz D, Baptista J, Azen SP, Pike MC (1978). Obtaining confidence intervals for the risk ratio in cohort studies. Biometrics 34:469–474.",
	Definition: "exp(log(p1/p2) ± z·√(1/x1 − 1/n1 + 1/x2 − 1/n2)); [0, ∞] when a group has no events",
	Limits:     katzLimits,
}

func katzLimits(c Counts, conf Confidence) (lower, upper float64) {
	if c.X1 == 0 || c.X2 == 0 {
		return 0, math.Inf(1)
	}
	return logRatioLimits(float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2), conf.Z)
}

// logRatioLimits returns exp(log((x1/n1)/(x2/n2)) ± z·se) with
// se² = 1/x1 − 1/n1 + 1/x2 − 1/n2, for positive (possibly fractional) x.
func logRatioLimits(x1, n1, x2, n2, z float64) (lower, upper float64) {
	logr := math.Log(x1/n1) - math.Log(x2/n2)
	se := math.Sqrt(math.Max(1/x1-1/n1+1/x2-1/n2, 0))
	return math.Exp(logr - z*se), math.Exp(logr + z*se)
}
