package strata

import (
	"errors"
	"math"
	"math/big"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// randomRows draws k strata of up to maxN units per group, each group with
// at least one unit, from a fixed seed.
func randomRows(r *rand.Rand, k int, maxN int64) [][4]int64 {
	rows := make([][4]int64, k)
	for i := range rows {
		n1, n2 := 1+r.Int64N(maxN), 1+r.Int64N(maxN)
		rows[i] = [4]int64{r.Int64N(n1 + 1), n1, r.Int64N(n2 + 1), n2}
	}
	return rows
}

func analyze(t *testing.T, rows [][4]int64, opts ...proportions.Option) Analysis {
	t.Helper()
	a, err := Analyze(breakdownOf(t, rows), opts...)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func close(a, b, rel float64) bool {
	if a == b || (math.IsNaN(a) && math.IsNaN(b)) {
		return true
	}
	return math.Abs(a-b) <= rel*math.Max(math.Abs(a), math.Abs(b))
}

// With one stratum every stratified method is its single-table
// counterpart: the score interval is Miettinen–Nurminen's, the
// Cochran–Mantel–Haenszel X² is Pearson's X² times (n − 1)/n exactly, the
// exact conditional test is Fisher's test and its interval Cornfield's,
// the Mantel–Haenszel difference is p1 − p2 with Wald's interval under
// both variances, the ratio is Katz's interval and the odds ratio Woolf's.
func TestOneStratumIsTheSingleTable(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for range 300 {
		row := randomRows(r, 1, 40)[0]
		c := proportions.Counts{X1: row[0], N1: row[1], X2: row[2], N2: row[3]}
		for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
			a := analyze(t, [][4]int64{row}, proportions.WithAlternative(alt), proportions.WithLevel(0.975))
			conf, _ := proportions.NewConfidence(a.Interval.Level)
			fisher, err := proportions.FisherTest.Test(c, proportions.WithAlternative(alt), proportions.WithLevel(0.975))
			if err != nil {
				t.Fatal(err)
			}
			if ex := findTest(t, a.Tests, ExactTestKey); !close(ex.PValue, fisher.PValue, 1e-9) {
				t.Errorf("%v %v: exact conditional p %v, Fisher %v", c, alt, ex.PValue, fisher.PValue)
			}
			if alt != proportions.TwoSided {
				continue
			}
			mn := proportions.MiettinenNurminen.IntervalAt(c, conf)
			if !close(a.Interval.Lower, mn.Lower, 1e-9) && math.Abs(a.Interval.Lower-mn.Lower) > 1e-11 ||
				!close(a.Interval.Upper, mn.Upper, 1e-9) && math.Abs(a.Interval.Upper-mn.Upper) > 1e-11 {
				t.Errorf("%v: stratified score %v to %v, Miettinen–Nurminen %v to %v", c, a.Interval.Lower, a.Interval.Upper, mn.Lower, mn.Upper)
			}
			if d := float64(c.X1)/float64(c.N1) - float64(c.X2)/float64(c.N2); math.Abs(a.Interval.Estimate-d) > 1e-14 {
				t.Errorf("%v: Mantel–Haenszel difference %v, want p1 − p2", c, a.Interval.Estimate)
			}
			pearson, err := proportions.PearsonChiSquareTest.Test(c)
			if err != nil {
				t.Fatal(err)
			}
			n := float64(c.N1 + c.N2)
			if want := pearson.Statistic * (n - 1) / n; !close(a.Test.Statistic, want, 1e-12) {
				t.Errorf("%v: CMH X² %v, want Pearson %v × (n−1)/n = %v", c, a.Test.Statistic, pearson.Statistic, want)
			}
			cf := proportions.CornfieldExact.IntervalAt(c, conf)
			or := findEstimate(t, a.Estimates, ExactOddsRatioKey)
			if !close(or.Lower, cf.Lower, 1e-8) || !close(or.Upper, cf.Upper, 1e-8) || !close(or.Estimate, cf.Estimate, 1e-8) {
				t.Errorf("%v: exact conditional %v (%v, %v), Cornfield %v (%v, %v)", c, or.Estimate, or.Lower, or.Upper, cf.Estimate, cf.Lower, cf.Upper)
			}
			wald := proportions.Wald.IntervalAt(c, conf)
			for _, key := range []string{SatoKey, GreenlandRobinsKey} {
				e := findEstimate(t, a.Estimates, key)
				if !close(e.Lower, wald.Lower, 1e-9) && math.Abs(e.Lower-wald.Lower) > 1e-12 ||
					!close(e.Upper, wald.Upper, 1e-9) && math.Abs(e.Upper-wald.Upper) > 1e-12 {
					t.Errorf("%v %s: %v to %v, Wald %v to %v", c, key, e.Lower, e.Upper, wald.Lower, wald.Upper)
				}
			}
			if c.X1 > 0 && c.X2 > 0 && c.X1 < c.N1 && c.X2 < c.N2 {
				katz, woolf := proportions.Katz.IntervalAt(c, conf), proportions.Woolf.IntervalAt(c, conf)
				rr, mor := findEstimate(t, a.Estimates, MHRatioKey), findEstimate(t, a.Estimates, MHOddsRatioKey)
				if !close(rr.Lower, katz.Lower, 1e-9) || !close(rr.Upper, katz.Upper, 1e-9) {
					t.Errorf("%v: Mantel–Haenszel ratio %v to %v, Katz %v to %v", c, rr.Lower, rr.Upper, katz.Lower, katz.Upper)
				}
				if !close(mor.Lower, woolf.Lower, 1e-9) || !close(mor.Upper, woolf.Upper, 1e-9) {
					t.Errorf("%v: Mantel–Haenszel odds ratio %v to %v, Woolf %v to %v", c, mor.Lower, mor.Upper, woolf.Lower, woolf.Upper)
				}
			}
		}
	}
}

// k copies of one table give that table's estimates, and homogeneity
// statistics of 0.
func TestIdenticalStrata(t *testing.T) {
	for _, row := range [][4]int64{{12, 30, 7, 25}, {3, 10, 8, 12}, {40, 41, 30, 45}} {
		rows := [][4]int64{row, row, row, row, row}
		a := analyze(t, rows)
		c := proportions.Counts{X1: row[0], N1: row[1], X2: row[2], N2: row[3]}
		for key, want := range map[string]float64{
			SatoKey: proportions.Difference.Estimate(c), MHRatioKey: proportions.Ratio.Estimate(c),
			MHOddsRatioKey: proportions.OddsRatio.Estimate(c), ScoreKey: proportions.Difference.Estimate(c),
		} {
			if e := findEstimate(t, a.Estimates, key); !close(e.Estimate, want, 1e-12) {
				t.Errorf("%v ×5 %s: %v, want the table's %v", row, key, e.Estimate, want)
			}
		}
		for _, h := range a.Homogeneity {
			if math.Abs(h.Statistic) > 1e-9 || h.DF != 4 {
				t.Errorf("%v ×5 %s: %v with %d df, want 0 with 4", row, h.Key, h.Statistic, h.DF)
			}
		}
	}
}

// The order of the strata changes no figure.
func TestOrderOfStrata(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	for range 40 {
		rows := randomRows(r, 2+r.IntN(6), 30)
		a := analyze(t, rows)
		shuffled := slices.Clone(rows)
		r.Shuffle(len(shuffled), func(i, j int) { shuffled[i], shuffled[j] = shuffled[j], shuffled[i] })
		slices.Reverse(shuffled)
		b := analyze(t, shuffled)
		for i := range a.Tests {
			if !close(a.Tests[i].PValue, b.Tests[i].PValue, 1e-9) || !close(a.Tests[i].Statistic, b.Tests[i].Statistic, 1e-9) {
				t.Errorf("%v: %s changes with the order: %v vs %v", rows, a.Tests[i].Key, a.Tests[i], b.Tests[i])
			}
		}
		for i := range a.Estimates {
			x, y := a.Estimates[i], b.Estimates[i]
			if !close(x.Estimate, y.Estimate, 1e-9) || !close(x.Lower, y.Lower, 1e-8) || !close(x.Upper, y.Upper, 1e-8) {
				t.Errorf("%v: %s changes with the order: %v vs %v", rows, x.Key, x, y)
			}
		}
		for i := range a.Homogeneity {
			if !close(a.Homogeneity[i].Statistic, b.Homogeneity[i].Statistic, 1e-8) {
				t.Errorf("%v: %s changes with the order", rows, a.Homogeneity[i].Key)
			}
		}
	}
}

// The headline pair agrees: the stratified score interval excludes 0
// exactly when the uncorrected Cochran–Mantel–Haenszel test rejects.
func TestHeadlineIntervalMatchesTest(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	checked := 0
	for range 400 {
		a := analyze(t, randomRows(r, 1+r.IntN(6), 25))
		if math.Abs(a.Test.PValue-0.05) < 1e-6 {
			continue
		}
		checked++
		if a.Test.Reject == a.Interval.Contains(0) {
			t.Errorf("CMH p = %v but the score interval is %v to %v", a.Test.PValue, a.Interval.Lower, a.Interval.Upper)
		}
	}
	if checked < 300 {
		t.Errorf("only %d breakdowns checked", checked)
	}
}

// bruteSum enumerates every set of tables with the strata's margins and
// returns, under ψ = 1, the exact probabilities (as big rationals) of
// each possible Σx1, from products of binomial coefficients.
func bruteSum(rows [][4]int64) map[int64]*big.Rat {
	dist := map[int64]*big.Rat{0: big.NewRat(1, 1)}
	for _, r := range rows {
		n1, n2, m := r[1], r[3], r[0]+r[2]
		total := new(big.Int).Binomial(n1+n2, m)
		next := map[int64]*big.Rat{}
		for s, p := range dist {
			for k := max(0, m-n2); k <= min(n1, m); k++ {
				w := new(big.Int).Mul(new(big.Int).Binomial(n1, k), new(big.Int).Binomial(n2, m-k))
				q := new(big.Rat).Mul(p, new(big.Rat).SetFrac(w, total))
				if old, ok := next[s+k]; ok {
					old.Add(old, q)
				} else {
					next[s+k] = q
				}
			}
		}
		dist = next
	}
	return dist
}

// bruteTails returns P(S ≥ s) and P(S ≤ s) under ψ by enumerating every
// combination of tables (not sums): the probability of a combination is
// the product of the strata's noncentral hypergeometric probabilities.
func bruteTails(rows [][4]int64, s int64, psi float64) (above, below float64) {
	type state struct {
		sum int64
		p   float64
	}
	states := []state{{0, 1}}
	for _, r := range rows {
		n1, n2, m := r[1], r[3], r[0]+r[2]
		var ks []int64
		var ws []float64
		tot := 0.0
		for k := max(0, m-n2); k <= min(n1, m); k++ {
			w := math.Exp(lchoose(n1, k) + lchoose(n2, m-k) + float64(k)*math.Log(psi))
			ks, ws, tot = append(ks, k), append(ws, w), tot+w
		}
		var next []state
		for _, st := range states {
			for i, k := range ks {
				next = append(next, state{st.sum + k, st.p * ws[i] / tot})
			}
		}
		states = next
	}
	for _, st := range states {
		if st.sum >= s {
			above += st.p
		}
		if st.sum <= s {
			below += st.p
		}
	}
	return above, below
}

func lchoose(n, k int64) float64 {
	a, _ := math.Lgamma(float64(n + 1))
	b, _ := math.Lgamma(float64(k + 1))
	c, _ := math.Lgamma(float64(n - k + 1))
	return a - b - c
}

// The exact conditional test against exact rational arithmetic over every
// possible sum, and its interval against the tails of a brute-force
// enumeration of every combination of tables at the reported limits.
func TestExactAgainstBruteForce(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for range 60 {
		rows := randomRows(r, 1+r.IntN(4), 9)
		a := analyze(t, rows)
		var s int64
		for _, row := range rows {
			s += row[0]
		}
		dist := bruteSum(rows)
		obs := dist[s]
		limit := new(big.Rat).Mul(obs, new(big.Rat).SetFloat64(1+proportions.FisherTieTolerance))
		two, greater, less := new(big.Rat), new(big.Rat), new(big.Rat)
		for v, p := range dist {
			if p.Cmp(limit) <= 0 {
				two.Add(two, p)
			}
			if v >= s {
				greater.Add(greater, p)
			}
			if v <= s {
				less.Add(less, p)
			}
		}
		want, _ := two.Float64()
		if got := findTest(t, a.Tests, ExactTestKey).PValue; !close(got, math.Min(1, want), 1e-10) {
			t.Errorf("%v: exact two-sided p %v, enumeration %v", rows, got, want)
		}
		for _, alt := range []proportions.Alternative{proportions.Greater, proportions.Less} {
			tail := greater
			if alt == proportions.Less {
				tail = less
			}
			want, _ := tail.Float64()
			got := findTest(t, analyze(t, rows, proportions.WithAlternative(alt)).Tests, ExactTestKey).PValue
			if !close(got, want, 1e-10) {
				t.Errorf("%v %v: exact p %v, enumeration %v", rows, alt, got, want)
			}
		}
		or := findEstimate(t, a.Estimates, ExactOddsRatioKey)
		if or.Lower > 0 {
			if above, _ := bruteTails(rows, s, or.Lower); math.Abs(above-0.025) > 1e-8 {
				t.Errorf("%v: P(S ≥ %d; ψL = %v) = %v by enumeration, want 0.025", rows, s, or.Lower, above)
			}
		}
		if !math.IsInf(or.Upper, 1) {
			if _, below := bruteTails(rows, s, or.Upper); math.Abs(below-0.025) > 1e-8 {
				t.Errorf("%v: P(S ≤ %d; ψU = %v) = %v by enumeration, want 0.025", rows, s, or.Upper, below)
			}
		}
	}
}

// Rows with an empty group are kept and flagged, change no stratified
// figure, and are named in a warning; the crude analysis counts them.
func TestEmptyRowsAreKeptAndLeftOut(t *testing.T) {
	rows := [][4]int64{{12, 30, 7, 25}, {3, 10, 8, 12}, {9, 20, 11, 22}}
	full := analyze(t, rows)
	b := breakdownOf(t, rows)
	b.Rows = append(b.Rows, proportions.BreakdownRow{Value: "lost", Counts: proportions.Counts{X1: 4, N1: 9}},
		proportions.BreakdownRow{Value: "other", Counts: proportions.Counts{X2: 2, N2: 5}})
	a, err := Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	if len(a.Strata) != 5 || a.Used() != 3 || a.Strata[3].Used || !math.IsNaN(a.Strata[3].Difference) || a.Strata[3].Weight != 0 {
		t.Errorf("strata %+v: want 5 listed, 3 used, the empty ones flagged", a.Strata)
	}
	for i := range full.Estimates {
		if full.Estimates[i] != a.Estimates[i] {
			t.Errorf("%s changes with empty rows: %v vs %v", full.Estimates[i].Key, full.Estimates[i], a.Estimates[i])
		}
	}
	if a.Crude.Comparison.First.Trials != 30+10+20+9 {
		t.Errorf("crude first group has %d trials, want every row's", a.Crude.Comparison.First.Trials)
	}
	if !hasWarning(a, WarnEmptyRows) {
		t.Errorf("no %s warning: %v", WarnEmptyRows, a.Warnings)
	}
}

func hasWarning(a Analysis, code string) bool {
	for _, w := range a.Warnings {
		if w.Code == code {
			return true
		}
	}
	return false
}

// A reversal after stratifying never passes silently; a crude answer
// outside the stratified interval is flagged; heterogeneous strata are
// flagged; a plain breakdown raises none of these.
func TestCrudeAndHomogeneityWarnings(t *testing.T) {
	confounded := [][4]int64{{19, 20, 70, 80}, {18, 20, 68, 80}, {19, 20, 67, 80}, {18, 20, 69, 80},
		{38, 80, 8, 20}, {36, 80, 8, 20}, {40, 80, 9, 20}, {35, 80, 7, 20}}
	a := analyze(t, confounded)
	if !(a.Crude.Difference < 0 && a.Interval.Estimate > 0) || !hasWarning(a, WarnReversal) {
		t.Errorf("confounded blocks: crude %v, stratified %v, warnings %v: want a reversal warning", a.Crude.Difference, a.Interval.Estimate, a.Warnings)
	}
	differs := analyze(t, [][4]int64{{85, 100, 16, 20}, {5, 20, 20, 100}})
	if !hasWarning(differs, WarnCrudeDiffers) || hasWarning(differs, WarnReversal) {
		t.Errorf("crude %v vs stratified %v to %v: no warning", differs.Crude.Difference, differs.Interval.Lower, differs.Interval.Upper)
	}
	het := analyze(t, [][4]int64{{30, 50, 10, 50}, {10, 50, 30, 50}})
	if !hasWarning(het, WarnNotHomogeneous) {
		t.Errorf("opposite effects: no %s warning: %v", WarnNotHomogeneous, het.Homogeneity)
	}
	plain := analyze(t, [][4]int64{{30, 50, 20, 50}, {28, 50, 19, 50}, {31, 50, 21, 50}})
	for _, code := range []string{WarnReversal, WarnCrudeDiffers, WarnNotHomogeneous, WarnEmptyRows} {
		if hasWarning(plain, code) {
			t.Errorf("balanced, homogeneous breakdown warns %s", code)
		}
	}
}

func TestBadInput(t *testing.T) {
	b := breakdownOf(t, [][4]int64{{3, 10, 4, 10}})
	if _, err := Analyze(b, proportions.WithNull(0.1)); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("null 0.1: %v, want ErrUnsupported", err)
	}
	if _, err := Analyze(b, proportions.WithLevel(1.5)); !errors.Is(err, proportions.ErrLevel) {
		t.Errorf("level 1.5: %v, want ErrLevel", err)
	}
	if _, err := Analyze(proportions.Breakdown{By: "block"}); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("no rows: %v, want ErrEmptyInput", err)
	}
	empty, err := proportions.NewBreakdown("block", proportions.Labels{}, []proportions.BreakdownRow{
		{Value: "a", Counts: proportions.Counts{X1: 1, N1: 4}}, {Value: "b", Counts: proportions.Counts{X1: 2, N1: 5}}})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := Analyze(empty); !errors.Is(err, proportions.ErrNoTrials) {
		t.Errorf("no row with both groups: %v, want ErrNoTrials", err)
	}
}

