package notebookui

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"math"
	"os"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
	"gonum.org/v1/gonum/stat/distuv"
)

// TestEngineChecksum checks the vendored echarts against the SHA-256 of
// dist/echarts.min.js in the npm package echarts@5.4.3 (taken with
// `npm pack echarts@5.4.3`, recorded in echarts/README.md), and that its
// licence and notice travel with it.
func TestEngineChecksum(t *testing.T) {
	sum := sha256.Sum256([]byte(echartsJS))
	if got := hex.EncodeToString(sum[:]); got != EngineSHA256 {
		t.Fatalf("echarts.min.js sha256 = %s, want %s (npm echarts@5.4.3)", got, EngineSHA256)
	}
	if len(echartsJS) != 1024740 {
		t.Errorf("echarts.min.js is %d bytes, want 1024740", len(echartsJS))
	}
	for _, f := range []string{"LICENSE", "NOTICE", "LICENSE-d3", "LICENSE-zrender", "README.md"} {
		if _, err := os.Stat("echarts/" + f); err != nil {
			t.Errorf("echarts/%s must be kept with the vendored file: %v", f, err)
		}
	}
}

// TestEngineScriptSafe checks that the inline engine cannot end its script
// element early and hides the AMD loader from the bundle.
func TestEngineScriptSafe(t *testing.T) {
	s := EngineScript()
	if n := strings.Count(strings.ToLower(s), "</script"); n != 1 {
		t.Errorf("engine script holds %d </script sequences, want 1 (its own end tag)", n)
	}
	if strings.Contains(s, "<!--") {
		t.Error("engine script holds <!--, which changes how HTML parses a script")
	}
	if !strings.Contains(s, "(function (define, exports, module) {") || !strings.Contains(s, "}).call(window);") {
		t.Error("engine script lacks the RequireJS-safe wrapper")
	}
}

// sampleAnalysis builds an analysis by hand (the numbers are arbitrary
// chart inputs; the charts only draw them).
func sampleAnalysis(first, second string) proportions.Analysis {
	a := proportions.Analysis{Level: 0.95, Null: 0, Difference: 0.75 - 30.0/55}
	a.Comparison = proportions.Comparison{Event: "germinated",
		First:  proportions.Group{Label: first, Events: 45, Trials: 60},
		Second: proportions.Group{Label: second, Events: 30, Trials: 55}}
	iv := func(key, name string, est, lo, hi float64) proportions.Interval {
		return proportions.Interval{Method: key, MethodName: name, Level: 0.95, Estimate: est, Defined: true, Lower: lo, Upper: hi, RawLower: lo, RawUpper: hi}
	}
	a.Groups[0] = proportions.GroupEstimate{Group: a.Comparison.First, Rate: 0.75, Intervals: []proportions.Interval{
		iv("wilson-rate", "Wilson", 0.75, 0.6275, 0.8423), iv("clopper-pearson-rate", "Clopper–Pearson", 0.75, 0.6214, 0.8528)}}
	a.Groups[1] = proportions.GroupEstimate{Group: a.Comparison.Second, Rate: 30.0 / 55, Intervals: []proportions.Interval{
		iv("wilson-rate", "Wilson", 30.0/55, 0.4142, 0.6708), iv("clopper-pearson-rate", "Clopper–Pearson", 30.0/55, 0.4055, 0.6802)}}
	d := a.Difference
	a.DifferenceIntervals = []proportions.Interval{
		iv("wald", "Wald", d, 0.0319, 0.3772),
		iv("mee", "Mee", d, 0.0276, 0.3719),
		{Method: "wide", MethodName: "Wide", Level: 0.95, Estimate: d, Defined: true, Lower: -0.2, Upper: 1, RawLower: -0.2, RawUpper: 1.08},
	}
	a.Interval = a.DifferenceIntervals[1]
	a.Test = proportions.TestResult{Method: "farrington-manning-test", MethodName: "Score"}
	return a
}

