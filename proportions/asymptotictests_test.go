package proportions

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func hypothesis(t *testing.T, null float64, alt Alternative, level float64) Hypothesis {
	t.Helper()
	conf, err := NewConfidence(level)
	if err != nil {
		t.Fatal(err)
	}
	return Hypothesis{Null: null, Alternative: alt, Conf: conf}
}

// Score statistics on Newcombe's example (a), 56/70 vs 48/80, at δ = 0 and
// ±0.1 with their upper one-sided p-values (testdata/reference/
// newcombe1998.json, N98a-FM-* and N98a-MN-*). Status recomputed: an
// independent recomputation, not a published number, so this is a
// cross-implementation check at the 6 decimals given.
func TestScoreTestsRecomputedValues(t *testing.T) {
	checked := 0
	for _, r := range loadReference(t, "newcombe1998.json") {
		var m TestMethod
		switch {
		case strings.HasPrefix(r.ID, "N98a-FM-"):
			m = FarringtonManningTest
		case strings.HasPrefix(r.ID, "N98a-MN-"):
			m = MiettinenNurminenTest
		default:
			continue
		}
		delta := parseDelta(t, r.ID)
		res := m.Run(r.counts(t), hypothesis(t, delta, Greater, 0.95))
		p := number(t, r.Value)
		if math.Abs(res.Statistic-r.Statistic) > 5e-7 || math.Abs(res.PValue-p) > 5e-7 {
			t.Errorf("%s: z = %.7f, p = %.7f; recomputation z = %v, p = %v", r.ID, res.Statistic, res.PValue, r.Statistic, p)
		}
		checked++
	}
	if checked != 6 {
		t.Errorf("checked %d score-statistic entries, want 6", checked)
	}
}

// parseDelta reads δ from an id such as "N98a-FM-d-0.1".
func parseDelta(t *testing.T, id string) float64 {
	_, d, _ := strings.Cut(id, "-d")
	return number(t, jsonNumber(d))
}

// SciPy 1.10.1 scipy.stats.chi2_contingency (testdata/reference/
// scipy-core.json): Pearson's chi-square with and without Yates'
// correction (SciPy caps the ½ shift at |O − E|) and the likelihood-ratio
// G², statistics and two-sided p-values, including zero cells and a table
// with |O − E| < ½.
func TestChiSquareTestsSciPy(t *testing.T) {
	methods := map[string]TestMethod{
		"Pearson chi-square, no continuity correction":  PearsonChiSquareTest,
		"Pearson chi-square with Yates correction":      YatesTest,
		"likelihood-ratio G2, no continuity correction": LikelihoodRatioTest,
	}
	checked := 0
	for _, r := range loadReference(t, "scipy-core.json") {
		m, ok := methods[r.Quantity]
		if !ok {
			continue
		}
		res := m.Run(r.counts(t), hypothesis(t, 0, TwoSided, 0.95))
		if !nearly(res.Statistic, r.Statistic, 1e-9) || !withinRel(res.PValue, r.PTwoSided, 1e-8) || res.DF != 1 {
			t.Errorf("%s %v: %s = %.12g, p = %.12g (df %d); SciPy %.12g, p = %.12g", m.Name, r.Data, res.StatisticName, res.Statistic, res.PValue, res.DF, r.Statistic, r.PTwoSided)
		}
		checked++
	}
	if checked < 30 {
		t.Errorf("checked %d SciPy chi-square entries", checked)
	}
}

func withinRel(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Abs(b) }

