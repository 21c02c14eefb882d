package planning

import "github.com/propscope/propscope/proportions"

// scoreTest is the two-sided score test of no difference used by the
// benchmark: at ρ0 = 1 the Farrington–Manning ratio statistic is the pooled
// score z of π1 − π2 = 0 (the Pearson chi-square test).
var scoreTest = proportions.FarringtonManningRatio
