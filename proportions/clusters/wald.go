package clusters

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// DesignEffectWald is the Wald interval for π1 − π2 with each group's
// variance inflated by its design effect:
//
//	p1 − p2 ± z·√(D1·p1(1 − p1)/N1 + D2·p2(1 − p2)/N2),
//	D_i = 1 + (Σ_j n_ij²/N_i − 1)·ρ,
//
// ρ the pooled ANOVA estimate of the intracluster correlation (0 where
// negative or not defined; see GroupDesignEffect). Donner A, Klar N (1993),
// "Confidence interval construction for effect measures arising from
// cluster randomization trials", Journal of Clinical Epidemiology
// 46:123–131. With ρ = 0, or every cluster of one unit, it is the Wald
// interval of package proportions.
var DesignEffectWald = IntervalMethod{
	Key:        "design-effect-wald",
	Name:       "Wald with design effect",
	Citation:   "Donner A, Klar N (1993). Confidence interval construction for effect measures arising from cluster randomization trials. Journal of Clinical Epidemiology 46:123–131.",
	Definition: "p1 − p2 ± z·√(D1·p1(1−p1)/N1 + D2·p2(1−p2)/N2), D_i = 1 + (Σ n_ij²/N_i − 1)·ρ with ρ the pooled ANOVA estimate (0 if negative)",
	Limits:     designEffectWaldLimits,
}

func designEffectWaldLimits(s Summary, conf proportions.Confidence) (lower, upper float64) {
	d1, d2 := designEffects(s)
	p1, p2 := s.Group1.Rate(), s.Group2.Rate()
	se := math.Sqrt(d1*p1*(1-p1)/float64(s.Group1.Trials) + d2*p2*(1-p2)/float64(s.Group2.Trials))
	d := p1 - p2
	return d - conf.Z*se, d + conf.Z*se
}
