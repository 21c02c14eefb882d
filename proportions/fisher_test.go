package proportions

import (
	"fmt"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/propscope/propscope/internal/bigref"
	"github.com/propscope/propscope/internal/special"
)

// TestFisherReference checks Fisher's test and its mid-p against published
// worked examples and SciPy (testdata/reference/exact.json): Fisher's
// tea-tasting example (Fisher 1935, The Design of Experiments, Ch. II),
// Agresti (2002) larynx-cancer data, Fisher's twins data, the 56/70 vs 48/80
// example of Newcombe (1998) recomputed, and SciPy 1.10.1 fisher_exact up to
// n = 10⁴ per group. Each value keeps its status: `memory` entries would be
// skipped (none is used here); `recomputed` ones are cross-implementation
// checks.
func TestFisherReference(t *testing.T) {
	n := 0
	for _, c := range loadExactChecks(t) {
		var m TestMethod
		switch c.Test {
		case "fisher-test":
			m = FisherTest
		case "fisher-mid-p-test":
			m = FisherMidPTest
		default:
			continue
		}
		if c.Status == "memory" {
			continue
		}
		n++
		r, err := m.Test(c.counts(), WithAlternative(c.alternative(t)))
		if err != nil {
			t.Fatalf("%s: %v", c.ID, err)
		}
		if !c.within(r.PValue) {
			t.Errorf("%s (%s): p = %.12g, want %.12g (tolerance %g %s)", c.ID, c.Source, r.PValue, c.P, c.Tolerance, c.ToleranceKind)
		}
		if c.Exact != "" {
			// The exact fraction is arithmetic on binomial coefficients.
			if want := ratFloat(t, c.Exact); math.Abs(r.PValue-want) > 1e-12*want {
				t.Errorf("%s: p = %.15g, want exactly %s = %.15g", c.ID, r.PValue, c.Exact, want)
			}
		}
	}
	if n < 15 {
		t.Fatalf("only %d Fisher checks found", n)
	}
}

// fisherBrute computes Fisher's p-values by full enumeration in exact
// rational arithmetic, independently of the log-space code: each table's
// probability C(n1,k)C(n2,m−k)/C(n,m) as a big.Rat.
func fisherBrute(c Counts, a Alternative, mid bool) float64 {
	m := c.X1 + c.X2
	lo, hi := special.HypergeomSupport(c.N1, c.N2, m)
	total := new(big.Int).Binomial(c.N1+c.N2, m)
	prob := func(k int64) *big.Rat {
		num := new(big.Int).Mul(new(big.Int).Binomial(c.N1, k), new(big.Int).Binomial(c.N2, m-k))
		return new(big.Rat).SetFrac(num, total)
	}
	obs := prob(c.X1)
	sum, ties := new(big.Rat), new(big.Rat)
	// Relative tie tolerance of the library, applied exactly.
	tolHi := new(big.Rat).Mul(obs, new(big.Rat).SetFloat64(1+FisherTieTolerance))
	tolLo := new(big.Rat).Mul(obs, new(big.Rat).SetFloat64(1-FisherTieTolerance))
	for k := lo; k <= hi; k++ {
		p := prob(k)
		switch a {
		case Greater:
			if k > c.X1 {
				sum.Add(sum, p)
			} else if k == c.X1 {
				ties.Add(ties, p)
			}
		case Less:
			if k < c.X1 {
				sum.Add(sum, p)
			} else if k == c.X1 {
				ties.Add(ties, p)
			}
		default:
			if p.Cmp(tolLo) < 0 {
				sum.Add(sum, p)
			} else if p.Cmp(tolHi) <= 0 {
				ties.Add(ties, p)
			}
		}
	}
	if mid {
		ties.Mul(ties, big.NewRat(1, 2))
	}
	if lo == hi {
		return 1
	}
	f, _ := sum.Add(sum, ties).Float64()
	return f
}

