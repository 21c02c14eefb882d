package proportions

import "github.com/propscope/propscope/internal/special"

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
// The beta quantiles come from special.BetaLowerQuantile (betaquantile.go): a
// uniform asymptotic expansion for large shapes, continued fractions with an
// exact Taylor step otherwise, to about 1e-15 relative precision in each
// limit and in its distance from 1; the shapes 1 (x = 0, 1, n − 1, n) have
// closed forms. (gonum's distuv.Beta quantiles, used before, put the
// 99.9999% upper limit at x = 0 near 1 once n ≥ 60.)
var ClopperPearson = RateMethod{
	Key:        "clopper-pearson-rate",
	Name:       "Clopper–Pearson",
	Citation:   "Clopper CJ, Pearson ES (1934). The use of confidence or fiducial limits illustrated in the case of the binomial. Biometrika 26:404–413.",
	Definition: "lower = Beta quantile α/2 of Beta(x, n−x+1), upper = quantile 1−α/2 of Beta(x+1, n−x); 0 at x = 0 and 1 at x = n",
	Limits:     clopperPearsonLimits,
}

func clopperPearsonLimits(x, n int64, conf Confidence) (lower, upper float64) {
	t := special.NewBetaTail(conf.Alpha()/2, conf.Z)
	fx, fn := float64(x), float64(n)
	lower, upper = 0, 1
	if x > 0 {
		lower, _ = special.BetaLowerQuantile(fx, fn-fx+1, &t)
	}
	if x < n {
		// The 1 − α/2 quantile of Beta(x+1, n−x) is 1 minus the α/2 quantile
		// of Beta(n−x, x+1), which the solver returns directly.
		_, upper = special.BetaLowerQuantile(fn-fx, fx+1, &t)
	}
	return lower, upper
}
