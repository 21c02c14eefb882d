package proportions

import (
	"math"
	"math/big"
	"testing"
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
		case "fisher":
			m = Fisher
		case "fisher-midp":
			m = FisherMidP
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
	lo, hi := hypergeomSupport(c.N1, c.N2, m)
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
						m := Fisher
						if mid {
							m = FisherMidP
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
		r, err := Fisher.Test(c, WithAlternative(tc.a))
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
		lt = logAddExp(lt, logChoose(n, float64(k))+logChoose(n, float64(m-k))-logChoose(2*n, float64(m)))
	}
	r, err := Fisher.Test(c, WithAlternative(Less))
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
		for _, m := range []TestMethod{Fisher, FisherMidP} {
			for _, a := range []Alternative{TwoSided, Greater, Less} {
				r, err := m.Test(c, WithAlternative(a))
				if err != nil || r.PValue != 1 || r.LogPValue != 0 || r.Reject {
					t.Errorf("%s %v %v: %+v, %v", m.Key, c, a, r, err)
				}
			}
		}
	}
}
