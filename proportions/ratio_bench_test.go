package proportions

import (
	"math"
	"testing"

	"github.com/propscope/propscope/internal/root"
)

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

// ratioScoreBenchTables are the sizes of the speed target for the ratio and
// odds-ratio score intervals (under about 0.5 µs per interval).
var ratioScoreBenchTables = []struct {
	name string
	c    Counts
}{
	{"30of50-25of50", Counts{30, 50, 25, 50}},
	{"600of1000-500of1000", Counts{600, 1000, 500, 1000}},
	{"600000of1e6-500000of1e6", Counts{600000, 1000000, 500000, 1000000}},
}

// BenchmarkRatioScoreLimits times the Koopman and Miettinen–Nurminen ratio
// and odds-ratio intervals ("new") against the previous implementation
// kept below ("previous"), in the same run; ns/op is per interval.
func BenchmarkRatioScoreLimits(b *testing.B) {
	conf, _ := NewConfidence(0.95)
	methods := []struct {
		key           string
		now, previous func(Counts, Confidence) (float64, float64)
	}{
		{"koopman-ratio", Koopman.Limits, previousKoopmanLimits},
		{"miettinen-nurminen-ratio", MiettinenNurminenRatio.Limits, previousMNRatioLimits},
		{"miettinen-nurminen-odds-ratio", MiettinenNurminenOddsRatio.Limits, previousMNOddsRatioLimits},
	}
	for _, m := range methods {
		for _, tb := range ratioScoreBenchTables {
			for _, v := range []struct {
				name string
				f    func(Counts, Confidence) (float64, float64)
			}{{"new", m.now}, {"previous", m.previous}} {
				b.Run(m.key+"/"+tb.name+"/"+v.name, func(b *testing.B) {
					b.ReportAllocs()
					for b.Loop() {
						lo, hi := v.f(tb.c, conf)
						benchSink += lo + hi
					}
				})
			}
		}
	}
}

// The previous implementation of the ratio and odds-ratio score limits,
// kept as an internal reference for BenchmarkRatioScoreLimits and
// TestRatioScoreLimitsMatchPrevious: a search on t = log θ outward from the
// estimate with doubling steps, then Brent's method, on the statistics
// evaluated with a restricted fit at each trial value. The odds-ratio
// statistic is kept in its previous form too (restricted fit and
// residual), which loses precision at extreme ψ and at the 10^12-trial
// scale.

func previousKoopmanLimits(c Counts, conf Confidence) (lower, upper float64) {
	return previousRatioLimitsFrom(c, conf, func(t float64) float64 { return koopmanSigned(c, math.Exp(t)) })
}

func previousMNRatioLimits(c Counts, conf Confidence) (lower, upper float64) {
	f := mnVarianceFactor(c)
	return previousRatioLimitsFrom(c, conf, func(t float64) float64 { return ratioScore(c, math.Exp(t), f) })
}

func previousMNOddsRatioLimits(c Counts, conf Confidence) (lower, upper float64) {
	f := mnVarianceFactor(c)
	return previousOddsRatioLimitsFrom(c, conf, func(t float64) float64 { return previousOddsRatioScore(c, math.Exp(t), f) })
}

func previousRatioLimitsFrom(c Counts, conf Confidence, z func(t float64) float64) (lower, upper float64) {
	lower, upper = 0, math.Inf(1)
	if c.X1 == 0 && c.X2 == 0 {
		return lower, upper
	}
	t0, se := adjustedLogRatio(c)
	step := conf.Z * se
	lowerFn := func(t float64) float64 { return z(t) - conf.Z }
	upperFn := func(t float64) float64 { return z(t) + conf.Z }
	if c.X1 > 0 && c.X2 > 0 {
		// Start at the estimate, where the statistic is 0.
		t0 = math.Log(c.P1()) - math.Log(c.P2())
		return math.Exp(root.DecreasingCrossingFrom(lowerFn, t0, -conf.Z, step)),
			math.Exp(root.DecreasingCrossingFrom(upperFn, t0, conf.Z, step))
	}
	if c.X1 > 0 {
		lower = math.Exp(root.DecreasingCrossing(lowerFn, t0, step))
	}
	if c.X2 > 0 {
		upper = math.Exp(root.DecreasingCrossing(upperFn, t0, step))
	}
	return lower, upper
}

