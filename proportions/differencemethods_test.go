package proportions

import (
	"math"
	"strings"
	"testing"
)

// Newcombe RG (1998b), Statistics in Medicine 17:873–890, Table II: the 95%
// intervals of methods 1 (Wald), 2 (Wald CC), 3 (Haldane), 4 (Jeffreys–
// Perks), 5 (Mee), 6 (Miettinen–Nurminen), 7 (profile likelihood), 8 and 9
// (profile-likelihood tail areas, "exact" and mid-p), 10 (hybrid score)
// and 11 (hybrid score CC) for examples (a), (b), (d)–(g). Limits with
// status memory-recomputed are hard checks at the printed 4 decimals on the
// raw (unclipped) limits, as Newcombe prints them (value recalled from the
// paper, confirmed by recomputation; example (b) method 9 has that status
// for its lower limit only); every entry's *_full values, independent
// recomputations, are cross-implementation checks at 1e−6.
func TestDifferenceMethodsNewcombeTableII(t *testing.T) {
	methods := map[string]IntervalMethod{"1": Wald, "2": WaldCC, "3": Haldane, "4": JeffreysPerks, "5": Mee, "6": MiettinenNurminen,
		"7": ProfileLikelihood, "8": ProfileExactTails, "9": ProfileMidPTails, "10": Newcombe, "11": NewcombeCC}
	conf, err := NewConfidence(0.95)
	if err != nil {
		t.Fatal(err)
	}
	checked, hard := 0, 0
	for _, r := range loadReference(t, "newcombe1998.json") {
		m, ok := methods[r.methodNumber()]
		if !ok || !strings.HasPrefix(r.ID, "N98D-") {
			continue
		}
		c := r.counts(t)
		iv := m.IntervalAt(c, conf)
		if r.hardLower() {
			hard++
			if math.Abs(iv.RawLower-r.Lower) > printedTolerance(r.Lower, iv.RawLower) {
				t.Errorf("%s %s %v: lower %.6f, Newcombe (1998b) Table II prints %.4f", r.ID, m.Name, c, iv.RawLower, r.Lower)
			}
		}
		if r.hardUpper() {
			hard++
			if math.Abs(iv.RawUpper-r.Upper) > printedTolerance(r.Upper, iv.RawUpper) {
				t.Errorf("%s %s %v: upper %.6f, Newcombe (1998b) Table II prints %.4f", r.ID, m.Name, c, iv.RawUpper, r.Upper)
			}
		}
		if math.Abs(iv.RawLower-r.LowerFull) > 1e-6 || math.Abs(iv.RawUpper-r.UpperFull) > 1e-6 {
			t.Errorf("%s %s %v: (%.8f, %.8f), recomputation (%.8f, %.8f)", r.ID, m.Name, c, iv.RawLower, iv.RawUpper, r.LowerFull, r.UpperFull)
		}
		checked++
	}
	// 66 entries; 26 of them (and the lower limit of one more) memory-recomputed.
	if checked != 66 || hard != 53 {
		t.Errorf("checked %d Table II entries (%d hard limits), want 66 (53 hard limits)", checked, hard)
	}
}

