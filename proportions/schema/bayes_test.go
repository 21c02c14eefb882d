package schema_test

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/schema"
)

// checkBayes validates Bayesian analyses of many tables (zero cells, all
// events, unequal and large groups) under every kind of prior, both
// directions of benefit, with and without a margin and an equivalence
// region, several levels and batch sizes.
func checkBayes(t *testing.T, c *corpus) {
	tables := [][4]int64{
		{41, 50, 33, 50}, {0, 10, 0, 10}, {10, 10, 10, 10}, {0, 12, 5, 12}, {7, 7, 0, 9},
		{1, 3, 2, 40}, {3, 1000, 9, 1000}, {499, 1000, 501, 1000}, {120, 300, 90, 250},
		{5, 5, 4, 5}, {0, 1, 1, 1}, {2, 20, 2, 20}, {500_000, 1_000_000, 499_000, 1_000_000},
	}
	informative, err := bayes.PriorFromMean(0.7, 20)
	if err != nil {
		t.Fatal(err)
	}
	shapes, err := bayes.PriorFromShapes(2.5, 7)
	if err != nil {
		t.Fatal(err)
	}
	settings := [][]bayes.Option{
		nil,
		{bayes.WithPrior(bayes.Jeffreys()), bayes.WithEquivalence(-0.05, 0.05)},
		{bayes.WithPrior(bayes.Neutral()), bayes.WithMargin(0.02), bayes.WithLevel(0.9)},
		{bayes.WithPrior(informative), bayes.WithBetter(proportions.LowerIsBetter), bayes.WithBatch(1)},
		{bayes.WithPriors(shapes, bayes.Uniform()), bayes.WithMargin(-0.1), bayes.WithEquivalence(-0.2, 0.01), bayes.WithBatch(1000)},
	}
	type job struct {
		tb [4]int64
		o  []bayes.Option
	}
	var jobs []job
	for _, tb := range tables {
		for j, o := range settings {
			if tb[1] >= 1_000_000 && j > 1 { // the large table twice: the sums and the integrals
				continue
			}
			jobs = append(jobs, job{tb, o})
		}
	}
	type out struct {
		a   bayes.Analysis
		err error
	}
	results := parallelMap(jobs, func(j job) out {
		cmp, err := proportions.NewComparison(j.tb[0], j.tb[1], j.tb[2], j.tb[3], proportions.Labels{First: "A", Second: "B", Event: "germinated"})
		if err != nil {
			return out{err: err}
		}
		a, err := bayes.Analyze(cmp, j.o...)
		return out{a, err}
	})
	for i, r := range results {
		if r.err != nil {
			t.Fatalf("table %v: %v", jobs[i].tb, r.err)
		}
		c.check(schema.Bayes, r.a)
	}
}
