package notebookui

import (
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Number style: the one policy for every number a reader sees, in cards,
// charts (axes, tooltips, notes), explorers, and in their HTML, Markdown
// and text forms alike. New views format through the helpers below and
// never call strconv or fmt's %g on a number a reader sees.
//
//   - Minus: the typographic minus U+2212 ("−1.2"), never the hyphen, also
//     on chart axes (axisLabelJS) and inside infinities ("−∞").
//   - Sign: a difference (anything whose no-effect value is 0) always
//     carries its sign, "+16.0" and "−1.2"; zero is "0.0". Rates, ratios,
//     p-values and counts are unsigned.
//   - Digits: fixed decimals per kind of number, trailing zeros kept, so a
//     column lines up at the point and the same number reads the same
//     everywhere:
//     rates as percentages, 1 decimal ("82.0%") — 2 in chart tooltips;
//     differences in percentage points, 1 decimal in headlines and the
//     conclusion, 2 in the method tables and chart tooltips;
//     ratios and odds ratios, 3 decimals ("1.242");
//     test statistics, 3 decimals ("z = 1.824", "X² = 2.010");
//     p-values and probabilities, 4 decimals ("0.0126", "0.1010");
//     coverage, 2 decimals as a percentage ("94.87%").
//   - Small p-values: "< 0.0001" where four decimals would print zero; no
//     exponent is ever shown to a reader. Where more digits matter (the
//     proven bound of an unconditional test) scientific numbers read
//     "1.907 × 10⁻⁶" (sci).
//   - Units: a number is printed in the unit of the axis or column it sits
//     beside (differences in percentage points under a points axis).
//   - Special values: "∞", "−∞", and "not estimable" for 0/0.
//
// The conclusion is written in package proportions, which cannot import
// this one: the primitives it shares with the card (signed points, the
// p-value rule) live in proportions/reader_numbers.go and are called from
// here, so there is one implementation. TestNumberStyle checks the rule
// over many values and the card's forms against each other.

// minus is the typographic minus sign, which lines up with "+" in tables
// and is not broken across lines like a hyphen.
const minus = proportions.ReaderMinus

// percent prints a proportion as a percentage with the given decimals
// ("86.0%").
func percent(p float64, decimals int) string {
	return signless(100*p, decimals) + "%"
}

// points prints a difference of proportions in percentage points with an
// explicit sign ("+15.0", "−3.2", "0.0").
func points(d float64, decimals int) string {
	return proportions.FormatPoints(d, decimals)
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
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-") // no "−0.0"
	}
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

// alphaText prints a significance level as a probability with up to four
// significant digits ("0.05", "0.025"): a setting, not a measurement.
func alphaText(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }

// pValue prints a p-value: four decimals, "< 0.0001" below.
func pValue(p float64) string { return proportions.FormatPValue(p) }

// pClause prints "p = 0.0682", or "p < 0.0001".
func pClause(p float64) string { return proportions.PValueClause(p) }

// probability prints a probability other than a p-value (a posterior
// probability, a coverage as a share) with the given decimals.
func probability(v float64, decimals int) string { return signless(v, decimals) }

// statDecimals is the decimals of every test statistic.
const statDecimals = 3

// statistic prints a test statistic with its name ("z = 1.824"). Tests
// without a statistic of their own (Fisher's, which order tables by their
// probability) print a dash, and an unbounded statistic reads "unbounded";
// statisticNote says why in words.
func statistic(r proportions.TestResult) string {
	switch {
	case !hasStatistic(r):
		return "—"
	case math.IsInf(r.Statistic, 0):
		return r.StatisticName + " unbounded"
	case strings.HasSuffix(r.StatisticName, " p"):
		// Boschloo's statistic is Fisher's one-sided p-value: printed
		// as a p-value.
		return r.StatisticName + strings.TrimPrefix(pClause(r.Statistic), "p")
	}
	return r.StatisticName + " = " + signless(r.Statistic, statDecimals)
}

// hasStatistic reports whether a test has a statistic to print: Fisher's
// tests report the probability of the observed table, which is no test
// statistic and would be misread beside the p-value.
func hasStatistic(r proportions.TestResult) bool {
	return r.StatisticName != "" && !math.IsNaN(r.Statistic) && !strings.HasPrefix(r.StatisticName, "P(")
}

// statisticNotes explains, in words, each dash and "unbounded" of the
// statistic column, one sentence per kind, in the order of the rows.
func statisticNotes(tests []proportions.TestResult) []string {
	var out []string
	var noStat, unbounded, ordering []string
	for _, t := range tests {
		switch {
		case hasStatistic(t) && strings.HasSuffix(t.StatisticName, " p"):
			ordering = append(ordering, t.MethodName)
		case t.StatisticName != "" && !hasStatistic(t) && !math.IsNaN(t.Statistic):
			noStat = append(noStat, t.MethodName)
		case hasStatistic(t) && math.IsInf(t.Statistic, 0):
			unbounded = append(unbounded, t.MethodName)
		}
	}
	if len(noStat) > 0 {
		out = append(out, joinNames(noStat)+": no test statistic (—): these tests order the possible tables by their probability under the null hypothesis, and the p-value comes from the tables no more probable than the one observed.")
	}
	if len(ordering) > 0 {
		out = append(out, joinNames(ordering)+": the statistic is Fisher's p-value, used only to order the possible tables; the test's own p-value is in the next column.")
	}
	if len(unbounded) > 0 {
		out = append(out, joinNames(unbounded)+": the statistic has no finite value at these counts, because its estimate of the variance is zero (each group's observed rate is 0% or 100%); the p-value is still exact.")
	}
	return out
}

// joinNames lists names as "A", "A and B", "A, B and C".
func joinNames(names []string) string {
	if len(names) < 2 {
		return strings.Join(names, "")
	}
	return strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1]
}

