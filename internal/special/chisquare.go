package special

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// ChiSquareUpperTail returns P(X ≥ x) for a chi-square variable with df
// degrees of freedom, with its natural log: the regularised upper
// incomplete gamma function Q(df/2, x/2) from gonum's mathext. Where Q
// underflows (x far beyond df) the log comes from the leading term of its
// asymptotic expansion, log Q(a, y) ≈ (a−1)·log y − y − log Γ(a)
// (Abramowitz & Stegun 1964, 6.5.32), so a tiny p-value keeps its order of
// magnitude. df = 1 uses ChiSquare1UpperTail. x ≤ 0 gives 1; df < 1 is
// the caller's error and gives NaN.
func ChiSquareUpperTail(x float64, df int) (p, logp float64) {
	switch {
	case df < 1 || math.IsNaN(x):
		return math.NaN(), math.NaN()
	case x <= 0:
		return 1, 0
	case df == 1:
		return ChiSquare1UpperTail(x)
	}
	a, y := float64(df)/2, x/2
	p = mathext.GammaIncRegComp(a, y)
	if p > 0 {
		return p, math.Log(p)
	}
	lg, _ := math.Lgamma(a)
	return 0, (a-1)*math.Log(y) - y - lg
}
