package notebookui

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/planning"
	"github.com/propscope/propscope/proportions/strata"
)

// The script-injection payload of issue 20: a group label wrapped in the
// go-echarts code marker, which used to be pasted into the chart option as
// bare JavaScript.
const markerPayload = `__f__(document.title='PWNED-'+document.domain)__f__`

// hostileLabelSeeds are labels aimed at every way text could turn into code
// or markup: the code marker, our own code token, script and comment ends,
// quotes of each kind, backslashes, JavaScript line separators, Markdown
// and echarts rich text.
var hostileLabelSeeds = []string{
	markerPayload,
	funcMarker + "function(){document.title='x'}" + funcMarker,
	`__f__alert(1)`, `alert(1)__f__`, funcMarker + funcMarker,
	`\/propscope-code\/alert(1)`, `"\/propscope-code\/alert(1)"`, `/propscope-code/alert(1)`,
	`\`, `\\`, `"`, `'`, "`", `\"`, `\u0022`,
	`</script><script>alert(1)</script>`, `</SCRIPT >`, `<!--`, `-->`, `<![CDATA[`, `]]>`,
	`<img src=x onerror=alert(2)>`, `"><svg onload=alert(3)>'`, `" onmouseover="alert(4)`,
	"line\u2028sep\u2029", "nul\x00byte", "bad utf8 \xff\xfe", "cr\rlf\n",
	`{a|rich}`, `{b}`, `${alert(5)}`, `*x* _y_ [l](javascript:alert(6)) ![i](http://x/y.png)`,
	"", " ", "同じ",
}

// labelViews builds every view a label reaches: the charts that print
// labels (rates, difference intervals, confidence curve, power by size and
// by difference), the result card and a hand-made explorer frame around a
// chart, the card and a message.
func labelViews(t testing.TB, first, second, event string) (names []string, ds []Displayable) {
	t.Helper()
	a := sampleAnalysis(first, second)
	a.Comparison.Event = event
	a.Conclusion = "rates differ for " + first
	a.Warnings = []proportions.Warning{{Code: "x", Message: second}}
	add := func(name string, d Displayable, err error) {
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		names = append(names, name)
		ds = append(ds, d)
	}
	rates, err := RatesChart(a)
	add("rates chart", rates, err)
	diff, err := DifferenceIntervalsChart(a, WithHighlightedMethod("mee", "because "+first))
	add("difference chart", diff, err)
	cc := ConfidenceCurve{Method: "farrington-manning-test", MethodName: second, Level: 0.95,
		Deltas: []float64{-0.2, 0, 0.2, 0.4}, PValues: []float64{0.001, 0.1, 0.9, 0.05},
		Estimate: 0.2, Lower: -0.05, Upper: 0.38}
	curve, err := ConfidenceCurveChartFrom(cc, a.Comparison)
	add("confidence curve chart", curve, err)
	d := planning.NewPlan(planning.Equality, 0.60, 0.75)
	bySize := planning.PowerCurve{Plan: d, Basis: first, Axis: "n1", Points: []planning.PowerPoint{
		{N1: 10, N2: 10, Power: 0.2}, {N1: 100, N2: 100, Power: 0.7}, {N1: 200, N2: 200, Power: 0.9}}}
	power, err := PowerChart([]planning.PowerCurve{bySize})
	add("power-by-size chart", power, err)
	byDiff := planning.PowerCurve{Plan: d, Basis: event, Axis: "rate1", Points: []planning.PowerPoint{
		{N1: 100, N2: 100, Rate1: 0.6, Power: 0.05}, {N1: 100, N2: 100, Rate1: 0.7, Difference: -0.05, Power: 0.4},
		{N1: 100, N2: 100, Rate1: 0.9, Difference: 0.15, Power: 0.9}}}
	powerDiff, err := PowerChart([]planning.PowerCurve{byDiff})
	add("power-by-difference chart", powerDiff, err)
	card := ResultCard{Analysis: a, lookup: fixedReferences}
	add("result card", card, nil)
	frame := Frame{Explorer: "what-if", Title: first, Note: "note " + second,
		Settings: []Setting{{Key: "x1", Label: first, Value: second}, {Key: "n1", Label: event, Value: event}},
		View:     views{rates, card, message{kind: "message", text: event}}}
	add("explorer frame", frame, nil)
	add("segments card", segmentsCardFor(t, first, second, event), nil)
	segForest, err := SegmentsForestChart(segmentsCardFor(t, first, second, event).Result, 4)
	add("segments forest chart", segForest, err)
	sim, err := SimulatedCoverageChart(handCurve(event, first, second))
	add("simulated coverage chart", sim, err)
	// the cluster column named by the event label, so that a label reaches
	// the card's headings and sentences too
	cd, err := clusters.New(event, proportions.Labels{First: first, Second: second, Event: event},
		[]clusters.Cluster{{Value: "t1", Events: 3, Trials: 8}, {Value: "t2", Events: 6, Trials: 9}},
		[]clusters.Cluster{{Value: "t3", Events: 1, Trials: 7}, {Value: "t4", Events: 4, Trials: 10}})
	if err != nil {
		t.Fatalf("clustered data: %v", err)
	}
	ca, err := clusters.Analyze(cd)
	add("cluster card", NewClusterCard(ca), err)
	grid, err := planning.ClusteredPowerByClusters(d, 0.05, 0, []float64{5, 20}, []int64{4, 8})
	if err != nil {
		t.Fatalf("clustered power: %v", err)
	}
	cp, err := ClusteredPowerChart(grid)
	add("clustered power chart", cp, err)
	forest, err := ForestChart(Forest{Title: "by " + event, Subtitle: first + " − " + second, Effect: event, Scale: proportions.Difference, Level: 0.95,
		Rows: []ForestRow{{Label: first, Estimate: 0.1, Lower: -0.05, Upper: 0.25, Weight: 0.6, Note: second},
			{Label: second, Estimate: math.NaN(), Lower: math.NaN(), Upper: math.NaN(), Note: event}},
		Summary: &ForestRow{Label: event, Estimate: 0.08, Lower: 0.01, Upper: 0.15}, Notes: []string{first}})
	add("forest chart", forest, err)
	sa := strataAnalysis(t, first, second, event)
	add("stratified card", NewStrataCard(sa), nil)
	sf, err := StrataForestChart(sa)
	add("stratified forest chart", sf, err)
	ba := bayesBase(t)
	ba.Comparison.First.Label, ba.Comparison.Second.Label, ba.Comparison.Event = first, second, event
	ba.Groups[0].Group.Label, ba.Groups[1].Group.Label = first, second
	add("Bayesian card", NewBayesCard(ba), nil)
	return names, ds
}

