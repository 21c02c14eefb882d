package proportions_test

// The printed values were confirmed independently with SciPy 1.10.1's
// general routines (minimize_scalar for the restricted likelihood, brentq
// for the score limits, beta.ppf and binomtest's Wilson interval).

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// Seed lots: 84 of 120 coated seeds germinated against 66 of 118 uncoated
// ones (an invented trial). Mee's score interval for the difference in
// germination rates, coated minus uncoated.
func ExampleMee() {
	c := proportions.Counts{X1: 84, N1: 120, X2: 66, N2: 118}
	iv, err := proportions.Mee.Interval(c, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(iv)
	// Output:
	// Mee score: 0.1407 (0.0181 to 0.2596), 95% confidence
}

// The same seed lots: is coating worth at least 0, and is it no worse than
// 5 points below uncoated seed? The Farrington–Manning score test of
// H0: π1 − π2 = δ, two-sided at δ = 0 and one-sided (greater) at δ = −0.05.
func ExampleFarringtonManningTest() {
	c := proportions.Counts{X1: 84, N1: 120, X2: 66, N2: 118}
	r, err := proportions.FarringtonManningTest.Test(c)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(r)
	r, _ = proportions.FarringtonManningTest.Test(c, proportions.WithNull(-0.05), proportions.WithAlternative(proportions.Greater))
	fmt.Println(r)
	// Output:
	// Farrington–Manning score test: z = 2.248, p = 0.02459 (two-sided, null 0): reject at 5%
	// Farrington–Manning score test: z = 3.047, p = 0.001155 (greater, null -0.05): reject at 5%
}

// Defects on a packing line: 3 faulty seals in 250. Wilson's interval for
// the defect rate, and the Clopper–Pearson interval for comparison.
func ExampleWilson() {
	for _, m := range []proportions.RateMethod{proportions.Wilson, proportions.ClopperPearson} {
		iv, err := m.Interval(3, 250, 0.95)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Println(iv)
	}
	// Output:
	// Wilson score: 0.0120 (0.0041 to 0.0347), 95% confidence
	// Clopper–Pearson: 0.0120 (0.0025 to 0.0347), 95% confidence
}

// The rates most likely under the null that coated seed germinates 5
// points below uncoated seed: the restricted maximum-likelihood estimates
// the score tests and intervals are built on.
func ExampleRestrictedMLE() {
	c := proportions.Counts{X1: 84, N1: 120, X2: 66, N2: 118}
	p1, p2 := proportions.RestrictedMLE(c, -0.05)
	fmt.Printf("%.4f %.4f\n", p1, p2)
	// Output:
	// 0.6028 0.6528
}

// A non-inferiority reading with the paired score test and interval: is
// coated seed at most 10 points worse than uncoated? The one-sided test at
// α = 2.5% rejects H0: π1 − π2 = −0.10 exactly when the lower limit of the
// 95% interval lies above −0.10.
func ExampleFarringtonManningPair() {
	test, interval := proportions.FarringtonManningPair()
	c := proportions.Counts{X1: 84, N1: 120, X2: 66, N2: 118}
	r, err := test.Test(c, proportions.WithNull(-0.10), proportions.WithAlternative(proportions.Greater), proportions.WithLevel(0.975))
	if err != nil {
		fmt.Println(err)
		return
	}
	iv, _ := interval.Interval(c, 0.95)
	fmt.Println(r)
	fmt.Printf("lower limit %.4f\n", iv.Lower)
	// Output:
	// Farrington–Manning score test: z = 3.855, p = 5.798e-05 (greater, null -0.1): reject at 2.5%
	// lower limit 0.0181
}
