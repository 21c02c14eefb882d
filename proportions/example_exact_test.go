package proportions_test

import (
	"fmt"

	"github.com/propscope/propscope/proportions"
)

// A pilot germination trial: 9 of 12 seeds germinated under the new
// coating, 3 of 11 without it (invented numbers). With so few seeds the
// exact tests are the right tools; the unconditional tests report where the
// nuisance supremum was found.
func Example_exactTests() {
	c := proportions.Counts{X1: 9, N1: 12, X2: 3, N2: 11}
	for _, m := range []proportions.TestMethod{proportions.FisherTest, proportions.BarnardTest, proportions.BoschlooTest} {
		r, err := m.Test(c, proportions.WithAlternative(proportions.Greater))
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%-16s p = %.4f\n", r.MethodName, r.PValue)
	}
	iv, _ := proportions.ChanZhang.Interval(c, 0.95)
	fmt.Printf("%s: %.3f to %.3f\n", iv.MethodName, iv.Lower, iv.Upper)
	// Output:
	// Fisher exact     p = 0.0296
	// Barnard (score)  p = 0.0180
	// Boschloo         p = 0.0178
	// Chan–Zhang exact unconditional: 0.029 to 0.789
}