// optionOfChart decodes a chart's option JSON.
func optionOfChart(t *testing.T, c *Chart) map[string]any {
	t.Helper()
	b, err := c.OptionJSON()
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatalf("option is not JSON: %v", err)
	}
	return m
}

func seriesList(t *testing.T, m map[string]any) []map[string]any {
	t.Helper()
	raw, _ := m["series"].([]any)
	out := make([]map[string]any, len(raw))
	for i, s := range raw {
		out[i] = s.(map[string]any)
	}
	return out
}

func values(t *testing.T, item any) []float64 {
	t.Helper()
	var raw []any
	switch v := item.(type) {
	case map[string]any:
		raw = v["value"].([]any)
	case []any:
		raw = v
	}
	out := make([]float64, len(raw))
	for i, x := range raw {
		out[i] = x.(float64)
	}
	return out
}

// checkCommon checks what every chart promises: no animation, the
// colour-blind-safe palette, tooltips, axis titles with units.
func checkCommon(t *testing.T, m map[string]any, units ...string) {
	t.Helper()
	if m["animation"] != false {
		t.Errorf("animation = %v, want false", m["animation"])
	}
	colors, _ := m["color"].([]any)
	if len(colors) == 0 || colors[0] != ColorBlue || colors[1] != ColorVermillion {
		t.Errorf("palette = %v, want the Okabe–Ito colours", colors)
	}
	tip, _ := m["tooltip"].(map[string]any)
	if tip["show"] != true || !strings.HasPrefix(tip["formatter"].(string), "function") {
		t.Errorf("tooltip = %v, want shown with a formatter", tip)
	}
	var names []string
	for _, ax := range []string{"xAxis", "yAxis"} {
		for _, a := range m[ax].([]any) {
			if n, ok := a.(map[string]any)["name"].(string); ok {
				names = append(names, n)
			}
		}
	}
	for _, u := range units {
		found := false
		for _, n := range names {
			found = found || strings.Contains(n, "("+u+")")
		}
		if !found {
			t.Errorf("axis titles %q: none carries the unit (%s)", names, u)
		}
	}
}

func TestRatesChartOption(t *testing.T) {
	a := sampleAnalysis("coated", "uncoated")
	c, err := RatesChart(a)
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, c)
	checkCommon(t, m, "%")
	cats := m["yAxis"].([]any)[0].(map[string]any)["data"].([]any)
	if cats[0] != "coated" || cats[1] != "uncoated" {
		t.Errorf("categories = %v", cats)
	}
	series := seriesList(t, m)
	if len(series) != 2 || series[0]["name"] != "Wilson" || series[1]["name"] != "Clopper–Pearson" {
		t.Fatalf("series = %v, want one per method in the analysis's order", series)
	}
	for k, s := range series {
		data := s["data"].([]any)
		for gi := range 2 {
			v := values(t, data[gi])
			want := a.Groups[gi].Intervals[k]
			if v[0] != a.Groups[gi].Rate || v[1] != float64(gi) || v[2] != want.Lower || v[3] != want.Upper {
				t.Errorf("series %d group %d value %v, want estimate %v, limits %v–%v", k, gi, v, a.Groups[gi].Rate, want.Lower, want.Upper)
			}
			tip := data[gi].(map[string]any)["tip"].(string)
			if !strings.Contains(tip, fmtPct(want.Lower)) || !strings.Contains(tip, fmtPct(want.Upper)) {
				t.Errorf("tooltip %q lacks the limits", tip)
			}
		}
	}
	if !strings.Contains(c.Text(), "62.75%") || !strings.Contains(c.Markdown(), "| coated | Wilson |") {
		t.Errorf("text or Markdown lacks the numbers:\n%s\n%s", c.Text(), c.Markdown())
	}
}

