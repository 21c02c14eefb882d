package root

import (
	"math"
	"testing"
)

// sinkRoot keeps the compiler from discarding the benchmarked calls.
var sinkRoot float64

// The benchmarks time one root search per op and report the function
// evaluations it took (evals/op), which is what a search costs a caller
// whose statistic is expensive. The functions are cheap on purpose, so
// ns/op is the finder's own overhead plus a handful of exp calls.

// BenchmarkDecreasingCrossing: the shape of a limit search in the
// interval code, a p-value-like logistic crossing at e^1.7 searched from
// t0 = 0 with a step guess of 0.5 (near, as the callers' standard-error
// guesses are), and with a poor guess of 0.01 that needs more doublings.
func BenchmarkDecreasingCrossing(b *testing.B) {
	g := logistic(math.Exp(1.7))
	for _, bc := range []struct {
		name string
		step float64
	}{{"good-step", 0.5}, {"poor-step", 0.01}} {
		b.Run(bc.name, func(b *testing.B) {
			evals := 0
			counted := func(t float64) float64 { evals++; return g(t) }
			for b.Loop() {
				sinkRoot = DecreasingCrossing(counted, 0, bc.step)
			}
			b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
		})
	}
}

// BenchmarkDecreasingCrossingFrom: the same search when g(t0) is known
// (a score statistic, 0 at its estimate, shifted by the critical value).
func BenchmarkDecreasingCrossingFrom(b *testing.B) {
	g := logistic(math.Exp(1.7))
	evals := 0
	counted := func(t float64) float64 { evals++; return g(t) }
	g0 := g(0)
	for b.Loop() {
		sinkRoot = DecreasingCrossingFrom(counted, 0, g0, 0.5)
	}
	b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
}

// BenchmarkBrent: Wallis's cubic on [2, 3] (smooth, the interpolation
// steps converge superlinearly), the steep tanh (bisection carries the
// search) and the wide bracket [−1000, 1000].
func BenchmarkBrent(b *testing.B) {
	steep := func(x float64) float64 { return math.Tanh(1e6 * (x - 0.3)) }
	for _, bc := range []struct {
		name string
		f    func(float64) float64
		a, b float64
	}{
		{"cubic", wallis, 2, 3},
		{"steep", steep, -1, 1},
		{"cubic-wide-bracket", wallis, -1e3, 1e3},
	} {
		b.Run(bc.name, func(b *testing.B) {
			evals := 0
			f := func(x float64) float64 { evals++; return bc.f(x) }
			fa, fb := bc.f(bc.a), bc.f(bc.b)
			for b.Loop() {
				sinkRoot = Brent(f, bc.a, bc.b, fa, fb)
			}
			b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
		})
	}
}

// BenchmarkBracketedHalley: Wallis's cubic from a start near the root (as
// the score intervals start from a good estimate) and from the far end of
// the bracket; the steep tanh, where most steps are bisections.
func BenchmarkBracketedHalley(b *testing.B) {
	cubic := func(x float64) (float64, float64, float64) { return wallis(x), 3*x*x - 2, 6 * x }
	steep := func(x float64) (float64, float64, float64) {
		th := math.Tanh(1e3 * (x - 0.3))
		s := 1 - th*th
		return th, 1e3 * s, -2e6 * th * s
	}
	for _, bc := range []struct {
		name     string
		F        func(float64) (float64, float64, float64)
		x0, a, b float64
	}{
		{"cubic-near-start", cubic, 2.1, 2, 3},
		{"cubic-far-start", cubic, 2.999, 2, 3},
		{"steep", steep, 0.9, 0, 1},
	} {
		b.Run(bc.name, func(b *testing.B) {
			evals := 0
			F := func(x float64) (float64, float64, float64) { evals++; return bc.F(x) }
			for b.Loop() {
				sinkRoot = BracketedHalley(F, bc.x0, bc.a, bc.b)
			}
			b.ReportMetric(float64(evals)/float64(b.N), "evals/op")
		})
	}
}
