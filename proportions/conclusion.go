package proportions

import (
	"fmt"
	"strconv"
)

// conclusion reads the headline test and interval in plain language. A
// non-rejection is never read as equality: it says which differences the
// interval still allows.
func conclusion(a Analysis) string {
	c := a.Comparison
	first, second := c.First.Label, c.Second.Label
	data := fmt.Sprintf("%s: %d of %d %s (%s); %s: %d of %d (%s).", first, c.First.Events, c.First.Trials, c.Event,
		percent(c.First.Proportion()), second, c.Second.Events, c.Second.Trials, percent(c.Second.Proportion()))
	est := fmt.Sprintf("The difference %s − %s is %s percentage points (%s confidence interval %s to %s).",
		first, second, points(a.Difference), levelPercent(a.Interval.Level), points(a.Interval.Lower), points(a.Interval.Upper))
	alpha := levelPercent(1 - a.Level)
	p := FormatP(a.Test.PValue, a.Test.LogPValue)
	var verdict string
	switch a.Alternative {
	case TwoSided:
		verdict = twoSidedVerdict(a, alpha, p)
	case Greater:
		verdict = oneSidedVerdict(a, alpha, p, "more than", "lower confidence bound", a.Interval.Lower)
	default:
		verdict = oneSidedVerdict(a, alpha, p, "less than", "upper confidence bound", a.Interval.Upper)
	}
	return data + " " + est + " " + verdict
}

func twoSidedVerdict(a Analysis, alpha, p string) string {
	c := a.Comparison
	null := "equal rates"
	if a.Null != 0 {
		null = fmt.Sprintf("a difference of %s percentage points", points(a.Null))
	}
	if a.Test.Reject {
		dir := "higher"
		if a.Difference < a.Null {
			dir = "lower"
		}
		tail := fmt.Sprintf("the %s rate is %s for %s than for %s", c.Event, dir, c.First.Label, c.Second.Label)
		if a.Null != 0 {
			tail = fmt.Sprintf("the difference is %s than %s percentage points", map[bool]string{true: "larger", false: "smaller"}[dir == "higher"], points(a.Null))
		}
		return fmt.Sprintf("The score test rejects %s at the %s level (p = %s): %s.", null, alpha, p, tail)
	}
	claim := "the rates are equal"
	if a.Null != 0 {
		claim = fmt.Sprintf("the difference is %s percentage points", points(a.Null))
	}
	return fmt.Sprintf("The score test does not reject %s at the %s level (p = %s). This does not show that %s: "+
		"the interval still allows differences from %s to %s percentage points.", null, alpha, p, claim,
		points(a.Interval.Lower), points(a.Interval.Upper))
}

func oneSidedVerdict(a Analysis, alpha, p, side, bound string, limit float64) string {
	c := a.Comparison
	claim := fmt.Sprintf("the difference %s − %s is %s %s percentage points", c.First.Label, c.Second.Label, side, points(a.Null))
	if a.Test.Reject {
		return fmt.Sprintf("At the one-sided %s level the data show that %s (p = %s; the %s %s is beyond it)%s.",
			alpha, claim, p, bound, points(limit), marginReading(a, true))
	}
	return fmt.Sprintf("At the one-sided %s level the data do not show that %s (p = %s; the %s is %s)%s. "+
		"Failing to show it is not evidence of the opposite.", alpha, claim, p, bound, points(limit), marginReading(a, false))
}

// marginReading names the usual reading of a one-sided margin test.
func marginReading(a Analysis, shown bool) string {
	c := a.Comparison
	verb := map[bool]string{true: "", false: "not "}[shown]
	switch {
	case a.Alternative == Greater && a.Null < 0, a.Alternative == Less && a.Null > 0:
		return fmt.Sprintf(": non-inferiority of %s to %s within a margin of %s percentage points is %sshown",
			c.First.Label, c.Second.Label, points(abs(a.Null)), verb)
	case a.Null == 0:
		return fmt.Sprintf(": superiority in that direction is %sshown", verb)
	}
	return ""
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}

func percent(v float64) string {
	return strconv.FormatFloat(100*v, 'f', 1, 64) + "%"
}

func points(v float64) string {
	return strconv.FormatFloat(100*v, 'f', 1, 64)
}

// levelPercent prints a level or α as a percentage with up to 4 significant
// digits ("95%", "2.5%").
func levelPercent(v float64) string {
	return strconv.FormatFloat(100*v, 'g', 4, 64) + "%"
}
