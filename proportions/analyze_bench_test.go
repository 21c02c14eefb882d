package proportions

import (
	"fmt"
	"testing"
)

// BenchmarkAnalyze times the analysis of one table at several sizes, in
// each method scope: "quick" is the default analysis, "large-sample"
// leaves out the exact methods, "all" runs every registered method up to
// its size limit. The target for the default analysis is under 10 µs up
// to 10⁶ per group.
func BenchmarkAnalyze(b *testing.B) {
	for _, n := range []int64{50, 1000, 1_000_000} {
		c, _ := NewComparison(n*3/5, n, n/2, n, Labels{})
		for _, v := range []struct {
			name string
			opts []Option
		}{{"quick", nil}, {"large-sample", []Option{WithMethods(LargeSampleMethods)}}, {"all", []Option{WithMethods(AllMethods)}}} {
			b.Run(fmt.Sprintf("%s/n=%d", v.name, n), func(b *testing.B) {
				for b.Loop() {
					if _, err := Analyze(c, v.opts...); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}
