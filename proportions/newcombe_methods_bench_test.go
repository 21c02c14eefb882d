package proportions

import (
	"fmt"
	"testing"
)

// BenchmarkProfileTailIntervals times the methods added from Newcombe
// (1998a, b) on balanced tables with rates 0.3 and 0.2, from 20 to 10⁴
// per group; the profile tail-area intervals' TrialLimit rests on it.
func BenchmarkProfileTailIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, n := range []int64{20, 100, 1000, 10000} {
		c := Counts{X1: 3 * n / 10, N1: n, X2: 2 * n / 10, N2: n}
		for _, m := range []IntervalMethod{Haldane, JeffreysPerks, ProfileLikelihood, ProfileExactTails, ProfileMidPTails} {
			b.Run(fmt.Sprintf("%s/n=%d", m.Key, n), func(b *testing.B) {
				for b.Loop() {
					sinkLo, sinkHi = m.Limits(c, conf)
				}
			})
		}
		for _, m := range []RateMethod{MidPRate, LikelihoodRate} {
			b.Run(fmt.Sprintf("%s/n=%d", m.Key, n), func(b *testing.B) {
				for b.Loop() {
					sinkLo, sinkHi = m.Limits(c.X1, c.N1, conf)
				}
			})
		}
	}
}
