package proportions

import "gonum.org/v1/gonum/stat/distuv"

// ClopperPearson is the "exact" interval for one proportion, inverting two
// one-sided binomial tests each at level α/2: the lower limit is the π with
// P(X ≥ x | π) = α/2 and the upper the π with P(X ≤ x | π) = α/2, which by
// the beta–binomial identity are the beta quantiles
//
//	lower = B⁻¹(α/2; x, n − x + 1),   upper = B⁻¹(1 − α/2; x + 1, n − x),
//
// with lower = 0 when x = 0 and upper = 1 when x = n (the tail equations
// have no solution there). Clopper CJ, Pearson ES (1934), "The use of
// confidence or fiducial limits illustrated in the case of the binomial",
// Biometrika 26:404–413; method 5 of Newcombe (1998a). Its coverage is at
// least the nominal level for every π, at the price of width.
//
// The beta quantiles come from gonum's distuv.Beta.
var ClopperPearson = ProportionMethod{
	Key:        "clopper-pearson",
	Name:       "Clopper–Pearson",
	Citation:   "Clopper CJ, Pearson ES (1934). The use of confidence or fiducial limits illustrated in the case of the binomial. Biometrika 26:404–413.",
	Definition: "lower = Beta quantile α/2 of Beta(x, n−x+1), upper = quantile 1−α/2 of Beta(x+1, n−x); 0 at x = 0 and 1 at x = n",
	Limits:     clopperPearsonLimits,
}

func clopperPearsonLimits(x, n int64, conf Confidence) (lower, upper float64) {
	alpha := conf.Alpha()
	fx, fn := float64(x), float64(n)
	lower, upper = 0, 1
	if x > 0 {
		lower = distuv.Beta{Alpha: fx, Beta: fn - fx + 1}.Quantile(alpha / 2)
	}
	if x < n {
		upper = distuv.Beta{Alpha: fx + 1, Beta: fn - fx}.Quantile(1 - alpha/2)
	}
	return lower, upper
}
