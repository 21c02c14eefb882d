package notebookui

import (
	"fmt"
	"strings"
	"unicode"
	"unicode/utf8"

	"github.com/propscope/propscope/proportions"
)

// cardView is everything a card shows, already worded and formatted; the
// HTML, Markdown and text renderers lay out the same view, so the three
// forms always say the same thing. Strings here are raw: each renderer
// escapes them for its own format.
type cardView struct {
	Title      string
	Event      string
	First      string
	Second     string
	Difference string // "+15.0"
	Level      string // "95%"
	Lower      string
	Upper      string
	Method     string // headline interval's name
	Verdict    string // one line: headline test, p, decision
	Strip      *strip // nil when the interval cannot be drawn
	Groups     groupTable
	Hypothesis string
	Tests      []testRow
	// StatNotes say in words why a statistic shows a dash or "unbounded".
	StatNotes  []string
	Conclusion string
	Warnings   []string
	NotRun     string // which methods the analysis's scope left out, or ""
	Sections   []methodSection
	References []Reference
	// Bounds are the unconditional tests' proven bounds, one line each,
	// shown in the folded sources.
	Bounds  []string
	Caution string
}

type groupTable struct {
	EventHeader    string // "germinated"
	ShareHeader    string // "Share germinated"
	IntervalHeader string // "95% interval (Wilson)", empty when none
	Rows           []groupRow
}

type groupRow struct {
	Label, Events, Trials, Share, Interval string
}

type testRow struct {
	Name, Statistic, P, Decision string
	Headline                     bool
}

// methodSection is one scale's intervals in the folded table.
type methodSection struct {
	Title string
	Unit  string // column unit note: "percentage points" or "1 = no difference"
	Rows  []methodRow
}

// HasNotes reports whether any row has a note; the Note column is shown
// only then.
func (s methodSection) HasNotes() bool {
	for _, r := range s.Rows {
		if r.Note != "" {
			return true
		}
	}
	return false
}

type methodRow struct {
	Name, Estimate, Lower, Upper, Note string
	Headline                           bool
}

// Reference is a published method and the paper it comes from.
type Reference struct {
	Name     string `json:"name"`
	Citation string `json:"citation"`
}

// referenceLookup finds a method's reference by the kind of method
// ("interval", "rate" or "test") and its key.
type referenceLookup func(kind, key string) (Reference, bool)

// registryReference looks a method up in the proportions registry.
func registryReference(kind, key string) (Reference, bool) {
	switch kind {
	case "interval":
		if m, err := proportions.LookupInterval(key); err == nil {
			return Reference{m.Name, m.Citation}, true
		}
	case "rate":
		if m, err := proportions.LookupRate(key); err == nil {
			return Reference{m.Name, m.Citation}, true
		}
	case "test":
		if m, err := proportions.LookupTest(key); err == nil {
			return Reference{m.Name, m.Citation}, true
		}
	}
	return Reference{}, false
}

func (c ResultCard) view() cardView {
	a := c.Analysis
	cmp := a.Comparison
	v := cardView{
		Title:      c.Title,
		Event:      cmp.Event,
		First:      cmp.First.Label,
		Second:     cmp.Second.Label,
		Difference: points(a.Difference, 1),
		Level:      levelText(a.Interval.Level),
		Lower:      points(a.Interval.Lower, 1),
		Upper:      points(a.Interval.Upper, 1),
		Method:     a.Interval.MethodName,
		Verdict:    verdict(a),
		Strip:      stripOf(a),
		Groups:     groupsOf(a),
		Hypothesis: hypothesis(a),
		Tests:      testsOf(a),
		StatNotes:  statisticNotes(a.Tests),
		Conclusion: a.Conclusion,
		Caution:    a.Caution,
	}
	if v.Title == "" {
		v.Title = fmt.Sprintf("%s: %s vs %s", capitalize(cmp.Event), cmp.First.Label, cmp.Second.Label)
	}
	if v.Caution == "" {
		v.Caution = proportions.Caution
	}
	for _, w := range a.Warnings {
		v.Warnings = append(v.Warnings, w.Message)
	}
	v.Sections = sectionsOf(a)
	v.Bounds = boundsOf(a)
	lookup := c.lookup
	if lookup == nil {
		lookup = registryReference
	}
	v.NotRun = notRun(a, lookup)
	v.References = referencesOf(a, lookup)
	return v
}

