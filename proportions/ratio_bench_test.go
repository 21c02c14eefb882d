package proportions

import "testing"

// benchTables are typical tables for the speed targets: every asymptotic
// ratio and odds-ratio interval under 5 µs per table.
var benchTables = []Counts{{36, 40, 16, 80}, {3, 30, 15, 50}, {189, 11034, 104, 11037}, {0, 25, 6, 25}}

var benchSink float64

// BenchmarkRatioIntervals times each registered ratio and odds-ratio
// interval (the exact ones too, on these small tables); ns/op is per table.
func BenchmarkRatioIntervals(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	for _, m := range ratioFamilies() {
		b.Run(m.Key, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				lo, hi := m.Limits(benchTables[i%len(benchTables)], conf)
				benchSink += lo + hi
			}
		})
	}
}

// BenchmarkRatioTests times each ratio and odds-ratio score test.
func BenchmarkRatioTests(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	h := Hypothesis{Null: 0.8, Alternative: Greater, Conf: conf}
	for _, m := range ratioTests {
		b.Run(m.Key, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				r := m.Run(benchTables[i%len(benchTables)], h)
				benchSink += r.PValue
			}
		})
	}
}

// BenchmarkConditionalOddsRatio times the exact conditional intervals and
// the conditional estimate at n = 1000 per group (target: under 1 ms).
func BenchmarkConditionalOddsRatio(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	tables := []Counts{{500, 1000, 430, 1000}, {30, 1000, 12, 1000}, {990, 1000, 960, 1000}}
	for _, m := range []IntervalMethod{CornfieldExact, CornfieldMidP, BaptistaPike} {
		b.Run(m.Key, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				lo, hi := m.Limits(tables[i%len(tables)], conf)
				benchSink += lo + hi
			}
		})
	}
	b.Run("conditional-mle", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			benchSink += conditionalMLE(tables[i%len(tables)])
		}
	})
}