// The limit rule (interval.go): raw limits as the formula gives them,
// reported limits clipped to [−1, 1]. Newcombe (1998b) Table II example (b)
// method 2 prints the overshooting upper limit 1.0395.
func TestDifferenceLimitRule(t *testing.T) {
	iv, err := WaldCC.Interval(Counts{X1: 9, N1: 10, X2: 3, N2: 10}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(iv.RawUpper-1.0395) > 5e-5 || iv.Upper != 1 || !iv.Clipped || iv.Lower != iv.RawLower {
		t.Errorf("Wald CC 9/10 vs 3/10: %+v; want raw upper 1.0395 reported as 1, clipped", iv)
	}
	iv, _ = Mee.Interval(Counts{X1: 10, N1: 10, X2: 0, N2: 20}, 0.95)
	if iv.RawUpper != 1 || iv.Upper != 1 || iv.Clipped {
		t.Errorf("Mee 10/10 vs 0/20: %+v; want upper exactly 1, not clipped", iv)
	}
}

// Agresti & Caffo (2000) define their interval as the Wald interval on the
// counts with one event and one non-event added to each group; checked
// against a direct evaluation of that formula.
func TestAgrestiCaffoDefinition(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range []Counts{{56, 70, 48, 80}, {0, 10, 0, 20}, {10, 10, 0, 20}, {1, 1, 0, 1}} {
		q1 := float64(c.X1+1) / float64(c.N1+2)
		q2 := float64(c.X2+1) / float64(c.N2+2)
		se := math.Sqrt(q1*(1-q1)/float64(c.N1+2) + q2*(1-q2)/float64(c.N2+2))
		lo, hi := AgrestiCaffo.Limits(c, conf)
		if !nearly(lo, q1-q2-conf.Z*se, 1e-14) || !nearly(hi, q1-q2+conf.Z*se, 1e-14) {
			t.Errorf("Agresti–Caffo %v: (%v, %v), formula (%v, %v)", c, lo, hi, q1-q2-conf.Z*se, q1-q2+conf.Z*se)
		}
	}
}

// Mee's and Miettinen–Nurminen's limits solve their score equations
// |p1 − p2 − δ| = z·√(k·V(δ)), with V from a brute-force maximisation of the
// restricted likelihood (independent of the closed-form cubic).
func TestScoreLimitsSolveScoreEquation(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	for _, c := range []Counts{{56, 70, 48, 80}, {9, 10, 3, 10}, {5, 56, 0, 29}, {0, 10, 0, 20}, {10, 10, 0, 20}, {2, 3, 1, 4}} {
		for _, m := range []struct {
			iv IntervalMethod
			k  float64
		}{{Mee, 1}, {MiettinenNurminen, mnVarianceFactor(c)}} {
			lo, hi := m.iv.Limits(c, conf)
			for _, delta := range []float64{lo, hi} {
				if delta <= -1 || delta >= 1 {
					continue
				}
				p1, p2 := bruteRestrictedMLE(c, delta)
				v := p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2)
				gap := math.Abs(c.P1()-c.P2()-delta) - conf.Z*math.Sqrt(m.k*v)
				if math.Abs(gap) > 1e-6 {
					t.Errorf("%s %v: limit %.8f misses the score equation by %.3g", m.iv.Name, c, delta, gap)
				}
			}
		}
	}
}

// Properties every difference method must have, over all tables with
// n1, n2 ≤ 12 (including 0/n and n/n) and a few large ones: no NaN, lower ≤
// upper, swapping the groups negates the interval, and the reported limits
// lie in [−1, 1] (a costly method, with a TrialLimit, on the tables
// within its limit). Score and hybrid intervals must contain p1 − p2 and widen
// with the level.
func TestDifferenceMethodsProperties(t *testing.T) {
	levels := []float64{0.5, 0.9, 0.95, 0.99, 0.999}
	confs := make([]Confidence, len(levels))
	for i, l := range levels {
		confs[i], _ = NewConfidence(l)
	}
	containing := map[string]bool{"newcombe": true, "newcombe-cc": true, "mee": true, "miettinen-nurminen": true, "profile-likelihood": true}
	for _, c := range propertyTables() {
		for _, m := range EnumerableIntervalMethods(Difference) {
			if m.TrialLimit > 0 && c.N1+c.N2 > m.TrialLimit {
				continue // a costly method is promised up to its limit
			}
			prevLo, prevHi := math.Inf(1), math.Inf(-1)
			for _, conf := range confs {
				lo, hi := m.Limits(c, conf)
				if math.IsNaN(lo) || math.IsNaN(hi) || lo > hi {
					t.Fatalf("%s %v at %v: (%v, %v)", m.Name, c, conf.Level, lo, hi)
				}
				slo, shi := m.Limits(c.Swapped(), conf)
				if math.Abs(slo+hi) > 1e-12 || math.Abs(shi+lo) > 1e-12 {
					t.Errorf("%s %v: (%v, %v) but swapped (%v, %v)", m.Name, c, lo, hi, slo, shi)
				}
				iv := m.IntervalAt(c, conf)
				if iv.Lower < -1 || iv.Upper > 1 {
					t.Errorf("%s %v: reported (%v, %v) outside [−1, 1]", m.Name, c, iv.Lower, iv.Upper)
				}
				if !containing[m.Key] {
					continue
				}
				d := c.P1() - c.P2()
				if lo > d || hi < d || lo < -1 || hi > 1 {
					t.Errorf("%s %v at %v: (%v, %v) does not contain %v inside [−1, 1]", m.Name, c, conf.Level, lo, hi, d)
				}
				if lo > prevLo+1e-12 || hi < prevHi-1e-12 {
					t.Errorf("%s %v: level %v gives (%v, %v), narrower than the lower level's (%v, %v)", m.Name, c, conf.Level, lo, hi, prevLo, prevHi)
				}
				prevLo, prevHi = lo, hi
			}
		}
	}
}

