package e2e

import (
	"context"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/segments"
)

// Hostile labels: each would run script if it reached the page unescaped,
// by setting window.__pwned. The same strings are in
// testdata/notebooks/hostile.ipynb.
var hostile = proportions.Labels{
	First:  `<script>window.__pwned=1</script>`,
	Second: `<img src=x onerror="window.__pwned=2">`,
	Event:  `"><svg onload=window.__pwned=3>'`,
}

// hostileAnalysis fills an analysis by hand from registered methods (Wald,
// Fisher), with the hostile strings in every place a user string can reach
// the card: labels, event name, conclusion and a warning.
func hostileAnalysis(t *testing.T) proportions.Analysis {
	t.Helper()
	c, err := proportions.NewComparison(3, 10, 7, 10, hostile)
	if err != nil {
		t.Fatal(err)
	}
	iv, err := proportions.Wald.Interval(c.Counts(), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	test, err := proportions.FisherTest.Test(c.Counts())
	if err != nil {
		t.Fatal(err)
	}
	return proportions.Analysis{
		Comparison: c, Level: 0.95, Difference: c.Counts().P1() - c.Counts().P2(),
		Groups:   [2]proportions.GroupEstimate{{Group: c.First, Rate: 0.3}, {Group: c.Second, Rate: 0.7}},
		Interval: iv, DifferenceIntervals: []proportions.Interval{iv},
		Test: test, Tests: []proportions.TestResult{test},
		Conclusion: "In " + hostile.First + " the rate of " + hostile.Event + " differs from " + hostile.Second,
		Warnings:   []proportions.Warning{{Code: "test", Message: hostile.Second}},
		Caution:    proportions.Caution,
	}
}

// TestHostileLabelsInBrowser opens a standalone card page made from hostile
// labels: no script may run, and each label must show as literal text.
func TestHostileLabelsInBrowser(t *testing.T) {
	page := filepath.Join(outDir, "hostile-card.html")
	card := notebookui.NewResultCard(hostileAnalysis(t))
	if err := card.WriteHTMLFile(page); err != nil {
		t.Fatal(err)
	}
	ctx := browse(t)
	open(t, ctx, page)
	assertInert(t, ctx)
	screenshot(t, ctx, "hostile-card")
}

// TestHostileLabelsInBayesCard opens a standalone page of the Bayesian
// card made from hostile labels: no script may run, and each label must
// show as literal text.
func TestHostileLabelsInBayesCard(t *testing.T) {
	c, err := proportions.NewComparison(3, 10, 7, 10, hostile)
	if err != nil {
		t.Fatal(err)
	}
	a, err := bayes.Analyze(c, bayes.WithMargin(0.05), bayes.WithEquivalence(-0.1, 0.1))
	if err != nil {
		t.Fatal(err)
	}
	page := filepath.Join(outDir, "hostile-bayes-card.html")
	if err := notebookui.WriteHTMLFile(page, "hostile labels", notebookui.NewBayesCard(a)); err != nil {
		t.Fatal(err)
	}
	ctx := browse(t)
	open(t, ctx, page)
	assertInertCard(t, ctx, "bayes-card")
	screenshot(t, ctx, "hostile-bayes-card")
}

// TestHostileLabelsInSegmentsCard opens a standalone page of the segments
// card with hostile labels, breakdown column and segment values: no script
// may run, and each string must show as literal text.
func TestHostileLabelsInSegmentsCard(t *testing.T) {
	rows := []proportions.BreakdownRow{
		{Value: hostile.First, Counts: proportions.Counts{X1: 30, N1: 40, X2: 18, N2: 40}},
		{Value: hostile.Second, Counts: proportions.Counts{X1: 3, N1: 10}},
		{Value: hostile.Event, Counts: proportions.Counts{X1: 2, N1: 6, X2: 4, N2: 7}},
	}
	b, err := proportions.NewBreakdown(hostile.Second, hostile, rows)
	if err != nil {
		t.Fatal(err)
	}
	r, err := segments.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	page := filepath.Join(outDir, "hostile-segments-card.html")
	if err := notebookui.WriteHTMLFile(page, "hostile labels", notebookui.NewSegmentsCard(r)); err != nil {
		t.Fatal(err)
	}
	ctx := browse(t)
	open(t, ctx, page)
	assertInertCard(t, ctx, "segments-card")
	screenshot(t, ctx, "hostile-segments-card")
}

// TestHostileLabelsInNotebook runs the hostile labels through the whole
// notebook path: GoNB display output, nbconvert's HTML export, browser.
func TestHostileLabelsInNotebook(t *testing.T) {
	root := repoRoot(t)
	r := execute(t, root, filepath.Join("testdata", "notebooks", "hostile.ipynb"))
	ctx := browse(t)
	open(t, ctx, r.HTML)
	assertInert(t, ctx)
	screenshot(t, ctx, "hostile-notebook")
}

// assertInert checks that nothing the hostile strings carry has run or
// become an element, and that the strings show literally in the card.
func assertInert(t *testing.T, ctx context.Context) {
	t.Helper()
	assertInertCard(t, ctx, "result-card")
}

// assertInertCard is assertInert for a card of the given kind
// ("result-card", "bayes-card").
func assertInertCard(t *testing.T, ctx context.Context, kind string) {
	t.Helper()
	if pwned := eval[any](t, ctx, `window.__pwned === undefined ? null : window.__pwned`); pwned != nil {
		t.Errorf("a hostile label ran script: window.__pwned = %v", pwned)
	}
	// markerPayload would set the title (testdata/notebooks/hostile.ipynb
	// draws charts with it).
	if title := eval[string](t, ctx, `document.title`); strings.HasPrefix(title, "PWNED") {
		t.Errorf("a hostile label ran script: document.title = %q", title)
	}
	injected := eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="`+kind+`"] :is(script, img, svg:not(.ps-strip), iframe, object)').length
		+ document.querySelectorAll('img[src="x"], [onerror], [onload]').length`)
	if injected > 0 {
		t.Errorf("%d elements were injected by hostile labels", injected)
	}
	n := eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="`+kind+`"]').length`)
	if n == 0 {
		t.Fatalf("no %s on the page", kind)
	}
	text := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="`+kind+`"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the hostile "+kind, text, hostile.First, hostile.Second, hostile.Event)
}

