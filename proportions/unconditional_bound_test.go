package proportions

import (
	"context"
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"os"
	"testing"
)

// Tests of the proven bound on the unconditional supremum
// (unconditional_bound.go). Independent references: tails summed table by
// table with binomial terms from lgamma and math.Pow (binomTable), regions
// from each statistic's definition (bruteStat, restrictedByLikelihood), and
// exact tails in math/big at 256 bits.

// bigTail returns the exact tail of the tables in[x1][x2] at (p1, p2), the
// float64 rates taken exactly, in 256-bit floating point.
func bigTail(in [][]bool, p1, p2 float64) float64 {
	const prec = 256
	binom := func(n int, p float64) []*big.Float {
		out := make([]*big.Float, n+1)
		bp, bq := new(big.Float).SetPrec(prec).SetFloat64(p), new(big.Float).SetPrec(prec)
		bq.Sub(new(big.Float).SetPrec(prec).SetInt64(1), bp)
		for k := 0; k <= n; k++ {
			c := new(big.Float).SetPrec(prec).SetInt(new(big.Int).Binomial(int64(n), int64(k)))
			for range k {
				c.Mul(c, bp)
			}
			for range n - k {
				c.Mul(c, bq)
			}
			out[k] = c
		}
		return out
	}
	b1, b2 := binom(len(in)-1, p1), binom(len(in[0])-1, p2)
	sum := new(big.Float).SetPrec(prec)
	for x1, row := range in {
		for x2, ok := range row {
			if ok {
				sum.Add(sum, new(big.Float).SetPrec(prec).Mul(b1[x1], b2[x2]))
			}
		}
	}
	v, _ := sum.Float64()
	return v
}

// regionTables expands a region's runs into a membership matrix.
func regionTables(r *region) [][]bool {
	in := make([][]bool, r.n1+1)
	for x1 := range in {
		in[x1] = make([]bool, r.n2+1)
		for _, run := range r.runs[r.rowStart[x1]:r.rowStart[x1+1]] {
			for x2 := run[0]; x2 <= run[1]; x2++ {
				in[x1][x2] = true
			}
		}
	}
	return in
}

// testRegions returns regions of several designs, statistics, sides and
// nulls, with their null value.
func testRegions() []struct {
	reg   region
	delta float64
	name  string
} {
	var out []struct {
		reg   region
		delta float64
		name  string
	}
	for _, c := range []Counts{{4, 15, 9, 15}, {12, 30, 5, 20}, {3, 25, 0, 20}, {17, 40, 9, 35}} {
		for _, side := range []regionSide{sideGreater, sideLess, sideBoth} {
			fr, _ := fisherRegion(c, side)
			out = append(out, struct {
				reg   region
				delta float64
				name  string
			}{fr, 0, fmt.Sprintf("%v Fisher side %d", c, side)})
			for _, delta := range []float64{0, 0.15, -0.3} {
				zr, _ := zRegion(c, delta, true, side)
				out = append(out, struct {
					reg   region
					delta float64
					name  string
				}{zr, delta, fmt.Sprintf("%v score δ0=%v side %d", c, delta, side)})
			}
		}
	}
	return out
}

// TestSupremumBoundBig: the rounding allowance of every evaluated tail
// holds. At random nuisance values (and at the ends of the range) the
// exact tail, in math/big, is within value ± allowance of the evaluated
// one, on the regions of testRegions, with the cutoff the search uses.
func TestSupremumBoundBig(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 4))
	for _, tr := range testRegions() {
		reg := tr.reg
		in := regionTables(&reg)
		a, b := max(0, -tr.delta), min(1, 1-tr.delta)
		s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, delta: tr.delta, a: a, b: b, prove: true}
		for i := range 12 {
			theta := rng.Float64() * math.Pi / 2
			switch i {
			case 0:
				theta = 0
			case 1:
				theta = math.Pi / 2
			}
			s.best = 0.3 // a cutoff that skips terms, as in a real search
			pt := s.point(theta)
			p1 := min(max(pt.pi2+tr.delta, 0), 1)
			exact := bigTail(in, p1, pt.pi2)
			// The allowance includes the move from fl(π2 + δ0) to the
			// line; the big value is taken at the rounded π1, so it must
			// lie within the allowance a fortiori.
			if math.Abs(exact-pt.val) > pt.up-pt.val {
				t.Errorf("%s θ=%v: evaluated %.17g, exact %.17g, allowance %.3g", tr.name, theta, pt.val, exact, pt.up-pt.val)
			}
			if pt.up-pt.val > 1e-11*pt.val+1e-13 {
				t.Errorf("%s θ=%v: allowance %.3g too wide for a value %.3g", tr.name, theta, pt.up-pt.val, pt.val)
			}
		}
	}
}

