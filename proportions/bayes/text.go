package bayes

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

func pct(v float64) string { return strconv.FormatFloat(100*v, 'f', 1, 64) + "%" }

func pp(v float64) string {
	s := strconv.FormatFloat(100*v, 'f', 1, 64)
	if v > 0 && s != "0.0" {
		s = "+" + s
	}
	return strings.Replace(s, "-", "−", 1) + " pp"
}

func prob(v float64) string {
	switch {
	case v > 0.999:
		return "> 0.999"
	case v < 0.001:
		return "< 0.001"
	}
	return strconv.FormatFloat(v, 'f', 3, 64)
}

// PriorText names the priors: "uniform Beta(1, 1) on each group" or each
// group's.
func (a Analysis) PriorText() string {
	p1, p2 := a.Groups[0].Prior, a.Groups[1].Prior
	if p1 == p2 {
		return p1.String() + " on each group"
	}
	return fmt.Sprintf("%s on %s, %s on %s", p1, a.Comparison.First.Label, p2, a.Comparison.Second.Label)
}

// Sentences returns the analysis in plain sentences: the prior, the
// probability that group 1's rate is higher, the difference with its
// interval, the margin and equivalence region when set, the expected loss
// and the next batch.
func (a Analysis) Sentences() []string {
	first, second, event := a.Comparison.First.Label, a.Comparison.Second.Label, a.Comparison.Event
	d := a.Effects[0]
	lvl := strconv.FormatFloat(100*a.Level, 'g', 4, 64) + "%"
	out := []string{
		fmt.Sprintf("Prior: %s.", a.PriorText()),
		fmt.Sprintf("Given the data and this prior, the probability that the %s rate is higher for %s than for %s is %s.",
			event, first, second, prob(a.ProbabilityFirstHigher)),
		fmt.Sprintf("The difference %s − %s is most likely near %s; with %s probability it lies between %s and %s (highest-density: %s to %s).",
			first, second, pp(d.Median), lvl, pp(d.Lower), pp(d.Upper), pp(d.HighestDensityLower), pp(d.HighestDensityUpper)),
	}
	if a.Margin != 0 {
		out = append(out, fmt.Sprintf("The probability that %s's rate exceeds %s's by more than %s is %s.",
			first, second, pp(a.Margin), prob(a.ProbabilityBeyondMargin)))
	}
	if r := a.EquivalenceRegion; r != nil && a.ProbabilityEquivalent != nil {
		out = append(out, fmt.Sprintf("The probability that the difference lies inside the equivalence region you set, %s to %s, is %s.",
			pp(r.Lower), pp(r.Upper), prob(*a.ProbabilityEquivalent)))
	}
	out = append(out, fmt.Sprintf("Choosing %s costs on average %s of rate if %s is in fact better; choosing %s costs %s (%s is better).",
		first, ppAbs(a.ExpectedLoss.First), second, second, ppAbs(a.ExpectedLoss.Second), betterText(a.Better)),
		fmt.Sprintf("In a next batch of %d units each, %s expects %.1f %s and %s %.1f; the chance that %s's batch does better is %s (a tie %s).",
			a.Prediction.Batch, first, a.Prediction.Groups[0].Mean, event, second, a.Prediction.Groups[1].Mean,
			first, prob(a.Prediction.ProbabilityFirstBeats), prob(a.Prediction.ProbabilityTie)))
	return out
}

func ppAbs(v float64) string { return strings.TrimPrefix(pp(v), "+") }

func betterText(b proportions.Better) string {
	if b == proportions.LowerIsBetter {
		return "a lower rate"
	}
	return "a higher rate"
}

// String is a plain-text summary: the sentences, the effects, the
// sensitivity table and the caution.
func (a Analysis) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Bayesian view: %s\n", a.Comparison)
	for _, s := range a.Sentences() {
		b.WriteString(s + "\n")
	}
	lvl := strconv.FormatFloat(100*a.Level, 'g', 4, 64) + "%"
	for _, e := range a.Effects {
		fmt.Fprintf(&b, "%s: median %.4g, %s equal-tailed %.4g to %.4g, highest-density %.4g to %.4g\n",
			e.Scale, e.Median, lvl, e.Lower, e.Upper, e.HighestDensityLower, e.HighestDensityUpper)
	}
	b.WriteString("Under other priors:\n")
	for _, r := range a.Sensitivity {
		fmt.Fprintf(&b, "  %s: P(higher) %s, difference %s (%s to %s)", r.PriorText(), prob(r.ProbabilityFirstHigher), pp(r.Median), pp(r.Lower), pp(r.Upper))
		if r.ProbabilityEquivalent != nil {
			fmt.Fprintf(&b, ", P(equivalent) %s", prob(*r.ProbabilityEquivalent))
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "Error estimate of the probabilities: %.1g\nCaution: %s\n", a.ErrorBound, a.Caution)
	return b.String()
}

// PriorText names the row's priors.
func (r SensitivityRow) PriorText() string {
	if r.Priors[0] == r.Priors[1] {
		return r.Priors[0].String()
	}
	return r.Priors[0].String() + " / " + r.Priors[1].String()
}