// TestFisherBruteForce compares every table of several small designs with
// exact rational enumeration.
func TestFisherBruteForce(t *testing.T) {
	designs := [][2]int64{{1, 1}, {4, 4}, {7, 3}, {10, 10}, {12, 17}, {25, 6}}
	for _, d := range designs {
		for x1 := int64(0); x1 <= d[0]; x1++ {
			for x2 := int64(0); x2 <= d[1]; x2++ {
				c := Counts{X1: x1, N1: d[0], X2: x2, N2: d[1]}
				for _, a := range []Alternative{TwoSided, Greater, Less} {
					for _, mid := range []bool{false, true} {
						m := FisherTest
						if mid {
							m = FisherMidPTest
						}
						r, err := m.Test(c, WithAlternative(a))
						if err != nil {
							t.Fatal(err)
						}
						want := fisherBrute(c, a, mid)
						if math.Abs(r.PValue-want) > 1e-12*want+1e-300 {
							t.Fatalf("%v %v mid=%v: p = %.15g, want %.15g", c, a, mid, r.PValue, want)
						}
						if math.IsNaN(r.LogPValue) || math.Abs(r.LogPValue-math.Log(want)) > 1e-10 {
							t.Fatalf("%v %v mid=%v: log p = %v, want %v", c, a, mid, r.LogPValue, math.Log(want))
						}
					}
				}
			}
		}
	}
}

// logChoose is log C(n, k) through lgamma, an independent route used only
// for the very large checks below (its absolute error, ~1e−9 at n = 2·10⁶,
// is far inside their tolerance).
func logChoose(n, k float64) float64 {
	a, _ := math.Lgamma(n + 1)
	b, _ := math.Lgamma(k + 1)
	c, _ := math.Lgamma(n - k + 1)
	return a - b - c
}

// TestFisherTinyP checks p-values far below the float64 range at 10⁶ per
// group: the most extreme table [[10⁶, 0], [0, 10⁶]] has one-sided
// p = 1/C(2·10⁶, 10⁶) and two-sided p = 2/C(2·10⁶, 10⁶) (exact arithmetic:
// it and its mirror are the only tables that improbable). PValue underflows
// to 0; LogPValue must carry the value.
func TestFisherTinyP(t *testing.T) {
	const n = 1_000_000
	c := Counts{X1: n, N1: n, X2: 0, N2: n}
	lc := logChoose(2*n, n)
	for _, tc := range []struct {
		a    Alternative
		want float64
	}{{Greater, -lc}, {TwoSided, math.Ln2 - lc}, {Less, 0}} {
		r, err := FisherTest.Test(c, WithAlternative(tc.a))
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.LogPValue-tc.want) > 1e-9*math.Max(1, math.Abs(tc.want)) {
			t.Errorf("%v: log p = %.12g, want %.12g", tc.a, r.LogPValue, tc.want)
		}
	}
	// A moderately extreme table at 10⁶ per group: compare the one-sided
	// tail with a direct lgamma summation in log space.
	c = Counts{X1: 300_000, N1: n, X2: 301_500, N2: n}
	m := c.X1 + c.X2
	lt := math.Inf(-1)
	for k := m - n; k <= c.X1; k++ {
		lt = special.LogAddExp(lt, logChoose(n, float64(k))+logChoose(n, float64(m-k))-logChoose(2*n, float64(m)))
	}
	r, err := FisherTest.Test(c, WithAlternative(Less))
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.LogPValue-lt) > 1e-6 {
		t.Errorf("10⁶ per group: log p = %.10g, lgamma sum %.10g", r.LogPValue, lt)
	}
}

// TestFisherZeroMargin: with no events (or only events) there is one
// possible table, so every version gives p = 1 (documented on Fisher).
func TestFisherZeroMargin(t *testing.T) {
	for _, c := range []Counts{{0, 5, 0, 9}, {5, 5, 9, 9}} {
		for _, m := range []TestMethod{FisherTest, FisherMidPTest} {
			for _, a := range []Alternative{TwoSided, Greater, Less} {
				r, err := m.Test(c, WithAlternative(a))
				if err != nil || r.PValue != 1 || r.LogPValue != 0 || r.Reject {
					t.Errorf("%s %v %v: %+v, %v", m.Key, c, a, r, err)
				}
			}
		}
	}
}