// TestSupremumCellBound: the bound on one cell of the nuisance range is
// never below the largest tail on a fine grid of that cell (an
// independent brute-force tail), for cells of every width from the whole
// range down to 1e−4 radians, at the ends and in the middle, each of the
// bounds (A)–(D) on its own. The grid maximum is at most the true
// supremum, so a bound below it is wrong.
func TestSupremumCellBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 3))
	var used [cellBoundKinds]int
	for _, tr := range testRegions() {
		reg := tr.reg
		in := regionTables(&reg)
		a, b := max(0, -tr.delta), min(1, 1-tr.delta)
		s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, delta: tr.delta, a: a, b: b, prove: true}
		s.rowRange()
		brute := func(p2 float64) float64 {
			b1, b2 := binomTable(int64(reg.n1), min(max(p2+tr.delta, 0), 1)), binomTable(int64(reg.n2), p2)
			v := 0.0
			for x1, row := range in {
				for x2, ok := range row {
					if ok {
						v += b1[x1] * b2[x2]
					}
				}
			}
			return v
		}
		for i := range 16 {
			width := math.Pi / 2 * math.Pow(10, -4*rng.Float64())
			lo := rng.Float64() * (math.Pi/2 - width)
			switch i {
			case 0:
				lo, width = 0, math.Pi/2
			case 1:
				lo = 0
			case 2:
				lo = math.Pi/2 - width
			}
			l, r := s.point(lo), s.point(lo+width)
			var parts [cellBoundKinds]float64
			s.cellBounds(l, r, &parts, -1)
			top := 0.0
			for k := 0; k <= 400; k++ {
				top = max(top, brute(l.pi2+(r.pi2-l.pi2)*float64(k)/400))
			}
			for kind, ub := range parts {
				if ub < top*(1-1e-13) {
					t.Errorf("%s cell θ ∈ [%v, %v]: bound %d is %.15g, below the grid maximum %.15g", tr.name, lo, lo+width, kind, ub, top)
				}
				if !math.IsInf(ub, 1) {
					used[kind]++
				}
			}
		}
	}
	// Regions where a bound is nearly attained, so that a wrong constant
	// shows: every table but (0, 0) (P = 1 − (1 − π)^N has slope N at 0,
	// and arcsin √P slope √N on the angle scale: bounds (A) and (D) on
	// cells [0, Δ]); the tables with x1 + x2 = N/2 (P″ = −4N·P = −J·P at
	// ½: the relative (B)); n1 = n2 = 1 with x1 + x2 = 1 (P = 2π(1 − π),
	// P″ = −4 = −I/2 at ½: the absolute (B)); and every table but (0, 0)
	// and (n1, n2) (C″ = (1 − 1/N)·K·C at ½: (B) through the complement).
	tight := []struct {
		name   string
		n      int
		in     func(x1, x2, n int) bool
		center bool
	}{
		{"all but (0,0)", 10, func(x1, x2, n int) bool { return x1+x2 > 0 }, false},
		{"x1+x2 = N/2", 5, func(x1, x2, n int) bool { return x1+x2 == n }, true},
		{"x1+x2 = 1", 1, func(x1, x2, n int) bool { return x1+x2 == 1 }, true},
		{"all but the corners", 3, func(x1, x2, n int) bool { return x1+x2 > 0 && x1+x2 < 2*n }, true},
	}
	for _, tc := range tight {
		reg := buildRegion(context.Background(), tc.n, tc.n, func(x1, from int, part []bool) {
			for j := range part {
				part[j] = tc.in(x1, from+j, tc.n)
			}
		})
		in := regionTables(&reg)
		s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, a: 0, b: 1, prove: true}
		s.rowRange()
		for _, w := range []float64{1e-1, 3e-2, 1e-2, 1e-3} {
			lo, hi := 0.0, w
			if tc.center {
				lo, hi = math.Pi/4-w, math.Pi/4+w
			}
			l, r := s.point(lo), s.point(hi)
			var parts [cellBoundKinds]float64
			s.cellBounds(l, r, &parts, -1)
			top := 0.0
			for k := 0; k <= 2000; k++ {
				p := l.pi2 + (r.pi2-l.pi2)*float64(k)/2000
				top = max(top, bigTail(in, p, p))
			}
			for kind, ub := range parts {
				if ub < top*(1-1e-13) {
					t.Errorf("%s cell θ ∈ [%v, %v]: bound %d is %.15g, below the grid maximum %.15g", tc.name, lo, hi, kind, ub, top)
				}
			}
		}
	}
	for kind, n := range used {
		if n == 0 {
			t.Errorf("bound %d never applied: the test does not exercise it", kind)
		}
	}
	t.Logf("cells where each bound applied (A, B with I, B with J, B with K, D, monotone): %v", used)
}

