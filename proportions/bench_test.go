package proportions

import (
	"fmt"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// scoreBenchTables are the designs the interval benchmarks cycle through:
// moderate, small, zero cells, unequal and large groups.
var scoreBenchTables = []Counts{
	{56, 70, 48, 80}, {9, 10, 3, 10}, {5, 56, 0, 29}, {0, 10, 0, 20}, {10, 10, 0, 20},
	{120, 400, 180, 400}, {3, 1000000, 1, 1000000}, {17, 25, 30, 31},
}

var sinkLo, sinkHi float64

// BenchmarkDifferenceIntervals times each registered difference method per
// interval (both limits); the score intervals (Mee, Miettinen–Nurminen)
// target under about 0.35 µs.
//
// The score intervals are also timed on single tables (30/50 vs 25/50,
// 600/1000 vs 500/1000, 600000/10⁶ vs 500000/10⁶) beside the search they
// replaced (the "old-" sub-benchmarks, the reference copy in
// score_reference_test.go), so one run gives the ratio on the same machine.
func BenchmarkDifferenceIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range EnumerableIntervalMethods(Difference) {
		b.Run(m.Key, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				sinkLo, sinkHi = m.Limits(scoreBenchTables[i%len(scoreBenchTables)], conf)
			}
		})
	}
	type limits func(Counts) (float64, float64)
	methods := []struct {
		name string
		f    limits
	}{
		{"mee", func(c Counts) (float64, float64) { return Mee.Limits(c, conf) }},
		{"old-mee", func(c Counts) (float64, float64) { return scoreLimitsOld(c, conf.Z, 1) }},
		{"miettinen-nurminen", func(c Counts) (float64, float64) { return MiettinenNurminen.Limits(c, conf) }},
		{"old-miettinen-nurminen", func(c Counts) (float64, float64) {
			return scoreLimitsOld(c, conf.Z, mnVarianceFactor(c))
		}},
	}
	for _, m := range methods {
		b.Run(m.name+"/mixed", func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				sinkLo, sinkHi = m.f(scoreBenchTables[i%len(scoreBenchTables)])
			}
		})
		for _, c := range []Counts{{30, 50, 25, 50}, {600, 1000, 500, 1000}, {600000, 1000000, 500000, 1000000}} {
			b.Run(fmt.Sprintf("%s/%d-%d-%d-%d", m.name, c.X1, c.N1, c.X2, c.N2), func(b *testing.B) {
				for b.Loop() {
					sinkLo, sinkHi = m.f(c)
				}
			})
		}
	}
}

// BenchmarkProportionIntervals times each single-proportion method per
// interval (both limits), on the benchmark tables' first groups and then,
// for the beta-quantile methods (target: under about 0.6 µs at every n), on
// a spread of x at n = 50, 1000, 10⁵ and 10⁶ at 95%, beside the gonum
// distuv.Beta quantiles they used before (the "gonum-" sub-benchmarks), so
// one run gives the ratio on the same machine.
func BenchmarkProportionIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range RateMethods() {
		b.Run(m.Key, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				c := scoreBenchTables[i%len(scoreBenchTables)]
				sinkLo, sinkHi = m.Limits(c.X1, c.N1, conf)
			}
		})
	}
	alpha := conf.Alpha()
	gonumCP := func(x, n int64) (lo, hi float64) {
		fx, fn := float64(x), float64(n)
		lo, hi = 0, 1
		if x > 0 {
			lo = distuv.Beta{Alpha: fx, Beta: fn - fx + 1}.Quantile(alpha / 2)
		}
		if x < n {
			hi = distuv.Beta{Alpha: fx + 1, Beta: fn - fx}.Quantile(1 - alpha/2)
		}
		return lo, hi
	}
	gonumJeffreys := func(x, n int64) (lo, hi float64) {
		post := distuv.Beta{Alpha: float64(x) + 0.5, Beta: float64(n-x) + 0.5}
		lo, hi = 0, 1
		if x > 0 {
			lo = post.Quantile(alpha / 2)
		}
		if x < n {
			hi = post.Quantile(1 - alpha/2)
		}
		return lo, hi
	}
	for _, n := range []int64{50, 1000, 100000, 1000000} {
		xs := betaBenchCounts(n)
		for _, c := range []struct {
			name   string
			limits func(x, n int64) (float64, float64)
		}{
			{"clopper-pearson-rate", func(x, n int64) (float64, float64) { return ClopperPearson.Limits(x, n, conf) }},
			{"gonum-clopper-pearson", gonumCP},
			{"jeffreys-rate", func(x, n int64) (float64, float64) { return Jeffreys.Limits(x, n, conf) }},
			{"gonum-jeffreys", gonumJeffreys},
		} {
			b.Run(fmt.Sprintf("%s/n=%d", c.name, n), func(b *testing.B) {
				for i := 0; b.Loop(); i++ {
					sinkLo, sinkHi = c.limits(xs[i%len(xs)], n)
				}
			})
		}
	}
}

// betaBenchCounts spreads x over 0..n: both ends, their neighbours, small
// counts and fractions of n.
func betaBenchCounts(n int64) []int64 {
	return []int64{0, 1, 2, 5, 20, n / 100, n / 10, n / 4, n / 2, 3 * n / 4, n - 20, n - 2, n - 1, n}
}

// BenchmarkRestrictedMLE times one restricted MLE.
func BenchmarkRestrictedMLE(b *testing.B) {
	for i := 0; b.Loop(); i++ {
		sinkLo, sinkHi = RestrictedMLE(scoreBenchTables[i%len(scoreBenchTables)], 0.05)
	}
}

var sinkResult TestResult

// BenchmarkAsymptoticTests times each registered asymptotic test of
// π1 − π2 = δ per table (two-sided, δ = 0 where the test requires it,
// δ = −0.05 for the score tests).
func BenchmarkAsymptoticTests(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range asymptoticTests {
		h := Hypothesis{Alternative: TwoSided, Conf: conf}
		if m.Margins {
			h.Null = -0.05
		}
		b.Run(m.Key, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				sinkResult = m.Run(scoreBenchTables[i%len(scoreBenchTables)], h)
			}
		})
	}
}

// BenchmarkScoreStatistics times the allocation-free statistics that
// coverage, size and power computations call.
func BenchmarkScoreStatistics(b *testing.B) {
	b.Run("farrington-manning", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			sinkLo = FarringtonManningZ(scoreBenchTables[i%len(scoreBenchTables)], -0.05)
		}
	})
	b.Run("miettinen-nurminen", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			sinkLo = MiettinenNurminenZ(scoreBenchTables[i%len(scoreBenchTables)], -0.05)
		}
	})
}