// verdict is the headline test in one line, its decision in words.
func verdict(a proportions.Analysis) string {
	t := a.Test
	if t.MethodName == "" {
		return ""
	}
	stat := ""
	if s := statistic(t); s != "—" {
		stat = s + ", "
	}
	return fmt.Sprintf("%s: %s%s; %s at the %s level.", t.MethodName, stat,
		pClause(t.PValue), decision(a, t), levelText(1-t.Level))
}

// decision words a test's outcome; it never says "accept".
func decision(a proportions.Analysis, t proportions.TestResult) string {
	null := nullWords(a)
	if t.Reject {
		return "rejects " + null
	}
	return "does not reject " + null
}

// nullWords names the null hypothesis in plain words: for a one-sided
// alternative the null is the whole other side.
func nullWords(a proportions.Analysis) string {
	switch {
	case a.Alternative == proportions.Greater:
		return "a difference of " + points(a.Null, 1) + " points or less"
	case a.Alternative == proportions.Less:
		return "a difference of " + points(a.Null, 1) + " points or more"
	case a.Null == 0:
		return "equal rates"
	}
	return "a difference of " + points(a.Null, 1) + " points"
}

func hypothesis(a proportions.Analysis) string {
	cmp := a.Comparison
	diff := fmt.Sprintf("%s − %s", cmp.First.Label, cmp.Second.Label)
	null := points(a.Null, 1)
	// The null and the alternative split the line between them.
	nullRel, altRel := "=", "≠"
	switch a.Alternative {
	case proportions.Greater:
		nullRel, altRel = "≤", ">"
	case proportions.Less:
		nullRel, altRel = "≥", "<"
	}
	return fmt.Sprintf("Null hypothesis: %s %s %s points; alternative: %s %s %s (%s). Level of each test: %s.",
		diff, nullRel, null, diff, altRel, null, a.Alternative, levelText(1-a.Level))
}

