package proportions

import (
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// smallTables returns every table with 1 ≤ n1, n2 ≤ maxN plus a few
// unbalanced and larger designs: zero cells, all-event groups and the
// 0/0 cases are all included.
func smallTables(maxN int64) []Counts {
	var out []Counts
	add := func(n1, n2 int64) {
		for x1 := int64(0); x1 <= n1; x1++ {
			for x2 := int64(0); x2 <= n2; x2++ {
				out = append(out, Counts{x1, n1, x2, n2})
			}
		}
	}
	for n1 := int64(1); n1 <= maxN; n1++ {
		for n2 := int64(1); n2 <= maxN; n2++ {
			add(n1, n2)
		}
	}
	add(40, 3)
	add(25, 60)
	return out
}

// invertedClose reports whether a ≈ 1/b, with 0 and ∞ exchanged exactly.
func invertedClose(a, b float64) bool {
	switch {
	case a == 0:
		return math.IsInf(b, 1) || b > 1e120
	case math.IsInf(a, 1):
		return b == 0 || b < 1e-120
	}
	return math.Abs(a*b-1) <= 1e-8
}

func ratioFamilies() []IntervalMethod {
	return slices.Concat(EnumerableIntervalMethods(Ratio), EnumerableIntervalMethods(OddsRatio))
}

// TestRatioIntervalsWellFormed: on every small table each ratio and
// odds-ratio interval has no NaN, lower ≤ upper, and contains the point
// estimate whenever that is defined, except where the method's documented
// zero-cell rule says otherwise (the ½-adjusted intervals are centred on
// the adjusted estimate).
func TestRatioIntervalsWellFormed(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range smallTables(9) {
		for _, m := range ratioFamilies() {
			iv := m.IntervalAt(c, conf)
			if math.IsNaN(iv.RawLower) || math.IsNaN(iv.RawUpper) {
				t.Fatalf("%s %v: NaN limit %v", m.Key, c, iv)
			}
			if !(iv.Lower <= iv.Upper) || iv.Lower < 0 {
				t.Fatalf("%s %v: bad order %v", m.Key, c, iv)
			}
			if !iv.Defined || hasZeroCell(c, m.Scale) {
				continue
			}
			if !iv.Contains(iv.Estimate) && !nearlyContains(iv, iv.Estimate) {
				t.Errorf("%s %v: %v does not contain the estimate", m.Key, c, iv)
			}
		}
	}
}

// nearlyContains allows for the root-finding tolerance when an interval
// collapses onto its estimate.
func nearlyContains(iv Interval, v float64) bool {
	return v >= iv.Lower*(1-1e-9) && v <= iv.Upper*(1+1e-9)
}

func hasZeroCell(c Counts, f Scale) bool {
	if f == Ratio {
		return c.X1 == 0 || c.X2 == 0
	}
	return c.X1 == 0 || c.X2 == 0 || c.X1 == c.N1 || c.X2 == c.N2
}

// TestRatioZeroCellRules checks each method's documented behaviour at zero
// cells: the score intervals put 0 or ∞ exactly where the estimate is 0 or
// ∞; Katz and Woolf report [0, ∞]; the ½-adjusted intervals stay finite.
func TestRatioZeroCellRules(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	inf := math.Inf(1)
	for _, c := range smallTables(7) {
		est := func(f Scale) float64 { return f.Estimate(c) }
		for _, m := range ratioFamilies() {
			iv := m.IntervalAt(c, conf)
			e := est(m.Scale)
			switch m.Key {
			case "katz-ratio":
				if (c.X1 == 0 || c.X2 == 0) && (iv.Lower != 0 || iv.Upper != inf) {
					t.Errorf("katz %v: %v, want [0, ∞]", c, iv)
				}
			case "woolf-odds-ratio":
				if hasZeroCell(c, OddsRatio) && (iv.Lower != 0 || iv.Upper != inf) {
					t.Errorf("woolf %v: %v, want [0, ∞]", c, iv)
				}
			case "katz-zero-adjusted-ratio", "gart-odds-ratio":
				if math.IsInf(iv.Upper, 0) || iv.Lower <= 0 {
					t.Errorf("%s %v: %v, want finite positive limits", m.Key, c, iv)
				}
			default: // score and exact intervals
				if math.IsNaN(e) {
					if iv.Lower != 0 || iv.Upper != inf {
						t.Errorf("%s %v: not estimable but %v, want [0, ∞]", m.Key, c, iv)
					}
					continue
				}
				if (e == 0) != (iv.Lower == 0) || math.IsInf(e, 1) != math.IsInf(iv.Upper, 1) {
					t.Errorf("%s %v: estimate %v but %v", m.Key, c, e, iv)
				}
			}
		}
	}
}

// TestRatioSwapInvariance: exchanging the groups inverts a ratio or odds
// ratio interval; exchanging events and non-events inverts an odds-ratio
// interval (the odds ratio of non-events is 1/ψ).
func TestRatioSwapInvariance(t *testing.T) {
	conf, _ := NewConfidence(0.9)
	for _, c := range smallTables(8) {
		flip := Counts{c.N1 - c.X1, c.N1, c.N2 - c.X2, c.N2}
		for _, m := range ratioFamilies() {
			iv := m.IntervalAt(c, conf)
			sw := m.IntervalAt(c.Swapped(), conf)
			if !invertedClose(iv.Lower, sw.Upper) || !invertedClose(iv.Upper, sw.Lower) {
				t.Errorf("%s %v: %v, swapped groups %v", m.Key, c, iv, sw)
			}
			if m.Scale != OddsRatio {
				continue
			}
			fl := m.IntervalAt(flip, conf)
			if !invertedClose(iv.Lower, fl.Upper) || !invertedClose(iv.Upper, fl.Lower) {
				t.Errorf("%s %v: %v, events and non-events exchanged %v", m.Key, c, iv, fl)
			}
		}
	}
}

// TestKoopmanEqualsFarringtonManningSquared: Koopman's Pearson chi-square
// (Biometrics 1984) and the square of the Farrington–Manning z (Statistics
// in Medicine 1990) are two published forms of one statistic; they are
// computed here by separate code.
func TestKoopmanEqualsFarringtonManningSquared(t *testing.T) {
	for _, c := range smallTables(6) {
		for _, theta := range []float64{0.01, 0.3, 1, 2.5, 40, 1e200} {
			k := koopmanSigned(c, theta)
			z := ratioScore(c, theta, 1)
			if math.IsInf(k, 0) || math.IsInf(z, 0) {
				if k != z {
					t.Errorf("%v θ=%v: Koopman %v, FM %v", c, theta, k, z)
				}
				continue
			}
			if math.Abs(k-z) > 1e-7*math.Max(1, math.Abs(z)) {
				t.Errorf("%v θ=%v: Koopman %v, FM %v", c, theta, k, z)
			}
		}
	}
}

// bruteMax maximises f on (lo, hi) by a fine grid then golden-section
// search: an independent check of the closed-form restricted estimates.
func bruteMax(f func(float64) float64, lo, hi float64) float64 {
	best, bx := math.Inf(-1), lo
	const steps = 2000
	for i := 1; i < steps; i++ {
		x := lo + (hi-lo)*float64(i)/steps
		if v := f(x); v > best {
			best, bx = v, x
		}
	}
	a, b := math.Max(lo, bx-(hi-lo)/steps), math.Min(hi, bx+(hi-lo)/steps)
	g := (math.Sqrt(5) - 1) / 2
	for range 200 {
		x1, x2 := b-g*(b-a), a+g*(b-a)
		if f(x1) < f(x2) {
			a = x1
		} else {
			b = x2
		}
	}
	return (a + b) / 2
}

func binomialLogLik(x, n, p float64) float64 {
	l := 0.0
	if x > 0 {
		l += x * math.Log(p)
	}
	if n-x > 0 {
		l += (n - x) * math.Log1p(-p)
	}
	return l
}

// TestRestrictedEstimates compares the closed-form maximum-likelihood
// estimates under a ratio or odds-ratio constraint with a direct numerical
// maximisation of the binomial likelihood.
func TestRestrictedEstimates(t *testing.T) {
	cases := []Counts{{36, 40, 16, 80}, {3, 30, 15, 50}, {0, 12, 5, 9}, {7, 7, 2, 11}, {1, 20, 0, 20}, {189, 11034, 104, 11037}}
	for _, c := range cases {
		x1, n1, x2, n2 := float64(c.X1), float64(c.N1), float64(c.X2), float64(c.N2)
		for _, theta := range []float64{0.2, 0.9, 1, 1.7, 6} {
			ll := func(p2 float64) float64 { return binomialLogLik(x1, n1, theta*p2) + binomialLogLik(x2, n2, p2) }
			want := bruteMax(ll, 0, math.Min(1, 1/theta))
			_, got := restrictedUnderRatio(c, theta)
			if math.Abs(got-want) > 1e-6 {
				t.Errorf("ratio %v θ=%v: p̃2 = %.9f, numerical maximum at %.9f", c, theta, got, want)
			}
			llo := func(p2 float64) float64 {
				p1 := theta * p2 / (1 - p2 + theta*p2)
				return binomialLogLik(x1, n1, p1) + binomialLogLik(x2, n2, p2)
			}
			want = bruteMax(llo, 0, 1)
			_, got = restrictedUnderOddsRatio(c, theta)
			if math.Abs(got-want) > 1e-6 {
				t.Errorf("odds ratio %v ψ=%v: p̃2 = %.9f, numerical maximum at %.9f", c, theta, got, want)
			}
		}
	}
}

// TestRatioTestsMatchIntervals: each score test rejects a null value
// exactly when its paired interval excludes it.
func TestRatioTestsMatchIntervals(t *testing.T) {
	pairs := []struct {
		test TestMethod
		iv   IntervalMethod
	}{
		{FarringtonManningRatioTest, Koopman},
		{MiettinenNurminenRatioTest, MiettinenNurminenRatio},
		{MiettinenNurminenOddsRatioTest, MiettinenNurminenOddsRatio},
	}
	for _, c := range []Counts{{36, 40, 16, 80}, {3, 30, 15, 50}, {0, 12, 5, 9}, {12, 40, 5, 38}} {
		for _, p := range pairs {
			iv, err := p.iv.Interval(c, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			for _, null := range []float64{0.05, 0.3, 0.8, 1, 1.3, 2.5, 4, 9, 30} {
				if math.Abs(null-iv.Lower) < 1e-6*null || math.Abs(null-iv.Upper) < 1e-6*null {
					continue
				}
				r, err := p.test.Test(c, WithNull(null))
				if err != nil {
					t.Fatal(err)
				}
				if r.Reject == iv.Contains(null) {
					t.Errorf("%s %v null %v: reject=%v but interval %v", p.test.Key, c, null, r.Reject, iv)
				}
			}
		}
	}
}

// TestRatioTestsOneSided: a one-sided non-inferiority test at margin ρ0
// uses the upper normal tail; the two-sided p is twice the smaller tail.
func TestRatioTestsOneSided(t *testing.T) {
	c := Counts{X1: 90, N1: 100, X2: 85, N2: 100}
	g, err := FarringtonManningRatioTest.Test(c, WithNull(0.9), WithAlternative(Greater))
	if err != nil {
		t.Fatal(err)
	}
	l, _ := FarringtonManningRatioTest.Test(c, WithNull(0.9), WithAlternative(Less))
	two, _ := FarringtonManningRatioTest.Test(c, WithNull(0.9))
	// Φ(−z) from math.Erfc, independent of the package's tail code.
	want := 0.5 * math.Erfc(g.Statistic/math.Sqrt2)
	if !relClose(g.PValue, want, 1e-12) || !relClose(g.PValue+l.PValue, 1, 1e-12) || !relClose(two.PValue, 2*math.Min(g.PValue, l.PValue), 1e-12) {
		t.Errorf("greater %v less %v two-sided %v", g.PValue, l.PValue, two.PValue)
	}
	if g.Statistic <= 0 || !g.Reject {
		t.Errorf("90/100 vs 85/100 should be non-inferior at ratio 0.9: %v", g)
	}
}

// TestRatioBadInput: nulls outside (0, ∞) and invalid counts are errors
// wrapping the package's sentinels, never a panic or NaN.
func TestRatioBadInput(t *testing.T) {
	c := Counts{X1: 3, N1: 10, X2: 4, N2: 10}
	for _, null := range []float64{0, -1, math.Inf(1), math.NaN()} {
		for _, m := range ratioTests {
			if _, err := m.Test(c, WithNull(null)); !errors.Is(err, ErrNull) {
				t.Errorf("%s null %v: err %v, want ErrNull", m.Key, null, err)
			}
		}
	}
	if _, err := Koopman.Interval(Counts{X1: 11, N1: 10, X2: 1, N2: 5}, 0.95); !errors.Is(err, ErrEventsExceedTrials) {
		t.Errorf("err %v, want ErrEventsExceedTrials", err)
	}
	if _, err := Woolf.Interval(c, 1.5); !errors.Is(err, ErrLevel) {
		t.Errorf("err %v, want ErrLevel", err)
	}
}

// TestRatioExtremeNulls: huge and tiny null ratios, to the edges of the
// accepted range (MaxNullRatio; beyond it they are refused, see
// TestRatioNullsAtTheirEdges), give finite or infinite statistics, never
// NaN.
func TestRatioExtremeNulls(t *testing.T) {
	for _, c := range []Counts{{0, 5, 3, 5}, {5, 5, 0, 5}, {5, 5, 5, 5}, {2, 9, 7, 9}, {1 << 40, 1 << 41, 3, 1 << 45}} {
		for _, null := range []float64{1 / MaxNullRatio, 1e-6, 1e6, MaxNullRatio} {
			for _, m := range ratioTests {
				r, err := m.Test(c, WithNull(null))
				if err != nil {
					t.Fatal(err)
				}
				if math.IsNaN(r.Statistic) || math.IsNaN(r.PValue) {
					t.Errorf("%s %v null %v: %v", m.Key, c, null, r)
				}
			}
		}
	}
}

// TestRatioIntervalJSON: infinite limits are written as "Infinity" and a
// not-estimable estimate as null, never NaN.
func TestRatioIntervalJSON(t *testing.T) {
	iv, err := Koopman.Interval(Counts{X1: 5, N1: 10, X2: 0, N2: 10}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(iv)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), `"upper":"Infinity"`) || !strings.Contains(string(b), `"estimate":"Infinity"`) {
		t.Errorf("JSON %s", b)
	}
	iv, _ = MiettinenNurminenOddsRatio.Interval(Counts{X1: 0, N1: 10, X2: 0, N2: 10}, 0.95)
	b, _ = json.Marshal(iv)
	if !strings.Contains(string(b), `"estimate":null`) || !strings.Contains(string(b), `"estimate_defined":false`) {
		t.Errorf("JSON %s", b)
	}
	if s := iv.String(); !strings.Contains(s, "not estimable") || !strings.Contains(s, "∞") {
		t.Errorf("String %q", s)
	}
}