func TestChartIDDeterministic(t *testing.T) {
	a := sampleAnalysis("coated", "uncoated")
	c1, _ := RatesChart(a)
	c2, _ := RatesChart(a)
	if c1.ID() != c2.ID() || c1.HTML() != c2.HTML() {
		t.Error("the same data gave different chart IDs or HTML")
	}
	a.Groups[0].Intervals[0].Upper = 0.85
	c3, _ := RatesChart(a)
	if c3.ID() == c1.ID() {
		t.Error("different data gave the same chart ID")
	}
	d, _ := DifferenceIntervalsChart(a)
	if d.ID() == c1.ID() || !strings.HasPrefix(d.ID(), "propscope-difference-intervals-") {
		t.Errorf("difference chart ID %q", d.ID())
	}
}

// TestChartEscapesLabels feeds hostile labels and checks that they reach
// the page only escaped: as JSON strings with < and > escaped inside the
// script, and as HTML text in the table and notes.
func TestChartEscapesLabels(t *testing.T) {
	hostile := []string{`</script><script>alert(1)</script>`, `<img src=x onerror=alert(2)>`, `"; alert(3); "`}
	a := sampleAnalysis(hostile[0], hostile[1])
	a.Comparison.Event = hostile[2]
	for _, build := range []func(proportions.Analysis) (*Chart, error){
		func(a proportions.Analysis) (*Chart, error) { return RatesChart(a) },
		func(a proportions.Analysis) (*Chart, error) { return DifferenceIntervalsChart(a) },
	} {
		c, err := build(a)
		if err != nil {
			t.Fatal(err)
		}
		h := c.HTML()
		if n := strings.Count(h, "</script>"); n != 1 {
			t.Errorf("%s: %d </script> in the HTML, want only its own", c.Name(), n)
		}
		for _, bad := range []string{"<script>alert", "<img src=x", `"; alert(3); "`} {
			if strings.Contains(h, bad) {
				t.Errorf("%s: raw %q in the HTML", c.Name(), bad)
			}
		}
		if !strings.Contains(h, "&lt;img src=x onerror=alert(2)&gt;") {
			t.Errorf("%s: the label is not shown as escaped text", c.Name())
		}
		if strings.Contains(c.Markdown(), "<img") {
			t.Errorf("%s: raw HTML in Markdown", c.Name())
		}
	}
}

func TestDifferenceIntervalsChartOption(t *testing.T) {
	a := sampleAnalysis("coated", "uncoated")
	a.Null = -0.1
	c, err := DifferenceIntervalsChart(a, WithHighlightedMethod("wald", "because the test says so"))
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, c)
	checkCommon(t, m, "percentage points")
	series := seriesList(t, m)
	data := series[0]["data"].([]any)
	if len(data) != len(a.DifferenceIntervals) {
		t.Fatalf("%d items, want one per method (%d)", len(data), len(a.DifferenceIntervals))
	}
	for i, iv := range a.DifferenceIntervals {
		item := data[i].(map[string]any)
		v := values(t, item)
		strong := iv.Method == "wald"
		if v[0] != iv.Estimate || v[2] != iv.Lower || v[3] != iv.Upper || (v[4] == 1) != strong {
			t.Errorf("%s: value %v, want %v %v–%v recommended=%v", iv.MethodName, v, iv.Estimate, iv.Lower, iv.Upper, strong)
		}
		if (item["mark"] == "recommended") != strong {
			t.Errorf("%s: mark %v", iv.MethodName, item["mark"])
		}
		color := item["itemStyle"].(map[string]any)["color"]
		if strong && color != ColorVermillion || !strong && color != ColorBlue {
			t.Errorf("%s: colour %v", iv.MethodName, color)
		}
	}
	if v := values(t, data[2]); v[6] != 1 || v[5] != 0 {
		t.Errorf("the clipped upper limit is not flagged: %v", v)
	}
	ml := series[0]["markLine"].(map[string]any)["data"].([]any)[0].(map[string]any)
	if ml["xAxis"] != -0.1 {
		t.Errorf("null line at %v, want the margin -0.1", ml["xAxis"])
	}
	ax := m["xAxis"].([]any)[0].(map[string]any)
	if ax["min"].(float64) > -0.2 || ax["max"].(float64) < 1 {
		t.Errorf("x axis [%v, %v] does not hold every interval and the margin", ax["min"], ax["max"])
	}
	if !strings.Contains(c.Text(), "because the test says so") || !strings.Contains(c.Text(), "upper limit clipped from +108.00 pp") {
		t.Errorf("text lacks the recommendation or the clipping note:\n%s", c.Text())
	}
	if _, err := DifferenceIntervalsChart(a, WithHighlightedMethod("nosuch", "")); err == nil {
		t.Error("an unknown recommended method gave no error")
	}
}