func groupsOf(a proportions.Analysis) groupTable {
	t := groupTable{
		EventHeader: capitalize(a.Comparison.Event),
		ShareHeader: "Share " + a.Comparison.Event,
	}
	if ivs := a.Groups[0].Intervals; len(ivs) > 0 {
		t.IntervalHeader = fmt.Sprintf("%s interval (%s)", levelText(ivs[0].Level), ivs[0].MethodName)
	}
	for _, g := range a.Groups {
		row := groupRow{
			Label:  g.Group.Label,
			Events: fmt.Sprint(g.Group.Events),
			Trials: fmt.Sprint(g.Group.Trials),
			Share:  percent(g.Rate, 1),
		}
		if len(g.Intervals) > 0 {
			iv := g.Intervals[0]
			row.Interval = percent(iv.Lower, 1) + " to " + percent(iv.Upper, 1)
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

func testsOf(a proportions.Analysis) []testRow {
	rows := make([]testRow, 0, len(a.Tests))
	for _, t := range a.Tests {
		rows = append(rows, testRow{
			Name:      t.MethodName,
			Statistic: statistic(t),
			P:         pValue(t.PValue),
			Decision:  decision(a, t),
			Headline:  t.Method == a.Test.Method && a.Test.Method != "",
		})
	}
	return rows
}

func sectionsOf(a proportions.Analysis) []methodSection {
	var out []methodSection
	if len(a.DifferenceIntervals) > 0 {
		s := methodSection{Title: "Difference " + a.Comparison.First.Label + " − " + a.Comparison.Second.Label, Unit: "percentage points"}
		for _, iv := range a.DifferenceIntervals {
			r := methodRow{Name: iv.MethodName, Estimate: points(iv.Estimate, 2), Lower: points(iv.Lower, 2), Upper: points(iv.Upper, 2),
				Headline: iv.Method == a.Interval.Method}
			if iv.Clipped {
				r.Note = fmt.Sprintf("cut to the possible range; formula gave %s to %s", points(iv.RawLower, 2), points(iv.RawUpper, 2))
			}
			s.Rows = append(s.Rows, r)
		}
		out = append(out, s)
	}
	for _, f := range []struct {
		title string
		ivs   []proportions.Interval
	}{{"Ratio of rates " + a.Comparison.First.Label + " / " + a.Comparison.Second.Label, a.RatioIntervals},
		{"Odds ratio " + a.Comparison.First.Label + " / " + a.Comparison.Second.Label, a.OddsRatioIntervals}} {
		if len(f.ivs) == 0 {
			continue
		}
		s := methodSection{Title: f.title, Unit: "1 = no difference"}
		for _, iv := range f.ivs {
			r := methodRow{Name: iv.MethodName, Estimate: ratio(iv.Estimate), Lower: ratio(iv.Lower), Upper: ratio(iv.Upper)}
			if !iv.Defined {
				r.Note = "not estimable from these counts (0/0)"
			}
			s.Rows = append(s.Rows, r)
		}
		out = append(out, s)
	}
	return out
}

// referencesOf lists each method the analysis used once, in the order the
// card shows them: headline pair, group intervals, tests, other intervals.
// notRun names the methods the analysis's scope left out, in one
// sentence that says how to add them.
func notRun(a proportions.Analysis, lookup referenceLookup) string {
	if len(a.Omitted) == 0 {
		return ""
	}
	var names []string
	for _, key := range a.Omitted {
		name := key
		for _, kind := range [...]string{"test", "interval", "rate"} {
			if r, ok := lookup(kind, key); ok {
				name = r.Name
				break
			}
		}
		names = append(names, name)
	}
	list := strings.Join(names, ", ")
	if a.Scope == proportions.ScopeLargeSample {
		return "Large-sample analysis. Left out: the exact and conditional methods and the costlier ones (" + list + ")."
	}
	return "Quick analysis. Left out for their cost (tens of microseconds to seconds each): " + list +
		". An analysis with every method (scope \"all\") adds them."
}

func referencesOf(a proportions.Analysis, lookup referenceLookup) []Reference {
	var refs []Reference
	seen := map[string]bool{}
	add := func(kind, key string) {
		if key == "" || seen[kind+"/"+key] {
			return
		}
		seen[kind+"/"+key] = true
		if r, ok := lookup(kind, key); ok && r.Citation != "" {
			refs = append(refs, r)
		}
	}
	add("interval", a.Interval.Method)
	add("test", a.Test.Method)
	for _, g := range a.Groups {
		for _, iv := range g.Intervals {
			add("rate", iv.Method)
		}
	}
	for _, t := range a.Tests {
		add("test", t.Method)
	}
	for _, ivs := range [][]proportions.Interval{a.DifferenceIntervals, a.RatioIntervals, a.OddsRatioIntervals} {
		for _, iv := range ivs {
			add("interval", iv.Method)
		}
	}
	return dedupeCitations(refs)
}

// dedupeCitations merges methods that cite the same paper (a test and the
// interval that inverts it, say) into one entry naming both.
func dedupeCitations(refs []Reference) []Reference {
	var out []Reference
	index := map[string]int{}
	for _, r := range refs {
		if i, ok := index[r.Citation]; ok {
			out[i].Name += "; " + r.Name
			continue
		}
		index[r.Citation] = len(out)
		out = append(out, r)
	}
	return out
}

// capitalize upper-cases the first letter ("germinated" → "Germinated").
func capitalize(s string) string {
	r, size := utf8.DecodeRuneInString(s)
	if r == utf8.RuneError {
		return s
	}
	return string(unicode.ToUpper(r)) + s[size:]
}

// boundsOf words each unconditional test's proven bound on its p-value
// (TestResult.PValueBound) in one line.
func boundsOf(a proportions.Analysis) []string {
	var out []string
	for _, t := range a.Tests {
		if t.PValueBound == nil {
			continue
		}
		out = append(out, fmt.Sprintf("%s: p = %s, proven bound %s", t.MethodName,
			sci(t.PValue, 10), sci(*t.PValueBound, 10)))
	}
	return out
}
