package clusters

import "math"

// DesignEffectCitation is the source of the design effect for clusters of
// unequal size.
const DesignEffectCitation = "Donner A, Birkett N, Buck C (1981). Randomization by cluster: sample size requirements and analysis. American Journal of Epidemiology 114:906–914; " +
	"unequal sizes: Eldridge SM, Ashby D, Kerry S (2006). Sample size for cluster randomized trials: effect of coefficient of variation of cluster size and analysis method. International Journal of Epidemiology 35:1292–1300."

// DesignEffect is how much a group's clustering inflates the variance of
// its rate, against independent units, and what its units are worth.
type DesignEffect struct {
	// Clusters and Trials are the group's m clusters and N units.
	Clusters int64 `json:"clusters"`
	Trials   int64 `json:"trials"`
	// MeanSize is the mean cluster size m̄ = N/m.
	MeanSize float64 `json:"mean_size"`
	// SizeVariation is the coefficient of variation of the cluster sizes
	// (standard deviation with divisor m, over the mean).
	SizeVariation float64 `json:"size_variation"`
	// Correlation is the ρ used: the estimate, or 0 where it is negative
	// or not defined.
	Correlation float64 `json:"correlation"`
	// Value is the design effect 1 + ((CV² + 1)·m̄ − 1)·ρ.
	Value float64 `json:"value"`
	// EffectiveSize is N / Value: the number of independent units the
	// group's units are worth.
	EffectiveSize float64 `json:"effective_size"`
}

// GroupDesignEffect is the design effect of one group for intracluster
// correlation rho,
//
//	D = Σ_j n_j (1 + (n_j − 1)ρ) / N = 1 + (Σ_j n_j²/N − 1)·ρ
//	  = 1 + ((CV² + 1)·m̄ − 1)·ρ,
//
// the variance of the group's rate over its variance were the N units
// independent: 1 + (m − 1)ρ for clusters of equal size m (Donner, Birkett &
// Buck 1981, American Journal of Epidemiology 114:906–914), with the
// cluster sizes' coefficient of variation CV for unequal sizes (Eldridge,
// Ashby & Kerry 2006, International Journal of Epidemiology 35:1292–1300;
// CV with divisor m makes the two forms equal). A negative or undefined ρ
// counts as 0, the usual practice (Donner & Klar 2000): clustering is not
// taken to make units worth more than independent ones.
func GroupDesignEffect(g GroupSummary, rho float64) DesignEffect {
	rho = usableRho(rho)
	n, m := float64(g.Trials), float64(g.Clusters)
	mean := n / m
	cv := math.Sqrt(nonNegative(g.SumSquaredTrials/m-mean*mean)) / mean
	v := designEffect(g, rho)
	return DesignEffect{Clusters: g.Clusters, Trials: g.Trials, MeanSize: mean, SizeVariation: cv,
		Correlation: rho, Value: v, EffectiveSize: n / v}
}

// designEffect is 1 + (Σ n_j²/N − 1)·ρ for a usable ρ (see usableRho).
func designEffect(g GroupSummary, rho float64) float64 {
	return 1 + (g.SumSquaredTrials/float64(g.Trials)-1)*rho
}

// usableRho clamps an ICC estimate to [0, 1] and maps NaN to 0, the
// value the design effect uses.
func usableRho(rho float64) float64 {
	if !(rho > 0) {
		return 0
	}
	return min(rho, 1)
}

// designEffects returns both groups' design effects from the pooled ANOVA
// estimate, the inflation the Donner and design-effect methods use.
func designEffects(s Summary) (d1, d2 float64) {
	rho, _ := anova(s).rho()
	rho = usableRho(rho)
	return designEffect(s.Group1, rho), designEffect(s.Group2, rho)
}
