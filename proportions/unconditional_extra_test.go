package proportions

import (
	"errors"
	"fmt"
	"math"
	"testing"
	"time"
)

// TestSupremumDense: the search (grid plus Brent refinement of every
// candidate peak) must never be beaten by a search 50 times denser, over
// the whole nuisance range on the angle scale and on a uniform π grid.
func TestSupremumDense(t *testing.T) {
	designs := []Counts{{4, 15, 9, 15}, {12, 30, 5, 20}, {20, 50, 29, 50}, {30, 80, 18, 60}, {3, 40, 0, 25}}
	for _, c := range designs {
		for _, st := range []OrderingStatistic{PooledScore, UnpooledWald, FisherPValue} {
			for _, side := range []regionSide{sideGreater, sideLess, sideBoth} {
				var reg region
				if st == FisherPValue {
					reg, _ = fisherRegion(c, side)
				} else {
					reg, _ = zRegion(c, 0, st == PooledScore, side)
				}
				s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, a: 0, b: 1}
				logp, _ := s.supremum()
				found := math.Exp(logp)
				w := newTailWork(reg.n1, reg.n2)
				k := 50 * supGridPoints(reg.n1, reg.n2)
				dense := 0.0
				for i := 0; i <= k; i++ {
					sn := math.Sin(float64(i) / float64(k) * math.Pi / 2)
					dense = max(dense, w.prob(&reg, sn*sn, sn*sn, 0), w.prob(&reg, float64(i)/float64(k), float64(i)/float64(k), 0))
				}
				if dense > found*(1+1e-9) {
					t.Errorf("%v stat %d side %d: search %.12g, dense search %.12g", c, st, side, found, dense)
				}
			}
		}
	}
}

// TestRegionRuns records the shape of the regions the tests produce: for
// every observed table of several designs, each row of the region is at
// most two runs of x2, and with two runs they touch 0 and n2 (one-sided
// regions: one run touching an end). The code does not rely on this (it
// stores whatever runs it finds); the test verifies, statistic by
// statistic, the property that makes the prefix-sum evaluation O(n1 + n2).
func TestRegionRuns(t *testing.T) {
	for _, d := range [][2]int64{{8, 8}, {12, 7}, {20, 25}} {
		for x1 := int64(0); x1 <= d[0]; x1++ {
			for x2 := int64(0); x2 <= d[1]; x2++ {
				c := Counts{x1, d[0], x2, d[1]}
				for _, st := range []OrderingStatistic{PooledScore, UnpooledWald, FisherPValue} {
					for _, side := range []regionSide{sideGreater, sideLess, sideBoth} {
						var reg region
						if st == FisherPValue {
							reg, _ = fisherRegion(c, side)
						} else {
							reg, _ = zRegion(c, 0, st == PooledScore, side)
						}
						if msg := runShape(reg, side); msg != "" {
							t.Errorf("%v stat %d side %d: %s", c, st, side, msg)
						}
					}
				}
			}
		}
	}
}

func runShape(r region, side regionSide) string {
	for x1 := 0; x1 <= r.n1; x1++ {
		runs := r.runs[r.rowStart[x1]:r.rowStart[x1+1]]
		switch {
		case len(runs) > 2 || (side != sideBoth && len(runs) > 1):
			return fmt.Sprintf("row %d has %d runs %v", x1, len(runs), runs)
		case len(runs) == 2 && (runs[0][0] != 0 || int(runs[1][1]) != r.n2):
			return fmt.Sprintf("row %d runs %v do not touch both ends", x1, runs)
		case len(runs) == 1 && side != sideBoth && runs[0][0] != 0 && int(runs[0][1]) != r.n2:
			return fmt.Sprintf("row %d run %v touches no end", x1, runs)
		}
	}
	return ""
}

