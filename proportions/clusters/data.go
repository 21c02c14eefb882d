// Package clusters analyses two groups whose units come in clusters (seeds
// in trays, items in batches, patients in clinics): how clustered the data
// are, and intervals and tests for π1 − π2 that account for it.
package clusters

import (
	"fmt"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Cluster is one cluster's counts: Events of Trials units, under the value
// that names it in the data (a tray, a batch).
type Cluster struct {
	Value  string `json:"value"`
	Events int64  `json:"events"`
	Trials int64  `json:"trials"`
}

// Data is two groups of clusters. Every cluster belongs to one group; By
// names the cluster column ("tray"), the labels the groups and the event.
// Build it with [New] or [FromBreakdown], which guarantee at least one
// cluster per group, 0 ≤ events ≤ trials, trials ≥ 1 and distinct values.
type Data struct {
	By     string    `json:"by"`
	First  string    `json:"first"`
	Second string    `json:"second"`
	Event  string    `json:"event"`
	Group1 []Cluster `json:"group1"`
	Group2 []Cluster `json:"group2"`
}

// DefaultColumn names the cluster column when the caller gives no name.
const DefaultColumn = "cluster"

// New validates two groups' clusters. Errors wrap proportions.ErrEmptyInput
// (a group with no clusters), ErrNoTrials (a cluster with no units),
// ErrNegativeCount, ErrEventsExceedTrials, ErrTooLarge or
// ErrDuplicateValue (one value twice, within or across the groups: a
// cluster found in both groups), and name the cluster.
func New(by string, labels proportions.Labels, group1, group2 []Cluster) (Data, error) {
	if strings.TrimSpace(by) == "" {
		by = DefaultColumn
	}
	c, err := proportions.NewComparison(0, 1, 0, 1, labels) // fills default labels
	if err != nil {
		return Data{}, err
	}
	d := Data{By: by, First: c.First.Label, Second: c.Second.Label, Event: c.Event}
	seen := map[string]string{}
	var total [2]int64
	for gi, g := range [][]Cluster{group1, group2} {
		label := []string{d.First, d.Second}[gi]
		if len(g) == 0 {
			return Data{}, fmt.Errorf("group %q: %w; each group needs at least one %s", label, proportions.ErrEmptyInput, by)
		}
		out := make([]Cluster, len(g))
		for i, k := range g {
			k.Value = strings.TrimSpace(k.Value)
			if k.Value == "" {
				return Data{}, fmt.Errorf("group %q, %s %d: %w; every %s needs a name", label, by, i+1, proportions.ErrEmptyInput, by)
			}
			if other, ok := seen[k.Value]; ok {
				where := "twice in group " + fmt.Sprintf("%q", label)
				if other != label {
					where = fmt.Sprintf("in both groups %q and %q", other, label)
				}
				return Data{}, fmt.Errorf("%s %q found %s: %w; each %s belongs to one group and appears once", by, k.Value, where, proportions.ErrDuplicateValue, by)
			}
			seen[k.Value] = label
			if err := checkCluster(k); err != nil {
				return Data{}, fmt.Errorf("group %q, %s %q: %w", label, by, k.Value, err)
			}
			total[gi] += k.Trials
			if total[gi] > proportions.MaxTrials {
				return Data{}, fmt.Errorf("group %q: %w; at most %d units per group", label, proportions.ErrTooLarge, proportions.MaxTrials)
			}
			out[i] = k
		}
		if gi == 0 {
			d.Group1 = out
		} else {
			d.Group2 = out
		}
	}
	return d, nil
}

// checkCluster checks one cluster's counts: 0 ≤ events ≤ trials, 1 ≤
// trials ≤ MaxTrials. Its messages speak of the cluster, not of a group of
// a comparison (the cluster may be in either group).
func checkCluster(k Cluster) error {
	switch {
	case k.Events < 0 || k.Trials < 0:
		return fmt.Errorf("%d events of %d units: %w; counts must be 0 or more", k.Events, k.Trials, proportions.ErrNegativeCount)
	case k.Trials == 0:
		return fmt.Errorf("%w; every cluster needs at least one unit", proportions.ErrNoTrials)
	case k.Events > k.Trials:
		return fmt.Errorf("%d events of %d units: %w; events must be between 0 and the number of units", k.Events, k.Trials, proportions.ErrEventsExceedTrials)
	case k.Trials > proportions.MaxTrials:
		return fmt.Errorf("%d units: %w; at most %d units per group are supported", k.Trials, proportions.ErrTooLarge, proportions.MaxTrials)
	}
	return nil
}

// validate checks data that may not have come from New (Data's fields are
// exported, so a caller can fill them directly): a cluster of no units
// gave NaN in every result, one of negative events wrong numbers. The
// errors are New's.
func (d Data) validate() error {
	_, err := New(d.By, d.labels(), d.Group1, d.Group2)
	return err
}

// labels returns the group and event labels of the data.
func (d Data) labels() proportions.Labels {
	return proportions.Labels{First: d.First, Second: d.Second, Event: d.Event}
}

// FromBreakdown reads clusters from a breakdown by the cluster column: each
// row must have trials in exactly one group (the cluster's group). A row
// with units in both groups is an error wrapping ErrDuplicateValue that
// names the cluster.
func FromBreakdown(b proportions.Breakdown) (Data, error) {
	var g1, g2 []Cluster
	for _, r := range b.Rows {
		c := r.Counts
		switch {
		case c.N1 > 0 && c.N2 > 0:
			return Data{}, fmt.Errorf("%s %q found in both groups %q (%d units) and %q (%d units): %w; each %s belongs to one group",
				b.By, r.Value, b.First, c.N1, b.Second, c.N2, proportions.ErrDuplicateValue, b.By)
		case c.N1 > 0:
			g1 = append(g1, Cluster{Value: r.Value, Events: c.X1, Trials: c.N1})
		default:
			g2 = append(g2, Cluster{Value: r.Value, Events: c.X2, Trials: c.N2})
		}
	}
	return New(b.By, b.Labels(), g1, g2)
}

// Totals returns the unit-level counts of the two groups, the comparison an
// analysis that ignores the clusters would use.
func (d Data) Totals() proportions.Counts {
	var c proportions.Counts
	for _, k := range d.Group1 {
		c.X1 += k.Events
		c.N1 += k.Trials
	}
	for _, k := range d.Group2 {
		c.X2 += k.Events
		c.N2 += k.Trials
	}
	return c
}

// String prints the labels, the number of clusters and units per group.
func (d Data) String() string {
	t := d.Totals()
	return fmt.Sprintf("%s: %s %d/%d in %d %ss vs %s %d/%d in %d %ss",
		d.Event, d.First, t.X1, t.N1, len(d.Group1), d.By, d.Second, t.X2, t.N2, len(d.Group2), d.By)
}