// segmentsCardFor is the segments card of the fixture with the labels as
// the groups, the event, the breakdown column and a segment's value.
func segmentsCardFor(t testing.TB, first, second, event string) SegmentsCard {
	c := segmentsFixture(t)
	c.Result.First, c.Result.Second, c.Result.Event, c.Result.By = first, second, event, second
	c.Result.Segments[0].Value = first
	c.Result.Segments[3].Value = event // the empty segment, in the flagged table
	return c
}

// bayesBase is a Bayesian analysis with an equivalence region, computed
// once (its numbers do not depend on the labels, which each fuzz input
// sets; the posterior chart, which integrates its curves anew each time,
// is checked by TestPosteriorChartEscapesLabels instead).
var bayesBase = func() func(t testing.TB) bayes.Analysis {
	var once sync.Once
	var a bayes.Analysis
	var err error
	return func(t testing.TB) bayes.Analysis {
		once.Do(func() {
			a, err = bayes.Analyze(proportions.Comparison{First: proportions.Group{Label: "a", Events: 41, Trials: 50},
				Second: proportions.Group{Label: "b", Events: 33, Trials: 50}, Event: "e"}, bayes.WithEquivalence(-0.05, 0.05))
		})
		if err != nil {
			t.Fatalf("Bayesian analysis: %v", err)
		}
		return a
	}
}()