// With a few large strata sharing one difference, Sato's variance and
// Greenland and Robins' both estimate the variance of the Mantel–Haenszel
// difference consistently (Sato 1989; Sato's is derived under a common
// difference), so their intervals must agree closely; a wrong term in
// either formula would show as a gap of the order of the term.
func TestSatoMatchesGreenlandRobinsInLargeStrata(t *testing.T) {
	r := rand.New(rand.NewPCG(9, 10))
	for range 50 {
		delta := float64(r.IntN(5)) / 10 // 0 to 0.4, common to every stratum
		rows := make([][4]int64, 2+r.IntN(4))
		for i := range rows {
			n1, n2 := 100*int64(20+r.IntN(80)), 100*int64(20+r.IntN(80))
			p2 := float64(1+r.IntN(5)) / 10 // 0.1 to 0.5
			rows[i] = [4]int64{int64(math.Round((p2 + delta) * float64(n1))), n1, int64(math.Round(p2 * float64(n2))), n2}
		}
		ts := usable(breakdownOf(t, rows)) // the two estimates alone: the exact methods would be slow here
		conf, _ := proportions.NewConfidence(0.95)
		s, g := satoDifference(ts, conf), greenlandRobinsDifference(ts, conf)
		ws, wg := s.Upper-s.Lower, g.Upper-g.Lower
		if math.Abs(ws-wg) > 0.01*wg {
			t.Errorf("%v: Sato width %v, Greenland–Robins %v: more than 1%% apart", rows, ws, wg)
		}
	}
}

