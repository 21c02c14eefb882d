package proportions

// AgrestiCaffo is the Wald interval for π1 − π2 computed after adding one
// event and one non-event to each group: with p̃i = (xi + 1)/(ni + 2),
//
//	p̃1 − p̃2 ± z·√(p̃1(1−p̃1)/(n1+2) + p̃2(1−p̃2)/(n2+2)).
//
// Agresti A, Caffo B (2000), "Simple and effective confidence intervals for
// proportions and differences of proportions result from adding two
// successes and two failures", The American Statistician 54:280–288. The
// adjustment keeps the interval's simplicity while bringing its coverage
// close to nominal, and it never collapses to a point.
var AgrestiCaffo = IntervalMethod{
	Key:        "agresti-caffo",
	Name:       "Agresti–Caffo",
	Scale:      Difference,
	Citation:   "Agresti A, Caffo B (2000). Simple and effective confidence intervals for proportions and differences of proportions result from adding two successes and two failures. The American Statistician 54:280–288.",
	Definition: "Wald interval after adding one event and one non-event to each group: p̃i = (xi+1)/(ni+2), p̃1 − p̃2 ± z·√(Σ p̃i(1−p̃i)/(ni+2))",
	Symmetric:  true,
	Limits:     agrestiCaffoLimits,
}

func agrestiCaffoLimits(c Counts, conf Confidence) (lower, upper float64) {
	return waldLimits(Counts{X1: c.X1 + 1, N1: c.N1 + 2, X2: c.X2 + 1, N2: c.N2 + 2}, conf)
}