// fisherSets sums exact or high-precision weights (w[i] is the weight of
// the table X1 = from+i) by the definitions on Fisher and FisherMidP: the tables more extreme
// than x (one-sided: beyond x; two-sided: weight < w(x)·(1−tol)), the
// tables as extreme (x itself; two-sided: within w(x)·(1±tol)) and the
// rest. The tolerance factors are the float64 values 1 ± FisherTieTolerance
// taken as exact fractions. less(v) and leq(v) compare a weight with
// w(x)·(1−tol) and w(x)·(1+tol).
func fisherSets[W any](w []W, from, x int64, a Alternative, add func(acc, v W), less, leq func(v W) bool, more, tied, rest W) {
	for i, v := range w {
		k := from + int64(i)
		switch {
		case a != TwoSided && k == x, a == TwoSided && !less(v) && leq(v):
			add(tied, v)
		case a == Greater && k > x, a == Less && k < x, a == TwoSided && less(v):
			add(more, v)
		default:
			add(rest, v)
		}
	}
}

// fisherEnumLog is log p by full enumeration in exact integer arithmetic
// (fisherSets on the weights of hypergeomWeights), for n1+n2 up to a few
// thousand: p = (more + tied)/C(n1+n2, m), the tied tables counted half
// for the mid-p; p near 1 as log1p(−rest/C).
func fisherEnumLog(c Counts, a Alternative, mid bool) float64 {
	m := c.X1 + c.X2
	lo, w := bigref.HypergeomWeights(c.N1, c.N2, m)
	if len(w) == 1 {
		return 0
	}
	obs := w[c.X1-lo]
	hiR := new(big.Rat).SetFloat64(1 + FisherTieTolerance)
	loR := new(big.Rat).SetFloat64(1 - FisherTieTolerance)
	obsHi, obsLo := new(big.Int).Mul(obs, hiR.Num()), new(big.Int).Mul(obs, loR.Num())
	t := new(big.Int)
	more, tied, rest := new(big.Int), new(big.Int), new(big.Int)
	fisherSets(w, lo, c.X1, a, func(acc, v *big.Int) { acc.Add(acc, v) },
		func(v *big.Int) bool { return t.Mul(v, loR.Denom()).Cmp(obsLo) < 0 },
		func(v *big.Int) bool { return t.Mul(v, hiR.Denom()).Cmp(obsHi) <= 0 },
		more, tied, rest)
	den := new(big.Int).Binomial(c.N1+c.N2, m)
	num := new(big.Int).Add(more, tied)
	if mid {
		// p = (2·more + tied)/(2·C); 1 − p = (2·rest + tied)/(2·C).
		num.Add(num, more)
		rest.Add(rest, rest)
		rest.Add(rest, tied)
		den.Add(den, den)
	}
	if num.Cmp(rest) > 0 { // p > ½: log1p(−(1 − p))
		q, _ := new(big.Rat).SetFrac(rest, den).Float64()
		return math.Log1p(-q)
	}
	return bigref.RatLog(new(big.Rat).SetFrac(num, den))
}