// superscripts maps the characters of an exponent to superscripts.
var superscripts = strings.NewReplacer("-", "⁻", "0", "⁰", "1", "¹", "2", "²", "3", "³",
	"4", "⁴", "5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹")

// sci prints v with the given significant digits, plainly between 10⁻⁴
// and 10⁶ and otherwise as "1.907 × 10⁻⁶": the one exponent style.
func sci(v float64, digits int) string {
	a := math.Abs(v)
	if a == 0 || math.IsInf(v, 0) || math.IsNaN(v) || (a >= 1e-4 && a < 1e6) {
		if math.IsInf(v, 0) || math.IsNaN(v) {
			return signless(v, 0)
		}
		return strings.Replace(strconv.FormatFloat(v, 'g', digits, 64), "-", minus, 1)
	}
	s := strconv.FormatFloat(v, 'e', digits-1, 64)
	mant, exp, _ := strings.Cut(s, "e")
	exp = strings.TrimPrefix(exp, "+")
	neg := strings.HasPrefix(exp, "-")
	exp = strings.TrimLeft(strings.TrimPrefix(exp, "-"), "0")
	if neg {
		exp = "-" + exp
	}
	return strings.Replace(mant, "-", minus, 1) + " × 10" + superscripts.Replace(exp)
}

// Chart forms of the same rules: tooltips, tables and notes under charts
// print rates with two decimals and differences in signed points with two
// decimals and the unit.

// fmtPct prints a proportion as a percentage with two decimals ("94.87%").
func fmtPct(v float64) string { return percent(v, 2) }

// fmtPP prints a difference in signed percentage points with two decimals
// and the unit ("+15.00 pp", "−3.20 pp", "0.00 pp").
func fmtPP(v float64) string {
	if math.IsInf(v, 0) || math.IsNaN(v) {
		return signless(v, 0)
	}
	return points(v, 2) + " pp"
}

// fmtLevel prints a level as a percentage ("95%").
func fmtLevel(level float64) string { return levelText(level) }

// fmtP prints a significance level α ("0.05").
func fmtP(v float64) string { return alphaText(v) }

// fmtWidth prints an interval's width, a length and so unsigned, in
// percentage points with two decimals ("34.53 pp").
func fmtWidth(v float64) string {
	return signless(100*v, 2) + " pp"
}
