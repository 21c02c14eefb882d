package proportions

import (
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

func mustComparison(t *testing.T, x1, n1, x2, n2 int64) Comparison {
	t.Helper()
	c, err := NewComparison(x1, n1, x2, n2, Labels{First: "coated", Second: "bare", Event: "germinated"})
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func TestAnalyzeHeadlinePair(t *testing.T) {
	// Newcombe (1998b) Table II example (a): 56/70 vs 48/80.
	a, err := Analyze(mustComparison(t, 56, 70, 48, 80))
	if err != nil {
		t.Fatal(err)
	}
	if a.Interval.Method != HeadlineIntervalKey || a.Test.Method != HeadlineTestKey {
		t.Fatalf("headline pair %q/%q", a.Interval.Method, a.Test.Method)
	}
	// Mee's interval, Newcombe (1998b) Table II method 5: 0.0533 to 0.3377
	// (value recalled from the paper, confirmed by recomputation).
	if math.Abs(a.Interval.Lower-0.0533) > 5e-5 || math.Abs(a.Interval.Upper-0.3377) > 5e-5 {
		t.Errorf("headline interval %v to %v, want 0.0533 to 0.3377", a.Interval.Lower, a.Interval.Upper)
	}
	if !a.Test.Reject || a.Interval.Contains(0) {
		t.Errorf("test and interval should both exclude 0: %+v / %+v", a.Test, a.Interval)
	}
	// At δ = 0 the score statistic squared is Pearson's chi-square
	// (SciPy 1.10.1 chi2_contingency without correction: 7.02341137124).
	var chi TestResult
	for _, r := range a.Tests {
		if r.Method == "pearson-chi-square-test" {
			chi = r
		}
	}
	if math.Abs(chi.Statistic-7.02341137124) > 1e-9 || math.Abs(a.Test.Statistic*a.Test.Statistic-chi.Statistic) > 1e-9 {
		t.Errorf("z² = %v, X² = %v", a.Test.Statistic*a.Test.Statistic, chi.Statistic)
	}
	if len(a.DifferenceIntervals) != len(IntervalMethods(Difference, ScopeQuick)) || a.Scope != ScopeQuick {
		t.Errorf("%d difference intervals for %d quick methods (scope %v)", len(a.DifferenceIntervals), len(IntervalMethods(Difference, ScopeQuick)), a.Scope)
	}
	if len(a.Groups[0].Intervals) == 0 || a.Groups[0].Intervals[0].Method != "wilson-rate" {
		t.Errorf("group intervals should start with Wilson: %+v", a.Groups[0].Intervals)
	}
	if !strings.Contains(a.Conclusion, "higher for coated") || !strings.Contains(a.Conclusion, "rejects") {
		t.Errorf("conclusion: %s", a.Conclusion)
	}
	if a.Caution == "" || !strings.Contains(a.String(), "Caution:") {
		t.Error("caution missing")
	}
}

func countSkipped(a Analysis) int {
	n := 0
	for _, w := range a.Warnings {
		if w.Code == WarnSkipped {
			n++
		}
	}
	return n
}

// The headline interval excludes the null exactly when the headline test
// rejects, for two-sided and one-sided hypotheses and any margin.
func TestAnalyzeAgreement(t *testing.T) {
	tables := []Counts{{0, 10, 0, 10}, {10, 10, 0, 12}, {3, 15, 9, 14}, {56, 70, 48, 80}, {1, 40, 6, 35}, {20, 20, 19, 20}, {7, 200, 15, 200}}
	nulls := []float64{0, -0.1, 0.1, -0.3, 0.25}
	for _, c := range tables {
		cmp := mustComparison(t, c.X1, c.N1, c.X2, c.N2)
		for _, null := range nulls {
			for _, alt := range []Alternative{TwoSided, Greater, Less} {
				for _, level := range []float64{0.9, 0.95, 0.99} {
					a, err := Analyze(cmp, WithLevel(level), WithNull(null), WithAlternative(alt), WithScope(ScopeLargeSample))
					if err != nil {
						t.Fatal(err)
					}
					excluded := map[Alternative]bool{
						TwoSided: !a.Interval.Contains(null),
						Greater:  a.Interval.Lower > null,
						Less:     a.Interval.Upper < null,
					}[alt]
					if excluded != a.Test.Reject && math.Abs(a.Test.PValue-(1-level)) > 1e-6 {
						t.Errorf("%+v null %v %v level %v: interval %v..%v excludes=%v, test p=%v reject=%v",
							c, null, alt, level, a.Interval.Lower, a.Interval.Upper, excluded, a.Test.PValue, a.Test.Reject)
					}
				}
			}
		}
	}
}

func TestAnalyzeOneSidedLevel(t *testing.T) {
	// Non-inferiority at one-sided 2.5% reports the 95% two-sided interval.
	a, err := Analyze(mustComparison(t, 90, 100, 92, 100), WithLevel(0.975), WithNull(-0.1), WithAlternative(Greater))
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(a.Interval.Level-0.95) > 1e-12 {
		t.Errorf("interval level %v, want 0.95", a.Interval.Level)
	}
	if !strings.Contains(a.Conclusion, "non-inferiority") {
		t.Errorf("conclusion should read the margin test: %s", a.Conclusion)
	}
	if _, err := Analyze(mustComparison(t, 9, 10, 9, 10), WithLevel(0.4), WithAlternative(Less)); !errors.Is(err, ErrLevel) {
		t.Errorf("one-sided with level 0.4: %v", err)
	}
}

func TestAnalyzeNonRejectionWording(t *testing.T) {
	a, err := Analyze(mustComparison(t, 12, 20, 10, 20))
	if err != nil {
		t.Fatal(err)
	}
	if a.Test.Reject {
		t.Fatal("12/20 vs 10/20 should not reject")
	}
	for _, bad := range []string{"no difference", "are equal.", "the same"} {
		if strings.Contains(a.Conclusion, bad) {
			t.Errorf("conclusion reads non-rejection as equality (%q): %s", bad, a.Conclusion)
		}
	}
	if !strings.Contains(a.Conclusion, "does not show that the rates are equal") {
		t.Errorf("conclusion: %s", a.Conclusion)
	}
}

func TestAnalyzeWarnings(t *testing.T) {
	a, err := Analyze(mustComparison(t, 0, 8, 3, 9))
	if err != nil {
		t.Fatal(err)
	}
	codes := []string{}
	for _, w := range a.Warnings {
		codes = append(codes, w.Code)
	}
	for _, want := range []string{WarnSmallExpected, WarnZeroCell} {
		if !slices.Contains(codes, want) {
			t.Errorf("missing warning %q in %v", want, codes)
		}
	}
	b, _ := Analyze(mustComparison(t, 56, 70, 48, 80))
	for _, w := range b.Warnings {
		if w.Code == WarnSmallExpected || w.Code == WarnZeroCell {
			t.Errorf("unexpected warning %+v", w)
		}
	}
}

func TestAnalyzeContinuityOptIn(t *testing.T) {
	c := mustComparison(t, 56, 70, 48, 80)
	has := func(a Analysis, key string) bool {
		return slices.ContainsFunc(a.Tests, func(r TestResult) bool { return r.Method == key })
	}
	off, _ := Analyze(c)
	on, _ := Analyze(c, WithYatesTest(true))
	if has(off, "yates-test") || !has(on, "yates-test") {
		t.Errorf("Yates' test should be opt-in: off=%v on=%v", has(off, "yates-test"), has(on, "yates-test"))
	}
	// Tests defined only at δ = 0 drop out under a margin.
	m, _ := Analyze(c, WithNull(-0.1))
	if has(m, "pearson-chi-square-test") {
		t.Error("chi-square has no margin form")
	}
}

func TestAnalyzeErrors(t *testing.T) {
	c := mustComparison(t, 5, 10, 6, 10)
	cases := []struct {
		opts []Option
		want error
	}{
		{[]Option{WithLevel(1)}, ErrLevel},
		{[]Option{WithLevel(math.NaN())}, ErrLevel},
		{[]Option{WithNull(1)}, ErrNull},
		{[]Option{WithNull(-1.5)}, ErrNull},
		{[]Option{WithAlternative(Alternative(7))}, ErrAlternative},
	}
	for _, tc := range cases {
		if _, err := Analyze(c, tc.opts...); !errors.Is(err, tc.want) {
			t.Errorf("got %v, want %v", err, tc.want)
		}
	}
	if _, err := Analyze(Comparison{First: Group{"a", 3, 2}, Second: Group{"b", 1, 2}}); !errors.Is(err, ErrEventsExceedTrials) {
		t.Errorf("invalid comparison: %v", err)
	}
}

// The JSON field names are a documented, stable interface.
func TestAnalysisJSONFields(t *testing.T) {
	a, err := Analyze(mustComparison(t, 3, 12, 0, 10))
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(a)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"comparison", "level", "null", "alternative", "groups", "difference", "interval", "test", "tests", "difference_intervals", "ratio_intervals", "odds_ratio_intervals", "conclusion", "warnings", "caution", "scope"} {
		if _, ok := m[k]; !ok {
			t.Errorf("JSON lacks %q", k)
		}
	}
	if m["alternative"] != "two-sided" {
		t.Errorf("alternative = %v", m["alternative"])
	}
	// A zero cell gives an infinite odds-ratio limit: it must be a string, not invalid JSON.
	var back Analysis
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatalf("round trip: %v", err)
	}
	if m["scope"] != "quick" || back.Scope != ScopeQuick {
		t.Errorf("scope %v, round trip %v", m["scope"], back.Scope)
	}
	if back.Interval != a.Interval {
		t.Errorf("interval round trip: %+v vs %+v", back.Interval, a.Interval)
	}
}

