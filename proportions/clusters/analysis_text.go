package clusters

import (
	"fmt"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// String prints the analysis as plain text: the data, how clustered they
// are, the clustered answers beside the unit-level ones, the cluster-level
// check, the warnings and the caution.
func (a Analysis) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Clustered comparison: %s\n", a.Data)
	b.WriteString(a.Conclusion + "\n\nHow clustered\n")
	for _, c := range append([]Correlation{a.Correlation}, a.OtherCorrelations...) {
		b.WriteString("  " + c.String() + "\n")
	}
	for i, e := range a.DesignEffects {
		label := []string{a.Data.First, a.Data.Second}[i]
		fmt.Fprintf(&b, "  %s: %s\n", label, e)
	}
	b.WriteString("\nAccounting for the clusters\n")
	for _, iv := range a.Intervals {
		b.WriteString("  " + iv.String() + "\n")
	}
	for _, t := range a.Tests {
		b.WriteString("  " + t.String() + "\n")
	}
	fmt.Fprintf(&b, "\nAs if every unit were independent (%d units)\n", a.Naive.Comparison.First.Trials+a.Naive.Comparison.Second.Trials)
	b.WriteString("  " + a.Naive.Interval.String() + "\n  " + a.Naive.Test.String() + "\n")
	fmt.Fprintf(&b, "\n%s by %s (each %s one observation)\n  %s\n  %s\n", strings.ToUpper(a.Data.By[:1])+a.Data.By[1:], a.Data.By, a.Data.By,
		a.ClusterLevel, a.ClusterLevelTest)
	if len(a.Warnings) > 0 {
		b.WriteString("\nWarnings\n")
		for _, w := range a.Warnings {
			fmt.Fprintf(&b, "  [%s] %s\n", w.Code, w.Message)
		}
	}
	b.WriteString("\n" + a.Caution + "\n")
	return b.String()
}

// String prints "ANOVA estimator: 0.1234 (95% interval 0.0123 to 0.3456)".
func (c Correlation) String() string {
	if !c.Defined {
		return c.EstimatorName + ": not estimable from these data"
	}
	s := fmt.Sprintf("%s: %s", c.EstimatorName, proportions.FormatValue(c.Estimate))
	if c.IntervalDefined {
		s += fmt.Sprintf(" (%s%% interval %s to %s)", percent(c.Level), proportions.FormatValue(c.Lower), proportions.FormatValue(c.Upper))
	}
	return s
}

// String prints the design effect and the effective size.
func (e DesignEffect) String() string {
	return fmt.Sprintf("%d units in %d clusters (mean size %.1f, size variation %.2f): design effect %.3f, worth about %s independent units",
		e.Trials, e.Clusters, e.MeanSize, e.SizeVariation, e.Value, roundCount(e.EffectiveSize))
}
