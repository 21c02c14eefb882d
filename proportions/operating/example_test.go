package operating_test

import (
	"context"
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// A seed lab plans 24 seeds under the new coating and 30 untreated. How
// often would the Wald interval for the difference in germination rates
// cover the truth if the rates were 90% and 75%?
func ExampleCoverage() {
	d, err := operating.NewDesign(24, 30, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := operating.Coverage(proportions.Wald, d, 0.90, 0.75)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(p)
	// Output:
	// π1 = 0.9, π2 = 0.75: coverage 93.96% (below 3.11%, above 2.93%), width 0.3817
}

// The coverage map of an interval over every pair of rates, summarised.
func ExampleOutcomeLimits_Surface() {
	d, _ := operating.NewDesign(24, 30, 0.95)
	tab, err := operating.NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := tab.Surface(context.Background())
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(s.Summary())
	plausible, _ := s.RegionSummary(operating.Region{Pi1Min: 0.6, Pi1Max: 0.95, Pi2Min: 0.5, Pi2Max: 0.9})
	fmt.Println(plausible)
	// Output:
	// min 21.42% at (0.01, 0), mean 92.96%, 76.5% of points below 94.00%, mean width 0.4175
	// min 92.36% at (0.95, 0.85), mean 93.83%, 58.6% of points below 94.00%, mean width 0.4396
}

// Which interval for the difference should a quality engineer comparing
// 100 parts from each of two lines report? The answer depends on the
// design only, so it can be fixed before the parts are inspected. Here is
// what the ranking says about the textbook Wald interval.
func ExampleRecommend() {
	d, _ := operating.NewDesign(100, 100, 0.95)
	rec, err := operating.Recommend(context.Background(), proportions.Difference, d)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range rec.Ranking {
		if r.Method == "wald" {
			fmt.Println(r.MethodName+":", r.Reason)
		}
	}
	// Output:
	// Wald: falls to 79.99% at (π1 = 0.02, π2 = 0.99), more than 2 points below 95.00%, so it ranks after the methods that hold the level; average 94.55%.
}

// Coverage along the line of a true difference of 10 points, where a
// germination trial would be planned.
func ExampleOutcomeLimits_AlongEffect() {
	d, _ := operating.NewDesign(40, 40, 0.95)
	tab, err := operating.NewOutcomeLimits(context.Background(), proportions.AgrestiCaffo, d)
	if err != nil {
		fmt.Println(err)
		return
	}
	s, err := tab.AlongEffect(context.Background(), 0.10, operating.WithSteps(5))
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Print(s)
	// Output:
	// Agresti–Caffo, n1 = 40, n2 = 40, 95% level, difference fixed at 0.1:
	//   π1 = 0.1, π2 = 0: coverage 98.37% (below 1.48%, above 0.15%), width 0.2127
	//   π1 = 0.325, π2 = 0.225: coverage 95.26% (below 2.60%, above 2.14%), width 0.3795
	//   π1 = 0.55, π2 = 0.45: coverage 94.46% (below 2.84%, above 2.71%), width 0.4209
	//   π1 = 0.775, π2 = 0.675: coverage 95.26% (below 2.60%, above 2.14%), width 0.3795
	//   π1 = 1, π2 = 0.9: coverage 98.37% (below 1.48%, above 0.15%), width 0.2127
}

// The exact power of a test for a planned study, and its actual size.
func ExamplePower() {
	fisher, err := proportions.LookupTest("fisher-test")
	if err != nil {
		fmt.Println(err)
		return
	}
	s, _ := proportions.NewSettings() // two-sided at 5%
	h, _ := fisher.Hypothesis(s)
	power, err := operating.Power(fisher, 60, 60, h, 0.45, 0.2)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("exact power %.4f\n", power)
	size, err := operating.TypeIError(context.Background(), fisher, 60, 60, h)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("largest actual size %.4f (nominal %.2f)\n", size.Max, size.Alpha)
	// Output:
	// exact power 0.7908
	// largest actual size 0.0353 (nominal 0.05)
}

// A rejection region built once gives the power at any pair of rates, for
// a power curve: here Fisher's exact test, 40 seedlings per group.
func ExampleNewRejectionRegion() {
	fisher, err := proportions.LookupTest("fisher-test")
	if err != nil {
		fmt.Println(err)
		return
	}
	s, _ := proportions.NewSettings()
	h, _ := fisher.Hypothesis(s)
	region, err := operating.NewRejectionRegion(context.Background(), operating.Decision{Test: fisher, Hypotheses: []proportions.Hypothesis{h}}, 40, 40)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, pi1 := range []float64{0.3, 0.5, 0.7} {
		p, _ := region.Power(pi1, 0.3)
		fmt.Printf("π1 = %.1f, π2 = 0.3: power %.4f\n", pi1, p)
	}
	// Output:
	// π1 = 0.3, π2 = 0.3: power 0.0282
	// π1 = 0.5, π2 = 0.3: power 0.3683
	// π1 = 0.7, π2 = 0.3: power 0.9413
}
