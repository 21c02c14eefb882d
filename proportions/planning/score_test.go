package planning

import "github.com/propscope/propscope/proportions"

// scoreTest is the two-sided score test of the benchmark: the
// Farrington–Manning score test of π1 − π2 = 0.
var scoreTest = proportions.FarringtonManningTest
