package clusters

import (
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// unitClusters makes a group of n clusters of one unit, x of them events.
func unitClusters(prefix string, x, n int) []Cluster {
	out := make([]Cluster, n)
	for i := range out {
		out[i] = Cluster{Value: prefix + string(rune('A'+i/26)) + string(rune('a'+i%26)), Trials: 1}
		if i < x {
			out[i].Events = 1
		}
	}
	return out
}

func mustData(t *testing.T, g1, g2 []Cluster) Data {
	t.Helper()
	d, err := New("tray", proportions.Labels{First: "coated", Second: "bare", Event: "germinated"}, g1, g2)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

// assertSameInterval compares a clustered interval with a unit-level one.
func assertSameInterval(t *testing.T, what string, got proportions.Interval, want proportions.Interval) {
	t.Helper()
	if math.Abs(got.RawLower-want.RawLower) > 1e-12 || math.Abs(got.RawUpper-want.RawUpper) > 1e-12 {
		t.Errorf("%s: %s (%.15g, %.15g), want %s's (%.15g, %.15g)", what, got.Method, got.RawLower, got.RawUpper,
			want.Method, want.RawLower, want.RawUpper)
	}
}

// pearsonX2 is Pearson's X² from its definition Σ (O − E)²/E over the four
// cells of a table of (possibly non-whole) counts, computed here without
// the library.
func pearsonX2(x1, n1, x2, n2 float64) float64 {
	n := n1 + n2
	ev := x1 + x2
	obs := [4]float64{x1, n1 - x1, x2, n2 - x2}
	exp := [4]float64{n1 * ev / n, n1 * (n - ev) / n, n2 * ev / n, n2 * (n - ev) / n}
	s := 0.0
	for i := range obs {
		s += (obs[i] - exp[i]) * (obs[i] - exp[i]) / exp[i]
	}
	return s
}

// Clusters of one unit: no clustering to adjust for, so the design-effect
// methods are their unit-level forms exactly (design effect 1 whatever ρ),
// and Rao–Scott's d_i is N_i/(N_i − 1) (its variance estimator's m/(m − 1)).
func TestClustersOfOneUnitReduceToUnitLevel(t *testing.T) {
	for _, tc := range [][4]int{{7, 20, 3, 20}, {15, 31, 2, 17}, {0, 12, 5, 9}, {40, 50, 33, 50}} {
		x1, n1, x2, n2 := tc[0], tc[1], tc[2], tc[3]
		d := mustData(t, unitClusters("a", x1, n1), unitClusters("b", x2, n2))
		counts := d.Totals()
		for _, pair := range []struct {
			ours   IntervalMethod
			theirs proportions.IntervalMethod
		}{{DesignEffectWald, proportions.Wald}, {ZouDonner, proportions.Newcombe}} {
			got, err := pair.ours.Interval(d, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			want, err := pair.theirs.Interval(counts, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			assertSameInterval(t, d.String(), got, want)
		}
		donner, err := DonnerTest.Test(d)
		if err != nil {
			t.Fatal(err)
		}
		if want := pearsonX2(float64(x1), float64(n1), float64(x2), float64(n2)); math.Abs(donner.Statistic-want) > 1e-12*max(1, want) {
			t.Errorf("%v: Donner X² = %.15g, Pearson's = %.15g", tc, donner.Statistic, want)
		}
		rs, err := RaoScottTest.Test(d)
		if err != nil {
			t.Fatal(err)
		}
		scale := func(x, n int) float64 { // d = 1 at a rate of 0 or 1, the documented convention
			if x == 0 || x == n {
				return 1
			}
			return float64(n-1) / float64(n)
		}
		s1, s2 := scale(x1, n1), scale(x2, n2)
		if want := pearsonX2(float64(x1)*s1, float64(n1)*s1, float64(x2)*s2, float64(n2)*s2); math.Abs(rs.Statistic-want) > 1e-12*max(1, want) {
			t.Errorf("%v: Rao–Scott X² = %.15g, Pearson's on counts scaled by (N−1)/N = %.15g", tc, rs.Statistic, want)
		}
	}
}

// ratMeanSquares computes MSC and MSW of equal-sized clusters exactly in
// rationals, from their definitions over the 0/1 outcomes of every unit.
func ratMeanSquares(groups [][]int, size int) (msc, msw *big.Rat) {
	between, within := new(big.Rat), new(big.Rat)
	clusters, units := 0, 0
	for _, g := range groups {
		sum := 0
		for _, x := range g {
			sum += x
		}
		groupMean := big.NewRat(int64(sum), int64(size*len(g)))
		for _, x := range g {
			clusterMean := big.NewRat(int64(x), int64(size))
			dev := new(big.Rat).Sub(clusterMean, groupMean)
			between.Add(between, new(big.Rat).Mul(big.NewRat(int64(size), 1), new(big.Rat).Mul(dev, dev)))
			for u := 0; u < size; u++ {
				y := big.NewRat(0, 1)
				if u < x {
					y = big.NewRat(1, 1)
				}
				e := new(big.Rat).Sub(y, clusterMean)
				within.Add(within, new(big.Rat).Mul(e, e))
			}
		}
		clusters += len(g)
		units += size * len(g)
	}
	msc = new(big.Rat).Quo(between, big.NewRat(int64(clusters-2), 1))
	msw = new(big.Rat).Quo(within, big.NewRat(int64(units-clusters), 1))
	return msc, msw
}

// With equal cluster sizes and an ANOVA estimate of exactly 0 (MSC = MSW,
// found by exact rational search), the design effect is 1 and the adjusted
// methods are their unit-level forms.
func TestZeroCorrelationEqualSizesReducesToUnitLevel(t *testing.T) {
	const size = 6
	found := 0
	for a := 0; a <= size && found < 4; a++ {
		for b := 0; b <= size; b++ {
			for c := 0; c <= size; c++ {
				for e := 0; e <= size; e++ {
					g := [][]int{{a, b, 3}, {c, e, 1}}
					msc, msw := ratMeanSquares(g, size)
					if msc.Sign() == 0 || msc.Cmp(msw) != 0 {
						continue
					}
					found++
					d := mustData(t,
						[]Cluster{{"a1", int64(a), size}, {"a2", int64(b), size}, {"a3", 3, size}},
						[]Cluster{{"b1", int64(c), size}, {"b2", int64(e), size}, {"b3", 1, size}})
					if r := ANOVACorrelation(Summarize(d), 0.95); !r.Defined || math.Abs(r.Estimate) > 1e-14 {
						t.Errorf("%v: ANOVA estimate %v (defined %v), MSC = MSW exactly", g, r.Estimate, r.Defined)
					}
					counts := d.Totals()
					got, _ := DesignEffectWald.Interval(d, 0.9)
					want, _ := proportions.Wald.Interval(counts, 0.9)
					assertSameInterval(t, d.String(), got, want)
					got, _ = ZouDonner.Interval(d, 0.9)
					want, _ = proportions.Newcombe.Interval(counts, 0.9)
					assertSameInterval(t, d.String(), got, want)
					donner, _ := DonnerTest.Test(d)
					if x2 := pearsonX2(float64(counts.X1), float64(counts.N1), float64(counts.X2), float64(counts.N2)); math.Abs(donner.Statistic-x2) > 1e-12 {
						t.Errorf("%v: Donner X² %v, Pearson %v", g, donner.Statistic, x2)
					}
				}
			}
		}
	}
	if found == 0 {
		t.Fatal("no configuration with MSC = MSW found; the check ran on nothing")
	}
}

// randomData draws two groups of clusters with unequal sizes and
// cluster-to-cluster variation in the rate.
func randomData(t *testing.T, r *rand.Rand) Data {
	var groups [2][]Cluster
	for gi := range groups {
		m := 2 + r.IntN(8)
		base := r.Float64()
		for j := 0; j < m; j++ {
			n := 1 + r.IntN(30)
			p := min(max(base+0.3*(r.Float64()-0.5), 0), 1)
			x := 0
			for u := 0; u < n; u++ {
				if r.Float64() < p {
					x++
				}
			}
			groups[gi] = append(groups[gi], Cluster{Value: string(rune('a'+gi)) + string(rune('A'+j)), Events: int64(x), Trials: int64(n)})
		}
	}
	return mustData(t, groups[0], groups[1])
}

// The design-effect methods never give a narrower interval than their
// unit-level forms: their design effects are at least 1 by construction.
func TestAdjustedIntervalsNeverNarrower(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 2000; i++ {
		d := randomData(t, r)
		counts := d.Totals()
		for _, pair := range []struct {
			ours   IntervalMethod
			theirs proportions.IntervalMethod
		}{{DesignEffectWald, proportions.Wald}, {ZouDonner, proportions.Newcombe}} {
			got, err := pair.ours.Interval(d, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			want, _ := pair.theirs.Interval(counts, 0.95)
			if got.RawLower > want.RawLower+1e-12 || got.RawUpper < want.RawUpper-1e-12 {
				t.Fatalf("%v: %s (%v, %v) inside %s (%v, %v)", d, got.Method, got.RawLower, got.RawUpper, want.Method, want.RawLower, want.RawUpper)
			}
		}
	}
}

// Every registered method returns numbers (never NaN) on random data,
// including groups whose rate is 0 or 1.
func TestMethodsNeverNaN(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 3000; i++ {
		d := randomData(t, r)
		for _, m := range IntervalMethods() {
			iv, err := m.Interval(d, 0.95)
			if err != nil || math.IsNaN(iv.RawLower) || math.IsNaN(iv.RawUpper) || iv.RawLower > iv.RawUpper {
				t.Fatalf("%v: %s gives %+v, %v", d, m.Key, iv, err)
			}
		}
		for _, m := range Tests() {
			for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
				res, err := m.Test(d, proportions.WithAlternative(alt))
				if err != nil || math.IsNaN(res.PValue) || math.IsNaN(res.Statistic) || res.PValue < 0 || res.PValue > 1 {
					t.Fatalf("%v: %s (%v) gives %+v, %v", d, m.Key, alt, res, err)
				}
			}
		}
	}
}

// The methods read only the summary and allocate nothing per call, so the
// simulation engine can call them for every simulated data set.
func TestIntervalsDoNotAllocate(t *testing.T) {
	d := randomData(t, rand.New(rand.NewPCG(5, 6)))
	s := Summarize(d)
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range IntervalMethods() {
		if a := testing.AllocsPerRun(100, func() { m.IntervalAt(s, conf) }); a != 0 {
			t.Errorf("%s allocates %v times per call", m.Key, a)
		}
	}
}

func TestTooFewClustersRefused(t *testing.T) {
	d := mustData(t, []Cluster{{"a", 3, 10}}, []Cluster{{"b", 1, 10}, {"c", 2, 10}})
	for _, m := range IntervalMethods() {
		if _, err := m.Interval(d, 0.95); !errorsIs(err, proportions.ErrTooFewClusters) {
			t.Errorf("%s with one cluster in a group: %v", m.Key, err)
		}
	}
	for _, m := range Tests() {
		if _, err := m.Test(d); !errorsIs(err, proportions.ErrTooFewClusters) {
			t.Errorf("%s with one cluster in a group: %v", m.Key, err)
		}
		d2 := mustData(t, []Cluster{{"a", 3, 10}, {"x", 3, 10}}, []Cluster{{"b", 1, 10}, {"c", 2, 10}})
		if _, err := m.Test(d2, proportions.WithNull(0.1)); !errorsIs(err, proportions.ErrUnsupported) {
			t.Errorf("%s with null 0.1: %v", m.Key, err)
		}
	}
}

func errorsIs(err, target error) bool { return errors.Is(err, target) }