// TestUnconditionalTinyP: at 800 per group, 800/800 against 0/800 is the
// only table (with its mirror) so extreme under either ordering, so the
// two-sided p-value is sup over π of 2·π⁸⁰⁰(1−π)⁸⁰⁰ = 2·2⁻¹⁶⁰⁰ at π = ½
// (exact arithmetic), about 10⁻⁴⁸², far below the float64 range: PValue
// is 0 and LogPValue = −1599·log 2.
func TestUnconditionalTinyP(t *testing.T) {
	c := Counts{800, 800, 0, 800}
	want := -1599 * math.Ln2
	for _, m := range []TestMethod{BarnardTest, BarnardWaldTest, BoschlooTest} {
		r, err := m.Test(c)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.LogPValue-want) > 1e-9*math.Abs(want) || r.PValue != 0 || !r.Reject {
			t.Errorf("%s: log p = %.12g, want %.12g (p %v)", m.Key, r.LogPValue, want, r.PValue)
		}
		if math.Abs(*r.Nuisance-0.5) > 1e-6 {
			t.Errorf("%s: supremum at %v, want 0.5", m.Key, *r.Nuisance)
		}
	}
}

// TestUnconditionalZeroMargin: with no events (or only events) every
// table is as extreme as the observed one (z = 0, Fisher p = 1), so
// p = 1: the documented answer, never NaN.
func TestUnconditionalZeroMargin(t *testing.T) {
	for _, c := range []Counts{{0, 12, 0, 9}, {12, 12, 9, 9}} {
		for _, m := range []TestMethod{BarnardTest, BarnardWaldTest, BoschlooTest, BoschlooDoubledTest} {
			for _, a := range []Alternative{TwoSided, Greater, Less} {
				r, err := m.Test(c, WithAlternative(a))
				if err != nil || r.PValue != 1 || r.LogPValue != 0 || math.IsNaN(r.Statistic) || r.Nuisance == nil {
					t.Errorf("%s %v %v: %+v %v", m.Key, c, a, r, err)
				}
			}
		}
	}
}

// TestBoschlooNotAboveFisher: Boschloo's one-sided p-value never exceeds
// Fisher's (Boschloo 1970: the conditional test's region has conditional,
// hence unconditional, size at most its p-value).
func TestBoschlooNotAboveFisher(t *testing.T) {
	for x1 := int64(0); x1 <= 9; x1++ {
		for x2 := int64(0); x2 <= 11; x2++ {
			c := Counts{x1, 9, x2, 11}
			for _, a := range []Alternative{Greater, Less} {
				b, _ := BoschlooTest.Test(c, WithAlternative(a))
				f, _ := FisherTest.Test(c, WithAlternative(a))
				if b.PValue > f.PValue*(1+1e-12) {
					t.Errorf("%v %v: Boschloo %v above Fisher %v", c, a, b.PValue, f.PValue)
				}
			}
		}
	}
}

// TestBergerBoos checks the Berger–Boos option against its definition
// computed by brute force: sup of the tail over the 1 − γ Clopper–Pearson
// interval of the pooled proportion (dense grid) plus γ.
func TestBergerBoos(t *testing.T) {
	const gamma = 0.001
	m, err := NewUnconditionalTest(UnconditionalVariant{Statistic: PooledScore, BergerBoosGamma: gamma})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []Counts{{3, 10, 5, 10}, {7, 10, 5, 20}, {0, 8, 4, 9}} {
		r, err := m.Test(c)
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := clopperPearson(c.X1+c.X2, c.N1+c.N2, gamma)
		bt := newBruteTail(c, PooledScore, sideBoth)
		best := 0.0
		for i := 0; i <= 4000; i++ {
			best = max(best, bt.at(lo+(hi-lo)*float64(i)/4000))
		}
		want := min(best+gamma, 1)
		if r.PValue < want*(1-1e-9) || r.PValue > want*(1+1e-6) {
			t.Errorf("%v: Berger–Boos p = %.10g, brute force %.10g", c, r.PValue, want)
		}
		if n := *r.Nuisance; n < lo-1e-12 || n > hi+1e-12 {
			t.Errorf("%v: supremum at %v outside the interval [%v, %v]", c, n, lo, hi)
		}
	}
	if _, err := NewUnconditionalTest(UnconditionalVariant{BergerBoosGamma: 0.5}); !errors.Is(err, ErrUnsupported) {
		t.Errorf("γ = 0.5 accepted: %v", err)
	}
	if _, err := NewUnconditionalTest(UnconditionalVariant{Statistic: 7}); !errors.Is(err, ErrUnsupported) {
		t.Errorf("unknown statistic accepted: %v", err)
	}
}

