package bayes

import (
	"testing"

	"github.com/propscope/propscope/proportions"
)

// Targets from issue 18 (shared 2-core machine; compare the figures
// printed beside them, nothing here asserts time).
func BenchmarkProbabilityFirstHigherMillion(b *testing.B) {
	b.Log("target: under 50 µs per call at 10⁶ per group")
	p1, p2 := Uniform().Update(500_000, 1_000_000), Uniform().Update(499_000, 1_000_000)
	for b.Loop() {
		ProbabilityFirstHigher(p1, p2)
	}
}

func BenchmarkProbabilityFirstHigherMillionJeffreys(b *testing.B) {
	b.Log("target: under 50 µs per call at 10⁶ per group (this is the integral path)")
	p1, p2 := Jeffreys().Update(500_000, 1_000_000), Jeffreys().Update(499_000, 1_000_000)
	for b.Loop() {
		ProbabilityFirstHigher(p1, p2)
	}
}

func benchAnalyze(b *testing.B, x1, n1, x2, n2 int64) {
	b.Log("target: the whole Bayesian section under 2 ms")
	c, _ := proportions.NewComparison(x1, n1, x2, n2, proportions.Labels{})
	for b.Loop() {
		if _, err := Analyze(c, WithEquivalence(-0.05, 0.05)); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkAnalyzeSeedTrial(b *testing.B) { benchAnalyze(b, 41, 50, 33, 50) }
func BenchmarkAnalyzeMillion(b *testing.B)   { benchAnalyze(b, 500_000, 1_000_000, 499_000, 1_000_000) }
