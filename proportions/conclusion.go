package proportions

import (
	"strconv"
	"strings"
)

// conclusion reads the headline test and interval in plain language. A
// non-rejection is never read as equality: it says which differences the
// interval still allows.
//
// The sentences are appended to one buffer rather than formatted with fmt:
// the conclusion is part of every analysis, and formatting it piecewise
// cost about as much as all the interval methods together.
func conclusion(a Analysis) string {
	c := a.Comparison
	first, second := c.First.Label, c.Second.Label
	p := PValueClause(a.Test.PValue)
	alpha := levelPercent(1 - a.Level)
	var w prose
	w.Grow(512)
	w.add(first, ": ")
	w.int(c.First.Events)
	w.add(" of ")
	w.int(c.First.Trials)
	w.add(" ", c.Event, " (")
	w.percent(c.First.Proportion())
	w.add("); ", second, ": ")
	w.int(c.Second.Events)
	w.add(" of ")
	w.int(c.Second.Trials)
	w.add(" (")
	w.percent(c.Second.Proportion())
	w.add("). The difference ", first, " − ", second, " is ")
	w.points(a.Difference)
	w.add(" percentage points (", levelPercent(a.Interval.Level), " confidence interval ")
	w.points(a.Interval.Lower)
	w.add(" to ")
	w.points(a.Interval.Upper)
	w.add("). ")
	switch a.Alternative {
	case TwoSided:
		w.twoSidedVerdict(a, alpha, p)
	case Greater:
		w.oneSidedVerdict(a, alpha, p, "more than", "lower confidence bound", a.Interval.Lower)
	default:
		w.oneSidedVerdict(a, alpha, p, "less than", "upper confidence bound", a.Interval.Upper)
	}
	return w.String()
}

func (w *prose) twoSidedVerdict(a Analysis, alpha, p string) {
	c := a.Comparison
	nullWords := func() {
		if a.Null == 0 {
			w.add("equal rates")
			return
		}
		w.add("a difference of ")
		w.points(a.Null)
		w.add(" percentage points")
	}
	if a.Test.Reject {
		w.add("The ", testName(a), " rejects ")
		nullWords()
		w.add(" at the ", alpha, " level (", p, "): ")
		higher := a.Difference >= a.Null
		switch {
		case a.Null != 0 && higher:
			w.add("the difference is larger than ")
		case a.Null != 0:
			w.add("the difference is smaller than ")
		case higher:
			w.add("the ", c.Event, " rate is higher for ", c.First.Label, " than for ", c.Second.Label, ".")
			return
		default:
			w.add("the ", c.Event, " rate is lower for ", c.First.Label, " than for ", c.Second.Label, ".")
			return
		}
		w.points(a.Null)
		w.add(" percentage points.")
		return
	}
	w.add("The ", testName(a), " does not reject ")
	nullWords()
	w.add(" at the ", alpha, " level (", p, "). This does not show that ")
	if a.Null == 0 {
		w.add("the rates are equal")
	} else {
		w.add("the difference is ")
		w.points(a.Null)
		w.add(" percentage points")
	}
	w.add(": the interval still allows differences from ")
	w.points(a.Interval.Lower)
	w.add(" to ")
	w.points(a.Interval.Upper)
	w.add(" percentage points.")
}

func (w *prose) oneSidedVerdict(a Analysis, alpha, p, side, bound string, limit float64) {
	c := a.Comparison
	claim := func() {
		w.add("the difference ", c.First.Label, " − ", c.Second.Label, " is ", side, " ")
		w.points(a.Null)
		w.add(" percentage points")
	}
	if a.Test.Reject {
		w.add("At the one-sided ", alpha, " level the data show that ")
		claim()
		w.add(" (", testName(a), ", ", p, "; the ", bound, " ")
		w.points(limit)
		w.add(" is beyond it)")
		w.marginReading(a, true)
		w.add(".")
		return
	}
	w.add("At the one-sided ", alpha, " level the data do not show that ")
	claim()
	w.add(" (", testName(a), ", ", p, "; the ", bound, " is ")
	w.points(limit)
	w.add(")")
	w.marginReading(a, false)
	w.add(". Failing to show it is not evidence of the opposite.")
}

// marginReading names the usual reading of a one-sided margin test.
func (w *prose) marginReading(a Analysis, shown bool) {
	c := a.Comparison
	verb := "not "
	if shown {
		verb = ""
	}
	switch {
	case a.Alternative == Greater && a.Null < 0, a.Alternative == Less && a.Null > 0:
		w.add(": non-inferiority of ", c.First.Label, " to ", c.Second.Label, " within a margin of ")
		w.Write(appendFixed1(w.scratch[:0], 100*abs(a.Null)))
		w.add(" percentage points is ", verb, "shown")
	case a.Null == 0:
		w.add(": superiority in that direction is ", verb, "shown")
	}
}

// prose is a sentence under construction. A strings.Builder hands over its
// text without copying it; numbers are formatted in a small scratch buffer.
type prose struct {
	strings.Builder
	scratch [32]byte
}

func (w *prose) add(parts ...string) {
	for _, s := range parts {
		w.WriteString(s)
	}
}

func (w *prose) int(v int64) { w.Write(strconv.AppendInt(w.scratch[:0], v, 10)) }

// points appends a difference of proportions as signed percentage points
// with one decimal and the typographic minus ("+16.0", "−1.2"), as the
// card prints it (reader_numbers.go).
func (w *prose) points(v float64) { w.Write(appendSigned(w.scratch[:0], 100*v, 1)) }

// percent appends a proportion as a percentage with one decimal.
func (w *prose) percent(v float64) {
	w.Write(appendFixed1(w.scratch[:0], 100*v))
	w.WriteByte('%')
}

// testName is the headline test's name as the card prints it, so the
// conclusion and the card call it the same.
func testName(a Analysis) string {
	if a.Test.MethodName == "" {
		return "test"
	}
	return a.Test.MethodName
}

func abs(v float64) float64 {
	if v < 0 {
		return -v
	}
	return v
}

func percent(v float64) string {
	var buf [32]byte
	return string(append(appendFixed1(buf[:0], 100*v), '%'))
}

// levelPercent prints a level or α as a percentage with up to 4 significant
// digits ("95%", "2.5%").
func levelPercent(v float64) string {
	var buf [32]byte
	return string(append(appendSignificant4(buf[:0], 100*v), '%'))
}
