package simulate

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Limits of a simulation plan: they keep one call within minutes and its
// memory within a few megabytes.
const (
	// MaxClusters is the largest number of clusters per group.
	MaxClusters = 10_000
	// MaxClusterSize is the largest number of units in one cluster.
	MaxClusterSize = 100_000
	// MaxStudies is the largest number of simulated studies of one run.
	MaxStudies = 10_000_000
	// MaxCorrelation is the largest intracluster correlation ρ a design may
	// state: at ρ = 1 every cluster is all events or all non-events and the
	// beta shapes vanish.
	MaxCorrelation = 0.99
)

// Design is what a simulation draws: two groups of clusters, the units per
// cluster, the true rates and the intracluster correlation ρ. Cluster i of
// a group has Sizes[i mod len(Sizes)] units, so one size gives equal
// clusters and a list gives unequal ones in a fixed order. Each cluster's
// own rate is drawn from the beta distribution with mean Rate1 (or Rate2)
// and intracluster correlation ρ = Correlation, then its events from the
// binomial distribution at that rate (the beta-binomial model); ρ = 0
// draws every cluster at the group's rate, plain binomial sampling.
type Design struct {
	Clusters1   int     `json:"clusters1"`
	Clusters2   int     `json:"clusters2"`
	Sizes       []int   `json:"sizes"`
	Rate1       float64 `json:"rate1"`
	Rate2       float64 `json:"rate2"`
	Correlation float64 `json:"correlation"`
	Level       float64 `json:"level"`
}

// Validate returns an error wrapping proportions.ErrSimulation (or ErrLevel)
// that names the input out of range and the range allowed.
func (d Design) Validate() error {
	for i, k := range [2]int{d.Clusters1, d.Clusters2} {
		if k < 2 || k > MaxClusters {
			return fmt.Errorf("group %d: %d clusters: %w; a design needs 2 to %d clusters per group", i+1, k, proportions.ErrSimulation, MaxClusters)
		}
	}
	if len(d.Sizes) == 0 {
		return fmt.Errorf("no cluster sizes: %w; give one size for equal clusters or a list", proportions.ErrSimulation)
	}
	for i, n := range d.Sizes {
		if n < 1 || n > MaxClusterSize {
			return fmt.Errorf("cluster size %d (entry %d): %w; each cluster has 1 to %d units", n, i+1, proportions.ErrSimulation, MaxClusterSize)
		}
	}
	for i, r := range [2]float64{d.Rate1, d.Rate2} {
		if !(r >= 0 && r <= 1) {
			return fmt.Errorf("true rate of group %d = %v: %w; a rate lies between 0 and 1", i+1, r, proportions.ErrSimulation)
		}
	}
	if !(d.Correlation >= 0 && d.Correlation <= MaxCorrelation) {
		return fmt.Errorf("intracluster correlation ρ = %v: %w; ρ lies between 0 and %v", d.Correlation, proportions.ErrSimulation, MaxCorrelation)
	}
	return proportions.ValidateLevel(d.Level)
}

// size returns the number of units of the i-th cluster of a group.
func (d Design) size(i int) int64 { return int64(d.Sizes[i%len(d.Sizes)]) }

// Units returns the total units of each group.
func (d Design) Units() (n1, n2 int64) {
	for i := range d.Clusters1 {
		n1 += d.size(i)
	}
	for i := range d.Clusters2 {
		n2 += d.size(i)
	}
	return n1, n2
}

// Truth is the true difference π1 − π2 the intervals should contain.
func (d Design) Truth() float64 { return d.Rate1 - d.Rate2 }

// shapes returns the beta shapes of the cluster rates of a group with mean
// rate pi: α = π(1 − ρ)/ρ and β = (1 − π)(1 − ρ)/ρ, the parametrisation
// whose intraclass correlation is ρ = 1/(α + β + 1). It reports fixed when
// every cluster has the group's rate (ρ = 0, or a rate of 0 or 1).
func (d Design) shapes(pi float64) (a, b float64, fixed bool) {
	if d.Correlation == 0 || pi == 0 || pi == 1 {
		return 0, 0, true
	}
	k := (1 - d.Correlation) / d.Correlation
	return pi * k, (1 - pi) * k, false
}

// String prints "2 × 20 clusters of 25 units, rates 80% and 70%, intracluster correlation 0.05, 95% level".
func (d Design) String() string {
	sizes := make([]string, len(d.Sizes))
	for i, n := range d.Sizes {
		sizes[i] = strconv.Itoa(n)
	}
	of := "of " + strings.Join(sizes, ", ") + " units"
	if len(d.Sizes) > 1 {
		of = "of " + strings.Join(sizes, ", ") + " units in turn"
	}
	groups := fmt.Sprintf("%d and %d clusters", d.Clusters1, d.Clusters2)
	if d.Clusters1 == d.Clusters2 {
		groups = fmt.Sprintf("2 × %d clusters", d.Clusters1)
	}
	return fmt.Sprintf("%s %s, rates %s and %s, intracluster correlation %s, %s level", groups, of,
		pct(d.Rate1), pct(d.Rate2), strconv.FormatFloat(d.Correlation, 'g', 4, 64), pct(d.Level))
}

// pct prints 0.8 as "80%" and 0.955 as "95.5%".
func pct(v float64) string { return strconv.FormatFloat(100*v, 'g', 4, 64) + "%" }