// waldZ is a test written here, independently of the library: the
// unpooled z test of H0: π1 − π2 = δ, z = (p1 − p2 − δ)/√(p1q1/n1 + p2q2/n2),
// two-sided p = 2Φ(−|z|) (common practice). Inverting it gives exactly
// the Wald interval p1 − p2 ± z_{1−α/2}·se, which the library registers,
// so the interval read off its confidence curve must match that one.
var waldZ = proportions.TestMethod{
	Key: "test-wald-z", Name: "unpooled z", Scale: proportions.Difference, Margins: true,
	Run: func(c proportions.Counts, h proportions.Hypothesis) proportions.TestResult {
		p1, p2 := c.P1(), c.P2()
		se := math.Sqrt(p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2))
		z := (p1 - p2 - h.Null) / se
		p := 2 * distuv.UnitNormal.CDF(-math.Abs(z))
		return proportions.TestResult{Method: "test-wald-z", Statistic: z, PValue: p, LogPValue: math.Log(p)}
	},
}

func TestConfidenceCurveReadsOffInterval(t *testing.T) {
	for _, tc := range []struct {
		c     proportions.Counts
		level float64
	}{
		{proportions.Counts{X1: 45, N1: 60, X2: 30, N2: 55}, 0.95},
		{proportions.Counts{X1: 7, N1: 25, X2: 15, N2: 24}, 0.90},
		{proportions.Counts{X1: 480, N1: 1000, X2: 455, N2: 1000}, 0.99},
	} {
		cc, err := ConfidenceCurveOf(tc.c, waldZ, tc.level, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		want, err := proportions.Wald.Interval(tc.c, tc.level)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(cc.Lower-want.Lower) > 1e-8 || math.Abs(cc.Upper-want.Upper) > 1e-8 {
			t.Errorf("%+v at %v: read off %v to %v, Wald interval %v to %v", tc.c, tc.level, cc.Lower, cc.Upper, want.Lower, want.Upper)
		}
		peak := 0
		for i := range cc.PValues {
			if cc.PValues[i] > cc.PValues[peak] {
				peak = i
			}
			if i > 0 && cc.Deltas[i] <= cc.Deltas[i-1] {
				t.Fatalf("deltas not increasing at %d", i)
			}
		}
		if cc.Deltas[peak] != cc.Estimate || cc.PValues[peak] != 1 {
			t.Errorf("peak at %v (p %v), want the estimate %v with p = 1", cc.Deltas[peak], cc.PValues[peak], cc.Estimate)
		}
		if got := waldZ.Run(tc.c, proportions.Hypothesis{Null: 0}).PValue; cc.NullPValue != got {
			t.Errorf("p at the null %v, the test gives %v", cc.NullPValue, got)
		}
	}
}

func TestConfidenceCurveErrors(t *testing.T) {
	c := proportions.Counts{X1: 4, N1: 10, X2: 6, N2: 10}
	noMargins := waldZ
	noMargins.Margins = false
	for name, err := range map[string]error{
		"level": func() error { _, err := ConfidenceCurveOf(c, waldZ, 1.2, 0, 0); return err }(),
		"counts": func() error {
			_, err := ConfidenceCurveOf(proportions.Counts{X1: 11, N1: 10, N2: 1}, waldZ, 0.95, 0, 0)
			return err
		}(),
		"null":       func() error { _, err := ConfidenceCurveOf(c, waldZ, 0.95, 1, 0); return err }(),
		"no margins": func() error { _, err := ConfidenceCurveOf(c, noMargins, 0.95, 0, 0); return err }(),
		"points":     func() error { _, err := ConfidenceCurveOf(c, waldZ, 0.95, 0, 5); return err }(),
	} {
		if err == nil {
			t.Errorf("%s: no error", name)
		}
	}
}

func TestCurveChartOption(t *testing.T) {
	c := proportions.Counts{X1: 45, N1: 60, X2: 30, N2: 55}
	cc, err := ConfidenceCurveOf(c, waldZ, 0.95, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	a := sampleAnalysis("coated", "uncoated")
	ch, err := ConfidenceCurveChartFrom(cc, a.Comparison)
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, ch)
	checkCommon(t, m, "percentage points", "probability")
	series := seriesList(t, m)
	data := series[0]["data"].([]any)
	if len(data) != len(cc.Deltas) {
		t.Fatalf("%d points drawn, curve has %d", len(data), len(cc.Deltas))
	}
	for i, d := range data {
		v := values(t, d)
		if v[0] != cc.Deltas[i] || v[1] != cc.PValues[i] {
			t.Fatalf("point %d = %v, want (%v, %v)", i, v, cc.Deltas[i], cc.PValues[i])
		}
	}
	area := series[0]["markArea"].(map[string]any)["data"].([]any)[0].([]any)
	if area[0].(map[string]any)["xAxis"] != cc.Lower || area[1].(map[string]any)["xAxis"] != cc.Upper {
		t.Errorf("shaded band %v, want %v to %v", area, cc.Lower, cc.Upper)
	}
	lines := series[0]["markLine"].(map[string]any)["data"].([]any)
	if math.Abs(lines[0].(map[string]any)["yAxis"].(float64)-0.05) > 1e-15 {
		t.Errorf("alpha line at %v", lines[0])
	}
	for k, want := range []float64{cc.Lower, cc.Upper, 0} {
		pair := lines[k+1].([]any)
		from, to := values(t, pair[0].(map[string]any)["coord"]), values(t, pair[1].(map[string]any)["coord"])
		if from[0] != want || to[0] != want || from[1] != 0 || to[1] != 1 {
			t.Errorf("vertical line %d from %v to %v, want at %v across the axis", k, from, to, want)
		}
	}
}

// TestConfidenceCurveOfAnalysis checks the chart of a real analysis: the
// interval read off the Farrington–Manning score test's curve must be the
// analysis's headline Mee interval (Mee's interval is by definition the set
// of differences that test does not reject; Farrington & Manning 1990,
// Stat Med 9:1447–1454), and the curve's value at the null must be the
// test's p-value.
func TestConfidenceCurveOfAnalysis(t *testing.T) {
	for _, tc := range []struct{ x1, n1, x2, n2 int64 }{
		{41, 50, 30, 50}, {19, 400, 8, 400}, {0, 20, 4, 25}, {7, 12, 1, 15},
	} {
		c, err := proportions.NewComparison(tc.x1, tc.n1, tc.x2, tc.n2, proportions.Labels{})
		if err != nil {
			t.Fatal(err)
		}
		a, err := proportions.Analyze(c)
		if err != nil {
			t.Fatal(err)
		}
		test, err := proportions.LookupTest(a.Test.Method)
		if err != nil {
			t.Fatal(err)
		}
		cc, err := ConfidenceCurveOf(c.Counts(), test, a.Interval.Level, a.Null, 0)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(cc.Lower-a.Interval.Lower) > 1e-6 || math.Abs(cc.Upper-a.Interval.Upper) > 1e-6 {
			t.Errorf("%v: read off %.8f to %.8f, headline %s %.8f to %.8f", tc, cc.Lower, cc.Upper, a.Interval.MethodName, a.Interval.Lower, a.Interval.Upper)
		}
		if cc.NullPValue != a.Test.PValue {
			t.Errorf("%v: curve at the null %v, test p-value %v", tc, cc.NullPValue, a.Test.PValue)
		}
		if _, err := ConfidenceCurveChart(a); err != nil {
			t.Error(err)
		}
	}
}

func TestDifferenceChartWithRecommendation(t *testing.T) {
	c, err := proportions.NewComparison(7, 20, 2, 20, proportions.Labels{})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	d, _ := operating.NewDesign(20, 20, 0.95)
	grid := []float64{0.05, 0.2, 0.35, 0.5, 0.65, 0.8, 0.95}
	rec, err := operating.Recommend(context.Background(), proportions.Difference, d, operating.WithGrid(grid, grid))
	if err != nil {
		t.Fatal(err)
	}
	best, _ := rec.Best()
	ch, err := DifferenceIntervalsChart(a, WithRecommendation(rec))
	if err != nil {
		t.Fatal(err)
	}
	for _, item := range seriesList(t, optionOfChart(t, ch))[0]["data"].([]any) {
		it := item.(map[string]any)
		if (it["mark"] == "recommended") != (it["name"] == best.MethodName) {
			t.Errorf("%v marked %v; the recommendation's best is %s", it["name"], it["mark"], best.MethodName)
		}
	}
	if !strings.Contains(ch.Text(), best.Reason) {
		t.Errorf("the chart does not give the recommendation's reason %q", best.Reason)
	}
}

// TestDisplayablesNameTheirKind checks the display convention: the JSON
// form is an object whose "kind" is Kind().
func TestDisplayablesNameTheirKind(t *testing.T) {
	rates, err := RatesChart(sampleAnalysis("a", "b"))
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range []Displayable{ChartEngine(), rates} {
		raw, err := d.JSON()
		if err != nil {
			t.Fatal(err)
		}
		var obj struct {
			Kind string `json:"kind"`
		}
		if err := json.Unmarshal(raw, &obj); err != nil || obj.Kind != d.Kind() {
			t.Errorf("%s: JSON kind %q (%v)", d.Kind(), obj.Kind, err)
		}
	}
}

// TestDifferenceChartMarksHeadlineWithoutRecommendation: with no
// recommendation the marked method is the card's headline and is called
// so, never "recommended"; a recommendation of another method than the
// headline says why the two differ.
func TestDifferenceChartMarksHeadlineWithoutRecommendation(t *testing.T) {
	a := sampleAnalysis("coated", "uncoated")
	c, err := DifferenceIntervalsChart(a)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(c.HTML(), "recommended") || strings.Contains(c.Text(), "recommended") {
		t.Errorf("no recommendation was computed, yet the chart says recommended:\n%s", c.Text())
	}
	marked := 0
	for _, d := range seriesList(t, optionOfChart(t, c))[0]["data"].([]any) {
		if item := d.(map[string]any); item["mark"] != nil {
			marked++
			if item["mark"] != "headline" || item["name"] != a.Interval.MethodName {
				t.Errorf("mark %v on %v, want headline on %s", item["mark"], item["name"], a.Interval.MethodName)
			}
		}
	}
	if marked != 1 {
		t.Errorf("%d marked methods, want 1", marked)
	}
	other := "wald"
	if a.Interval.Method == other {
		other = "agresti-caffo"
	}
	c, err = DifferenceIntervalsChart(a, WithHighlightedMethod(other, "it covers best here"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(c.Text(), "The card's headline interval is "+a.Interval.MethodName) {
		t.Errorf("a recommendation other than the headline is not explained:\n%s", c.Text())
	}
}
