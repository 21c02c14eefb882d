package planning

import (
	"encoding/json"
	"fmt"
	"slices"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// citeClustered is the source of the clustered planning formulas.
const citeClustered = "Donner A, Birkett N, Buck C (1981). Randomization by cluster: sample size requirements and analysis. American Journal of Epidemiology 114:906–914; " +
	"unequal cluster sizes: Eldridge SM, Ashby D, Kerry S (2006). Sample size for cluster randomized trials: effect of coefficient of variation of cluster size and analysis method. International Journal of Epidemiology 35:1292–1300."

// Limits of a clustering: beyond them the design effect formula stops
// describing a study anyone would run.
const (
	// MaxClusterCorrelation is the largest anticipated intracluster
	// correlation a plan accepts; at 1 a cluster is worth one unit whatever
	// its size.
	MaxClusterCorrelation = 0.99
	// MaxSizeVariation is the largest coefficient of variation of the
	// cluster sizes a plan accepts.
	MaxSizeVariation = 5.0
	// maxPowerGrid bounds the cluster sizes and cluster counts of one grid.
	maxPowerGrid = 200
	// fewPlannedClusters is the number of clusters per group below which a
	// note says the normal approximation flatters the plan.
	fewPlannedClusters = 10
)

// Clustering describes the clusters a planned study's units will come in:
// their mean size, how much the sizes vary and the anticipated intracluster
// correlation.
type Clustering struct {
	// Size is the mean number of units per cluster whose outcome will be
	// known, m̄ ≥ 1.
	Size float64 `json:"cluster_size"`
	// Correlation is the anticipated intracluster correlation ρ, in
	// [0, MaxClusterCorrelation].
	Correlation float64 `json:"correlation"`
	// SizeVariation is the anticipated coefficient of variation of the
	// cluster sizes (standard deviation over mean), 0 for equal sizes, at
	// most MaxSizeVariation.
	SizeVariation float64 `json:"size_variation"`
}

// DesignEffect is 1 + ((CV² + 1)·m̄ − 1)·ρ: 1 + (m̄ − 1)ρ for equal sizes
// (Donner, Birkett & Buck 1981, American Journal of Epidemiology
// 114:906–914), with the sizes' coefficient of variation CV for unequal
// ones (Eldridge, Ashby & Kerry 2006, International Journal of
// Epidemiology 35:1292–1300).
func (c Clustering) DesignEffect() float64 {
	return 1 + ((c.SizeVariation*c.SizeVariation+1)*c.Size-1)*c.Correlation
}

// Validate reports a clustering outside its ranges with an error wrapping
// proportions.ErrPlan that names the field and its range.
func (c Clustering) Validate() error {
	switch {
	case !(c.Size >= 1 && c.Size <= float64(proportions.MaxTrials)):
		return fmt.Errorf("cluster size %v: %w; the mean units per cluster must be between 1 and %d", c.Size, proportions.ErrPlan, proportions.MaxTrials)
	case !(c.Correlation >= 0 && c.Correlation <= MaxClusterCorrelation):
		return fmt.Errorf("intracluster correlation %v: %w; it must be between 0 and %v", c.Correlation, proportions.ErrPlan, MaxClusterCorrelation)
	case !(c.SizeVariation >= 0 && c.SizeVariation <= MaxSizeVariation):
		return fmt.Errorf("cluster size variation %v: %w; the coefficient of variation must be between 0 and %v", c.SizeVariation, proportions.ErrPlan, MaxSizeVariation)
	case c.Size == 1 && c.SizeVariation != 0:
		return fmt.Errorf("cluster size variation %v with clusters of one unit: %w; clusters of mean size 1 all have one unit (variation 0)", c.SizeVariation, proportions.ErrPlan)
	}
	return nil
}

// String prints "clusters of 20 units (size variation 0.3), ρ = 0.05".
func (c Clustering) String() string {
	s := fmt.Sprintf("clusters of %s units", formatSize(c.Size))
	if c.SizeVariation > 0 {
		s += fmt.Sprintf(" on average (size variation %v)", c.SizeVariation)
	}
	return s + fmt.Sprintf(", intracluster correlation %v", c.Correlation)
}

func formatSize(v float64) string { return strings.TrimSuffix(fmt.Sprintf("%.1f", v), ".0") }

// ClusteredSizeResult is the number of clusters per group a plan needs
// when its units come in clusters.
type ClusteredSizeResult struct {
	Plan       Plan       `json:"plan"`
	Clustering Clustering `json:"clustering"`
	// DesignEffect is the clustering's design effect D.
	DesignEffect float64 `json:"design_effect"`
	Citation     string  `json:"citation"`
	Formula      string  `json:"formula"`
	// Independent is the plan's sample size were the units independent.
	Independent SampleSizeResult `json:"independent"`
	// Clusters1 and Clusters2 are the clusters per group, ⌈n_i·D/m̄⌉.
	Clusters1 int64 `json:"clusters1"`
	Clusters2 int64 `json:"clusters2"`
	// N1 and N2 are the units with an outcome, ⌈clusters·m̄⌉.
	N1 int64 `json:"n1"`
	N2 int64 `json:"n2"`
	// Enrolled1 and Enrolled2 are the units to enrol, inflated for the
	// plan's drop-out.
	Enrolled1 int64 `json:"enrolled1"`
	Enrolled2 int64 `json:"enrolled2"`
	// Power is the power at these clusters: the independent-units power at
	// the effective sizes clusters·m̄/D.
	Power   float64  `json:"power"`
	Notes   []string `json:"notes"`
	Caution string   `json:"caution"`
}

// ClusteredSampleSize returns the clusters per group a plan needs when its
// units come in clusters: the independent-units size n_i of SampleSize
// inflated by the design effect D = 1 + ((CV² + 1)·m̄ − 1)·ρ, and divided
// into clusters of m̄ units,
//
//	clusters_i = ⌈n_i·D / m̄⌉
//
// (Donner, Birkett & Buck 1981, American Journal of Epidemiology
// 114:906–914; CV for unequal sizes: Eldridge, Ashby & Kerry 2006,
// International Journal of Epidemiology 35:1292–1300), n_i unrounded. It
// reads every field of the plan. Errors are those of SampleSize, and
// ErrPlan for a clustering out of range.
func ClusteredSampleSize(p Plan, c Clustering) (ClusteredSizeResult, error) {
	if err := c.Validate(); err != nil {
		return ClusteredSizeResult{}, err
	}
	ind, err := SampleSize(p)
	if err != nil {
		return ClusteredSizeResult{}, err
	}
	de := c.DesignEffect()
	r := p.allocation()
	k1 := max(ceilSize(ind.Unrounded*de/c.Size), 2)
	k2 := max(ceilSize(r*ind.Unrounded*de/c.Size), 2)
	// The units are checked as real numbers before they become integers:
	// clusters of 10¹⁵ units can hold more than an int64 (4·10¹⁹ units
	// once wrapped around to a study of 1 unit per group).
	u1, u2 := float64(k1)*c.Size, float64(k2)*c.Size
	if !(u1 <= float64(proportions.MaxTrials) && u2 <= float64(proportions.MaxTrials)) {
		return ClusteredSizeResult{}, fmt.Errorf("clustered sample size of %.4g and %.4g units (%d and %d clusters of %s): %w; at most %d units per group",
			u1, u2, k1, k2, formatSize(c.Size), proportions.ErrTooLarge, proportions.MaxTrials)
	}
	n1, n2 := ceilSize(u1), ceilSize(u2)
	e1, err := enrolledUnits(n1, p.Dropout)
	if err != nil {
		return ClusteredSizeResult{}, err
	}
	e2, err := enrolledUnits(n2, p.Dropout)
	if err != nil {
		return ClusteredSizeResult{}, err
	}
	res := ClusteredSizeResult{Plan: p, Clustering: c, DesignEffect: de, Citation: citeClustered,
		Formula:     "clusters per group = ⌈n·D/m̄⌉, D = 1 + ((CV² + 1)·m̄ − 1)·ρ, n the size for independent units",
		Independent: ind, Clusters1: k1, Clusters2: k2, N1: n1, N2: n2, Enrolled1: e1, Enrolled2: e2,
		Power: clusteredPower(p, c, k1, k2), Caution: Caution}
	res.Notes = clusteredNotes(c, k1, k2)
	return res, nil
}

// clusteredPower is the independent-units power at the effective sizes
// k_i·m̄/D of k1 and k2 clusters.
func clusteredPower(p Plan, c Clustering, k1, k2 int64) float64 {
	de := c.DesignEffect()
	e1, e2 := float64(k1)*c.Size/de, float64(k2)*c.Size/de
	return newModel(p, p.Rate1, p.Rate2, e2/e1).power(e1)
}

// clusteredNotes are the cautions of a clustered plan.
func clusteredNotes(c Clustering, k1, k2 int64) []string {
	notes := []string{}
	if min(k1, k2) < fewPlannedClusters {
		notes = append(notes, fmt.Sprintf("only %d clusters in a group: the normal approximation flatters the plan, and the analysis will estimate the variation between clusters from few values; plan more clusters where you can", min(k1, k2)))
	}
	if c.Correlation == 0 {
		notes = append(notes, "an intracluster correlation of 0 assumes clusters do not matter; a small positive value from earlier data is safer")
	}
	return notes
}

// String prints the clusters per group and what they hold.
func (r ClusteredSizeResult) String() string {
	return fmt.Sprintf("%s; %s: design effect %.3f, %d and %d clusters (%d and %d units; independent units would need %d and %d), power %.3f",
		r.Plan, r.Clustering, r.DesignEffect, r.Clusters1, r.Clusters2, r.N1, r.N2, r.Independent.N1, r.Independent.N2, r.Power)
}

// MarshalJSON writes the result with its notes as an array.
func (r ClusteredSizeResult) MarshalJSON() ([]byte, error) {
	type plain ClusteredSizeResult
	q := plain(r)
	q.Notes = jsonlist.NonNil(q.Notes)
	return json.Marshal(q)
}

// ClusteredPowerPoint is the power of one clustered design.
type ClusteredPowerPoint struct {
	// Clusters is the number of clusters in group 1; group 2 gets
	// ⌈r·Clusters⌉ by the plan's allocation.
	Clusters int64 `json:"clusters"`
	// EffectiveSize is the independent units group 1 is worth,
	// clusters·m̄/D.
	EffectiveSize float64 `json:"effective_size"`
	Power         float64 `json:"power"`
}

// ClusteredPowerLine is the power over numbers of clusters at one size.
type ClusteredPowerLine struct {
	ClusterSize  float64               `json:"cluster_size"`
	DesignEffect float64               `json:"design_effect"`
	Points       []ClusteredPowerPoint `json:"points"`
}

// ClusteredPowerGrid is the power of a plan over cluster sizes and numbers
// of clusters, at one intracluster correlation and size variation.
type ClusteredPowerGrid struct {
	Plan          Plan                 `json:"plan"`
	Correlation   float64              `json:"correlation"`
	SizeVariation float64              `json:"size_variation"`
	Citation      string               `json:"citation"`
	Lines         []ClusteredPowerLine `json:"lines"`
	Caution       string               `json:"caution"`
}

// ClusteredPowerByClusters returns the power of a plan for every cluster
// size in sizes (one line each) and every number of clusters per group 1
// in clusters (group 2 by the plan's allocation), with the clustering's
// correlation and size variation: the independent-units power at the
// effective sizes clusters·m̄/D (Donner, Birkett & Buck 1981). It reads
// the plan as Power does (its target power is not used). Errors wrap
// ErrPlan: a plan or clustering out of range, empty lists or more than
// 200 entries, a cluster size below 1, fewer than 2 clusters, or more
// than MaxTrials units in a group.
func ClusteredPowerByClusters(p Plan, rho, sizeVariation float64, sizes []float64, clusters []int64) (ClusteredPowerGrid, error) {
	if _, err := checkedModel(p, reads{}); err != nil {
		return ClusteredPowerGrid{}, err
	}
	if len(sizes) == 0 || len(clusters) == 0 || len(sizes) > maxPowerGrid || len(clusters) > maxPowerGrid {
		return ClusteredPowerGrid{}, fmt.Errorf("%d cluster sizes and %d cluster counts: %w; give between 1 and %d of each", len(sizes), len(clusters), proportions.ErrPlan, maxPowerGrid)
	}
	g := ClusteredPowerGrid{Plan: p, Correlation: rho, SizeVariation: sizeVariation, Citation: citeClustered, Caution: Caution}
	r := p.allocation()
	for _, m := range sizes {
		c := Clustering{Size: m, Correlation: rho, SizeVariation: sizeVariation}
		if err := c.Validate(); err != nil {
			return ClusteredPowerGrid{}, err
		}
		line := ClusteredPowerLine{ClusterSize: m, DesignEffect: c.DesignEffect()}
		for _, k := range clusters {
			k2 := ceilSize(r * float64(k))
			if k < 2 || k2 < 2 || float64(max(k, k2))*m > float64(proportions.MaxTrials) {
				return ClusteredPowerGrid{}, fmt.Errorf("%d clusters of %v units: %w; each group needs at least 2 clusters and at most %d units", k, m, proportions.ErrPlan, proportions.MaxTrials)
			}
			line.Points = append(line.Points, ClusteredPowerPoint{Clusters: k, EffectiveSize: float64(k) * m / line.DesignEffect,
				Power: clusteredPower(p, c, k, k2)})
		}
		g.Lines = append(g.Lines, line)
	}
	return g, nil
}

// String prints one line per cluster size.
func (g ClusteredPowerGrid) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%s; intracluster correlation %v\n", g.Plan, g.Correlation)
	for _, l := range g.Lines {
		fmt.Fprintf(&b, "clusters of %s (design effect %.3f):", formatSize(l.ClusterSize), l.DesignEffect)
		for _, pt := range l.Points {
			fmt.Fprintf(&b, " %d→%.3f", pt.Clusters, pt.Power)
		}
		b.WriteString("\n")
	}
	return b.String()
}

// MarshalJSON writes the grid with every list as an array.
func (g ClusteredPowerGrid) MarshalJSON() ([]byte, error) {
	type plain ClusteredPowerGrid
	q := plain(g)
	q.Lines = jsonlist.NonNil(slices.Clone(q.Lines)) // a copy: the points are replaced below
	for i := range q.Lines {
		q.Lines[i].Points = jsonlist.NonNil(q.Lines[i].Points)
	}
	return json.Marshal(q)
}
