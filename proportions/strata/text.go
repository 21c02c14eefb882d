package strata

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// conclusion reads the headline result in plain words; it never reads a
// non-rejection as evidence of equal rates.
func conclusion(a Analysis) string {
	var w strings.Builder
	b := a.Breakdown
	lvl := strconv.FormatFloat(100*a.Interval.Level, 'g', 4, 64)
	alpha := strconv.FormatFloat(100*(1-a.Level), 'g', 4, 64)
	d := a.Interval.Estimate
	switch {
	case d > 0:
		fmt.Fprintf(&w, "Within each %s, %s's rate (%s) is on average %s above %s's", b.By, b.First, b.Event, points(d), b.Second)
	case d < 0:
		fmt.Fprintf(&w, "Within each %s, %s's rate (%s) is on average %s below %s's", b.By, b.First, b.Event, points(-d), b.Second)
	default:
		fmt.Fprintf(&w, "Within each %s, %s and %s have on average the same rate (%s)", b.By, b.First, b.Second, b.Event)
	}
	fmt.Fprintf(&w, " (%s%% interval %s to %s; %d of %d values of %s used). ", lvl, points(a.Interval.Lower), points(a.Interval.Upper), a.Used(), len(a.Strata), b.By)
	p := proportions.FormatP(a.Test.PValue, a.Test.LogPValue)
	if a.Test.Reject {
		fmt.Fprintf(&w, "The Cochran–Mantel–Haenszel test rejects no difference at %s%% (p = %s, %s).", alpha, p, a.Test.Alternative)
	} else {
		fmt.Fprintf(&w, "The Cochran–Mantel–Haenszel test does not reject no difference at %s%% (p = %s, %s): "+
			"the data do not show a difference, which is not evidence that the rates are equal.", alpha, p, a.Test.Alternative)
	}
	fmt.Fprintf(&w, " Pooled over every %s, ignoring it, the difference is %s.", b.By, points(a.Crude.Difference))
	return w.String()
}

// String prints the conclusion, the strata, the tests, the estimates, the
// homogeneity tests, the notes, the warnings and the caution.
func (a Analysis) String() string {
	var w strings.Builder
	b := a.Breakdown
	fmt.Fprintf(&w, "Stratified comparison of %s: %s vs %s by %s\n%s\n\n", b.Event, b.First, b.Second, b.By, a.Conclusion)
	fmt.Fprintf(&w, "%s\t%s\t%s\tdifference\tinterval\tweight\n", b.By, b.First, b.Second)
	for _, s := range a.Strata {
		c := s.Counts
		if !s.Used {
			fmt.Fprintf(&w, "%s\t%d/%d\t%d/%d\tnot used (a group has no units)\n", s.Value, c.X1, c.N1, c.X2, c.N2)
			continue
		}
		fmt.Fprintf(&w, "%s\t%d/%d\t%d/%d\t%s\t%s to %s\t%.3f\n", s.Value, c.X1, c.N1, c.X2, c.N2,
			proportions.FormatValue(s.Difference), proportions.FormatValue(s.Lower), proportions.FormatValue(s.Upper), s.Weight)
	}
	cr := a.Crude.Comparison
	fmt.Fprintf(&w, "pooled\t%d/%d\t%d/%d\t%s\t%s to %s\n\nTests of no association\n", cr.First.Events, cr.First.Trials,
		cr.Second.Events, cr.Second.Trials, proportions.FormatValue(a.Crude.Difference),
		proportions.FormatValue(a.Crude.Interval.Lower), proportions.FormatValue(a.Crude.Interval.Upper))
	for _, t := range a.Tests {
		fmt.Fprintf(&w, "  %v\n", t)
	}
	w.WriteString("Common estimates\n")
	for _, e := range a.Estimates {
		fmt.Fprintf(&w, "  %v\n", e)
	}
	if len(a.Homogeneity) > 0 {
		w.WriteString("Same effect in every " + b.By + "?\n")
		for _, t := range a.Homogeneity {
			fmt.Fprintf(&w, "  %v\n", t)
		}
	}
	for _, n := range a.Notes {
		fmt.Fprintf(&w, "Note: %s\n", n)
	}
	for _, x := range a.Warnings {
		fmt.Fprintf(&w, "Warning (%s): %s\n", x.Code, x.Message)
	}
	w.WriteString(a.Caution)
	return w.String()
}