// fisherWindow returns log p as a function of the alternative and the
// mid-p choice, from weights relative to the mode in 128-bit floating
// point (the same exact ratio recurrence, each step rounded at 128 bits)
// over the tables with P(k) ≥ P(x)·e⁻⁸⁰ (found by bisection on an lgamma
// log pmf, unimodal), which leaves out less than 10⁻²⁸ of any sum here.
// For the large tables, where exact enumeration is out of reach.
func fisherWindow(c Counts) func(a Alternative, mid bool) float64 {
	n1, n2, m, x := c.N1, c.N2, c.X1+c.X2, c.X1
	lo, hi := special.HypergeomSupport(n1, n2, m)
	if lo == hi {
		return func(Alternative, bool) float64 { return 0 }
	}
	const prec = 128
	newF := func() *big.Float { return new(big.Float).SetPrec(prec) }
	mode := special.HypergeomMode(n1, n2, m)
	lp := func(k int64) float64 {
		return logChoose(float64(n1), float64(k)) + logChoose(float64(n2), float64(m-k))
	}
	floor := lp(x) - 80
	from, to := lo, hi
	if lp(lo) < floor { // lp(from) < floor ≤ lp(b)
		for b := mode; b-from > 1; {
			if mid := from + (b-from)/2; lp(mid) < floor {
				from = mid
			} else {
				b = mid
			}
		}
	}
	if lp(hi) < floor {
		for a := mode; to-a > 1; {
			if mid := a + (to-a)/2; lp(mid) < floor {
				to = mid
			} else {
				a = mid
			}
		}
	}
	w := make([]*big.Float, to-from+1)
	w[mode-from] = newF().SetInt64(1)
	step := func(v *big.Float, a, b, c, d int64) *big.Float {
		u := newF().Mul(v, newF().SetInt64(a))
		u.Mul(u, newF().SetInt64(b))
		u.Quo(u, newF().SetInt64(c))
		return u.Quo(u, newF().SetInt64(d))
	}
	for k := mode; k < to; k++ {
		w[k+1-from] = step(w[k-from], n1-k, m-k, k+1, n2-m+k+1)
	}
	for k := mode; k > from; k-- {
		w[k-1-from] = step(w[k-from], k, n2-m+k, n1-k+1, m-k+1)
	}
	obsHi := newF().Mul(w[x-from], big.NewFloat(1+FisherTieTolerance))
	obsLo := newF().Mul(w[x-from], big.NewFloat(1-FisherTieTolerance))
	return func(a Alternative, mid bool) float64 {
		more, tied, rest := newF(), newF(), newF()
		fisherSets(w, from, x, a, func(acc, v *big.Float) { acc.Add(acc, v) },
			func(v *big.Float) bool { return v.Cmp(obsLo) < 0 },
			func(v *big.Float) bool { return v.Cmp(obsHi) <= 0 },
			more, tied, rest)
		if mid { // half of the tied tables on either side
			tied.Quo(tied, big.NewFloat(2))
			rest.Add(rest, tied)
		}
		num := newF().Add(more, tied)
		total := newF().Add(num, rest)
		if num.Cmp(rest) > 0 {
			q, _ := newF().Quo(rest, total).Float64()
			return math.Log1p(-q)
		}
		r, _ := newF().Quo(num, total).Rat(nil)
		return bigref.RatLog(r)
	}
}

// logPError is the error of a log p-value: the relative error of p
// (absolute in log p) while p is in the float64 range, and beyond it
// (log p < −700) the relative error of log p scaled by 700.
func logPError(got, want float64) float64 {
	e := math.Abs(got - want)
	if want < -700 {
		e *= 700 / -want
	}
	if math.IsNaN(got) {
		return math.Inf(1)
	}
	return e
}

// TestFisherRandomEnumeration compares both tests, all three alternatives,
// with full enumeration in exact integer arithmetic (fisherEnumLog, written
// from the definitions) on random tables: groups of 1 to 300, half of them
// equal (where mirror tables tie exactly), every margin including zero
// cells, a quarter of the tables near the null; and unequal groups of 500
// to 3000 with tables far from it (where the far side of the two-sided set
// is found by Newton steps instead of a walk). p must agree to 10⁻¹²
// relative (logPError).
func TestFisherRandomEnumeration(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	worst, worstAt := 0.0, ""
	check := func(c Counts) {
		for _, a := range []Alternative{TwoSided, Greater, Less} {
			for _, mid := range []bool{false, true} {
				got, want := fisherLogP(c, a, mid), fisherEnumLog(c, a, mid)
				e := logPError(got, want)
				if e > worst {
					worst, worstAt = e, fmt.Sprintf("%v %v mid=%v", c, a, mid)
				}
				if e > 1e-12 {
					t.Errorf("%v %v mid=%v: log p = %.17g, enumeration %.17g", c, a, mid, got, want)
				}
			}
		}
	}
	for range 1500 {
		n1 := 1 + r.Int64N(300)
		n2 := n1
		if r.IntN(2) == 0 {
			n2 = 1 + r.Int64N(300)
		}
		c := Counts{X1: r.Int64N(n1 + 1), N1: n1, X2: r.Int64N(n2 + 1), N2: n2}
		if r.IntN(4) == 0 {
			c.X2 = min(n2, max(0, c.X1*n2/n1+r.Int64N(5)-2))
		}
		check(c)
	}
	for range 60 {
		n1, n2 := 500+r.Int64N(2500), 500+r.Int64N(2500)
		p := 0.05 + 0.9*r.Float64()
		q := min(0.99, max(0.01, p+(0.1+0.3*r.Float64())*float64(r.IntN(2)*2-1)))
		check(Counts{X1: int64(p * float64(n1)), N1: n1, X2: int64(q * float64(n2)), N2: n2})
	}
	t.Logf("worst error %.2g (%s)", worst, worstAt)
}