// bruteRegion returns the tables at least as extreme as c for the
// statistic (bruteStat at δ0 = 0; the score statistic at the restricted
// estimates by likelihood maximisation otherwise), from the definitions.
func bruteRegion(c Counts, s OrderingStatistic, side regionSide, delta float64) [][]bool {
	if delta == 0 {
		return newBruteTail(c, s, side).in
	}
	z := bruteScoreZ(c, delta)
	obs := z(c.X1, c.X2)
	in := make([][]bool, c.N1+1)
	for x1 := range in {
		in[x1] = make([]bool, c.N2+1)
		for x2 := range in[x1] {
			in[x1][x2] = bruteMember(PooledScore, side, z(int64(x1), int64(x2)), obs)
		}
	}
	return in
}

// bruteDenseMax is the largest tail of the tables in on a uniform grid of
// k+1 values of π2 along π1 = π2 + δ0 (binomTable terms).
func bruteDenseMax(in [][]bool, delta float64, k int) float64 {
	a, b := max(0, -delta), min(1, 1-delta)
	best := 0.0
	for i := 0; i <= k; i++ {
		p2 := a + (b-a)*float64(i)/float64(k)
		b1, b2 := binomTable(int64(len(in)-1), min(max(p2+delta, 0), 1)), binomTable(int64(len(in[0])-1), p2)
		v := 0.0
		for x1, row := range in {
			for x2, ok := range row {
				if ok {
					v += b1[x1] * b2[x2]
				}
			}
		}
		best = max(best, v)
	}
	return best
}

// boundCase is one test of the sweep: a statistic, an alternative and a
// null value.
type boundCase struct {
	stat OrderingStatistic
	alt  Alternative
	null float64
}

