package proportions

import (
	"math"
	"testing"
)

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

func BenchmarkFisherTwoSided10000(b *testing.B)   { benchTest(b, FisherTest, 10000, TwoSided) }
func BenchmarkFisherTwoSided1000000(b *testing.B) { benchTest(b, FisherTest, 1000000, TwoSided) }
func BenchmarkBarnardTwoSided800(b *testing.B)    { benchTest(b, BarnardTest, 800, TwoSided) }
func BenchmarkBoschlooTwoSided400(b *testing.B)   { benchTest(b, BoschlooTest, 400, TwoSided) }
func BenchmarkBoschlooDoubled400(b *testing.B)    { benchTest(b, BoschlooDoubledTest, 400, TwoSided) }

// Fisher's tests on near and far tables at 50, 1000 and 10⁶ per group
// (equal groups, where the two-sided set is symmetric, and unequal ones),
// through Run with a prepared hypothesis, as an analysis calls them.
// BenchmarkFisherPrevious runs the same cases on the previous
// implementation kept in fisher_test.go, so one run of -bench Fisher
// compares them.
var fisherBenchTables = []struct {
	name string
	c    Counts
}{
	{"n50/near", Counts{X1: 30, N1: 50, X2: 25, N2: 50}},
	{"n50/far", Counts{X1: 40, N1: 50, X2: 15, N2: 50}},
	{"n1000/near", Counts{X1: 500, N1: 1000, X2: 510, N2: 1000}},
	{"n1000/far", Counts{X1: 600, N1: 1000, X2: 500, N2: 1000}},
	{"n1000x800/near", Counts{X1: 500, N1: 1000, X2: 410, N2: 800}},
	{"n1000x800/far", Counts{X1: 600, N1: 1000, X2: 400, N2: 800}},
	{"n1e6/near", Counts{X1: 500000, N1: 1000000, X2: 501000, N2: 1000000}},
	{"n1e6/1pct", Counts{X1: 500000, N1: 1000000, X2: 510000, N2: 1000000}},
	{"n1e6/far", Counts{X1: 600000, N1: 1000000, X2: 500000, N2: 1000000}},
	{"n1e6x8e5/near", Counts{X1: 500000, N1: 1000000, X2: 400800, N2: 800000}},
	{"n1e6x8e5/far", Counts{X1: 600000, N1: 1000000, X2: 400000, N2: 800000}},
}

func benchFisherCases(b *testing.B, fisher, midp TestMethod) {
	for _, tc := range fisherBenchTables {
		for _, m := range []TestMethod{fisher, midp} {
			for _, a := range []Alternative{TwoSided, Greater} {
				b.Run(tc.name+"/"+m.Key+"/"+a.String(), func(b *testing.B) {
					s, err := NewSettings(WithAlternative(a))
					if err != nil {
						b.Fatal(err)
					}
					h, err := m.Hypothesis(s)
					if err != nil {
						b.Fatal(err)
					}
					for b.Loop() {
						sinkResult = m.Run(tc.c, h)
					}
				})
			}
		}
	}
}

func BenchmarkFisher(b *testing.B) { benchFisherCases(b, FisherTest, FisherMidPTest) }

func BenchmarkFisherPrevious(b *testing.B) {
	run := func(mid bool) func(Counts, Hypothesis) TestResult {
		return func(c Counts, h Hypothesis) TestResult {
			logp := oldFisherLogP(c, h.Alternative, mid)
			r := TestResult{Statistic: math.Exp(logHypergeomPMFOld(c.X1, c.N1, c.N2, c.X1+c.X2)), PValue: math.Exp(logp), LogPValue: logp}
			r.decide(h)
			return r
		}
	}
	benchFisherCases(b,
		TestMethod{Key: "fisher-test", Scale: Difference, Run: run(false)},
		TestMethod{Key: "fisher-mid-p-test", Scale: Difference, Run: run(true)})
}
