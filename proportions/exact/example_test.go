package exact_test

import (
	"context"
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/exact"
)

// A seed lab plans 24 seeds under the new coating and 30 untreated. How
// often would the Wald interval for the difference in germination rates
// cover the truth if the rates were 90% and 75%?
func ExampleCoverage() {
	d, err := exact.NewDesign(24, 30, 0.95)
	if err != nil {
		fmt.Println(err)
		return
	}
	p, err := exact.Coverage(proportions.Wald, d, 0.90, 0.75)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(p)
	// Output:
	// π1 = 0.9, π2 = 0.75: coverage 93.96% (below 3.11%, above 2.93%), width 0.3817
}

// The coverage map of an interval over every pair of rates, summarised.
func ExampleTable_Surface() {
	d, _ := exact.NewDesign(24, 30, 0.95)
	tab, err := exact.NewTable(context.Background(), proportions.Wald, d)
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
	plausible, _ := s.RegionSummary(exact.Region{Pi1Min: 0.6, Pi1Max: 0.95, Pi2Min: 0.5, Pi2Max: 0.9})
	fmt.Println(plausible)
	// Output:
	// min 21.42% at (0.01, 0), mean 92.96%, 76.5% of points below 94.00%, mean width 0.4175
	// min 92.36% at (0.95, 0.85), mean 93.83%, 58.6% of points below 94.00%, mean width 0.4396
}
