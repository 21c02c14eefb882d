package proportions

import (
	"fmt"
	"testing"
)

// BenchmarkAnalyze times the default analysis of one table at several
// sizes: "asymptotic" leaves out the exact methods (WithExactMethods(false)),
// "full" runs every registered method up to its size limit.
func BenchmarkAnalyze(b *testing.B) {
	for _, n := range []int64{50, 1000, 1_000_000} {
		c, _ := NewComparison(n*3/5, n, n/2, n, Labels{})
		for _, v := range []struct {
			name string
			opts []Option
		}{{"asymptotic", []Option{WithExactMethods(false)}}, {"full", nil}} {
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
