package proportions

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/propscope/propscope/internal/special"
)

// scoreLimitTolerance is the agreement required of a score limit: 1e−10
// relative to its distance from p1 − p2 (the search's precision on the
// curve of restricted fits), or a few units in the last place of the
// limit, whichever is larger.
func scoreLimitTolerance(limit, d float64) float64 {
	return math.Max(1e-10*math.Abs(d-limit), 4*ulp(limit))
}

func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}

// scoreLimitError is the larger of the two limits' errors in units of
// scoreLimitTolerance (at most 1 passes).
func scoreLimitError(c Counts, lo, hi, wantLo, wantHi float64) float64 {
	d := c.P1() - c.P2()
	return math.Max(math.Abs(lo-wantLo)/scoreLimitTolerance(wantLo, d), math.Abs(hi-wantHi)/scoreLimitTolerance(wantHi, d))
}

// Mee's and Miettinen–Nurminen's limits against plain bisection of their
// own score statistics (FarringtonManningZ, MiettinenNurminenZ, which fit
// the restricted MLE at each trial δ and share no code with the search on
// the curve of fits) carried to adjacent floats, over random tables with
// group sizes from 1 to 10⁶ (log-uniform; arbitrary, rare, near-certain,
// zero and all-or-none counts), a few up to 2^50 trials, and levels drawn
// from 0.8 to 0.999, to 1e−10 relative to each limit's distance from
// p1 − p2.
func TestScoreLimitsMatchBisectionRandomLevels(t *testing.T) {
	r := rand.New(rand.NewPCG(21, 22))
	var tables []Counts
	for range 4000 {
		n1 := 1 + r.Int64N(int64(math.Pow(10, r.Float64()*6)))
		n2 := 1 + r.Int64N(int64(math.Pow(10, r.Float64()*6)))
		pick := func(n int64) int64 {
			switch r.IntN(5) {
			case 0:
				return 0
			case 1:
				return n
			case 2:
				return min(r.Int64N(4), n)
			case 3:
				return n - min(r.Int64N(4), n)
			}
			return r.Int64N(n + 1)
		}
		tables = append(tables, Counts{X1: pick(n1), N1: n1, X2: pick(n2), N2: n2})
	}
	tables = append(tables, Counts{1, 1 << 50, 0, 1 << 50}, Counts{1 << 49, 1 << 50, 1<<49 + 1, 1 << 50},
		Counts{3, 1 << 50, 2, 7}, Counts{1<<50 - 1, 1 << 50, 1 << 50, 1 << 50}, Counts{0, 1 << 50, 0, 1}, Counts{5, 1 << 50, 1 << 40, 1 << 45})
	worst := make([]float64, len(scorePairs))
	for i, c := range tables {
		level := 0.8 + 0.199*r.Float64()
		switch i % 10 {
		case 0:
			level = 0.8
		case 1:
			level = 0.999
		}
		conf, _ := NewConfidence(level)
		for j, m := range scorePairs {
			lo, hi := m.iv.Limits(c, conf)
			wantLo, wantHi := bisectedScoreLimits(c, m.z, conf)
			e := scoreLimitError(c, lo, hi, wantLo, wantHi)
			if !(e <= 1) {
				t.Errorf("%s %v level %.4f: (%.17g, %.17g), bisection (%.17g, %.17g)", m.iv.Key, c, level, lo, hi, wantLo, wantHi)
			}
			worst[j] = math.Max(worst[j], e)
		}
	}
	for j, m := range scorePairs {
		t.Logf("%s: largest error %.2g of the tolerance over %d tables", m.iv.Key, worst[j], len(tables))
	}
}

// The search on the curve of restricted fits against the search it
// replaced (scoreLimitsOld, the reference copy in score_reference_test.go:
// Newton steps in δ with a restricted fit at each), over every table with
// n1, n2 ≤ 15 at three levels, to the same tolerance.
func TestScoreLimitsMatchOldSearch(t *testing.T) {
	tables := smallCountTables(15)
	var worst float64
	for _, level := range []float64{0.9, 0.95, 0.999} {
		conf, _ := NewConfidence(level)
		for _, c := range tables {
			for _, m := range []struct {
				iv IntervalMethod
				k  float64
			}{{Mee, 1}, {MiettinenNurminen, mnVarianceFactor(c)}} {
				lo, hi := m.iv.Limits(c, conf)
				wantLo, wantHi := scoreLimitsOld(c, conf.Z, m.k)
				e := scoreLimitError(c, lo, hi, wantLo, wantHi)
				if !(e <= 1) {
					t.Errorf("%s %v level %v: (%.17g, %.17g), old search (%.17g, %.17g)", m.iv.Key, c, level, lo, hi, wantLo, wantHi)
				}
				worst = math.Max(worst, e)
			}
		}
	}
	t.Logf("largest error %.2g of the tolerance over %d tables at three levels", worst, len(tables))
}

// Limits for every level, extreme ones included (z near 0, z = ∞ when
// (1 + level)/2 rounds to 1), and group sizes up to 2^50: never NaN, inside
// [−1, 1], containing p1 − p2, and negated exactly by swapping the groups.
func TestScoreLimitsAnyLevel(t *testing.T) {
	tables := append(smallCountTables(4), Counts{0, 1 << 50, 0, 1 << 50}, Counts{1, 1 << 50, 1<<50 - 1, 1 << 50},
		Counts{1 << 50, 1 << 50, 0, 1}, Counts{7, 1 << 50, 3, 1 << 44}, Counts{1 << 49, 1 << 50, 1, 3})
	levels := []float64{1e-300, 1e-15, 1e-6, 0.5, 0.8, 0.999, 1 - 1e-12, 1 - 1e-15, math.Nextafter(1, 0)}
	for _, level := range levels {
		// Built by hand: NewConfidence accepts only [MinLevel, MaxLevel],
		// and these limits stay sound beyond it.
		conf := Confidence{Level: level, Z: special.NormalQuantile((1 + level) / 2)}
		for _, c := range tables {
			d := c.P1() - c.P2()
			for _, m := range []IntervalMethod{Mee, MiettinenNurminen} {
				lo, hi := m.Limits(c, conf)
				slo, shi := m.Limits(c.Swapped(), conf)
				if math.IsNaN(lo) || math.IsNaN(hi) || lo < -1 || hi > 1 || lo > d || hi < d || slo != -hi || shi != -lo {
					t.Errorf("%s %v level %v (z = %v): (%v, %v), swapped (%v, %v)", m.Key, c, level, conf.Z, lo, hi, slo, shi)
				}
			}
		}
	}
}