// The statistics recomputed on Newcombe's example (a) (newcombe1998.json,
// N98a-test-*; status recomputed, cross-implementation check).
func TestChiSquareTestsRecomputedValues(t *testing.T) {
	methods := map[string]TestMethod{
		"N98a-test-pearson-chi-square-no-cc":         PearsonChiSquareTest,
		"N98a-test-pearson-chi-square-with-yates-cc": YatesTest,
		"N98a-test-likelihood-ratio-g2":              LikelihoodRatioTest,
	}
	for _, r := range loadReference(t, "newcombe1998.json") {
		m, ok := methods[r.ID]
		if !ok {
			continue
		}
		res := m.Run(r.counts(t), hypothesis(t, 0, TwoSided, 0.95))
		if math.Abs(res.Statistic-r.Statistic) > 5e-6 || math.Abs(res.PValue-number(t, r.ValueFull)) > 5e-8 {
			t.Errorf("%s: %v, p %v; recomputation %v, p %v", r.ID, res.Statistic, res.PValue, r.Statistic, r.ValueFull)
		}
		delete(methods, r.ID)
	}
	if len(methods) != 0 {
		t.Errorf("reference entries not found: %v", methods)
	}
}

// The identity z² = X²: at δ = 0 the Farrington–Manning statistic (from the
// restricted MLE) squared equals Pearson's Σ(O − E)²/E, over every table
// with n1, n2 ≤ 12 and some large ones; and z equals the pooled z formula
// (p1 − p2)/√(p̄(1−p̄)(1/n1 + 1/n2)) evaluated directly.
func TestPooledZSquaredIsPearson(t *testing.T) {
	h := hypothesis(t, 0, TwoSided, 0.95)
	for _, c := range propertyTables() {
		z := FarringtonManningTest.Run(c, h).Statistic
		x2 := PearsonChiSquareTest.Run(c, h).Statistic
		if !nearly(z*z, x2, 1e-10) {
			t.Fatalf("%v: z² = %v, X² = %v", c, z*z, x2)
		}
		pooled := float64(c.X1+c.X2) / float64(c.N1+c.N2)
		v := pooled * (1 - pooled) * (1/float64(c.N1) + 1/float64(c.N2))
		want := 0.0
		if v > 0 {
			want = (c.P1() - c.P2()) / math.Sqrt(v)
		}
		if !nearly(z, want, 1e-10) {
			t.Fatalf("%v: z = %v, pooled formula %v", c, z, want)
		}
		// The two-sided p-values agree too, through different tails.
		if pz, px := FarringtonManningTest.Run(c, h).PValue, PearsonChiSquareTest.Run(c, h).PValue; !nearly(pz, px, 1e-12) {
			t.Fatalf("%v: p(z) = %v, p(X²) = %v", c, pz, px)
		}
	}
}

// Far tails: the pooled z of large tables against SciPy's norm.logsf
// (scipy-core.json). p = 3.05e−183 and 3.5e−210 come out as such; beyond
// float64 (log p = −913, −9096) p is 0 and its log still carries the value.
func TestScoreTestFarTail(t *testing.T) {
	checked := 0
	for _, r := range loadReference(t, "scipy-core.json") {
		if !strings.HasPrefix(r.Quantity, "pooled z, two-sided") {
			continue
		}
		res := FarringtonManningTest.Run(r.counts(t), hypothesis(t, 0, TwoSided, 0.95))
		want := number(t, r.Value)
		if !nearly(res.Statistic, r.Statistic, 1e-10) || !withinRel(res.LogPValue, r.LogValue, 1e-10) || !withinRel(res.PValue, want, 1e-8) {
			t.Errorf("%v: z = %v, p = %v, log p = %v; SciPy z = %v, p = %v, log p = %v", r.Data, res.Statistic, res.PValue, res.LogPValue, r.Statistic, want, r.LogValue)
		}
		if !res.Reject {
			t.Errorf("%v: not rejected with log p = %v", r.Data, res.LogPValue)
		}
		checked++
	}
	if checked != 4 {
		t.Errorf("checked %d far-tail entries, want 4", checked)
	}
}

