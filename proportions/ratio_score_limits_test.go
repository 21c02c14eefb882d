package proportions

import (
	"math"
	"math/rand/v2"
	"testing"
)

// ratioScorePairs are the ratio and odds-ratio score intervals with the
// statistics they invert, as functions of the parameter; each statistic
// falls as the parameter grows.
var ratioScorePairs = []struct {
	iv IntervalMethod
	z  func(c Counts, theta float64) float64
}{
	{Koopman, koopmanSigned},
	{MiettinenNurminenRatio, func(c Counts, theta float64) float64 { return ratioScore(c, theta, mnVarianceFactor(c)) }},
	{MiettinenNurminenOddsRatio, func(c Counts, psi float64) float64 { return oddsRatioScore(c, psi, mnVarianceFactor(c)) }},
}

// bisectedRatioLimits finds the limits {θ : |z(θ)| ≤ z_{α/2}} by plain
// bisection on t = log θ over [−300, 300], carried to adjacent floats, with
// the methods' zero-cell rules: a limit is 0 or ∞ when the estimate is
// (ratio: x1 = 0 or x2 = 0; odds ratio: a zero cell on that side), and the
// interval is [0, ∞] when the parameter is not estimable.
func bisectedRatioLimits(c Counts, fam Scale, z func(Counts, float64) float64, conf Confidence) (lo, hi float64) {
	lo, hi = 0, math.Inf(1)
	hasLower, hasUpper := c.X1 > 0, c.X2 > 0
	if fam == OddsRatio {
		hasLower, hasUpper = c.X1 > 0 && c.X2 < c.N2, c.X2 > 0 && c.X1 < c.N1
	}
	above := func(t, crit float64) bool { return z(c, math.Exp(t)) > crit }
	if hasLower {
		lo = math.Exp(bisectScore(func(t float64) bool { return above(t, conf.Z) }, -300, 300))
	}
	if hasUpper {
		hi = math.Exp(bisectScore(func(t float64) bool { return above(t, -conf.Z) }, -300, 300))
	}
	return lo, hi
}

// logGap returns |log a − log b|, 0 when a = b (0 and ∞ included) and ∞
// when only one of them is 0 or ∞.
func logGap(a, b float64) float64 {
	if a == b {
		return 0
	}
	if a == 0 || b == 0 || math.IsInf(a, 0) || math.IsInf(b, 0) || math.IsNaN(a) || math.IsNaN(b) {
		return math.Inf(1)
	}
	return math.Abs(math.Log(a) - math.Log(b))
}

// ratioBisectionTables draws tables with group sizes from 1 to 10^6
// (log-uniform, each group on its own), mixing arbitrary counts, zero or
// few events, all or nearly all events, and levels from 0.8 to 0.999; a
// few fixed edge tables come first. The seed is fixed so that failures
// reproduce.
func ratioBisectionTables(n int) ([]Counts, []float64) {
	tables := []Counts{
		{30, 50, 25, 50}, {600, 1000, 500, 1000}, {600000, 1000000, 500000, 1000000},
		{1, 1, 1, 1}, {1, 1, 0, 1}, {0, 1, 1, 1}, {1, 1, 1, 2}, {5, 5, 5, 5}, {5, 5, 3, 9}, {5, 5, 0, 9},
		{1, 1000000, 1000000, 1000000}, {999999, 1000000, 1, 1}, {1, 1000000, 0, 1000000}, {36, 40, 16, 80},
	}
	levels := make([]float64, len(tables))
	for i := range levels {
		levels[i] = []float64{0.8, 0.95, 0.999}[i%3]
	}
	r := rand.New(rand.NewPCG(21, 22))
	size := func() int64 { return min(1+int64(math.Exp(r.Float64()*math.Log(1e6))), 1000000) }
	count := func(n int64) int64 {
		switch r.IntN(5) {
		case 0:
			return min(r.Int64N(4), n)
		case 1:
			return n - min(r.Int64N(4), n)
		default:
			return r.Int64N(n + 1)
		}
	}
	for range n {
		n1, n2 := size(), size()
		tables = append(tables, Counts{X1: count(n1), N1: n1, X2: count(n2), N2: n2})
		levels = append(levels, 0.8+0.199*r.Float64())
	}
	return tables, levels
}

// TestRatioScoreLimitsMatchBisection compares the limits of the Koopman and
// Miettinen–Nurminen ratio and odds-ratio intervals with a plain bisection
// of the statistics they invert (koopmanSigned, ratioScore, oddsRatioScore,
// each computing the restricted fit at the trial value), over random tables
// with zero cells, unequal groups, 1 to 10^6 trials per group and levels
// from 0.8 to 0.999: the limits must agree to 1e−10 relative, and 0 and ∞
// exactly.
func TestRatioScoreLimitsMatchBisection(t *testing.T) {
	tables, levels := ratioBisectionTables(4000)
	for _, m := range ratioScorePairs {
		worst := 0.0
		for i, c := range tables {
			conf, _ := NewConfidence(levels[i])
			lo, hi := m.iv.Limits(c, conf)
			wantLo, wantHi := bisectedRatioLimits(c, m.iv.Scale, m.z, conf)
			gap := math.Max(logGap(lo, wantLo), logGap(hi, wantHi))
			if !(gap <= 1e-10) {
				t.Errorf("%s %v level %.4f: (%.17g, %.17g), bisection (%.17g, %.17g)", m.iv.Key, c, levels[i], lo, hi, wantLo, wantHi)
			}
			if !math.IsInf(gap, 1) {
				worst = math.Max(worst, gap)
			}
		}
		t.Logf("%s: largest relative difference from bisection %.2g over %d tables", m.iv.Key, worst, len(tables))
	}
}

// TestRatioScoreLimitsMatchPrevious compares the limits with the previous
// implementation (a log-scale Brent search on the statistics, kept in
// ratio_bench_test.go) on every table up to 12 trials per group and a few
// larger ones, where that search was accurate: agreement to 1e−9 relative
// (its tolerance was 1e−11 on log θ), 0 and ∞ exactly.
func TestRatioScoreLimitsMatchPrevious(t *testing.T) {
	previous := map[string]func(Counts, Confidence) (float64, float64){
		"koopman-ratio": previousKoopmanLimits, "miettinen-nurminen-ratio": previousMNRatioLimits, "miettinen-nurminen-odds-ratio": previousMNOddsRatioLimits,
	}
	tables := append(smallTables(12), Counts{30, 50, 25, 50}, Counts{600, 1000, 500, 1000}, Counts{600000, 1000000, 500000, 1000000}, Counts{189, 11034, 104, 11037})
	for _, level := range []float64{0.9, 0.95, 0.99} {
		conf, _ := NewConfidence(level)
		for _, m := range ratioScorePairs {
			worst := 0.0
			for _, c := range tables {
				lo, hi := m.iv.Limits(c, conf)
				plo, phi := previous[m.iv.Key](c, conf)
				gap := math.Max(logGap(lo, plo), logGap(hi, phi))
				if !(gap <= 1e-9) {
					t.Errorf("%s %v level %v: (%.17g, %.17g), previous (%.17g, %.17g)", m.iv.Key, c, level, lo, hi, plo, phi)
				}
				if !math.IsInf(gap, 1) {
					worst = math.Max(worst, gap)
				}
			}
			t.Logf("%s level %v: largest relative difference from the previous limits %.2g", m.iv.Key, level, worst)
		}
	}
}
