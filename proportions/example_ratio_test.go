package proportions_test

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// Two seed coatings: 36 of 40 coated seeds germinated against 16 of 80
// untreated ones. How many times as often does the coated seed germinate?
func ExampleKoopman() {
	c := proportions.Counts{X1: 36, N1: 40, X2: 16, N2: 80}
	iv, err := proportions.Koopman.Interval(c, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(iv)
	// Output: Koopman asymptotic score: 4.5000 (2.9396 to 7.1522), 95% confidence
}

// A zero cell: no defects at all on the new line (0 of 150) against 6 of
// 150 on the old one. The ratio estimate is 0; the score interval says how
// large the ratio could still be, while the plain Katz interval has nothing
// to say.
func ExampleIntervalMethods_zeroCell() {
	c := proportions.Counts{X1: 0, N1: 150, X2: 6, N2: 150}
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range proportions.EnumerableIntervalMethods(proportions.Ratio) {
		fmt.Println(m.IntervalAt(c, conf))
	}
	// Output:
	// Katz log: 0.0000 (0.0000 to ∞), 95% confidence
	// Katz log, ½ added at zero events: 0.0000 (0.0044 to 1.3534), 95% confidence
	// Koopman asymptotic score: 0.0000 (0.0000 to 0.6303), 95% confidence
	// Miettinen–Nurminen score (ratio): 0.0000 (0.0000 to 0.6324), 95% confidence
}

// Ratio-scale non-inferiority, in an invented packing-line check: is the
// new line's share of seals that pass at least 90% of the old line's? 171
// of 190 seals pass on the new line and 168 of 188 on the old.
func ExampleFarringtonManningRatioTest() {
	c := proportions.Counts{X1: 171, N1: 190, X2: 168, N2: 188}
	r, err := proportions.FarringtonManningRatioTest.Test(c,
		proportions.WithNull(0.9), proportions.WithAlternative(proportions.Greater))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(r)
	// Output: Farrington–Manning score test (ratio): z = 2.974, p = 0.001469 (greater, null 0.9): reject at 5%
}

// Odds ratios for a germination trial (20 of 25 against 6 of 15), by every
// registered method.
func ExampleIntervalMethods_oddsRatio() {
	c := proportions.Counts{X1: 20, N1: 25, X2: 6, N2: 15}
	conf, _ := proportions.NewConfidence(0.95)
	for _, m := range proportions.EnumerableIntervalMethods(proportions.OddsRatio) {
		fmt.Println(m.IntervalAt(c, conf))
	}
	// Output:
	// Woolf logit: 6.0000 (1.4447 to 24.9192), 95% confidence
	// Gart adjusted logit: 6.0000 (1.3821 to 21.4716), 95% confidence
	// Miettinen–Nurminen score (odds ratio): 6.0000 (1.4685 to 24.5733), 95% confidence
	// Cornfield exact conditional: 5.6922 (1.1864 to 31.7553), 95% confidence
	// Cornfield mid-p: 5.6922 (1.3856 to 26.0846), 95% confidence
	// Baptista–Pike exact: 5.6922 (1.3810 to 28.1663), 95% confidence
}

// Number needed to treat: 56 of 70 coated seed lots met the germination
// standard against 48 of 80 plain ones. How many lots must be coated for
// one more lot to meet it?
func ExampleNumberNeededToTreat() {
	c, err := proportions.NewComparison(56, 70, 48, 80,
		proportions.Labels{First: "coated", Second: "plain", Event: "lot meeting the standard"})
	if err != nil {
		fmt.Println(err)
		return
	}
	n, err := proportions.NumberNeededToTreat(c, proportions.Wald, proportions.HigherIsBetter)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(n)
	// Output: NNTB 5.0 (95% interval NNTB 2.9 to 17.4, from the Wald interval for the difference): treating about 5.0 with coated instead of plain gives one more lot meeting the standard (benefit).
}

// The conditional maximum-likelihood odds ratio for a germination trial
// (20 of 25 against 6 of 15), the estimate the exact conditional intervals
// report. It is a little nearer 1 than the sample odds ratio of 6.
func ExampleConditionalMLE() {
	est, err := proportions.ConditionalMLE(proportions.Counts{X1: 20, N1: 25, X2: 6, N2: 15})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.4f\n", est)
	// Output: 5.6922
}
