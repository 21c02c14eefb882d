package proportions_test

import (
	"fmt"
	"slices"

	"github.com/propscope/propscope/proportions"
)

// An invented coating trial: 56 of 70 coated seeds germinate, 48 of 80
// bare ones. The counts are those of a published worked example, Newcombe
// RG (1998), Interval estimation for the difference between independent
// proportions, Statistics in Medicine 17:873–890, Table II, example (a),
// so that the interval can be checked against the paper; the scenario is
// invented. The default analysis gives the headline score interval and the
// score test it inverts, with a plain-language reading.
//
// Outside checks: Mee's interval 0.0533 to 0.3377 is Newcombe (1998,
// Statistics in Medicine 17:873–890) Table II, example (a), method 5; the
// score z = 2.650 is the root of SciPy 1.10.1's chi2_contingency X² =
// 7.0234 (no correction), with p = chi2.sf(7.0234, 1) = 0.008045; Fisher's
// two-sided p = 0.01252 is scipy.stats.fisher_exact and the observed
// table's probability 0.0042 is scipy.stats.hypergeom.pmf(56, 150, 104, 70).
func ExampleAnalyze() {
	c, err := proportions.NewComparison(56, 70, 48, 80,
		proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(a.Interval)
	fmt.Println(a.Test)
	for _, r := range a.Tests {
		if r.Method == "fisher-test" {
			fmt.Println(r)
		}
	}
	fmt.Println(a.Conclusion)
	// Output:
	// Mee score: 0.2000 (0.0533 to 0.3377), 95% confidence
	// Farrington–Manning score test: z = 2.65, p = 0.008045 (two-sided, null 0): reject at 5%
	// Fisher exact: P(observed table) = 0.0042, p = 0.01252 (two-sided, null 0): reject at 5%
	// coated: 56 of 70 germinated (80.0%); bare: 48 of 80 (60.0%). The difference coated − bare is +20.0 percentage points (95% confidence interval +5.3 to +33.8). The Farrington–Manning score test rejects equal rates at the 5% level (p = 0.0080): the germinated rate is higher for coated than for bare.
}

// The method scope: the default analysis runs every method that costs
// microseconds; WithScope(ScopeAll) adds the exact methods that take
// milliseconds or more (here on a small, sparse table, where they matter
// most), and the default analysis lists them as left out.
func ExampleWithScope() {
	c, err := proportions.NewComparison(1, 12, 5, 11, proportions.Labels{})
	if err != nil {
		fmt.Println(err)
		return
	}
	quick, _ := proportions.Analyze(c)
	all, _ := proportions.Analyze(c, proportions.WithScope(proportions.ScopeAll))
	has := func(a proportions.Analysis, key string) bool {
		return slices.ContainsFunc(a.Tests, func(r proportions.TestResult) bool { return r.Method == key })
	}
	fmt.Println(quick.Scope, "Fisher:", has(quick, "fisher-test"), "Barnard:", has(quick, "barnard-test"))
	fmt.Println(all.Scope, "Fisher:", has(all, "fisher-test"), "Barnard:", has(all, "barnard-test"))
	fmt.Println("left out by the quick analysis:", quick.Omitted)
	// Output:
	// quick Fisher: true Barnard: false
	// all Fisher: true Barnard: true
	// left out by the quick analysis: [mid-p-rate likelihood-rate profile-likelihood profile-exact-tails profile-mid-p-tails chan-zhang agresti-min cornfield-odds-ratio cornfield-mid-p-odds-ratio baptista-pike-odds-ratio barnard-test barnard-wald-test boschloo-test boschloo-doubled-test]
}