// A one-sided alternative: the interval at 1 − 2α excludes 0 on the
// alternative's side exactly when the one-sided Cochran–Mantel–Haenszel
// test rejects.
func TestOneSidedHeadline(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	for range 200 {
		rows := randomRows(r, 1+r.IntN(5), 25)
		for _, alt := range []proportions.Alternative{proportions.Greater, proportions.Less} {
			a := analyze(t, rows, proportions.WithAlternative(alt), proportions.WithLevel(0.975))
			if math.Abs(a.Test.PValue-0.025) < 1e-6 {
				continue
			}
			excludes := a.Interval.Lower > 0
			if alt == proportions.Less {
				excludes = a.Interval.Upper < 0
			}
			if excludes != a.Test.Reject || a.Interval.Level != 0.95 {
				t.Errorf("%v %v: p %v, interval %v to %v at %v", rows, alt, a.Test.PValue, a.Interval.Lower, a.Interval.Upper, a.Interval.Level)
			}
		}
	}
}

// Extreme breakdowns (no events anywhere, only events, one unit per
// group, zero cells) never give a NaN where a number is due: the headline
// limits, every p-value and every test statistic.
func TestExtremeBreakdownsGiveNumbers(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 14))
	cases := [][][4]int64{
		{{0, 5, 0, 7}, {0, 3, 0, 2}}, {{5, 5, 7, 7}, {3, 3, 2, 2}}, {{1, 1, 0, 1}}, {{0, 1, 1, 1}, {1, 1, 0, 1}},
		{{0, 10, 4, 10}, {0, 8, 3, 9}}, {{10, 10, 4, 10}, {8, 8, 3, 9}}, {{0, 1, 0, 1}},
	}
	for range 200 {
		rows := randomRows(r, 1+r.IntN(4), 3)
		cases = append(cases, rows)
	}
	for _, rows := range cases {
		for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
			a := analyze(t, rows, proportions.WithAlternative(alt), proportions.WithLevel(0.975))
			if math.IsNaN(a.Interval.Lower) || math.IsNaN(a.Interval.Upper) || math.IsNaN(a.Interval.Estimate) || a.Interval.Lower > a.Interval.Upper {
				t.Errorf("%v %v: headline %v", rows, alt, a.Interval)
			}
			for _, x := range append(slices.Clone(a.Tests), a.Homogeneity...) {
				if !(x.PValue >= 0 && x.PValue <= 1) || math.IsNaN(x.Statistic) || math.IsNaN(x.LogPValue) {
					t.Errorf("%v %v: %s p %v, statistic %v", rows, alt, x.Key, x.PValue, x.Statistic)
				}
			}
			for _, e := range a.Estimates {
				if e.Scale == proportions.Difference && (math.IsNaN(e.Lower) || math.IsNaN(e.Upper)) {
					t.Errorf("%v %v: %s limits %v, %v", rows, alt, e.Key, e.Lower, e.Upper)
				}
			}
		}
	}
}

