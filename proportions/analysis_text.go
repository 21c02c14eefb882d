package proportions

import (
	"fmt"
	"strings"
	"unicode/utf8"
)

// String gives a readable plain-text summary of the analysis: the groups,
// the headline difference and test, every interval and test, the
// conclusion, the warnings and the caution.
func (a Analysis) String() string {
	var b strings.Builder
	c := a.Comparison
	fmt.Fprintf(&b, "Comparison of %q: %s vs %s\n", c.Event, c.First.Label, c.Second.Label)
	for _, g := range a.Groups {
		fmt.Fprintf(&b, "  %s: %d of %d, %s", g.Group.Label, g.Group.Events, g.Group.Trials, percent(g.Rate))
		if len(g.Intervals) > 0 {
			iv := g.Intervals[0]
			fmt.Fprintf(&b, " (%s %s: %s to %s)", iv.MethodName, levelPercent(iv.Level), percent(iv.Lower), percent(iv.Upper))
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "Difference %s − %s: %s (%s %s interval %s to %s)\n", c.First.Label, c.Second.Label,
		signedValue(a.Difference), a.Interval.MethodName, levelPercent(a.Interval.Level), signedValue(a.Interval.Lower), signedValue(a.Interval.Upper))
	fmt.Fprintf(&b, "Tests of difference = %s (%s):\n", signedValue(a.Null), a.Alternative)
	for _, t := range a.Tests {
		fmt.Fprintf(&b, "  %s\n", t)
	}
	writeIntervals(&b, "Intervals for the difference", a.DifferenceIntervals, signedValue)
	writeIntervals(&b, "Intervals for the ratio", a.RatioIntervals, FormatValue)
	writeIntervals(&b, "Intervals for the odds ratio", a.OddsRatioIntervals, FormatValue)
	fmt.Fprintf(&b, "Conclusion: %s\n", a.Conclusion)
	for _, w := range a.Warnings {
		fmt.Fprintf(&b, "Warning (%s): %s\n", w.Code, w.Message)
	}
	fmt.Fprintf(&b, "Caution: %s\n", a.Caution)
	return b.String()
}

// signedValue prints a difference as the summary shows it: four decimals,
// always signed, with the typographic minus (reader_numbers.go).
func signedValue(v float64) string { return FormatSigned(v, 4) }

func writeIntervals(b *strings.Builder, title string, ivs []Interval, value func(float64) string) {
	if len(ivs) == 0 {
		return
	}
	fmt.Fprintf(b, "%s (%s):\n", title, levelPercent(ivs[0].Level))
	width := 0
	for _, iv := range ivs {
		width = max(width, utf8.RuneCountInString(iv.MethodName))
	}
	for _, iv := range ivs {
		note := ""
		if iv.Clipped {
			note = fmt.Sprintf("  [raw %s to %s]", value(iv.RawLower), value(iv.RawUpper))
		}
		pad := strings.Repeat(" ", width-utf8.RuneCountInString(iv.MethodName))
		fmt.Fprintf(b, "  %s%s  %s to %s%s\n", iv.MethodName, pad, value(iv.Lower), value(iv.Upper), note)
	}
}
