package proportions

// KatzZeroAdjusted is the Katz log interval for π1/π2 with the usual repair
// for zero cells. The rule (common practice, as in meta-analysis handbooks):
// when either group has no events, ½ is added to each of the four cells of
// the 2×2 table, so each group gains ½ event and one trial, and the Katz
// formula is applied to the adjusted counts:
//
//	exp(log(((x1+½)/(n1+1)) / ((x2+½)/(n2+1))) ± z·√(1/(x1+½) − 1/(n1+1) + 1/(x2+½) − 1/(n2+1))).
//
// Tables in which both groups have events are left unchanged (the interval
// is then Katz's). Only zero event cells are adjusted: a group in which every
// trial is an event leaves the Katz variance defined. Katz D, Baptista J,
// Azen SP, Pike MC (1978), Biometrics 34:469–474, for the interval; the ½
// correction goes back to Haldane JBS (1956), "The estimation and
// significance of the logarithm of a ratio of frequencies", Annals of Human
// Genetics 20:309–311.
//
// Zero cells: both limits are always finite. With no events in the first
// group the interval lies above the crude estimate 0 (it is centred on the
// adjusted ratio), and with none in the second it lies below the crude ∞;
// with none in either it is a wide interval around (n2+1)/(n1+1) while the
// estimate is reported as not estimable.
var KatzZeroAdjusted = IntervalMethod{
	Key:        "katz-zero-adjusted-ratio",
	Name:       "Katz log, ½ added at zero events",
	Scale:      Ratio,
	Symmetric:  true,
	Citation:   "Katz D, Baptista J, Azen SP, Pike MC (1978). Obtaining confidence intervals for the risk ratio in cohort studies. Biometrics 34:469–474; ½ correction: Haldane JBS (1956). Annals of Human Genetics 20:309–311.",
	Definition: "Katz log interval; when a group has no events, ½ is first added to all four cells (x+½ events of n+1 trials in each group)",
	Limits:     katzZeroAdjustedLimits,
}

func katzZeroAdjustedLimits(c Counts, conf Confidence) (lower, upper float64) {
	x1, n1, x2, n2 := float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2)
	if c.X1 == 0 || c.X2 == 0 {
		x1, n1, x2, n2 = x1+0.5, n1+1, x2+0.5, n2+1
	}
	return logRatioLimits(x1, n1, x2, n2, conf.Z)
}
