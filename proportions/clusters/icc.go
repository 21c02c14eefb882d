package clusters

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/internal/special"
)

// Correlation is an estimate of the intracluster correlation ρ: the
// correlation between the outcomes of two units of one cluster, 0 when
// clusters do not matter, 1 when every unit of a cluster has the same
// outcome. Estimates can be negative (units of a cluster less alike than
// chance). Defined is false when the data cannot estimate ρ (Estimate is
// then 0); IntervalDefined is false when the estimator has no interval
// or the data give none (Lower and Upper are then 0).
type Correlation struct {
	// Estimator is the estimator's key: "anova" or "fleiss-cuzick".
	Estimator string `json:"estimator"`
	// EstimatorName is its published name.
	EstimatorName string `json:"estimator_name"`
	// Citation names the paper behind the estimator and its interval.
	Citation        string  `json:"citation"`
	Estimate        float64 `json:"estimate"`
	Defined         bool    `json:"estimate_defined"`
	Level           float64 `json:"level"`
	Lower           float64 `json:"lower"`
	Upper           float64 `json:"upper"`
	IntervalDefined bool    `json:"interval_defined"`
}

// anovaTable is the one-way analysis of variance of the 0/1 outcomes with
// clusters nested in the two groups.
type anovaTable struct {
	between, within float64 // mean squares between clusters (within groups) and within clusters
	dfBetween       float64 // M − 2
	dfWithin        float64 // N − M
	n0              float64 // the adjusted mean cluster size
}

// anova computes the mean squares from the summary:
//
//	MSC = Σ_i Σ_j n_ij (p_ij − p_i)² / (M − 2),
//	MSW = Σ_i Σ_j x_ij (n_ij − x_ij)/n_ij / (N − M),
//	n0  = (N − Σ_i Σ_j n_ij²/N_i) / (M − 2),
//
// M clusters and N units over both groups.
func anova(s Summary) anovaTable {
	g1, g2 := s.Group1, s.Group2
	m := float64(g1.Clusters + g2.Clusters)
	n := float64(g1.Trials + g2.Trials)
	t := anovaTable{dfBetween: m - 2, dfWithin: n - m}
	if t.dfBetween > 0 {
		t.between = (g1.betweenSquares() + g2.betweenSquares()) / t.dfBetween
		t.n0 = (n - g1.SumSquaredTrials/float64(g1.Trials) - g2.SumSquaredTrials/float64(g2.Trials)) / t.dfBetween
	}
	if t.dfWithin > 0 {
		t.within = (g1.withinSquares() + g2.withinSquares()) / t.dfWithin
	}
	return t
}

// rho is the ANOVA estimate (MSC − MSW)/(MSC + (n0 − 1)·MSW), with ok
// false when it is 0/0 or a degree of freedom is missing.
func (t anovaTable) rho() (float64, bool) {
	if t.dfBetween <= 0 || t.dfWithin <= 0 {
		return 0, false
	}
	den := t.between + (t.n0-1)*t.within
	if den <= 0 {
		return 0, false
	}
	return (t.between - t.within) / den, true
}

// ANOVACitation is the source of the ANOVA estimator and its interval.
const ANOVACitation = "Donner A (1986). A review of inference procedures for the intraclass correlation coefficient in the one-way random effects model. International Statistical Review 54:67–82; " +
	"pooled over the groups as in Donner A, Klar N (2000), Design and Analysis of Cluster Randomization Trials in Health Research, London: Arnold; " +
	"interval: Searle SR (1971), Linear Models, New York: Wiley."

