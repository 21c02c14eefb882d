package proportions

import (
	"math"
	"testing"
)

// bruteStat returns the ordering statistic of one table computed directly
// from its definition (independent of the region code): for Boschloo the
// Fisher p-value by exact enumeration (fisherBrute), for Barnard the z
// statistics written out.
func bruteStat(c Counts, s OrderingStatistic, side regionSide) float64 {
	p1, p2 := c.P1(), c.P2()
	switch s {
	case PooledScore:
		pool := float64(c.X1+c.X2) / float64(c.N1+c.N2)
		v := pool * (1 - pool) * (1/float64(c.N1) + 1/float64(c.N2))
		if p1 == p2 {
			return 0
		}
		return (p1 - p2) / math.Sqrt(v)
	case UnpooledWald:
		v := p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2)
		if p1 == p2 {
			return 0
		}
		if v == 0 {
			return math.Copysign(math.Inf(1), p1-p2)
		}
		return (p1 - p2) / math.Sqrt(v)
	}
	a := TwoSided
	if side == sideGreater {
		a = Greater
	} else if side == sideLess {
		a = Less
	}
	return fisherBrute(c, a, false)
}

// bruteMember decides region membership for the brute-force tail.
func bruteMember(s OrderingStatistic, side regionSide, t, obs float64) bool {
	if s == FisherPValue {
		return t <= obs*(1+1e-9)
	}
	const tol = 1e-9
	slack := 0.0
	if !math.IsInf(obs, 0) {
		slack = tol * math.Abs(obs)
	}
	switch side {
	case sideGreater:
		return t >= obs-slack
	case sideLess:
		return t <= obs+slack
	}
	return math.Abs(t) >= math.Abs(obs)-slack
}

// bruteTail is the O(n1·n2) tail probability at common π: the sum of
// b1(x1)·b2(x2) over every table at least as extreme as the observed one,
// with binomial probabilities from math.Pow and lgamma.
type bruteTail struct {
	in     [][]bool
	n1, n2 int64
}

func newBruteTail(c Counts, s OrderingStatistic, side regionSide) bruteTail {
	obs := bruteStat(c, s, side)
	bt := bruteTail{n1: c.N1, n2: c.N2}
	for x1 := int64(0); x1 <= c.N1; x1++ {
		row := make([]bool, c.N2+1)
		for x2 := int64(0); x2 <= c.N2; x2++ {
			row[x2] = bruteMember(s, side, bruteStat(Counts{x1, c.N1, x2, c.N2}, s, side), obs)
		}
		bt.in = append(bt.in, row)
	}
	return bt
}

func binomDirect(k, n int64, p float64) float64 {
	return math.Exp(logChoose(float64(n), float64(k))) * math.Pow(p, float64(k)) * math.Pow(1-p, float64(n-k))
}

func (bt bruteTail) at(pi float64) float64 {
	b1, b2 := binomTable(bt.n1, pi), binomTable(bt.n2, pi)
	t := 0.0
	for x1 := int64(0); x1 <= bt.n1; x1++ {
		for x2 := int64(0); x2 <= bt.n2; x2++ {
			if bt.in[x1][x2] {
				t += b1[x1] * b2[x2]
			}
		}
	}
	return t
}

// binomTable returns binomDirect(k, n, p) for k = 0..n.
func binomTable(n int64, p float64) []float64 {
	b := make([]float64, n+1)
	for k := range b {
		b[k] = binomDirect(int64(k), n, p)
	}
	return b
}

// dense returns the largest tail on a uniform grid of k+1 points.
func (bt bruteTail) dense(k int) (best, where float64) {
	for i := 0; i <= k; i++ {
		pi := float64(i) / float64(k)
		if v := bt.at(pi); v > best {
			best, where = v, pi
		}
	}
	return best, where
}

func designFor(s OrderingStatistic, rule TwoSidedRule) TestMethod {
	m, err := NewUnconditionalTest(UnconditionalVariant{Statistic: s, TwoSided: rule})
	if err != nil {
		panic(err)
	}
	return m
}

