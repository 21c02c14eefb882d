package strata_test

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/strata"
)

// An invented trial in two blocks: coated seed was sown mostly in the
// poor block, so pooled over the blocks it looks worse, while within each
// block it germinates better. By hand: each block has weight 40·160/200 =
// 32, so the common difference is (10 + 12.5)/2 = 11.25 points; pooled,
// 122/200 − 152/200 = −15 points.
func ExampleAnalyze() {
	b, err := proportions.NewBreakdown("block", proportions.Labels{First: "coated", Second: "bare", Event: "germinated"},
		[]proportions.BreakdownRow{
			{Value: "upper", Counts: proportions.Counts{X1: 38, N1: 40, X2: 136, N2: 160}},
			{Value: "lower", Counts: proportions.Counts{X1: 84, N1: 160, X2: 16, N2: 40}},
		})
	if err != nil {
		fmt.Println(err)
		return
	}
	a, err := strata.Analyze(b)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("within blocks: %+.1f points (%+.1f to %+.1f)\n", 100*a.Interval.Estimate, 100*a.Interval.Lower, 100*a.Interval.Upper)
	fmt.Printf("pooled: %+.1f points\n", 100*a.Crude.Difference)
	for _, w := range a.Warnings {
		fmt.Println("warning:", w.Code)
	}
	// Output:
	// within blocks: +11.2 points (+0.8 to +20.4)
	// pooled: -15.0 points
	// warning: reversal
}
