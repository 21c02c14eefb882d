package strata

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// mantelFleissMinimum is the smallest distance the Mantel–Fleiss criterion
// allows between ΣE and either end of the range of Σx1: 5. Mantel N,
// Fleiss JL (1980), "Minimum expected cell size requirements for the
// Mantel-Haenszel one-degree-of-freedom chi-square test and a related rapid
// procedure", American Journal of Epidemiology 112:129–134.
const mantelFleissMinimum = 5

// addWarnings flags empty rows, a sparse breakdown, a crude answer that
// disagrees with the stratified one, and rejected homogeneity.
func (a *Analysis) addWarnings(ts []table) {
	by := a.Breakdown.By
	if empty := emptyValues(a.Strata); len(empty) > 0 {
		a.Warnings = append(a.Warnings, proportions.Warning{Code: WarnEmptyRows, Message: fmt.Sprintf(
			"%d of the %d %s values (%s) have a group with no units: listed, but left out of every stratified method; "+
				"the pooled (crude) counts include them.", len(empty), len(a.Strata), by, strings.Join(empty, ", "))})
	}
	if gap := mantelFleissGap(ts); gap < mantelFleissMinimum {
		a.Warnings = append(a.Warnings, proportions.Warning{Code: proportions.WarnSmallExpected, Message: fmt.Sprintf(
			"The expected total of %s in %s lies %.2g from the nearest end of its possible range (below %d, the Mantel–Fleiss rule): "+
				"the Cochran–Mantel–Haenszel test may be inaccurate; prefer the exact conditional test.",
			a.Breakdown.Event, a.Breakdown.First, gap, mantelFleissMinimum)})
	}
	a.compareCrude()
	for _, t := range a.Homogeneity {
		if t.Reject {
			a.Warnings = append(a.Warnings, proportions.Warning{Code: WarnNotHomogeneous, Message: fmt.Sprintf(
				"%s rejects a common effect (p = %s): the effect differs between %s values, so one common estimate hides that. "+
					"Look at each %s's own estimate before reading the common one.",
				t.Name, proportions.FormatP(t.PValue, t.LogPValue), by, by)})
			return
		}
	}
}

// emptyValues lists the values of the unused rows.
func emptyValues(ss []Stratum) []string {
	var out []string
	for _, s := range ss {
		if !s.Used {
			out = append(out, strconv.Quote(s.Value))
		}
	}
	return out
}

// mantelFleissGap is min(ΣE − Σmax(0, m1 − n2), Σmin(n1, m1) − ΣE): how far
// the expected Σx1 lies from the ends of its possible range.
func mantelFleissGap(ts []table) float64 {
	var e, lo, hi float64
	for _, t := range ts {
		e += t.n1 * t.m1 / t.n
		lo += math.Max(0, t.m1-t.n2)
		hi += math.Min(t.n1, t.m1)
	}
	return math.Min(e-lo, hi-e)
}

// compareCrude warns when the pooled difference points the other way from
// the stratified one, or lies outside its interval.
func (a *Analysis) compareCrude() {
	crude, strat := a.Crude.Difference, a.Interval.Estimate
	by := a.Breakdown.By
	switch {
	case crude*strat < 0:
		a.Warnings = append(a.Warnings, proportions.Warning{Code: WarnReversal, Message: fmt.Sprintf(
			"The direction reverses: pooled over every %s, %s has the higher rate (%s); within each %s, on average, %s has (%s). "+
				"The %s values differ in their base rates and in how the groups are spread over them, so the pooled comparison is confounded: "+
				"read the stratified answer.", by, leader(a, crude), points(crude), by, leader(a, strat), points(strat), by)})
	case !a.Interval.Contains(crude):
		a.Warnings = append(a.Warnings, proportions.Warning{Code: WarnCrudeDiffers, Message: fmt.Sprintf(
			"The pooled difference (%s) lies outside the stratified interval (%s to %s): the %s values confound the pooled comparison; "+
				"read the stratified answer.", points(crude), points(a.Interval.Lower), points(a.Interval.Upper), by)})
	}
}

// leader names the group with the higher rate for a difference d ≠ 0.
func leader(a *Analysis, d float64) string {
	if d > 0 {
		return a.Breakdown.First
	}
	return a.Breakdown.Second
}

// points prints a difference of rates in percentage points with a
// typographic minus.
func points(d float64) string {
	return strings.Replace(strconv.FormatFloat(100*d, 'f', 1, 64), "-", "−", 1) + " points"
}