// TestBarnardMargin checks the score test with a non-zero null difference
// (Chan 1998) against the slow p-value of the interval tests (restricted
// estimates by likelihood maximisation, table-by-table tails).
func TestBarnardMargin(t *testing.T) {
	for _, c := range []Counts{{7, 10, 5, 12}, {2, 9, 6, 8}} {
		for _, d := range []float64{-0.3, 0.2} {
			for _, a := range []Alternative{Greater, Less, TwoSided} {
				r, err := BarnardTest.Test(c, WithNull(d), WithAlternative(a))
				if err != nil {
					t.Fatal(err)
				}
				want := bruteScoreP(c, d, [...]regionSide{sideBoth, sideGreater, sideLess}[a])
				if math.Abs(r.PValue-want) > 1e-7*want {
					t.Errorf("%v δ0=%v %v: p = %.10g, brute force %.10g", c, d, a, r.PValue, want)
				}
			}
		}
	}
	if _, err := BoschlooTest.Test(Counts{3, 10, 5, 10}, WithNull(0.1)); !errors.Is(err, ErrUnsupported) {
		t.Errorf("Boschloo with a margin: %v", err)
	}
}

// TestUnconditionalTooLarge: Test refuses designs above
// UnconditionalMaxTables with ErrTooLarge, and Run returns at once.
func TestUnconditionalTooLarge(t *testing.T) {
	c := Counts{300000, 1000000, 310000, 1000000}
	for _, m := range []TestMethod{BarnardTest, BoschlooTest} {
		if _, err := m.Test(c); !errors.Is(err, ErrTooLarge) {
			t.Errorf("%s: %v", m.Key, err)
		}
		start := time.Now()
		h, _ := m.Hypothesis(Settings{Level: 0.95})
		if r := m.Run(c, h); r.PValue != 1 || math.IsNaN(r.LogPValue) || time.Since(start) > time.Minute {
			t.Errorf("%s: Run gave %+v", m.Key, r)
		}
	}
	// The checked call refuses it (the cost guard); the raw limits, which
	// never fail, give the whole range rather than hang.
	if iv, err := ChanZhang.Interval(c, 0.95); !errors.Is(err, ErrTooLarge) {
		t.Errorf("interval above the size cap: %v %v, want an error wrapping ErrTooLarge", iv, err)
	}
	if iv := ChanZhang.IntervalAt(c, Confidence{Level: 0.95}); iv.Lower != -1 || iv.Upper != 1 {
		t.Errorf("raw interval above the size cap: %v", iv)
	}
}

// TestTwoSidedCutPaths: the linear-scale and log-space slice merges agree
// on every slice of several designs and thresholds.
func TestTwoSidedCutPaths(t *testing.T) {
	for _, d := range [][2]int64{{30, 30}, {40, 13}, {200, 150}} {
		for m := int64(0); m <= d[0]+d[1]; m++ {
			for _, thr := range []float64{-0.1, -3, -20, -200} {
				a, b := fisherTwoSidedCut(d[0], d[1], m, thr)
				c, e := fisherTwoSidedCutLog(d[0], d[1], m, thr)
				if a != c || b != e {
					t.Fatalf("n=%v m=%d thr=%v: linear (%d, %d), log (%d, %d)", d, m, thr, a, b, c, e)
				}
			}
		}
	}
}