// propertyTables lists every table with 1 ≤ n1, n2 ≤ 12 and some large or
// very unequal designs.
func propertyTables() []Counts {
	var cs []Counts
	for n1 := int64(1); n1 <= 12; n1++ {
		for n2 := int64(1); n2 <= 12; n2++ {
			for x1 := int64(0); x1 <= n1; x1++ {
				for x2 := int64(0); x2 <= n2; x2++ {
					cs = append(cs, Counts{x1, n1, x2, n2})
				}
			}
		}
	}
	big := []Counts{
		{0, 1000000, 0, 1000000}, {1, 1000000, 0, 3}, {500, 1000, 499, 1000}, {999999, 1000000, 1, 1000000},
		{0, 1 << 40, 1 << 40, 1 << 40}, {7, 1 << 45, 3, 1 << 44}, {1, 2, 300, 301}, {0, 500, 1, 2},
	}
	return append(cs, big...)
}

// bruteRestrictedMLE maximises the log-likelihood under π1 − π2 = δ by a
// grid search refined with golden sections; it shares no code with
// RestrictedMLE.
func bruteRestrictedMLE(c Counts, delta float64) (p1, p2 float64) {
	ll := func(q1 float64) float64 {
		q2 := q1 - delta
		return xlogy(c.X1, q1) + xlogy(c.N1-c.X1, 1-q1) + xlogy(c.X2, q2) + xlogy(c.N2-c.X2, 1-q2)
	}
	lo, hi := math.Max(0, delta), math.Min(1, 1+delta)
	const grid = 2000
	best, bi := math.Inf(-1), 0
	for i := 0; i <= grid; i++ {
		if v := ll(lo + (hi-lo)*float64(i)/grid); v > best {
			best, bi = v, i
		}
	}
	a := lo + (hi-lo)*float64(max(bi-1, 0))/grid
	b := lo + (hi-lo)*float64(min(bi+1, grid))/grid
	g := (math.Sqrt(5) - 1) / 2
	for range 200 {
		m1, m2 := b-g*(b-a), a+g*(b-a)
		if ll(m1) < ll(m2) {
			a = m1
		} else {
			b = m2
		}
	}
	p1 = (a + b) / 2
	if ll(lo) >= ll(p1) {
		p1 = lo
	}
	if ll(hi) >= ll(p1) {
		p1 = hi
	}
	return p1, p1 - delta
}

func xlogy(x int64, y float64) float64 {
	if x == 0 {
		return 0
	}
	return float64(x) * math.Log(y)
}

// The score limits' Newton search against plain bisection of
// |z(δ)| = z on the same statistic (FarringtonManningZ,
// MiettinenNurminenZ) carried to adjacent floats, over small, unequal,
// zero-cell and very large tables: the search must land within 1e−9 of the
// interval's width.
func TestScoreLimitsMatchBisection(t *testing.T) {
	conf, _ := NewConfidence(0.95)
	tables := []Counts{{56, 70, 48, 80}, {0, 10, 0, 20}, {10, 10, 0, 20}, {1, 2, 1, 2}, {3, 888129607140, 0, 1},
		{4, 103015417419, 4, 1436010050}, {7, 1 << 45, 3, 1 << 44}, {999997, 1000000, 999999, 1000000}, {0, 3, 3, 3}, {1, 1, 0, 1}}
	for _, c := range tables {
		for _, m := range scorePairs {
			lo, hi := m.iv.Limits(c, conf)
			wantLo, wantHi := bisectedScoreLimits(c, m.z, conf)
			tol := 1e-9 * (wantHi - wantLo)
			if math.Abs(lo-wantLo) > tol || math.Abs(hi-wantHi) > tol {
				t.Errorf("%s %v: (%.17g, %.17g), bisection (%.17g, %.17g)", m.iv.Name, c, lo, hi, wantLo, wantHi)
			}
		}
	}
}

// bisectScore returns the point in [a, b] where above switches from true
// to false, to the last bit.
func bisectScore(above func(float64) bool, a, b float64) float64 {
	return bisectScoreTo(above, a, b, 0)
}

// bisectScoreTo is bisectScore stopped once the bracket is no wider than
// width (the midpoint of the last bracket is returned).
func bisectScoreTo(above func(float64) bool, a, b, width float64) float64 {
	for {
		m := a + (b-a)/2
		if m == a || m == b || b-a <= width {
			return m
		}
		if above(m) {
			a = m
		} else {
			b = m
		}
	}
}
