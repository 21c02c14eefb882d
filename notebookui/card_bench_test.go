package notebookui

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
)

// Rendering cost of the card's forms (the fixture analysis: 2 tests, 2
// intervals, 5 references).
func BenchmarkResultCardHTML(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		_ = c.HTML()
	}
}

func BenchmarkResultCardText(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		_ = c.Text()
	}
}

func BenchmarkResultCardBundle(b *testing.B) {
	c := fixtureCard()
	for b.Loop() {
		if _, err := Bundle(c); err != nil {
			b.Fatal(err)
		}
	}
}

// The Bayesian section of a card from the counts: the analysis (with an
// equivalence region) and the card's HTML. Target (issue 18): under 2 ms;
// compare the figure printed beside it.
func benchBayesSection(b *testing.B, x1, n1, x2, n2 int64) {
	b.Log("target: the whole Bayesian section of a card under 2 ms")
	c, err := proportions.NewComparison(x1, n1, x2, n2, proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		a, err := bayes.Analyze(c, bayes.WithEquivalence(-0.05, 0.05))
		if err != nil {
			b.Fatal(err)
		}
		_ = NewBayesCard(a).HTML()
	}
}

func BenchmarkBayesSectionSeedTrial(b *testing.B) { benchBayesSection(b, 41, 50, 33, 50) }
func BenchmarkBayesSectionMillion(b *testing.B) {
	benchBayesSection(b, 500_000, 1_000_000, 499_000, 1_000_000)
}
func BenchmarkBayesSectionMillionJeffreys(b *testing.B) {
	b.Log("(Jeffreys prior: the integral path)")
	c, _ := proportions.NewComparison(500_000, 1_000_000, 499_000, 1_000_000, proportions.Labels{})
	for b.Loop() {
		a, err := bayes.Analyze(c, bayes.WithPrior(bayes.Jeffreys()), bayes.WithEquivalence(-0.05, 0.05))
		if err != nil {
			b.Fatal(err)
		}
		_ = NewBayesCard(a).HTML()
	}
}