// The scope decides which registered methods run: quick (the default)
// leaves out exactly the costly ones (a TrialLimit), all runs them up to
// their limit with a warning above it, large-sample leaves out every exact
// method too.
func TestAnalyzeMethodScopes(t *testing.T) {
	ran := func(a Analysis) map[string]bool {
		keys := map[string]bool{}
		for _, l := range [][]Interval{a.DifferenceIntervals, a.RatioIntervals, a.OddsRatioIntervals} {
			for _, iv := range l {
				keys[iv.Method] = true
			}
		}
		for _, r := range a.Tests {
			keys[r.Method] = true
		}
		for _, iv := range a.Groups[0].Intervals {
			keys[iv.Method] = true
		}
		return keys
	}
	type mark struct {
		key       string
		exact     bool
		sizeLimit int64
	}
	var marks []mark
	for _, m := range TwoGroupIntervalMethods(ScopeAll) {
		marks = append(marks, mark{m.Key, m.Exact, m.TrialLimit})
	}
	for _, m := range Tests() {
		if m.Scale == Difference && !m.ContinuityCorrected {
			marks = append(marks, mark{m.Key, m.Exact, m.TrialLimit})
		}
	}
	// Single-rate methods are left out for their cost only (never for
	// being exact): the mark says "not exact" for the scopes' rules.
	for _, m := range RateMethods() {
		marks = append(marks, mark{m.Key, false, m.TrialLimit})
	}
	small := mustComparison(t, 3, 12, 8, 11)
	for _, tc := range []struct {
		scope MethodScope
		want  func(m mark) bool
	}{
		{ScopeQuick, func(m mark) bool { return m.sizeLimit == 0 }},
		{ScopeAll, func(m mark) bool { return true }},
		{ScopeLargeSample, func(m mark) bool { return m.sizeLimit == 0 && !m.exact }},
	} {
		a, err := Analyze(small, WithScope(tc.scope))
		if err != nil {
			t.Fatal(err)
		}
		got := ran(a)
		left := 0
		for _, m := range marks {
			if got[m.key] != tc.want(m) {
				t.Errorf("scope %v: %s ran = %v, want %v", tc.scope, m.key, got[m.key], tc.want(m))
			}
			if !tc.want(m) {
				left++
				if !slices.Contains(a.Omitted, m.key) {
					t.Errorf("scope %v: %s left out but not listed in Omitted %v", tc.scope, m.key, a.Omitted)
				}
			}
		}
		if len(a.Omitted) != left {
			t.Errorf("scope %v: Omitted %v, want %d keys", tc.scope, a.Omitted, left)
		}
		if a.Scope != tc.scope || countSkipped(a) != 0 {
			t.Errorf("scope %v: recorded %v, %d skipped", tc.scope, a.Scope, countSkipped(a))
		}
	}
	// The named slow members are costly, and the sparse-table warning says
	// how to add them only when they were left out.
	sparse := mustComparison(t, 1, 12, 5, 11) // smallest expected count 2.9
	quick, _ := Analyze(sparse)
	all, _ := Analyze(sparse, WithScope(ScopeAll))
	if ran(quick)["chan-zhang"] || !ran(all)["chan-zhang"] || !ran(all)["agresti-min"] || !ran(quick)["fisher-test"] {
		t.Error("quick runs Fisher but not the exact unconditional intervals; all runs both")
	}
	advice := func(a Analysis) bool {
		return slices.ContainsFunc(a.Warnings, func(w Warning) bool {
			return w.Code == WarnSmallExpected && strings.Contains(w.Message, "every method")
		})
	}
	if !advice(quick) || advice(all) {
		t.Errorf("advice to add the exact methods: quick %v, all %v", advice(quick), advice(all))
	}
	big, _ := Analyze(mustComparison(t, 300, 1000, 280, 1000), WithScope(ScopeAll))
	if ran(big)["chan-zhang"] || countSkipped(big) == 0 {
		t.Errorf("above the size limit the slow intervals are skipped with a warning: %v", big.Warnings)
	}
	if _, err := Analyze(small, WithScope(MethodScope(7))); !errors.Is(err, ErrScope) {
		t.Errorf("unknown scope: %v, want ErrScope", err)
	}
}

