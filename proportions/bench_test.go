package proportions

import "testing"

// scoreBenchTables are the designs the interval benchmarks cycle through:
// moderate, small, zero cells, unequal and large groups.
var scoreBenchTables = []Counts{
	{56, 70, 48, 80}, {9, 10, 3, 10}, {5, 56, 0, 29}, {0, 10, 0, 20}, {10, 10, 0, 20},
	{120, 400, 180, 400}, {3, 1000000, 1, 1000000}, {17, 25, 30, 31},
}

var sinkLo, sinkHi float64

// BenchmarkDifferenceIntervals times each registered difference method per
// interval (both limits); the score intervals (Mee, Miettinen–Nurminen)
// target under 2 µs.
func BenchmarkDifferenceIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range IntervalMethods(Difference) {
		b.Run(m.Key, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				sinkLo, sinkHi = m.Limits(scoreBenchTables[i%len(scoreBenchTables)], conf)
			}
		})
	}
}

// BenchmarkProportionIntervals times each single-proportion method.
func BenchmarkProportionIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range ProportionMethods() {
		b.Run(m.Key, func(b *testing.B) {
			for i := 0; b.Loop(); i++ {
				c := scoreBenchTables[i%len(scoreBenchTables)]
				sinkLo, sinkHi = m.Limits(c.X1, c.N1, conf)
			}
		})
	}
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