// TestFisherLowerEnd checks the Newton search for the far side of the
// two-sided set directly on small and medium tables, where the p-value
// routes walk instead: for oriented tables (pmf not rising from x up) and
// the inner end b of the upper run found by exact enumeration, lowerEnd(b)
// must return the largest a < b with W(a) ≤ W(x)·(1+tol) (exact integer
// comparison), or lo − 1 if there is none, and ρ_a = W(a)/W(x) to 10⁻¹².
func TestFisherLowerEnd(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 10))
	hiR := new(big.Rat).SetFloat64(1 + FisherTieTolerance)
	tested := 0
	for range 3000 {
		n1, n2 := 1+r.Int64N(400), 1+r.Int64N(400)
		m := r.Int64N(n1 + n2 + 1)
		lo, w := bigref.HypergeomWeights(n1, n2, m)
		hi := lo + int64(len(w)) - 1
		x := lo + r.Int64N(hi-lo+1)
		if x < hi && w[x+1-lo].Cmp(w[x-lo]) > 0 {
			continue // not oriented
		}
		within := func(k int64) bool { // W(k) ≤ W(x)·(1+tol)
			a := new(big.Int).Mul(w[k-lo], hiR.Denom())
			return a.Cmp(new(big.Int).Mul(w[x-lo], hiR.Num())) <= 0
		}
		b := x
		for b > lo && within(b-1) && w[b-1-lo].Cmp(w[b-lo]) >= 0 {
			b--
		}
		if b == lo || (within(b-1) && w[b-1-lo].Cmp(w[b-lo]) < 0) {
			continue // every table is in the set
		}
		want := b - 2
		for want >= lo && !within(want) {
			want--
		}
		lpx := special.LogHypergeomPMF(x, n1, n2, m)
		f := fisherTables{n1: n1, n2: n2, m: m, x: x, lo: lo, hi: hi, lpx: lpx, px: math.Exp(lpx)}
		got, rho := f.lowerEnd(b)
		tested++
		if got != want {
			t.Errorf("n1=%d n2=%d m=%d x=%d b=%d: lowerEnd %d, want %d", n1, n2, m, x, b, got, want)
			continue
		}
		if got >= lo {
			wr, _ := new(big.Rat).SetFrac(w[got-lo], w[x-lo]).Float64()
			if math.Abs(rho-wr) > 1e-12*wr {
				t.Errorf("n1=%d n2=%d m=%d x=%d: ρ(%d) = %.15g, want %.15g", n1, n2, m, x, got, rho, wr)
			}
		}
	}
	if tested < 1000 {
		t.Fatalf("only %d tables tested", tested)
	}
}

