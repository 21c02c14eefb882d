package notebookui

import (
	"math"

	"github.com/propscope/propscope/proportions"
)

// germinationAnalysis is a hand-filled analysis for layout tests: 86 of 100
// primed seeds and 71 of 100 untreated seeds germinated (invented data).
// The Wald and Wilson limits, the pooled score z and its p-value and
// Fisher's p-value were computed with SciPy 1.10.1 (Debian) from the
// textbook formulas; the Mee limits are illustrative. These numbers test
// how the card shows an analysis, not the statistics.
func germinationAnalysis() proportions.Analysis {
	cmp := proportions.Comparison{
		First:  proportions.Group{Label: "primed", Events: 86, Trials: 100},
		Second: proportions.Group{Label: "untreated", Events: 71, Trials: 100},
		Event:  "germinated",
	}
	wilson := func(est, lo, hi float64) []proportions.Interval {
		return []proportions.Interval{{Method: "wilson-rate", MethodName: "Wilson", Scale: proportions.SingleRate, Level: 0.95,
			Estimate: est, Defined: true, Lower: lo, Upper: hi, RawLower: lo, RawUpper: hi}}
	}
	diff := func(key, name string, lo, hi float64) proportions.Interval {
		return proportions.Interval{Method: key, MethodName: name, Scale: proportions.Difference, Level: 0.95,
			Estimate: 0.15, Defined: true, Lower: lo, Upper: hi, RawLower: lo, RawUpper: hi}
	}
	mee := diff("mee", "Mee", 0.0362, 0.2606)
	score := proportions.TestResult{Method: "farrington-manning-test", MethodName: "Score (Farrington–Manning)", Scale: proportions.Difference,
		Level: 0.95, StatisticName: "z", Statistic: 2.581797660283076, PValue: 0.00982871917500466,
		LogPValue: -4.622446650870547, Reject: true}
	fisher := proportions.TestResult{Method: "fisher-test", MethodName: "Fisher", Scale: proportions.Difference,
		Level: 0.95, PValue: 0.015340331337839228, LogPValue: math.Log(0.015340331337839228), Reject: true}
	return proportions.Analysis{
		Comparison: cmp,
		Level:      0.95,
		Groups: [2]proportions.GroupEstimate{
			{Group: cmp.First, Rate: 0.86, Intervals: wilson(0.86, 0.7786281178903616, 0.9147365634006086)},
			{Group: cmp.Second, Rate: 0.71, Intervals: wilson(0.71, 0.6146110882442888, 0.7898516425087772)},
		},
		Difference:          0.15,
		Interval:            mee,
		Test:                score,
		Tests:               []proportions.TestResult{score, fisher},
		DifferenceIntervals: []proportions.Interval{mee, diff("wald", "Wald", 0.03804161428492761, 0.26195838571507246)},
		Conclusion:          "The Farrington–Manning score test rejects equal rates at the 5% level (p = 0.0098): the germinated rate is higher for primed than for untreated.",
		Warnings:            []proportions.Warning{{Code: "example", Message: "An example warning, shown as written."}},
		Omitted:             []string{"barnard-test"},
		Caution:             "Significance is not importance; decisions follow the applicable regulations and a qualified statistician.",
	}
}

// fixedReferences stands in for the registry so that golden files do not
// change when other methods are registered.
func fixedReferences(kind, key string) (Reference, bool) {
	refs := map[string]Reference{
		"interval/mee":                 {"Mee", "Mee RW (1984). Confidence bounds for the difference between two probabilities. Biometrics 40:1175–1176."},
		"test/farrington-manning-test": {"Score (Farrington–Manning)", "Farrington CP, Manning G (1990). Test statistics and sample size formulae for comparative binomial trials with null hypothesis of non-zero risk difference or non-unity relative risk. Statistics in Medicine 9:1447–1454."},
		"rate/wilson-rate":             {"Wilson", "Wilson EB (1927). Probable inference, the law of succession, and statistical inference. Journal of the American Statistical Association 22:209–212."},
		"test/barnard-test":            {"Barnard", "Barnard GA (1947). Significance tests for 2×2 tables. Biometrika 34:123–138."},
		"test/fisher-test":             {"Fisher", "Fisher RA (1935). The logic of inductive inference. Journal of the Royal Statistical Society 98:39–82."},
		"interval/wald":                {"Wald", "Newcombe RG (1998). Interval estimation for the difference between independent proportions: comparison of eleven methods. Statistics in Medicine 17:873–890 (method 1)."},
	}
	r, ok := refs[kind+"/"+key]
	return r, ok
}