// strataAnalysis is a small stratified analysis whose group labels,
// event, breakdown column and block values are the given labels (a block
// value cannot be empty or repeated, so the labels are prefixed).
func strataAnalysis(t testing.TB, first, second, event string) strata.Analysis {
	t.Helper()
	rows := []proportions.BreakdownRow{
		{Value: "1 " + first, Counts: proportions.Counts{X1: 9, N1: 10, X2: 30, N2: 40}},
		{Value: "2 " + second, Counts: proportions.Counts{X1: 20, N1: 40, X2: 3, N2: 10}},
		{Value: "3 " + event, Counts: proportions.Counts{X1: 4, N1: 6}},
	}
	b, err := proportions.NewBreakdown(event, proportions.Labels{First: first, Second: second, Event: event}, rows)
	if err != nil {
		t.Fatal(err)
	}
	a, err := strata.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// renders is labelViews as HTML with their JSON forms, and Page.
func renders(t testing.TB, first, second, event string) (names, pages []string, jsons [][]byte) {
	t.Helper()
	names, ds := labelViews(t, first, second, event)
	for i, d := range ds {
		pages = append(pages, d.HTML())
		b, err := d.JSON()
		if err != nil {
			t.Fatalf("%s: JSON: %v", names[i], err)
		}
		jsons = append(jsons, b)
	}
	// Page around the card alone: a page with a chart adds only the fixed
	// engine script (about 1 MB, which would slow fuzzing a hundredfold)
	// to the same fragments; TestMarkerPayloadIsNotCode checks that page.
	names = append(names, "page")
	pages = append(pages, Page(first, ds[5]))
	return names, pages, jsons
}

// whatIfFrame is the what-if explorer's own frame for the labels, with the
// quick methods so that a fuzz run stays fast.
func whatIfFrame(t testing.TB, first, second, event string) string {
	t.Helper()
	c := proportions.Comparison{First: proportions.Group{Label: first, Events: 3, Trials: 10},
		Second: proportions.Group{Label: second, Events: 7, Trials: 10}, Event: event}
	e := WhatIfExplorer{Comparison: c, SliderMaxTrials: 20, Analysis: []proportions.Option{
		proportions.WithScope(proportions.ScopeQuick)}}
	f, err := e.Frame(3, 10, 7, 10)
	if err != nil {
		t.Fatalf("what-if frame: %v", err)
	}
	return f.HTML()
}

// benign holds the skeletons of the views rendered once with plain
// labels: the reference every fuzzed rendering is compared with.
var benign struct {
	once      sync.Once
	names     []string
	skeletons []string
}

// FuzzLabelsStayData renders arbitrary labels (both groups and the event)
// through every chart, the card, explorer frames and Page, and checks the
// output's structure against the same views rendered with plain labels:
// the same elements and attributes, and in every script the same code once
// the contents of its string literals are set aside. A label that became
// code or markup anywhere changes that skeleton. The JSON forms must stay
// valid JSON, and the rates chart's option must give the labels back as
// data.
func FuzzLabelsStayData(f *testing.F) {
	for i, s := range hostileLabelSeeds {
		f.Add(s, hostileLabelSeeds[(i+1)%len(hostileLabelSeeds)], hostileLabelSeeds[(i+7)%len(hostileLabelSeeds)])
	}
	f.Add(markerPayload, markerPayload, markerPayload)
	f.Fuzz(func(t *testing.T, first, second, event string) {
		checkLabelsStayData(t, capLabel(first), capLabel(second), capLabel(event))
	})
}

// fuzzLabelBytes is the longest label the fuzz targets render. Rendering
// cost is linear in a label's length, but each label lands in the views
// about 140 times (axis, tooltips, legend, table, notes, the JSON forms
// and the frames around them), so an execution costs about 2 µs per byte
// of label on top of about 5 ms; the fuzzer lengthens its inputs as long
// as a longer one reaches new code, and minimises each such input for up
// to a minute of executions, which brought runs to a near stall once
// labels reached tens of kilobytes. Nothing in the views depends on a
// label's length beyond a few hundred bytes (wrapping widths, shortened
// forms), so longer inputs are cut here, which also stops the fuzzer from
// growing them (a cut input reaches no new code), and
// TestLongLabelsStayData runs the same check on hostile labels of 64 kB.
const fuzzLabelBytes = 512

// capLabel cuts a fuzz input to fuzzLabelBytes (possibly inside a UTF-8
// sequence: invalid UTF-8 is part of what the targets feed anyway).
func capLabel(s string) string { return s[:min(len(s), fuzzLabelBytes)] }

// checkLabelsStayData is the body of FuzzLabelsStayData (also run by
// TestLongLabelsStayData and timed by BenchmarkLabelsStayData).
func checkLabelsStayData(t testing.TB, first, second, event string) {
	t.Helper()
	benign.once.Do(func() {
		names, pages, _ := renders(t, "alpha", "beta", "gamma")
		pages = append(pages, whatIfFrame(t, "alpha", "beta", "gamma"))
		benign.names = append(names, "what-if explorer frame")
		for i, p := range pages {
			sk, err := pageSkeleton(p)
			if err != nil {
				t.Fatalf("%s (plain labels): %v", benign.names[i], err)
			}
			benign.skeletons = append(benign.skeletons, sk)
		}
	})
	_, pages, jsons := renders(t, first, second, event)
	pages = append(pages, whatIfFrame(t, first, second, event))
	names := benign.names
	for i := range pages {
		got, err := pageSkeleton(pages[i])
		if err != nil {
			t.Fatalf("%s: %v", names[i], err)
		}
		if ref := benign.skeletons[i]; got != ref {
			t.Fatalf("%s: the labels %q, %q, %q changed the page's structure or code:\n%s",
				names[i], first, second, event, firstDifference(ref, got))
		}
	}
	for i, b := range jsons {
		if !json.Valid(b) {
			t.Fatalf("%s: JSON form is not valid JSON", names[i])
		}
	}
	checkLabelsAsData(t, pages[0], first, second)
}

// checkLabelsAsData decodes the option expression of the rates chart's
// script (JSON with our callbacks as code) after setting the callbacks
// aside, and checks that the category axis holds the labels as strings.
func checkLabelsAsData(t testing.TB, page, first, second string) {
	t.Helper()
	const start = "var option = function () { return "
	i := strings.Index(page, start)
	j := strings.Index(page, "; };\n  var light")
	if i < 0 || j < i {
		t.Fatal("rates chart: no option expression in the script")
	}
	expr := page[i+len(start) : j]
	// Our callbacks are the only code: each is a "function (" ... "}" at
	// a value position. Replace them by null, counting braces outside the
	// JSON strings, and the rest must be JSON.
	var b strings.Builder
	for k := 0; k < len(expr); {
		if expr[k] == '"' {
			end := stringEnd(expr, k)
			b.WriteString(expr[k:end])
			k = end
			continue
		}
		if strings.HasPrefix(expr[k:], "function (") {
			depth, m := 0, k
			for ; m < len(expr); m++ {
				if expr[m] == '{' {
					depth++
				} else if expr[m] == '}' {
					depth--
					if depth == 0 {
						break
					}
				}
			}
			b.WriteString("null")
			k = m + 1
			continue
		}
		b.WriteByte(expr[k])
		k++
	}
	var opt struct {
		YAxis []struct {
			Data []string `json:"data"`
		} `json:"yAxis"`
	}
	if err := json.Unmarshal([]byte(b.String()), &opt); err != nil {
		t.Fatalf("rates chart: the option, callbacks set aside, is not JSON: %v", err)
	}
	if len(opt.YAxis) == 0 || len(opt.YAxis[0].Data) != 2 {
		t.Fatalf("rates chart: category axis %+v", opt.YAxis)
	}
	for k, want := range []string{first, second} {
		// encoding/json writes each invalid UTF-8 byte as U+FFFD.
		var wantData string
		wb, _ := json.Marshal(want)
		_ = json.Unmarshal(wb, &wantData)
		if got := opt.YAxis[0].Data[k]; got != wantData {
			t.Errorf("rates chart: category %d = %q, want the label %q as data", k, got, want)
		}
	}
}

// stringEnd returns the index just past the double-quoted string literal
// starting at s[i], following backslash escapes.
func stringEnd(s string, i int) int {
	j := i + 1
	for j < len(s) && s[j] != '"' {
		if s[j] == '\\' {
			j++
		}
		j++
	}
	return min(j+1, len(s))
}

// pageSkeleton is the skeleton of a rendered view with the chart engine's
// script (about 1 MB of fixed code, the same in every page that has it)
// set aside. The engine is found by its opening tag and compared whole,
// which costs one pass over the page: a search for the whole script as a
// pattern (strings.ReplaceAll) hashes its megabyte on every call.
func pageSkeleton(page string) (string, error) {
	engine := engineScriptOnce()
	open := engine[:strings.IndexByte(engine, '>')+1]
	for {
		i := strings.Index(page, open)
		if i < 0 || !strings.HasPrefix(page[i:], engine) {
			break
		}
		page = page[:i] + page[i+len(engine):]
	}
	return skeleton(page)
}

// engineScriptOnce is EngineScript, built once per test binary.
var engineScriptOnce = sync.OnceValue(EngineScript)

// skeleton reduces an HTML fragment or page to what must not depend on
// user text: each tag with its name and attribute names (values set
// aside), style elements verbatim, and each script with its double-quoted
// string literals emptied. Text between tags is left out. It fails on a
// tag or string that does not end.
func skeleton(h string) (string, error) {
	var b strings.Builder
	// ASCII lower case keeps byte offsets (strings.ToLower would turn
	// invalid UTF-8 into longer replacement characters).
	lb := []byte(h)
	for k, c := range lb {
		if 'A' <= c && c <= 'Z' {
			lb[k] = c + 'a' - 'A'
		}
	}
	lower := string(lb)
	for i := 0; i < len(h); {
		if h[i] != '<' {
			i++
			continue
		}
		// A tag: copy it with quoted attribute values emptied.
		open := i
		j := i + 1
		for j < len(h) && h[j] != '>' {
			if q := h[j]; (q == '"' || q == '\'') && h[j-1] == '=' {
				k := strings.IndexByte(h[j+1:], q)
				if k < 0 {
					return "", fmt.Errorf("attribute value at byte %d does not end", j)
				}
				b.WriteString(h[i:j+1] + string(q))
				i = j + 1 + k + 1
				j = i
				continue
			}
			j++
		}
		if j >= len(h) {
			return "", fmt.Errorf("tag at byte %d does not end", open)
		}
		b.WriteString(h[i:j+1] + "\n")
		name := ""
		if f := strings.FieldsFunc(h[open+1:j+1], func(r rune) bool {
			return r == ' ' || r == '>' || r == '\t' || r == '\n'
		}); len(f) > 0 {
			name = strings.ToLower(f[0])
		}
		i = j + 1
		if name != "script" && name != "style" {
			continue
		}
		end := strings.Index(lower[i:], "</"+name)
		if end < 0 {
			return "", fmt.Errorf("<%s> at byte %d does not end", name, i)
		}
		body := h[i : i+end]
		if name == "script" {
			body = emptyStrings(body)
		}
		b.WriteString(body + "\n")
		i += end
	}
	return b.String(), nil
}

// emptyStrings empties every double-quoted string literal of a script.
func emptyStrings(s string) string {
	var b bytes.Buffer
	for i := 0; i < len(s); {
		if s[i] == '"' {
			i = stringEnd(s, i)
			b.WriteString(`""`)
			continue
		}
		b.WriteByte(s[i])
		i++
	}
	return b.String()
}

// firstDifference shows where two skeletons part.
func firstDifference(want, got string) string {
	i := 0
	for i < len(want) && i < len(got) && want[i] == got[i] {
		i++
	}
	from := max(0, i-120)
	return fmt.Sprintf("plain labels: …%s…\nthese labels: …%s…", want[from:min(len(want), i+120)], got[from:min(len(got), i+120)])
}

// TestMarkerPayloadIsNotCode pins the reproducer without the fuzz
// machinery: the payload must reach the rates chart's script only inside a
// JSON string, never as the bare expression the old marker handling made
// of it, and a whole page of that chart must have the skeleton of the page
// with plain labels.
func TestMarkerPayloadIsNotCode(t *testing.T) {
	a := sampleAnalysis(markerPayload, "untreated")
	c, err := RatesChart(a)
	if err != nil {
		t.Fatal(err)
	}
	plain, err := RatesChart(sampleAnalysis("primed", "untreated"))
	if err != nil {
		t.Fatal(err)
	}
	got, err := skeleton(c.Page())
	if err != nil {
		t.Fatal(err)
	}
	want, err := skeleton(plain.Page())
	if err != nil {
		t.Fatal(err)
	}
	if got != want {
		t.Errorf("the payload changed the page's structure or code:\n%s", firstDifference(want, got))
	}
	h := c.HTML()
	if strings.Contains(h, "(document.title='PWNED-'+document.domain)") &&
		!strings.Contains(h, `"`+markerPayload+`"`) {
		t.Fatal("the payload reached the script outside a string")
	}
	if !strings.Contains(h, `"`+markerPayload+`"`) {
		t.Error("the payload is not in the option as a JSON string")
	}
	script := h[strings.LastIndex(h, "<script"):]
	if strings.Contains(emptyStrings(script), "document.title") {
		t.Error("document.title appears in the script outside string literals")
	}
}

// FuzzOptionStringsStayData is the fast core of FuzzLabelsStayData: an
// option holding an arbitrary string beside our callbacks, at the places
// labels take (a value, an array element, a nested map, a map key). The
// script form must have the code skeleton of the same option with a plain
// string, and the JSON form must give the string back.
func FuzzOptionStringsStayData(f *testing.F) {
	for _, s := range hostileLabelSeeds {
		f.Add(s)
	}
	option := func(s string) map[string]any {
		return map[string]any{
			"title":   map[string]any{"text": s},
			"yAxis":   []any{map[string]any{"data": []any{s, "b"}}},
			"tooltip": map[string]any{"formatter": jsFunc(tipFormatter)},
			"series":  []any{map[string]any{"name": s, "renderItem": jsFunc("function (p, api) { return {type: 'group'}; }")}},
			"keys":    map[string]any{s: 1},
		}
	}
	plain := &Chart{id: "x", option: option("plain")}
	want, err := plain.optionScript()
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		c := &Chart{id: "x", option: option(s)}
		got, err := c.optionScript()
		if err != nil {
			t.Fatal(err)
		}
		if emptyStrings(got) != emptyStrings(want) {
			t.Fatalf("the string %q changed the option's code:\n%s", s, firstDifference(emptyStrings(want), emptyStrings(got)))
		}
		b, err := c.OptionJSON()
		if err != nil {
			t.Fatal(err)
		}
		var back struct {
			Title struct {
				Text string `json:"text"`
			} `json:"title"`
			Tooltip struct {
				Formatter string `json:"formatter"`
			} `json:"tooltip"`
		}
		if err := json.Unmarshal(b, &back); err != nil {
			t.Fatalf("OptionJSON is not JSON: %v", err)
		}
		var wantText string
		wb, _ := json.Marshal(s)
		_ = json.Unmarshal(wb, &wantText)
		if back.Title.Text != wantText || back.Tooltip.Formatter != tipFormatter {
			t.Fatalf("OptionJSON gives back %q and %q, want %q and the formatter's source", back.Title.Text, back.Tooltip.Formatter, wantText)
		}
	})
}

