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
		tables := []struct {
			name string
			c    Counts
		}{
			{"60-50", Counts{X1: n * 3 / 5, N1: n, X2: n / 2, N2: n}},
			{"rare", Counts{X1: max(1, n/100), N1: n, X2: max(2, n/50), N2: n}},
			{"near", Counts{X1: n / 2, N1: n, X2: n * 51 / 100, N2: n}},
		}
		for _, t := range tables {
			c, err := NewComparison(t.c.X1, t.c.N1, t.c.X2, t.c.N2, Labels{})
			if err != nil {
				b.Fatal(err)
			}
			for _, v := range []struct {
				name string
				opts []Option
			}{{"quick", nil}, {"large-sample", []Option{WithMethods(LargeSampleMethods)}}, {"all", []Option{WithMethods(AllMethods)}}} {
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