func previousOddsRatioLimitsFrom(c Counts, conf Confidence, z func(t float64) float64) (lower, upper float64) {
	lower, upper = 0, math.Inf(1)
	m := c.X1 + c.X2
	if m == 0 || m == c.N1+c.N2 {
		return lower, upper
	}
	t0, se := adjustedLogOddsRatio(c)
	step := conf.Z * se
	lowerFn := func(t float64) float64 { return z(t) - conf.Z }
	upperFn := func(t float64) float64 { return z(t) + conf.Z }
	hasLower, hasUpper := c.X1 > 0 && c.X2 < c.N2, c.X2 > 0 && c.X1 < c.N1
	if hasLower && hasUpper {
		// Start at the estimate, where the statistic is 0.
		a, b := float64(c.X1), float64(c.N1-c.X1)
		cc, d := float64(c.X2), float64(c.N2-c.X2)
		t0 = math.Log(a) + math.Log(d) - math.Log(b) - math.Log(cc)
		return math.Exp(root.DecreasingCrossingFrom(lowerFn, t0, -conf.Z, step)),
			math.Exp(root.DecreasingCrossingFrom(upperFn, t0, conf.Z, step))
	}
	if hasLower {
		lower = math.Exp(root.DecreasingCrossing(lowerFn, t0, step))
	}
	if hasUpper {
		upper = math.Exp(root.DecreasingCrossing(upperFn, t0, step))
	}
	return lower, upper
}

func previousOddsRatioScore(c Counts, psi, f float64) float64 {
	fit := previousFitUnderOddsRatio(c, psi)
	n1, n2 := float64(c.N1), float64(c.N2)
	num := fit.residual1(c)
	v1, v2 := n1*fit.p1*fit.q1, n2*fit.p2*fit.q2
	if num == 0 {
		return 0
	}
	if v1 <= 0 || v2 <= 0 {
		return math.Copysign(math.Inf(1), num)
	}
	return signedScore(num, f*v1*v2/(v1+v2))
}

func previousFitUnderOddsRatio(c Counts, psi float64) ratioScaleFit {
	p1, p2 := previousRestrictedUnderOddsRatio(c, psi)
	f := ratioScaleFit{p1: p1, q1: 1 - p1, p2: p2, q2: 1 - p2}
	if p1 > 0.5 || p2 > 0.5 {
		flip := Counts{X1: c.N1 - c.X1, N1: c.N1, X2: c.N2 - c.X2, N2: c.N2}
		q1, q2 := previousRestrictedUnderOddsRatio(flip, 1/psi)
		if p1 > 0.5 {
			f.p1, f.q1 = 1-q1, q1
		}
		if p2 > 0.5 {
			f.p2, f.q2 = 1-q2, q2
		}
	}
	return f
}

func previousRestrictedUnderOddsRatio(c Counts, psi float64) (p1, p2 float64) {
	n1, n2 := float64(c.N1), float64(c.N2)
	m := float64(c.X1 + c.X2)
	s := math.Max(psi, 1)
	a := n2 * (psi - 1) / s
	b := (n1*psi + n2 - m*(psi-1)) / s
	ms := m / s
	disc := math.Max(b*b+4*a*ms, 0)
	root := math.Sqrt(disc)
	if b >= 0 {
		if b+root == 0 {
			p2 = 0
		} else {
			p2 = 2 * ms / (b + root)
		}
	} else {
		p2 = (root - b) / (2 * a)
	}
	p2 = math.Min(math.Max(p2, 0), 1)
	p1 = oddsShift(p2, psi)
	return p1, p2
}