// BenchmarkLabelsStayData times one execution of FuzzLabelsStayData's body
// at growing label lengths (the fuzzer lengthens its inputs as it runs).
// Target (issue 20): the cost grows linearly with the labels' length
// (compare the per-byte cost between the sizes), so that with the fuzz
// inputs cut to fuzzLabelBytes a run keeps a steady rate.
func BenchmarkLabelsStayData(b *testing.B) {
	b.Log("target: linear in the label length (a fixed cost per byte), so that capped fuzz inputs keep a steady rate")
	for _, n := range []int{8, 256, 4096} {
		label := strings.Repeat(`<a href="x">'\`, n/14+1)[:n]
		b.Run(fmt.Sprintf("label=%dB", n), func(b *testing.B) {
			for b.Loop() {
				checkLabelsStayData(b, label, label+"2", label+"e")
			}
		})
	}
}

// TestLongLabelsStayData is FuzzLabelsStayData's check on the hostile
// seeds repeated to 64 kB each, the lengths the fuzz targets cut off.
func TestLongLabelsStayData(t *testing.T) {
	if testing.Short() {
		t.Skip("renders labels of 64 kB")
	}
	long := func(i int) string {
		s := hostileLabelSeeds[i%len(hostileLabelSeeds)] + hostileLabelSeeds[(i+5)%len(hostileLabelSeeds)] + "x"
		return strings.Repeat(s, 64<<10/len(s)+1)[:64<<10]
	}
	for i := 0; i < 3; i++ {
		checkLabelsStayData(t, long(i), long(i+11), long(i+23))
	}
}