// markerPayload is a group label wrapped in the go-echarts code marker:
// before the fix, a chart pasted it into its option as bare JavaScript,
// and the page's title changed. The same string is in
// testdata/notebooks/hostile.ipynb.
const markerPayload = `__f__(document.title='PWNED-'+document.domain)__f__`

// TestMarkerLabelInChartsIsText reads the payload from a CSV file as a group
// label, draws every analysis chart on one page in Chromium, and checks
// that the title is still the page's own, that nothing ran, and that the
// label shows as text in the rates chart's tooltip.
func TestMarkerLabelInChartsIsText(t *testing.T) {
	csv := "group,outcome\n"
	for i := 0; i < 50; i++ {
		csv += `"` + markerPayload + `",` + map[bool]string{true: "1", false: "0"}[i < 41] + "\n"
		csv += "uncoated," + map[bool]string{true: "1", false: "0"}[i < 30] + "\n"
	}
	c, err := proportions.ReadCSV(strings.NewReader(csv), proportions.CSVSpec{RecordSpec: proportions.RecordSpec{FirstGroup: markerPayload}})
	if err != nil {
		t.Fatal(err)
	}
	if c.First.Label != markerPayload {
		t.Fatalf("the CSV gave the label %q", c.First.Label)
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	charts := analysisCharts(t, a)
	ds := []notebookui.Displayable{notebookui.NewResultCard(a)}
	for _, nc := range charts {
		ds = append(ds, nc.chart)
	}
	const title = "marker label"
	page := filepath.Join(chartsDir(t), "hostile-marker-label.html")
	if err := notebookui.WriteHTMLFile(page, title, ds...); err != nil {
		t.Fatal(err)
	}
	b := newOfflineBrowser(t)
	b.open(t, "file://"+page, len(charts))
	got, err := chromedp.Run(b.ctx, chromedp.Evaluate[string](`document.title`))
	if err != nil {
		t.Fatal(err)
	}
	if got != title {
		t.Errorf("document.title = %q, want %q: the label ran as code", got, title)
	}
	tip := b.tooltip(t, 0, 0, 0)
	if !strings.Contains(tip, markerPayload) {
		t.Errorf("rates tooltip %q does not show the label as text", tip)
	}
	b.offline(t)
}