// TestFisherLargeTables compares large tables (10⁴ to 10⁶ per group; 2²⁷
// and 2³⁶ per group, where the ratio loops leave exact integer
// differences; 128 against 2⁴⁰, where the walk through the central tables
// overflows and gives way to Newton steps) with a high-precision
// enumeration over the support that matters (fisherWindow) and with the
// previous implementation, kept below as a reference copy
// (oldFisherLogP). Both at 10⁻¹² relative (logPError).
func TestFisherLargeTables(t *testing.T) {
	if testing.Short() {
		t.Skip("high-precision enumeration of large tables")
	}
	worstRef, worstOld := 0.0, 0.0
	var atRef, atOld string
	for _, c := range []Counts{
		{3000, 10000, 4500, 10000}, {5000, 10000, 5100, 10000}, {5000, 10000, 4000, 8000},
		{500000, 1000000, 501000, 1000000}, {500000, 1000000, 510000, 1000000}, {600000, 1000000, 500000, 1000000},
		{500000, 1000000, 400800, 800000}, {600000, 1000000, 400000, 800000}, {300000, 1000000, 301500, 1000000},
		{123456, 1000000, 3456, 20000}, {700000, 1000000, 0, 3000},
		{1 << 26, 1 << 27, 1<<26 + 20000, 1 << 27}, {1 << 26, 1 << 27, 1<<25 + 3000, 1 << 26},
		{1 << 35, 1 << 36, 1<<35 + 1<<18, 1 << 36}, {128, 128, 0, 1 << 40}, {100, 128, 5, 1 << 40},
	} {
		ref := fisherWindow(c)
		for _, a := range []Alternative{TwoSided, Greater, Less} {
			for _, mid := range []bool{false, true} {
				got := fisherLogP(c, a, mid)
				old := oldFisherLogP(c, a, mid)
				if e := logPError(got, old); e > 1e-12 {
					t.Errorf("%v %v mid=%v: log p = %.15g, previous implementation %.15g", c, a, mid, got, old)
				} else if e > worstOld {
					worstOld, atOld = e, fmt.Sprintf("%v %v mid=%v", c, a, mid)
				}
				want := ref(a, mid)
				if e := logPError(got, want); e > 1e-12 {
					t.Errorf("%v %v mid=%v: log p = %.15g, high-precision enumeration %.15g", c, a, mid, got, want)
				} else if e > worstRef {
					worstRef, atRef = e, fmt.Sprintf("%v %v mid=%v", c, a, mid)
				}
			}
		}
	}
	t.Logf("worst error: against the enumeration %.2g (%s), against the previous implementation %.2g (%s)", worstRef, atRef, worstOld, atOld)
}

// TestFisherDoesNotAllocate covers every route of the p-value computation
// (the coverage engine calls Run for every outcome of a design).
func TestFisherDoesNotAllocate(t *testing.T) {
	h := Hypothesis{Conf: Confidence{Level: 0.95}}
	for _, c := range []Counts{
		{30, 50, 25, 50}, {40, 50, 15, 50}, {500, 1000, 510, 1000}, {500, 1000, 410, 800},
		{600000, 1000000, 400000, 800000}, {3, 4, 1, 4}, {0, 5, 0, 9},
	} {
		for _, a := range []Alternative{TwoSided, Greater, Less} {
			h.Alternative = a
			for _, m := range []TestMethod{FisherTest, FisherMidPTest} {
				if n := testing.AllocsPerRun(10, func() { m.Run(c, h) }); n != 0 {
					t.Errorf("%s %v %v allocates %v times", m.Key, c, a, n)
				}
			}
		}
	}
}

// The previous implementation, kept as a reference copy for
// TestFisherLargeTables and the benchmarks only (internal reference, not
// an outside source): tails summed in log space from their inner ends,
// found by bisection on the log pmf, and the two-sided p-value computed
// twice, with and without the tie tolerance.

func logHypergeomPMFOld(k, n1, n2, m int64) float64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	if k < lo || k > hi {
		return math.Inf(-1)
	}
	if lo == hi {
		return 0
	}
	n := float64(n1 + n2)
	p := float64(m) / n
	q := float64(n1+n2-m) / n
	return special.LogBinomPMF(float64(k), float64(n1), p, q) +
		special.LogBinomPMF(float64(m-k), float64(n2), p, q) -
		special.LogBinomPMF(float64(m), n, p, q)
}

func oldFisherLogP(c Counts, a Alternative, mid bool) float64 {
	n1, n2, m, x := c.N1, c.N2, c.X1+c.X2, c.X1
	if lo, hi := special.HypergeomSupport(n1, n2, m); lo == hi {
		return 0
	}
	var incl, excl float64
	switch a {
	case Greater:
		incl = oldLogTail(x, n1, n2, m, true)
		excl = oldLogTail(x+1, n1, n2, m, true)
	case Less:
		incl = oldLogTail(x, n1, n2, m, false)
		excl = oldLogTail(x-1, n1, n2, m, false)
	default:
		lp := logHypergeomPMFOld(x, n1, n2, m)
		incl = oldLogTwoSided(n1, n2, m, lp+math.Log1p(FisherTieTolerance))
		excl = oldLogTwoSided(n1, n2, m, lp+math.Log1p(-FisherTieTolerance))
	}
	if !mid {
		return min(incl, 0)
	}
	return min(special.LogAddExp(incl, excl)-math.Ln2, 0)
}