// ANOVACorrelation is the analysis-of-variance estimator of the
// intracluster correlation, pooled over the two groups (clusters nested in
// groups, so the difference between the groups' rates is not counted as
// clustering):
//
//	ρ = (MSC − MSW) / (MSC + (n0 − 1)·MSW),
//	MSC = Σ_i Σ_j n_ij (p_ij − p_i)² / (M − 2),
//	MSW = Σ_i Σ_j x_ij (n_ij − x_ij)/n_ij / (N − M),
//	n0  = (N − Σ_i Σ_j n_ij²/N_i) / (M − 2),
//
// with n0 the mean cluster size adjusted for unequal sizes (Donner 1986,
// International Statistical Review 54:67–82; Donner & Klar 2000). The
// interval is Searle's (1971, Linear Models, Wiley), from F = MSC/MSW and
// the F quantiles on M − 2 and N − M degrees of freedom:
//
//	F_L = F / F(1 − α/2), F_U = F / F(α/2), ρ = (F_· − 1)/(F_· + n0 − 1),
//
// exact for normal outcomes and equal sizes, approximate here. The estimate
// is not defined when every cluster has one unit (N = M), when there are
// only two clusters (M = 2), or when no unit differs from another in its
// group (MSC = MSW = 0); the interval needs MSW > 0 as well.
func ANOVACorrelation(s Summary, level float64) Correlation {
	c := Correlation{Estimator: "anova", EstimatorName: "ANOVA estimator", Citation: ANOVACitation, Level: level}
	t := anova(s)
	c.Estimate, c.Defined = t.rho()
	if !c.Defined || t.within <= 0 || level <= 0 || level >= 1 {
		return c
	}
	f := t.between / t.within
	lo, hi := fQuantiles(t.dfBetween, t.dfWithin, 1-level)
	fromF := func(v float64) float64 { return (v - 1) / (v + t.n0 - 1) }
	c.Lower = fromF(f / hi)
	c.Upper = fromF(f / lo)
	c.IntervalDefined = !math.IsNaN(c.Lower) && !math.IsNaN(c.Upper)
	if !c.IntervalDefined {
		c.Lower, c.Upper = 0, 0
	}
	return c
}

// fQuantiles returns the α/2 and 1 − α/2 quantiles of the F distribution
// on d1 and d2 degrees of freedom, from the beta quantiles of X =
// d1·F/(d1·F + d2) ~ Beta(d1/2, d2/2): F = d2·x/(d1·(1 − x)). The upper
// quantile is the lower one of the reflected Beta(d2/2, d1/2). Levels below
// 50% (α above ½) go to gonum's F quantile.
func fQuantiles(d1, d2, alpha float64) (lo, hi float64) {
	if !(alpha > 0 && alpha <= 1) {
		dist := distuv.F{D1: d1, D2: d2}
		return dist.Quantile(alpha / 2), dist.Quantile(1 - alpha/2)
	}
	tail := special.NewBetaTail(alpha/2, 0)
	x, y := special.BetaLowerQuantile(d1/2, d2/2, &tail)
	lo = d2 * x / (d1 * y)
	tail = special.NewBetaTail(alpha/2, 0)
	y, x = special.BetaLowerQuantile(d2/2, d1/2, &tail) // 1 − X and X at the upper tail
	hi = d2 * x / (d1 * y)
	return lo, hi
}

// FleissCuzickCitation is the source of the kappa-type estimator.
const FleissCuzickCitation = "Fleiss JL, Cuzick J (1979). The reliability of dichotomous judgments: unequal numbers of judges per subject. Applied Psychological Measurement 3:537–542."

// FleissCuzickCorrelation is the kappa-type estimator of Fleiss & Cuzick
// (1979, Applied Psychological Measurement 3:537–542), which compares the
// disagreement seen within clusters with the disagreement expected were
// units independent:
//
//	ρ = 1 − Σ_j x_j(n_j − x_j)/n_j / ((N − m)·p(1 − p)),
//
// for one group of m clusters with rate p. For two groups the numerators
// and denominators are added over the groups, each about its own rate p_i,
// as the ANOVA estimator pools its sums of squares (our pooling). It is not
// defined when the denominator is 0: every cluster of one unit, or both
// groups' rates 0 or 1. It has no interval here.
func FleissCuzickCorrelation(s Summary) Correlation {
	c := Correlation{Estimator: "fleiss-cuzick", EstimatorName: "Fleiss–Cuzick kappa", Citation: FleissCuzickCitation}
	var within, expected float64
	for _, g := range []GroupSummary{s.Group1, s.Group2} {
		p := g.Rate()
		within += g.withinSquares()
		expected += float64(g.Trials-g.Clusters) * p * (1 - p)
	}
	if expected <= 0 {
		return c
	}
	c.Estimate, c.Defined = 1-within/expected, true
	return c
}