// TestAnalysisListsAreSeparate checks that the interval lists of an
// analysis, which share one allocation, behave as separate slices: a
// caller appending to one list never changes another.
func TestAnalysisListsAreSeparate(t *testing.T) {
	c, err := NewComparison(12, 40, 5, 38, Labels{})
	if err != nil {
		t.Fatal(err)
	}
	a, err := Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	lists := []*[]Interval{&a.Groups[0].Intervals, &a.Groups[1].Intervals, &a.DifferenceIntervals, &a.RatioIntervals, &a.OddsRatioIntervals}
	before := make([][]Interval, len(lists))
	for i, l := range lists {
		before[i] = slices.Clone(*l)
	}
	for i, l := range lists {
		*l = append(*l, Interval{Method: "appended"}, Interval{Method: "appended"})
		for j, other := range lists {
			if j != i && !slices.Equal((*other)[:len(before[j])], before[j]) {
				t.Fatalf("appending to list %d changed list %d", i, j)
			}
		}
		*l = (*l)[:len(before[i])]
	}
}

// TestYatesAskedForWithAMargin: Yates' test, asked for by name with
// WithYatesTest(true), tests equal rates only; with a non-zero null the
// analysis leaves it out and says so in a warning, rather than dropping
// what was asked for without a word.
func TestYatesAskedForWithAMargin(t *testing.T) {
	c, err := NewComparison(30, 100, 20, 100, Labels{})
	if err != nil {
		t.Fatal(err)
	}
	a, err := Analyze(c, WithYatesTest(true), WithNull(0.1))
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range a.Tests {
		if r.Method == YatesTest.Key {
			t.Fatalf("Yates' test ran at a null of 0.1: %v", r)
		}
	}
	said := false
	for _, w := range a.Warnings {
		if w.Code == WarnSkipped && strings.Contains(w.Message, YatesTest.Name) && strings.Contains(w.Message, "+10.0 percentage points") {
			said = true
		}
	}
	if !said {
		t.Errorf("no warning says Yates' test was left out for the null: %v", a.Warnings)
	}
	// Not asked for: no warning about it.
	a, err = Analyze(c, WithNull(0.1))
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range a.Warnings {
		if strings.Contains(w.Message, YatesTest.Name) {
			t.Errorf("a warning names Yates' test, which was not asked for: %v", w)
		}
	}
}
