package proportions

import (
	"fmt"
	"testing"
)

// BenchmarkAnalyze times the analysis of one table at several sizes, in
// each method scope: "quick" is the default analysis, "large-sample"
// leaves out the exact methods, "all" runs every registered method up to
// its size limit. The target for the default analysis is under 10 µs up
// to 10⁶ per group, whatever the rates: the quick scope also runs on rare
// events (1% against 2%) and on a table near the null (50% against 51%).
func BenchmarkAnalyze(b *testing.B) {
	for _, n := range []int64{50, 1000, 1_000_000} {
		for _, t := range analysisBenchTables(n) {
			c, err := NewComparison(t.c.X1, t.c.N1, t.c.X2, t.c.N2, Labels{})
			if err != nil {
				b.Fatal(err)
			}
			for _, v := range []struct {
				name string
				opts []Option
			}{{"quick", nil}, {"large-sample", []Option{WithScope(ScopeLargeSample)}}, {"all", []Option{WithScope(ScopeAll)}}} {
				if v.name != "quick" && t.name != "60-50" {
					continue
				}
				b.Run(fmt.Sprintf("%s/%s/n=%d", v.name, t.name, n), func(b *testing.B) {
					for b.Loop() {
						if _, err := Analyze(c, v.opts...); err != nil {
							b.Fatal(err)
						}
					}
				})
			}
		}
	}
}

// analysisBenchTables are the tables of BenchmarkAnalyze at n per group.
func analysisBenchTables(n int64) []struct {
	name string
	c    Counts
} {
	return []struct {
		name string
		c    Counts
	}{
		{"60-50", Counts{X1: n * 3 / 5, N1: n, X2: n / 2, N2: n}},
		{"rare", Counts{X1: max(1, n/100), N1: n, X2: max(2, n/50), N2: n}},
		{"near", Counts{X1: n / 2, N1: n, X2: n * 51 / 100, N2: n}},
	}
}

// BenchmarkPlainBracketing is the yardstick of the speed targets: both
// limits of Mee's 95% interval by plain bisection of the score statistic
// to 10⁻⁹, about 60 score evaluations, on the tables of BenchmarkAnalyze.
// The targets (an analysis under 10 µs, a score interval under 2 µs) were
// set on machines where this search took 6–7 µs. Shared machines vary by a
// third from one minute to the next, so scripts/bench-analysis.sh measures
// both in alternating rounds and reports each time also as a multiple of
// this one.
func BenchmarkPlainBracketing(b *testing.B) {
	conf, err := NewConfidence(0.95)
	if err != nil {
		b.Fatal(err)
	}
	for _, n := range []int64{50, 1000, 1_000_000} {
		for _, t := range analysisBenchTables(n) {
			b.Run(fmt.Sprintf("%s/n=%d", t.name, n), func(b *testing.B) {
				evals := 0
				for b.Loop() {
					evals = 0
					above := func(d float64) bool { evals++; return scoreZ(t.c, d, 1) > conf.Z }
					below := func(d float64) bool { evals++; return scoreZ(t.c, d, 1) > -conf.Z }
					d := t.c.P1() - t.c.P2()
					bisectScoreTo(above, -1, d, 1e-9)
					bisectScoreTo(below, d, 1, 1e-9)
				}
				b.ReportMetric(float64(evals), "evals/op")
			})
		}
	}
}
