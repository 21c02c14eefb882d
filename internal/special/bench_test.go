package special

import (
	"fmt"
	"testing"
)

// Per-call timings of the kernels, so that `go test -bench . ./internal/...`
// shows what one call costs. Each op is one call; where a kernel's cost
// depends on its arguments, sub-benchmarks name the regime. The sinks keep
// the calls from being optimized away.
var sinkA, sinkB float64

// z975 is Φ⁻¹(0.975), the deviate of a 95% two-sided interval (see
// TestNormalHandbookQuantiles).
const z975 = 1.959963984540054

// BenchmarkBetaLowerQuantile: one Clopper–Pearson-style quantile at 95%
// (tail 0.025) for small shapes, moderate shapes, large shapes (the series
// branch, m ≥ 40 and well inside its bound) and huge shapes near 2⁴⁰.
// "fresh-tail" builds the BetaTail in the op, as a caller does once per
// interval (so the one-time Φ(−z), φ(z) or log q is included); "warm-tail"
// reuses one, as the second limit of the same interval does.
func BenchmarkBetaLowerQuantile(b *testing.B) {
	shapes := []struct {
		name string
		a, b float64
	}{
		{"small-3-18", 3, 18},
		{"moderate-30.5-70.5", 30.5, 70.5},
		{"large-5000-5001", 5000, 5001},
		{"huge-2^40", 0.3 * (1 << 40), 0.7 * (1 << 40)},
	}
	for _, s := range shapes {
		b.Run(s.name+"/fresh-tail", func(b *testing.B) {
			for b.Loop() {
				t := NewBetaTail(0.025, z975)
				sinkA, sinkB = BetaLowerQuantile(s.a, s.b, &t)
			}
		})
		b.Run(s.name+"/warm-tail", func(b *testing.B) {
			t := NewBetaTail(0.025, z975)
			BetaLowerQuantile(s.a, s.b, &t)
			for b.Loop() {
				sinkA, sinkB = BetaLowerQuantile(s.a, s.b, &t)
			}
		})
	}
}

// BenchmarkLogHypergeomPMF: one log-probability at the mode and in the tail,
// for margins of 100 and 10⁶ per group (the cost should not depend on the
// size: a fixed number of stirlerr and bd0 terms).
func BenchmarkLogHypergeomPMF(b *testing.B) {
	for _, c := range []struct{ n1, n2, m int64 }{{100, 100, 80}, {1000000, 1000000, 700000}} {
		mode := HypergeomMode(c.n1, c.n2, c.m)
		for _, at := range []struct {
			name string
			k    int64
		}{{"mode", mode}, {"tail", mode + c.m/8}} {
			b.Run(fmt.Sprintf("n=%d/%s", c.n1, at.name), func(b *testing.B) {
				for b.Loop() {
					sinkA = LogHypergeomPMF(at.k, c.n1, c.n2, c.m)
				}
			})
		}
	}
}

// BenchmarkLogBinomPMF: small counts (stirlerr by lgamma), large counts
// (the asymptotic series), and k near n·p, where bd0 runs its series.
func BenchmarkLogBinomPMF(b *testing.B) {
	for _, c := range []struct {
		name    string
		k, n, p float64
	}{
		{"small", 4, 12, 0.3},
		{"large-near-mean", 300001, 1e6, 0.3},
		{"large-tail", 250000, 1e6, 0.3},
	} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				sinkA = LogBinomPMF(c.k, c.n, c.p, 1-c.p)
			}
		})
	}
}

// BenchmarkNormalUpperTail: the erfc route at a typical statistic, in the
// tail, and the asymptotic route beyond z = 37.
func BenchmarkNormalUpperTail(b *testing.B) {
	for _, z := range []float64{1.5, 8, 40} {
		b.Run(fmt.Sprintf("z=%v", z), func(b *testing.B) {
			for b.Loop() {
				sinkA, sinkB = NormalUpperTail(z)
			}
		})
	}
}

// BenchmarkChiSquare1UpperTail: one Pearson chi-square p-value.
func BenchmarkChiSquare1UpperTail(b *testing.B) {
	for b.Loop() {
		sinkA, sinkB = ChiSquare1UpperTail(3.2)
	}
}

// BenchmarkNormalQuantile: the central and tail rational approximations.
func BenchmarkNormalQuantile(b *testing.B) {
	for _, p := range []float64{0.975, 1e-12} {
		b.Run(fmt.Sprintf("p=%v", p), func(b *testing.B) {
			for b.Loop() {
				sinkA = NormalQuantile(p)
			}
		})
	}
}

// BenchmarkHypergeomSum: the tail sums of Fisher's test from a point past
// the mode, where the pmf falls away from it: SumUp from mode + 2σ and
// SumDown from mode − 2σ, σ the hypergeometric standard deviation (√(n/8)
// for two groups of n and m = n events: 2.5 at 50, 11 at 1000, 354 at
// 10⁶). The loop runs until the terms no longer change the sum, so the cost
// grows with σ.
func BenchmarkHypergeomSum(b *testing.B) {
	for _, c := range []struct {
		n1, n2, m, twoSigma int64
	}{{50, 50, 50, 5}, {1000, 1000, 1000, 22}, {1000000, 1000000, 1000000, 707}} {
		mode := HypergeomMode(c.n1, c.n2, c.m)
		b.Run(fmt.Sprintf("up/n=%d", c.n1), func(b *testing.B) {
			for b.Loop() {
				sinkA = HypergeomSumUp(mode+c.twoSigma, c.n1, c.n2, c.m)
			}
		})
		b.Run(fmt.Sprintf("down/n=%d", c.n1), func(b *testing.B) {
			for b.Loop() {
				sinkA = HypergeomSumDown(mode-c.twoSigma, c.n1, c.n2, c.m)
			}
		})
	}
}

// BenchmarkLogAddExp: one fold step with a moderate gap.
func BenchmarkLogAddExp(b *testing.B) {
	x := -3.0
	for b.Loop() {
		sinkA = LogAddExp(x, -5.5)
	}
}