// TestSupremumBoundSweep: on every table of n1 = n2 = 15, 30 and 20 vs 25
// (n1 = n2 = 60 with PROPSCOPE_FULL_SWEEP=1), for Barnard's score and Wald
// orderings and Boschloo's, one- and two-sided, at δ0 = 0 and at margins
// δ0 = ±0.1, 0.25 (score ordering), the proven bound is at least the
// p-value and the relative gap is below supBoundTolerance (1e−9). The plain
// run takes every case on 15 vs 15 and, on the larger designs, every table
// with two or three of the 21 cases in turn. On the tables of 15 vs 15
// (every 17th table and case in the plain run) the bound is also
// compared with an independent brute-force maximum on a grid of 1500
// values of the nuisance parameter, which it must not be below.
func TestSupremumBoundSweep(t *testing.T) {
	full := os.Getenv("PROPSCOPE_FULL_SWEEP") == "1"
	designs := [][2]int64{{15, 15}, {30, 30}, {20, 25}}
	if full {
		designs = append(designs, [2]int64{60, 60})
	}
	var cases []boundCase
	for _, alt := range []Alternative{TwoSided, Greater, Less} {
		for _, st := range []OrderingStatistic{PooledScore, UnpooledWald, FisherPValue} {
			cases = append(cases, boundCase{st, alt, 0})
		}
		for _, null := range []float64{-0.25, -0.1, 0.1, 0.25} {
			cases = append(cases, boundCase{PooledScore, alt, null})
		}
	}
	worst, count := 0.0, 0
	for _, d := range designs {
		for x1 := int64(0); x1 <= d[0]; x1++ {
			for x2 := int64(0); x2 <= d[1]; x2++ {
				c := Counts{x1, d[0], x2, d[1]}
				for ci, bc := range cases {
					if !full && d[0] >= 20 && (x1*31+x2*7+int64(ci))%7 != 0 {
						continue // plain run: every table, each with 2 or 3 of the 21 cases
					}
					r, err := designFor(bc.stat, TwoSidedOrdered).Test(c, WithAlternative(bc.alt), WithNull(bc.null))
					if err != nil {
						t.Fatal(err)
					}
					count++
					bound := *r.PValueBound
					gap := (bound - r.PValue) / r.PValue
					worst = max(worst, gap)
					if !(bound >= r.PValue) || gap > supBoundTolerance {
						t.Errorf("%v %+v: p = %.15g, bound %.15g, gap %.3g", c, bc, r.PValue, bound, gap)
					}
					if d == [2]int64{15, 15} && (full || (x1+3*x2+int64(ci))%17 == 0) {
						side := map[Alternative]regionSide{TwoSided: sideBoth, Greater: sideGreater, Less: sideLess}[bc.alt]
						if dense := bruteDenseMax(bruteRegion(c, bc.stat, side, bc.null), bc.null, 1500); bound < dense*(1-1e-12) {
							t.Errorf("%v %+v: bound %.15g below the brute-force grid maximum %.15g", c, bc, bound, dense)
						}
					}
				}
			}
		}
	}
	t.Logf("%d tests, largest relative gap %.3g", count, worst)
}

// TestSupremumBoundEdges: the bound on the slow log-space path (tails
// below 1e−280), with Berger–Boos' restriction and the doubled two-sided
// rule, keeps p ≤ bound ≤ p·(1 + 1e−9); a full region's bound is 1.
func TestSupremumBoundEdges(t *testing.T) {
	check := func(name string, m TestMethod, c Counts, opts ...Option) {
		t.Helper()
		r, err := m.Test(c, opts...)
		if err != nil {
			t.Fatal(err)
		}
		if r.PValueBound == nil {
			t.Fatalf("%s: no bound", name)
		}
		b := *r.PValueBound
		if r.PValue == 0 {
			if b != 0 && math.Log(b) < r.LogPValue {
				t.Errorf("%s: bound %g below p (log %g)", name, b, r.LogPValue)
			}
			return
		}
		if !(b >= r.PValue && b <= r.PValue*(1+supBoundTolerance)) {
			t.Errorf("%s: p = %.15g, bound %.15g", name, r.PValue, b)
		}
	}
	check("tiny", BarnardTest, Counts{0, 700, 700, 700})
	check("small", BoschlooTest, Counts{3, 300, 120, 300})
	check("full region", BarnardTest, Counts{9, 15, 4, 15}, WithAlternative(Less))
	bb, _ := NewUnconditionalTest(UnconditionalVariant{Statistic: PooledScore, BergerBoosGamma: 0.001})
	check("Berger–Boos", bb, Counts{12, 30, 5, 20})
	check("doubled", BoschlooDoubledTest, Counts{12, 30, 5, 20})
	check("margin at the end", BarnardTest, Counts{20, 20, 3, 25}, WithNull(0.6), WithAlternative(Greater))
	// The log-space search itself: a region whose tail is below 1e−280
	// everywhere, proved on the log scale.
	c := Counts{0, 500, 500, 500}
	reg, _ := zRegion(c, 0, true, sideLess)
	s := nuisanceSearch{work: newTailWork(reg.n1, reg.n2), reg: &reg, a: 0, b: 1}
	logv, _, logb := s.provenSupremum()
	if !s.logScale || !(logb >= logv && logb-logv <= supBoundTolerance) {
		t.Errorf("log scale %v: log p %.15g, log bound %.15g", s.logScale, logv, logb)
	}
}