// The critical values at level 0.95: χ²₁,0.95 = 3.84146 (chi-square table,
// cf. Abramowitz & Stegun 1964 Table 26.8; newcombe1998.json CHI2-1-0.95,
// verified-page, 5 decimals) and z0.975 = 1.959963984540054 (Z-0.975,
// memory-recomputed).
func TestCriticalValues(t *testing.T) {
	want := map[string]float64{}
	for _, r := range loadReference(t, "newcombe1998.json") {
		if r.ID == "CHI2-1-0.95" || r.ID == "Z-0.975" {
			want[r.ID] = number(t, r.Value)
		}
	}
	h := hypothesis(t, 0, TwoSided, 0.95)
	c := Counts{X1: 56, N1: 70, X2: 48, N2: 80}
	for _, m := range []TestMethod{PearsonChiSquareTest, YatesTest, LikelihoodRatioTest} {
		if cv := *m.Run(c, h).CriticalValue; math.Abs(cv-want["CHI2-1-0.95"]) > 5e-6 {
			t.Errorf("%s: critical value %v, table 3.84146", m.Name, cv)
		}
	}
	for _, m := range []TestMethod{FarringtonManningTest, MiettinenNurminenTest} {
		if cv := *m.Run(c, h).CriticalValue; math.Abs(cv-want["Z-0.975"]) > 1e-15 {
			t.Errorf("%s: critical value %v, z0.975 = 1.959963984540054", m.Name, cv)
		}
	}
}

// Degenerate tables: both groups 0/n (or both n/n) give statistic 0 and
// two-sided p = 1 for every asymptotic test (the documented convention);
// one-sided p-values of a zero statistic are ½.
func TestDegenerateTables(t *testing.T) {
	for _, c := range []Counts{{0, 10, 0, 20}, {7, 7, 3, 3}, {0, 1, 0, 1}} {
		for _, m := range asymptoticTests {
			for _, alt := range []Alternative{TwoSided, Greater, Less} {
				res := m.Run(c, hypothesis(t, 0, alt, 0.95))
				wantP := 1.0
				if alt != TwoSided {
					wantP = 0.5
				}
				if res.Statistic != 0 || res.PValue != wantP || res.Reject {
					t.Errorf("%s %v %s: %v", m.Name, c, alt, res)
				}
			}
		}
	}
}

// Every asymptotic test over every table with n1, n2 ≤ 12, δ across
// (−1, 1) where allowed and all three alternatives: no NaN anywhere, the
// decision is p ≤ α and agrees with the critical value, one-sided
// p-values of a z statistic sum to 1, and swapping the groups (with −δ and
// the opposite alternative) gives the same p-value.
func TestAsymptoticTestsProperties(t *testing.T) {
	deltas := []float64{-0.99, -0.5, -0.1, 0, 0.05, 0.3, 0.9}
	opposite := map[Alternative]Alternative{TwoSided: TwoSided, Greater: Less, Less: Greater}
	for _, c := range propertyTables() {
		for _, m := range asymptoticTests {
			for _, delta := range deltas {
				if !m.Margins && delta != 0 {
					continue
				}
				var sum float64
				for _, alt := range []Alternative{TwoSided, Greater, Less} {
					h := hypothesis(t, delta, alt, 0.95)
					r := m.Run(c, h)
					if math.IsNaN(r.Statistic) || math.IsNaN(r.PValue) || math.IsNaN(r.LogPValue) || r.PValue < 0 || r.PValue > 1 {
						t.Fatalf("%s %v δ=%v %s: %+v", m.Name, c, delta, alt, r)
					}
					if r.Reject != (r.PValue <= 0.05) {
						t.Fatalf("%s %v: reject %v with p = %v", m.Name, c, r.Reject, r.PValue)
					}
					if !agreesWithCritical(r) {
						t.Errorf("%s %v δ=%v %s: statistic %v, critical %v, p %v", m.Name, c, delta, alt, r.Statistic, *r.CriticalValue, r.PValue)
					}
					if alt != TwoSided {
						sum += r.PValue
					}
					s := m.Run(c.Swapped(), hypothesis(t, -delta, opposite[alt], 0.95))
					if !nearly(s.PValue, r.PValue, 1e-9) {
						t.Errorf("%s %v δ=%v %s: p = %v, swapped p = %v", m.Name, c, delta, alt, r.PValue, s.PValue)
					}
				}
				if math.Abs(sum-1) > 1e-12 {
					t.Errorf("%s %v δ=%v: one-sided p-values sum to %v", m.Name, c, delta, sum)
				}
			}
		}
	}
}

