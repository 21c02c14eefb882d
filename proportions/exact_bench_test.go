package proportions

import "testing"

// Benchmarks on the tables of the SciPy side-by-side comparison
// (scripts/bench-exact.sh): x1 = ⌊0.3n+½⌋, x2 = ⌊0.45n+½⌋, n per group.

func benchTest(b *testing.B, m TestMethod, n int64, a Alternative) {
	c := Counts{X1: (3*n + 5) / 10, N1: n, X2: (45*n + 50) / 100, N2: n}
	for b.Loop() {
		if _, err := m.Test(c, WithAlternative(a)); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFisherTwoSided10000(b *testing.B)   { benchTest(b, Fisher, 10000, TwoSided) }
func BenchmarkFisherTwoSided1000000(b *testing.B) { benchTest(b, Fisher, 1000000, TwoSided) }
func BenchmarkBarnardTwoSided800(b *testing.B)    { benchTest(b, Barnard, 800, TwoSided) }
func BenchmarkBoschlooTwoSided400(b *testing.B)   { benchTest(b, Boschloo, 400, TwoSided) }
func BenchmarkBoschlooDoubled400(b *testing.B)    { benchTest(b, BoschlooDoubled, 400, TwoSided) }