// TestUnconditionalBruteForce compares Barnard's and Boschloo's p-values on
// small designs with an O(n1·n2·grid) brute force: the statistic of every
// table from its definition, the tail summed table by table, and the
// supremum over a dense uniform grid of 4000 points. The library's value
// must be at least the dense maximum (less 1e−9 relative) and must be a
// real tail value: the brute-force tail at the reported nuisance value
// equals it.
func TestUnconditionalBruteForce(t *testing.T) {
	cases := []Counts{{3, 10, 5, 10}, {7, 10, 5, 20}, {0, 8, 4, 9}, {4, 12, 8, 9}, {6, 6, 0, 7}, {2, 5, 2, 5}, {9, 15, 3, 11}}
	for _, c := range cases {
		for _, s := range []OrderingStatistic{PooledScore, UnpooledWald, FisherPValue} {
			for _, side := range []regionSide{sideGreater, sideLess, sideBoth} {
				alt := [...]Alternative{Greater, Less, TwoSided}[side]
				r, err := designFor(s, TwoSidedOrdered).Test(c, WithAlternative(alt))
				if err != nil {
					t.Fatal(err)
				}
				bt := newBruteTail(c, s, side)
				dense, where := bt.dense(2000)
				if r.PValue < dense*(1-1e-9) {
					t.Errorf("%v stat %d side %d: p = %.12g below the dense-grid maximum %.12g at π = %v", c, s, side, r.PValue, dense, where)
				}
				if at := bt.at(*r.Nuisance); math.Abs(at-r.PValue) > 1e-10*r.PValue+1e-15 {
					t.Errorf("%v stat %d side %d: p = %.12g but the brute-force tail at π = %v is %.12g", c, s, side, r.PValue, *r.Nuisance, at)
				}
			}
		}
	}
}

// TestUnconditionalReference checks Barnard and Boschloo against SciPy
// 1.10.1 (scipy-checks.json of the shared reference set, n = 10…800 per
// group, and SciPy values computed for exact.json on unbalanced designs,
// all one- and two-sided) and the recomputed 56/70 vs 48/80 values of
// Newcombe's (1998) example. SciPy maximises numerically, so a p-value
// above SciPy's by more than the tolerance is accepted only when it is a
// real tail value: the brute-force tail at the reported nuisance value
// confirms it (checked for n ≤ 100 here; larger ones by the dense test).
func TestUnconditionalReference(t *testing.T) {
	methods := map[string]TestMethod{"barnard-test": BarnardTest, "barnard-wald-test": BarnardWaldTest, "boschloo-test": BoschlooTest, "boschloo-doubled-test": BoschlooDoubledTest}
	n := 0
	for _, c := range loadExactChecks(t) {
		m, ok := methods[c.Test]
		if !ok {
			continue
		}
		n++
		r, err := m.Test(c.counts(), WithAlternative(c.alternative(t)))
		if err != nil {
			t.Fatalf("%s: %v", c.ID, err)
		}
		if c.within(r.PValue) {
			continue
		}
		if r.PValue < c.P {
			t.Errorf("%s (%s): p = %.12g, reference %.12g: lower than the reference supremum", c.ID, c.Source, r.PValue, c.P)
			continue
		}
		t.Logf("%s: p = %.12g above the reference %.12g (relative %.2g); confirming", c.ID, r.PValue, c.P, r.PValue/c.P-1)
		if c.N1+c.N2 > 200 || c.Test == "boschloo-doubled-test" || c.Alternative == "two-sided" && c.Test == "boschloo-test" {
			continue
		}
		st := map[string]OrderingStatistic{"barnard-test": PooledScore, "barnard-wald-test": UnpooledWald, "boschloo-test": FisherPValue}[c.Test]
		side := map[string]regionSide{"greater": sideGreater, "less": sideLess, "two-sided": sideBoth}[c.Alternative]
		if at := newBruteTail(c.counts(), st, side).at(*r.Nuisance); math.Abs(at-r.PValue) > 1e-9*r.PValue {
			t.Errorf("%s: p = %.12g not confirmed: brute-force tail at π = %v is %.12g", c.ID, r.PValue, *r.Nuisance, at)
		}
	}
	if n < 40 {
		t.Fatalf("only %d unconditional checks found", n)
	}
}
