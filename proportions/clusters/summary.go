package clusters

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// GroupSummary is one group's sufficient statistics over its clusters j:
// every clustered method in this package reads these sums only, so a
// simulation computes them once per data set and calls the methods without
// touching the clusters again.
type GroupSummary struct {
	// Clusters is the number of clusters m.
	Clusters int64 `json:"clusters"`
	// Trials is the number of units N = Σ n_j.
	Trials int64 `json:"trials"`
	// Events is the number of events X = Σ x_j.
	Events int64 `json:"events"`
	// SumSquaredTrials is Σ n_j².
	SumSquaredTrials float64 `json:"-"`
	// SumSquaredEvents is Σ x_j².
	SumSquaredEvents float64 `json:"-"`
	// SumEventsTrials is Σ x_j n_j.
	SumEventsTrials float64 `json:"-"`
	// SumSquaredEventsPerTrial is Σ x_j²/n_j (the between-cluster sum of
	// squares of the one-way analysis of variance is this minus X²/N).
	SumSquaredEventsPerTrial float64 `json:"-"`
	// SumRates is Σ p_j over the clusters' own rates p_j = x_j/n_j.
	SumRates float64 `json:"-"`
	// SumSquaredRates is Σ p_j².
	SumSquaredRates float64 `json:"-"`
}

// Add adds one cluster of events out of trials (trials ≥ 1) to the sums.
func (g *GroupSummary) Add(events, trials int64) {
	x, n := float64(events), float64(trials)
	p := x / n
	g.Clusters++
	g.Trials += trials
	g.Events += events
	g.SumSquaredTrials += n * n
	g.SumSquaredEvents += x * x
	g.SumEventsTrials += x * n
	g.SumSquaredEventsPerTrial += x * p
	g.SumRates += p
	g.SumSquaredRates += p * p
}

// Rate returns X/N, the group's unit-level rate.
func (g GroupSummary) Rate() float64 { return float64(g.Events) / float64(g.Trials) }

// withinSquares is the within-cluster sum of squares of the 0/1 outcomes,
// Σ_j x_j(n_j − x_j)/n_j = X − Σ x_j²/n_j.
func (g GroupSummary) withinSquares() float64 {
	return nonNegative(float64(g.Events) - g.SumSquaredEventsPerTrial)
}

// betweenSquares is the between-cluster sum of squares within the group,
// Σ_j n_j(p_j − p)² = Σ x_j²/n_j − X²/N.
func (g GroupSummary) betweenSquares() float64 {
	x := float64(g.Events)
	return nonNegative(g.SumSquaredEventsPerTrial - x*x/float64(g.Trials))
}

// nonNegative clears the rounding error that can leave a sum of squares
// computed as a difference a hair below zero.
func nonNegative(v float64) float64 { return max(v, 0) }

// Summary holds both groups' sufficient statistics.
type Summary struct {
	Group1 GroupSummary `json:"group1"`
	Group2 GroupSummary `json:"group2"`
}

// Summarize computes the sums of both groups of validated data.
func Summarize(d Data) Summary {
	var s Summary
	for _, k := range d.Group1 {
		s.Group1.Add(k.Events, k.Trials)
	}
	for _, k := range d.Group2 {
		s.Group2.Add(k.Events, k.Trials)
	}
	return s
}

// Counts returns the unit-level counts, as Data.Totals.
func (s Summary) Counts() proportions.Counts {
	return proportions.Counts{X1: s.Group1.Events, N1: s.Group1.Trials, X2: s.Group2.Events, N2: s.Group2.Trials}
}

// Check reports summaries the clustered methods cannot use: fewer than two
// clusters in a group (no variation between clusters can be seen within
// it), with an error wrapping proportions.ErrTooFewClusters.
func (s Summary) Check() error {
	for i, g := range []GroupSummary{s.Group1, s.Group2} {
		if g.Clusters < 2 {
			return fmt.Errorf("group %d has %d cluster(s): %w; the clustered methods need at least 2 clusters in each group to see how much clusters differ",
				i+1, g.Clusters, proportions.ErrTooFewClusters)
		}
		if g.Trials < 1 {
			return fmt.Errorf("group %d: %w", i+1, proportions.ErrNoTrials)
		}
	}
	return nil
}
