package notebookui

import (
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// minus is the typographic minus sign, which lines up with "+" in tables
// and is not broken across lines like a hyphen.
const minus = "−"

// percent prints a proportion as a percentage with the given decimals
// ("86.0%").
func percent(p float64, decimals int) string {
	return signless(100*p, decimals) + "%"
}

// points prints a difference of proportions in percentage points with an
// explicit sign ("+15.0", "−3.2", "0.0").
func points(d float64, decimals int) string {
	s := signless(100*d, decimals)
	switch {
	case strings.TrimLeft(s, minus+"0.") == "":
		return strings.TrimPrefix(s, minus)
	case strings.HasPrefix(s, minus), strings.HasPrefix(s, "∞"):
		return s
	}
	return "+" + s
}

// signless formats v with a typographic minus and ∞ for infinities.
func signless(v float64, decimals int) string {
	switch {
	case math.IsInf(v, 1):
		return "∞"
	case math.IsInf(v, -1):
		return minus + "∞"
	case math.IsNaN(v):
		return "not estimable"
	}
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	return strings.Replace(s, "-", minus, 1)
}

// ratio prints a ratio or odds ratio with three decimals, ∞ for an
// unbounded limit and "not estimable" for 0/0.
func ratio(v float64) string { return signless(v, 3) }

// levelText prints a level or α as a percentage with up to four significant
// digits ("95%", "2.5%").
func levelText(v float64) string {
	return strconv.FormatFloat(100*v, 'g', 4, 64) + "%"
}

// statistic prints a test statistic with its name ("z = 2.650"); exact
// tests without a reported statistic print a dash.
func statistic(r proportions.TestResult) string {
	if r.StatisticName == "" || math.IsNaN(r.Statistic) {
		return "—"
	}
	v := strconv.FormatFloat(r.Statistic, 'g', 4, 64)
	if math.IsInf(r.Statistic, 0) {
		v = signless(r.Statistic, 0)
	}
	return r.StatisticName + " = " + strings.Replace(v, "-", minus, 1)
}