// TestBreakdownFilledInByHandIsChecked checks that Analyze refuses the rows
// NewBreakdown refuses when a Breakdown is filled in directly: negative
// counts, more events than trials, and events without trials were analysed
// as they stood and gave wrong answers silently.
func TestBreakdownFilledInByHandIsChecked(t *testing.T) {
	good := proportions.BreakdownRow{Value: "b", Counts: proportions.Counts{X1: 3, N1: 5, X2: 2, N2: 5}}
	for _, tc := range []struct {
		name string
		bad  proportions.BreakdownRow
		want error
	}{
		{"negative events", proportions.BreakdownRow{Value: "a", Counts: proportions.Counts{X1: -1, N1: 5, X2: 2, N2: 5}}, proportions.ErrNegativeCount},
		{"events above trials", proportions.BreakdownRow{Value: "a", Counts: proportions.Counts{X1: 7, N1: 5, X2: 2, N2: 5}}, proportions.ErrEventsExceedTrials},
		{"events without trials", proportions.BreakdownRow{Value: "a", Counts: proportions.Counts{X1: 2, N1: 0, X2: 1, N2: 5}}, proportions.ErrNoTrials},
		{"a value twice", proportions.BreakdownRow{Value: "b", Counts: proportions.Counts{X1: 1, N1: 5, X2: 2, N2: 5}}, proportions.ErrDuplicateValue},
	} {
		b := proportions.Breakdown{By: "block", First: "x", Second: "y", Event: "e", Rows: []proportions.BreakdownRow{tc.bad, good}}
		if _, err := Analyze(b); !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want one wrapping %v", tc.name, err, tc.want)
		}
	}
}
