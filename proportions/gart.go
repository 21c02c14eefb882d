package proportions

// GartAdjusted is the logit interval for the odds ratio with ½ added to
// every cell of the table, whether or not a cell is zero:
//
//	exp(log((a+½)(d+½) / ((b+½)(c+½))) ± z·√(Σ 1/(cell + ½))),
//
// with a = x1, b = n1 − x1, c = x2, d = n2 − x2. The ½ removes the
// first-order bias of the log odds ratio (Haldane JBS 1956, Annals of Human
// Genetics 20:309–311) and keeps both limits finite. Gart JJ (1966),
// "Alternative analyses of contingency tables", Journal of the Royal
// Statistical Society B 28:164–179.
//
// Zero cells: both limits are always finite and positive; the interval is
// centred on the adjusted odds ratio, so with a zero cell it excludes the
// crude estimate 0 or ∞. With no events at all (or only events) it is a
// wide interval around roughly (n2+1)/(n1+1) while the estimate is
// reported as not estimable.
var GartAdjusted = IntervalMethod{
	Key:        "gart-odds-ratio",
	Name:       "Gart adjusted logit",
	Scale:      OddsRatio,
	Symmetric:  true,
	Citation:   "Gart JJ (1966). Alternative analyses of contingency tables. Journal of the Royal Statistical Society B 28:164–179.",
	Definition: "exp(log((a+½)(d+½)/((b+½)(c+½))) ± z·√(1/(a+½) + 1/(b+½) + 1/(c+½) + 1/(d+½))), a = x1, b = n1 − x1, c = x2, d = n2 − x2",
	Limits:     gartLimits,
}

func gartLimits(c Counts, conf Confidence) (lower, upper float64) {
	return logOddsRatioLimits(float64(c.X1)+0.5, float64(c.N1-c.X1)+0.5, float64(c.X2)+0.5, float64(c.N2-c.X2)+0.5, conf.Z)
}