func oldLogTwoSided(n1, n2, m int64, thr float64) float64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	mode := special.HypergeomMode(n1, n2, m)
	if logHypergeomPMFOld(mode, n1, n2, m) <= thr {
		return 0
	}
	total := math.Inf(-1)
	if logHypergeomPMFOld(lo, n1, n2, m) <= thr {
		a, b := lo, mode
		for b-a > 1 {
			mid := a + (b-a)/2
			if logHypergeomPMFOld(mid, n1, n2, m) <= thr {
				a = mid
			} else {
				b = mid
			}
		}
		total = oldLogOuter(a, n1, n2, m, false)
	}
	if logHypergeomPMFOld(hi, n1, n2, m) <= thr {
		a, b := mode, hi
		for b-a > 1 {
			mid := a + (b-a)/2
			if logHypergeomPMFOld(mid, n1, n2, m) <= thr {
				b = mid
			} else {
				a = mid
			}
		}
		total = special.LogAddExp(total, oldLogOuter(b, n1, n2, m, true))
	}
	return total
}

func oldLogTail(k, n1, n2, m int64, upper bool) float64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	mode := special.HypergeomMode(n1, n2, m)
	if upper {
		switch {
		case k <= lo:
			return 0
		case k > hi:
			return math.Inf(-1)
		case k <= mode:
			return oldLog1mexp(oldLogOuter(k-1, n1, n2, m, false))
		}
		return oldLogOuter(k, n1, n2, m, true)
	}
	switch {
	case k >= hi:
		return 0
	case k < lo:
		return math.Inf(-1)
	case k >= mode:
		return oldLog1mexp(oldLogOuter(k+1, n1, n2, m, true))
	}
	return oldLogOuter(k, n1, n2, m, false)
}

func oldLogOuter(k, n1, n2, m int64, up bool) float64 {
	lo, hi := special.HypergeomSupport(n1, n2, m)
	sum, term := 1.0, 1.0
	if up {
		for j := k; j < hi; j++ {
			term *= special.HypergeomRatio(j, n1, n2, m)
			sum += term
			if term < sum*1e-17 {
				break
			}
		}
	} else {
		for j := k; j > lo; j-- {
			term /= special.HypergeomRatio(j-1, n1, n2, m)
			sum += term
			if term < sum*1e-17 {
				break
			}
		}
	}
	return logHypergeomPMFOld(k, n1, n2, m) + math.Log(sum)
}

func oldLog1mexp(x float64) float64 {
	if x > -math.Ln2 {
		return math.Log(-math.Expm1(x))
	}
	return math.Log1p(-math.Exp(x))
}

// TestFisherSharedWork checks that an analysis's shared Fisher sums give
// each test exactly what a run without them gives, when Fisher's test and
// the mid-p alternate over tables and alternatives in any order (the memo
// must never return another table's sums). Internal consistency check; the
// p-values themselves are checked against enumeration above.
func TestFisherSharedWork(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	shared := Hypothesis{Conf: Confidence{Level: 0.95}, shared: &sharedWork{}}
	alone := Hypothesis{Conf: Confidence{Level: 0.95}}
	methods := []TestMethod{FisherTest, FisherMidPTest}
	alts := []Alternative{TwoSided, Greater, Less}
	for i := range 3000 {
		n1, n2 := 1+rng.Int64N(60), 1+rng.Int64N(60)
		if i%10 == 0 {
			n1, n2 = 1+rng.Int64N(2_000_000), 1+rng.Int64N(2_000_000)
		}
		c := Counts{X1: rng.Int64N(n1 + 1), N1: n1, X2: rng.Int64N(n2 + 1), N2: n2}
		for range 1 + rng.IntN(3) {
			m := methods[rng.IntN(2)]
			shared.Alternative = alts[rng.IntN(3)]
			alone.Alternative = shared.Alternative
			got, want := m.Run(c, shared), m.Run(c, alone)
			if got.LogPValue != want.LogPValue || got.PValue != want.PValue || got.Statistic != want.Statistic || got.Reject != want.Reject {
				t.Fatalf("%s %v %v: shared sums give log p %v (p %v), alone %v (p %v)", m.Key, c, shared.Alternative,
					got.LogPValue, got.PValue, want.LogPValue, want.PValue)
			}
		}
	}
}
