package clusters

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// ClusterLevelCitation is the source of the cluster-level analysis.
const ClusterLevelCitation = "Common practice: Donner A, Klar N (2000). Design and Analysis of Cluster Randomization Trials in Health Research. London: Arnold; Hayes RJ, Moulton LH (2009). Cluster Randomised Trials. Boca Raton: Chapman & Hall/CRC."

// clusterLevel is the two-sample t comparison of the clusters' own rates
// p_ij = x_ij/n_ij, each cluster one observation.
type clusterLevel struct {
	diff float64 // mean cluster rate of group 1 minus that of group 2
	se   float64 // pooled-variance standard error of diff
	df   float64 // m1 + m2 − 2
}

func newClusterLevel(s Summary) clusterLevel {
	g1, g2 := s.Group1, s.Group2
	m1, m2 := float64(g1.Clusters), float64(g2.Clusters)
	mean1, mean2 := g1.SumRates/m1, g2.SumRates/m2
	squares := nonNegative(g1.SumSquaredRates-m1*mean1*mean1) + nonNegative(g2.SumSquaredRates-m2*mean2*mean2)
	df := m1 + m2 - 2
	return clusterLevel{diff: mean1 - mean2, se: math.Sqrt(squares / df * (1/m1 + 1/m2)), df: df}
}

// meanClusterRateDifference is the cluster-level estimate: the mean of
// group 1's cluster rates minus the mean of group 2's.
func meanClusterRateDifference(s Summary) float64 {
	return s.Group1.SumRates/float64(s.Group1.Clusters) - s.Group2.SumRates/float64(s.Group2.Clusters)
}

// ClusterLevelT is the cluster-level interval: each cluster reduced to its
// own rate p_ij = x_ij/n_ij, and the mean rates of the two groups compared
// by the pooled-variance two-sample t interval,
//
//	p̄1 − p̄2 ± t(1 − α/2; m1 + m2 − 2)·s·√(1/m1 + 1/m2),
//	s² = (Σ_j (p_1j − p̄1)² + Σ_j (p_2j − p̄2)²)/(m1 + m2 − 2).
//
// It is the plain check that needs no estimate of ρ: clusters are the
// independent units (common practice: Donner & Klar 2000, Design and
// Analysis of Cluster Randomization Trials in Health Research, Arnold;
// Hayes & Moulton 2009, Cluster Randomised Trials, Chapman & Hall/CRC).
// Its estimate weighs every cluster alike, so with unequal sizes it is the
// difference of mean cluster rates, not p1 − p2.
var ClusterLevelT = IntervalMethod{
	Key:           "cluster-level-t",
	Name:          "Cluster-level t",
	Citation:      ClusterLevelCitation,
	Definition:    "p̄1 − p̄2 ± t(1−α/2; m1+m2−2)·s·√(1/m1 + 1/m2) over the clusters' own rates, s² the pooled variance of the cluster rates",
	Limits:        clusterLevelLimits,
	PointEstimate: meanClusterRateDifference,
}

func clusterLevelLimits(s Summary, conf proportions.Confidence) (lower, upper float64) {
	c := newClusterLevel(s)
	t := tQuantile(c.df, conf.Alpha())
	return c.diff - t*c.se, c.diff + t*c.se
}

// tQuantile is the t distribution's two-sided critical value: the t with
// P(|T| ≥ t) = alpha on df degrees of freedom. Since P(|T| ≥ t) =
// I_x(df/2, ½) with x = df/(df + t²), it is √(df·(1 − x)/x) for the beta
// quantile x, which the library's beta solver finds in well under a
// microsecond (gonum's t quantile takes tens of microseconds, too slow for
// a simulation); alpha above ½ (levels below 50%) goes to gonum.
func tQuantile(df, alpha float64) float64 {
	if !(alpha > 0 && alpha <= 0.5) {
		return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(1 - alpha/2)
	}
	tail := special.NewBetaTail(alpha, 0)
	x, y := special.BetaLowerQuantile(df/2, 0.5, &tail)
	return math.Sqrt(df * y / x)
}

// ClusterLevelTTest is the pooled-variance two-sample t test on the
// clusters' own rates, t = (p̄1 − p̄2)/(s·√(1/m1 + 1/m2)) on m1 + m2 − 2
// degrees of freedom (see ClusterLevelT). When every cluster of each group
// has the same rate (s = 0) the test gives p = 1 for equal means and p = 0
// otherwise.
var ClusterLevelTTest = TestMethod{
	Key:        "cluster-level-t-test",
	Name:       "Cluster-level t test",
	Citation:   ClusterLevelCitation,
	Definition: "t = (p̄1 − p̄2)/(s·√(1/m1 + 1/m2)) over the clusters' own rates, s² the pooled variance; t with m1 + m2 − 2 df",
	Run:        clusterLevelRun,
}

func clusterLevelRun(s Summary, h proportions.Hypothesis) proportions.TestResult {
	c := newClusterLevel(s)
	dist := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: c.df}
	r := proportions.TestResult{Method: "cluster-level-t-test", MethodName: "Cluster-level t test",
		Scale: proportions.Difference, StatisticName: "t"}
	switch {
	case c.se > 0:
		r.Statistic = c.diff / c.se
	case c.diff > 0:
		r.Statistic = math.Inf(1)
	case c.diff < 0:
		r.Statistic = math.Inf(-1)
	}
	var crit float64
	switch h.Alternative {
	case proportions.Greater:
		r.PValue, crit = dist.Survival(r.Statistic), tQuantile(c.df, 2*h.Alpha())
	case proportions.Less:
		r.PValue, crit = dist.CDF(r.Statistic), -tQuantile(c.df, 2*h.Alpha())
	default:
		r.PValue, crit = min(2*dist.Survival(math.Abs(r.Statistic)), 1), tQuantile(c.df, h.Alpha())
	}
	r.LogPValue = math.Log(r.PValue)
	r.CriticalValue = &crit
	return decide(r, h)
}