// agreesWithCritical checks the decision against the critical value, away
// from the boundary where rounding may decide either way.
func agreesWithCritical(r TestResult) bool {
	s, cv := r.Statistic, *r.CriticalValue
	if math.Abs(math.Abs(s)-math.Abs(cv)) < 1e-9 {
		return true
	}
	switch {
	case r.DF == 1:
		return r.Reject == (s >= cv)
	case r.Alternative == Greater:
		return r.Reject == (s >= cv)
	case r.Alternative == Less:
		return r.Reject == (s <= cv)
	}
	return r.Reject == (math.Abs(s) >= cv)
}

// Hypotheses outside a test's scope are errors wrapping the sentinels.
func TestAsymptoticTestsErrors(t *testing.T) {
	c := Counts{X1: 3, N1: 10, X2: 5, N2: 10}
	if _, err := PearsonChiSquareTest.Test(c, WithNull(0.1)); !errors.Is(err, ErrUnsupported) {
		t.Errorf("chi-square with null 0.1: %v", err)
	}
	if _, err := FarringtonManningTest.Test(c, WithNull(1)); !errors.Is(err, ErrNull) {
		t.Errorf("score test with null 1: %v", err)
	}
	if _, err := MiettinenNurminenTest.Test(Counts{X1: 3, N1: 2, X2: 0, N2: 1}); !errors.Is(err, ErrEventsExceedTrials) {
		t.Errorf("3 events of 2: %v", err)
	}
	r, err := MiettinenNurminenTest.Test(c, WithNull(-0.2), WithAlternative(Greater), WithLevel(0.975))
	if err != nil || r.Null != -0.2 || r.Alternative != Greater || r.Level != 0.975 {
		t.Errorf("MN test: %+v, %v", r, err)
	}
}

// At δ = 0 the score tests take the pooled z from the table's O − E
// instead of a restricted fit; over every table up to 25 per group (and a
// few large ones) it must equal the general restricted-MLE statistic, and
// its square Pearson's X².
func TestScoreTestPooledShortcut(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	h := Hypothesis{Alternative: TwoSided, Conf: conf}
	check := func(c Counts) {
		for _, tc := range []struct {
			m TestMethod
			z float64
		}{{FarringtonManningTest, FarringtonManningZ(c, 0)}, {MiettinenNurminenTest, MiettinenNurminenZ(c, 0)}} {
			got := tc.m.Run(c, h).Statistic
			if math.Abs(got-tc.z) > 1e-12*math.Max(1, math.Abs(tc.z)) {
				t.Errorf("%+v %s: pooled z %v, restricted-fit z %v", c, tc.m.Key, got, tc.z)
			}
		}
		z := FarringtonManningTest.Run(c, h).Statistic
		if x2 := PearsonChiSquareTest.Run(c, h).Statistic; math.Abs(z*z-x2) > 1e-12*math.Max(1, x2) {
			t.Errorf("%+v: z² = %v, X² = %v", c, z*z, x2)
		}
	}
	for n1 := int64(1); n1 <= 25; n1++ {
		for n2 := int64(1); n2 <= 25; n2 += 3 {
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					check(Counts{x1, n1, x2, n2})
				}
			}
		}
	}
	for _, c := range []Counts{{600000, 1000000, 500000, 1000000}, {3, 1 << 30, 9, 1 << 31}, {1<<40 - 5, 1 << 40, 1<<40 - 9, 1 << 40}} {
		check(c)
	}
}
