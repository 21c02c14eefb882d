package clusters

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
)

// betaBinomialGroup draws m clusters of n units whose cluster rates follow
// a beta distribution with mean pi and intracluster correlation rho
// (α + β = (1 − ρ)/ρ, the beta-binomial model of clustered binary data).
func betaBinomialGroup(r *rand.Rand, prefix string, m, n int, pi, rho float64) []Cluster {
	s := (1 - rho) / rho
	b := distuv.Beta{Alpha: pi * s, Beta: (1 - pi) * s, Src: r}
	out := make([]Cluster, m)
	for j := range out {
		p := b.Rand()
		x := int64(0)
		for u := 0; u < n; u++ {
			if r.Float64() < p {
				x++
			}
		}
		out[j] = Cluster{Value: fmt.Sprintf("%s%d", prefix, j), Events: x, Trials: int64(n)}
	}
	return out
}

// A fact of the trade, checked by simulation with a fixed seed: with
// clustered units (ρ = 0.1, 12 trays of 20 per group, design effect 2.9)
// the unit-level Newcombe interval covers the true difference far less
// often than 95%, while the intervals that account for the trays come
// close to it. The bounds are wide (1000 data sets: a coverage's standard
// error is about 0.7 points), so the test fails only on a gross error.
func TestClusteredIntervalsCoverWhereUnitLevelFails(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	const sets, pi1, pi2 = 1000, 0.6, 0.5
	conf, _ := proportions.NewConfidence(0.95)
	covered := map[string]int{}
	for i := 0; i < sets; i++ {
		d := mustData(t, betaBinomialGroup(r, "a", 12, 20, pi1, 0.1), betaBinomialGroup(r, "b", 12, 20, pi2, 0.1))
		s := Summarize(d)
		for _, m := range IntervalMethods() {
			if iv := m.IntervalAt(s, conf); iv.Contains(pi1 - pi2) {
				covered[m.Key]++
			}
		}
		if iv, _ := proportions.Newcombe.Interval(d.Totals(), 0.95); iv.Contains(pi1 - pi2) {
			covered["newcombe"]++
		}
	}
	if c := float64(covered["newcombe"]) / sets; c > 0.85 {
		t.Errorf("unit-level Newcombe covers %.3f of clustered data sets; with a design effect near 3 it should be near 0.75", c)
	}
	for _, m := range IntervalMethods() {
		if c := float64(covered[m.Key]) / sets; c < 0.91 || c > 0.985 {
			t.Errorf("%s covers %.3f, want near 0.95", m.Key, c)
		}
	}
	t.Logf("coverage in %d data sets: %v", sets, covered)
}
