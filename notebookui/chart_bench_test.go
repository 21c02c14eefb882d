package notebookui

import (
	"context"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// Chart building is on the path of every notebook cell and live explorer
// redraw. The analysis and the coverage surface are computed once, outside
// the loop; the confidence curve chart evaluates its curve (about 450 runs
// of the score test) inside it, as it does in a notebook.

func BenchmarkConfidenceCurveChart(b *testing.B) {
	c, _ := proportions.NewComparison(41, 50, 30, 50, proportions.Labels{})
	a, err := proportions.Analyze(c)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		ch, err := ConfidenceCurveChart(a)
		if err != nil {
			b.Fatal(err)
		}
		_ = ch.HTML()
	}
}

func BenchmarkDifferenceIntervalsChartHTML(b *testing.B) {
	c, _ := proportions.NewComparison(41, 50, 30, 50, proportions.Labels{})
	a, err := proportions.Analyze(c)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		ch, err := DifferenceIntervalsChart(a)
		if err != nil {
			b.Fatal(err)
		}
		_ = ch.HTML()
	}
}

func BenchmarkCoverageMapChartHTML(b *testing.B) {
	d, _ := operating.NewDesign(50, 50, 0.95)
	tab, err := operating.NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		b.Fatal(err)
	}
	s, err := tab.Surface(context.Background()) // 101 × 101 grid
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		ch, err := CoverageMapChart(s)
		if err != nil {
			b.Fatal(err)
		}
		_ = ch.HTML()
	}
}
