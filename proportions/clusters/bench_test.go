package clusters

import (
	"fmt"
	"math/rand/v2"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// benchData is 20 clusters of 5 to 40 units per group.
func benchData(b *testing.B) Data {
	r := rand.New(rand.NewPCG(7, 8))
	var g [2][]Cluster
	for gi := range g {
		for j := 0; j < 20; j++ {
			n := int64(5 + r.IntN(36))
			g[gi] = append(g[gi], Cluster{Value: fmt.Sprintf("%d-%d", gi, j), Events: r.Int64N(n + 1), Trials: n})
		}
	}
	d, err := New("tray", proportions.Labels{}, g[0], g[1])
	if err != nil {
		b.Fatal(err)
	}
	return d
}

// BenchmarkClusteredMethods times each registered method on a summary, as
// the simulation engine calls them.
func BenchmarkClusteredMethods(b *testing.B) {
	s := Summarize(benchData(b))
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range IntervalMethods() {
		b.Run(m.Key, func(b *testing.B) {
			b.Log("target: under 1 µs and no allocation per interval")
			b.ReportAllocs()
			for b.Loop() {
				m.IntervalAt(s, conf)
			}
		})
	}
	h, _ := DonnerTest.Hypothesis()
	for _, m := range Tests() {
		b.Run(m.Key, func(b *testing.B) {
			b.Log("target: under 1 µs per test (one allocation: the critical value's pointer)")
			b.ReportAllocs()
			for b.Loop() {
				m.Run(s, h)
			}
		})
	}
}

// BenchmarkSummarize times the one pass over the clusters.
func BenchmarkSummarize(b *testing.B) {
	d := benchData(b)
	b.Log("target: under 1 µs for 40 clusters, no allocation")
	b.ReportAllocs()
	for b.Loop() {
		Summarize(d)
	}
}

// BenchmarkAnalyze times the whole clustered analysis, the unit-level
// analysis included.
func BenchmarkAnalyze(b *testing.B) {
	d := benchData(b)
	b.Log("target: under 100 µs per analysis (the unit-level proportions.Analyze is about half of it)")
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Analyze(d); err != nil {
			b.Fatal(err)
		}
	}
}
