package schema_test

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/schema"
	"github.com/propscope/propscope/proportions/strata"
)

// stratifiedCases are breakdowns that reach every warning, key and
// branch of the stratified analysis: confounded blocks (reversal), a crude
// answer outside the stratified interval, opposite effects (not
// homogeneous), a lost group in one block (empty rows), small trays
// (the Mantel–Fleiss rule), strata too large for the exact methods
// (method skipped), one stratum (no homogeneity) and a zero cell (infinite
// odds ratios).
var stratifiedCases = [][][4]int64{
	{{19, 20, 70, 80}, {18, 20, 68, 80}, {38, 80, 8, 20}, {36, 80, 8, 20}},
	{{85, 100, 16, 20}, {5, 20, 20, 100}},
	{{30, 50, 10, 50}, {10, 50, 30, 50}},
	{{12, 30, 7, 25}, {4, 9, 0, 0}, {9, 20, 11, 22}},
	{{3, 5, 1, 6}, {2, 4, 0, 3}, {1, 3, 1, 4}},
	{{10000, 20000, 10000, 20000}, {10000, 20000, 10001, 20000}, {10000, 20000, 10002, 20000}, {10000, 20000, 10000, 20000},
		{10000, 20000, 10001, 20000}, {10000, 20000, 10002, 20000}, {10000, 20000, 10000, 20000}, {10000, 20000, 10001, 20000}},
	{{7, 12, 3, 11}},
	{{5, 5, 0, 6}, {4, 4, 1, 5}},
}

func stratifiedOf(t *testing.T, rows [][4]int64, labels proportions.Labels, opts ...proportions.Option) strata.Analysis {
	t.Helper()
	var rs []proportions.BreakdownRow
	for i, r := range rows {
		rs = append(rs, proportions.BreakdownRow{Value: string(rune('A' + i)), Counts: proportions.Counts{X1: r[0], N1: r[1], X2: r[2], N2: r[3]}})
	}
	b, err := proportions.NewBreakdown("block", labels, rs)
	if err != nil {
		t.Fatal(err)
	}
	a, err := strata.Analyze(b, opts...)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// checkStratified validates stratified analyses of every case, two-sided
// and one-sided, with plain and hostile labels.
func checkStratified(t *testing.T, c *corpus) {
	for _, rows := range stratifiedCases {
		for _, alt := range []proportions.Alternative{proportions.TwoSided, proportions.Greater, proportions.Less} {
			c.check(schema.Stratified, stratifiedOf(t, rows, proportions.Labels{First: "primed", Second: `<b>"bare"</b>`, Event: "germinated"},
				proportions.WithAlternative(alt)))
		}
	}
	c.check(schema.Stratified, stratifiedOf(t, stratifiedCases[0], proportions.Labels{}, proportions.WithScope(proportions.ScopeLargeSample)))
}

func mustStratified(t *testing.T) strata.Analysis {
	return stratifiedOf(t, stratifiedCases[0], proportions.Labels{})
}
