package e2e

// Browser checks of propscope's charts: each chart draws on its canvas, its
// tooltip shows the numbers, hostile labels stay text, and pages (and
// exported notebooks) draw with the network blocked.

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/clusters/simulate"
	"github.com/propscope/propscope/proportions/operating"
	"github.com/propscope/propscope/proportions/planning"
	"github.com/propscope/propscope/proportions/strata"
)

// chartsDir is where chart pages and screenshots go (e2e/out/charts).
func chartsDir(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs(filepath.Join(outDir, "charts"))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	return dir
}

// offlineBrowser starts headless Chromium with every network path closed:
// a proxy on a port where nothing listens and a resolver that finds no
// host. It records every request the page makes and every dialog it opens.
type offlineBrowser struct {
	ctx      context.Context
	mu       sync.Mutex
	requests []string
	dialogs  []string
}

func newOfflineBrowser(t *testing.T) *offlineBrowser {
	t.Helper()
	if _, err := os.Stat(chromium); err != nil {
		t.Fatalf("%s not found: run scripts/setup-notebooks.sh (make setup)", chromium)
	}
	opts := append(chromedp.DefaultExecAllocatorOptions[:],
		chromedp.ExecPath(chromium), chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.UserDataDir(t.TempDir()), chromedp.Flag("disable-quic", true),
		chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("proxy-server", "http://127.0.0.1:9"),
		chromedp.Flag("host-resolver-rules", "MAP * ~NOTFOUND"),
		chromedp.WindowSize(1000, 900),
	)
	actx, cancelA := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancelC := chromedp.NewContext(actx)
	t.Cleanup(func() { cancelC(); cancelA() })
	b := &offlineBrowser{ctx: ctx}
	if _, err := chromedp.Call(ctx, network.Enable, network.EnableParams{}); err != nil {
		t.Fatalf("start Chromium: %v", err)
	}
	if err := chromedp.Listen(ctx, func(ev any) {
		b.mu.Lock()
		defer b.mu.Unlock()
		switch e := ev.(type) {
		case *network.EventRequestWillBeSent:
			b.requests = append(b.requests, e.Request.URL)
		case *page.EventJavascriptDialogOpening:
			b.dialogs = append(b.dialogs, e.Message)
			// A dialog blocks the page: close it (from another goroutine,
			// as a listener must not send commands) so the test can fail
			// instead of hanging.
			go func() {
				_, _ = chromedp.Call(ctx, page.HandleJavaScriptDialog, page.HandleJavaScriptDialogParams{Accept: true})
			}()
		}
	}); err != nil {
		t.Fatal(err)
	}
	return b
}

// open loads a page and waits until every chart on it says it is drawn.
func (b *offlineBrowser) open(t *testing.T, url string, charts int) {
	t.Helper()
	start := time.Now()
	defer func() { t.Logf("opened %s in %v", filepath.Base(url), time.Since(start)) }()
	if err := chromedp.Do(b.ctx, chromedp.Navigate(url)); err != nil {
		t.Fatalf("open %s: %v", url, err)
	}
	ctx, cancel := context.WithTimeout(b.ctx, 20*time.Second)
	defer cancel()
	expr := fmt.Sprintf(`document.querySelectorAll('[data-propscope-drawn="true"]').length >= %d`, charts)
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](expr, chromedp.WithPollingTimeout(15*time.Second))); err != nil {
		t.Fatalf("%s: the charts were not all drawn: %v", url, err)
	}
}

// inkJS counts, for each chart element, the canvas pixels that are neither
// transparent nor white.
const inkJS = `Array.from(document.querySelectorAll('[data-propscope-chart]')).map(function (el) {
  var n = 0;
  el.querySelectorAll('canvas').forEach(function (c) {
    var d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
    for (var i = 0; i < d.length; i += 4) {
      if (d[i + 3] > 0 && !(d[i] > 245 && d[i + 1] > 245 && d[i + 2] > 245)) { n++; }
    }
  });
  return n;
})`

func (b *offlineBrowser) ink(t *testing.T) []int {
	t.Helper()
	v, err := chromedp.Run(b.ctx, chromedp.Evaluate[[]int](inkJS))
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// tooltip shows the tooltip of a data item of chart i and returns its text.
func (b *offlineBrowser) tooltip(t *testing.T, chart, series, item int) string {
	t.Helper()
	show := fmt.Sprintf(`(function () {
  var el = document.querySelectorAll('[data-propscope-chart]')[%d];
  var chart = echarts.getInstanceByDom(el);
  var s = %d, i = %d;
  if (i < 0) { i = Math.floor(chart.getOption().series[s].data.length / 2); }
  chart.dispatchAction({type: 'showTip', seriesIndex: s, dataIndex: i});
  return true;
})()`, chart, series, item)
	if _, err := chromedp.Run(b.ctx, chromedp.Evaluate[bool](show)); err != nil {
		t.Fatal(err)
	}
	// echarts draws the tooltip on its next frame: wait for its text.
	read := fmt.Sprintf(`(function () {
  var el = document.querySelectorAll('[data-propscope-chart]')[%d];
  var text = '';
  el.querySelectorAll('div').forEach(function (d) {
    if (d.style && d.style.zIndex && d.style.display !== 'none' && d.innerText) { text = d.innerText; }
  });
  return text;
})()`, chart)
	ctx, cancel := context.WithTimeout(b.ctx, 5*time.Second)
	defer cancel()
	text, err := chromedp.Run(ctx, chromedp.Poll[string](read, chromedp.WithPollingTimeout(4*time.Second), chromedp.WithPollingInterval(50*time.Millisecond)))
	if err != nil {
		t.Logf("chart %d: no tooltip text: %v", chart, err)
	}
	return text
}

// screenshot writes a PNG of chart i's figure (the i-th on the page).
func (b *offlineBrowser) screenshot(t *testing.T, chart int, path string) {
	t.Helper()
	mark := fmt.Sprintf(`(function () {
  var f = document.querySelectorAll('figure.propscope-chart')[%d];
  f.setAttribute('data-shot', '%d');
  f.scrollIntoView();
  return true;
})()`, chart, chart)
	if _, err := chromedp.Run(b.ctx, chromedp.Evaluate[bool](mark)); err != nil {
		t.Fatal(err)
	}
	png, err := chromedp.Run(b.ctx, chromedp.Screenshot(chromedp.CSS(fmt.Sprintf(`figure[data-shot="%d"]`, chart))))
	if err != nil {
		t.Fatalf("screenshot: %v", err)
	}
	if err := os.WriteFile(path, png, 0o644); err != nil {
		t.Fatal(err)
	}
}

// offline checks that the page asked for nothing but local files.
func (b *offlineBrowser) offline(t *testing.T) {
	t.Helper()
	b.mu.Lock()
	defer b.mu.Unlock()
	for _, u := range b.requests {
		if !strings.HasPrefix(u, "file:") && !strings.HasPrefix(u, "data:") {
			t.Errorf("the page requested %s; it must need no network", u)
		}
	}
	if len(b.dialogs) > 0 {
		t.Errorf("the page opened dialogs %q: some text ran as code", b.dialogs)
	}
}

// seedTrial is an invented pilot trial: coated against uncoated seed.
func seedTrial(t *testing.T, first, second string) proportions.Analysis {
	t.Helper()
	c, err := proportions.NewComparison(41, 50, 30, 50, proportions.Labels{First: first, Second: second, Event: "germinated"})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

type namedChart struct {
	name  string
	chart *notebookui.Chart
}

func analysisCharts(t *testing.T, a proportions.Analysis) []namedChart {
	t.Helper()
	r, err := notebookui.RatesChart(a)
	if err != nil {
		t.Fatal(err)
	}
	d, err := notebookui.DifferenceIntervalsChart(a)
	if err != nil {
		t.Fatal(err)
	}
	cc, err := notebookui.ConfidenceCurveChart(a)
	if err != nil {
		t.Fatal(err)
	}
	p, err := notebookui.PosteriorChart(bayesView(t, a.Comparison))
	if err != nil {
		t.Fatal(err)
	}
	return []namedChart{{"rates", r}, {"difference-intervals", d}, {"confidence-curve", cc}, {"posterior", p}, {"forest", strataForest(t, a.Comparison)}}
}

// strataForest is the forest chart of the comparison split into two
// blocks, the second named after the first group (so hostile labels reach
// the block values too), plus a block that lost its second group.
func strataForest(t *testing.T, c proportions.Comparison) *notebookui.Chart {
	t.Helper()
	x1, n1, x2, n2 := c.First.Events, c.First.Trials, c.Second.Events, c.Second.Trials
	b, err := proportions.NewBreakdown("block", proportions.Labels{First: c.First.Label, Second: c.Second.Label, Event: c.Event},
		[]proportions.BreakdownRow{
			{Value: "north", Counts: proportions.Counts{X1: x1 / 2, N1: n1 / 2, X2: x2 / 2, N2: n2 / 2}},
			{Value: "south " + c.First.Label, Counts: proportions.Counts{X1: x1 - x1/2, N1: n1 - n1/2, X2: x2 - x2/2, N2: n2 - n2/2}},
			{Value: "flooded", Counts: proportions.Counts{X1: 3, N1: 8}},
		})
	if err != nil {
		t.Fatal(err)
	}
	a, err := strata.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	f, err := notebookui.StrataForestChart(a)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// bayesView is the Bayesian analysis of the comparison with the default
// prior and an equivalence region of ±5 points, so the chart shades it.
func bayesView(t *testing.T, c proportions.Comparison) bayes.Analysis {
	t.Helper()
	b, err := bayes.Analyze(c, bayes.WithEquivalence(-0.05, 0.05))
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// designCharts are the charts of a design: exact coverage along a slice
// and over all rates, and power against group size (the exact saw-tooth of
// Fisher's test beside the normal approximation) and against the true
// difference. Small designs keep the test quick.
func designCharts(t *testing.T) []namedChart {
	t.Helper()
	ctx := context.Background()
	d, err := operating.NewDesign(30, 30, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	var slices []*operating.Slice
	for _, m := range proportions.EnumerableIntervalMethods(proportions.Difference) {
		tab, err := operating.NewOutcomeLimits(ctx, m, d)
		if err != nil {
			t.Fatal(err)
		}
		s, err := tab.AlongFirst(ctx, 0.2)
		if err != nil {
			t.Fatal(err)
		}
		slices = append(slices, s)
	}
	slice, err := notebookui.CoverageSliceChart(slices)
	if err != nil {
		t.Fatal(err)
	}
	wald, err := operating.NewOutcomeLimits(ctx, proportions.Wald, d)
	if err != nil {
		t.Fatal(err)
	}
	surface, err := wald.Surface(ctx)
	if err != nil {
		t.Fatal(err)
	}
	heat, err := notebookui.CoverageMapChart(surface)
	if err != nil {
		t.Fatal(err)
	}
	pd := planning.NewPlan(planning.Equality, 0.25, 0.55)
	approx, err := planning.PowerByTrials(pd, 10, 80)
	if err != nil {
		t.Fatal(err)
	}
	fisher, err := planning.ExactPowerByTrials(ctx, pd, proportions.FisherTest, 10, 80)
	if err != nil {
		t.Fatal(err)
	}
	byN, err := notebookui.PowerChart([]planning.PowerCurve{approx, fisher})
	if err != nil {
		t.Fatal(err)
	}
	curve, err := planning.PowerByDifference(pd, 40, 40, 0.05, 0.95, 91)
	if err != nil {
		t.Fatal(err)
	}
	byDiff, err := notebookui.PowerChart([]planning.PowerCurve{curve})
	if err != nil {
		t.Fatal(err)
	}
	sp := simulate.NewPlan(8, 20, 0.8, 0.7, 0)
	sp.Studies, sp.By = 500, "tray"
	sweep, err := simulate.Sweep(ctx, sp, []float64{0, 0.05, 0.1})
	if err != nil {
		t.Fatal(err)
	}
	simulated, err := notebookui.SimulatedCoverageChart(sweep)
	if err != nil {
		t.Fatal(err)
	}
	grid, err := planning.ClusteredPowerByClusters(planning.NewPlan(planning.Equality, 0.8, 0.65), 0.05, 0.3,
		[]float64{5, 20, 60}, []int64{4, 6, 8, 10, 12, 16, 20, 24, 32, 40, 48})
	if err != nil {
		t.Fatal(err)
	}
	clustered, err := notebookui.ClusteredPowerChart(grid)
	if err != nil {
		t.Fatal(err)
	}
	return []namedChart{{"coverage-slice", slice}, {"coverage-map", heat}, {"power-by-size", byN}, {"power-by-difference", byDiff},
		{"simulated-coverage", simulated}, {"clustered-power", clustered}}
}

// TestChartsDrawOffline writes each chart as a standalone page, opens it in
// Chromium with the network blocked, checks that the canvas has ink and
// that hovering the middle data item shows a tooltip with numbers, and
// saves a screenshot.
func TestChartsDrawOffline(t *testing.T) {
	a := seedTrial(t, "coated", "uncoated")
	dir := chartsDir(t)
	b := newOfflineBrowser(t)
	for _, nc := range append(analysisCharts(t, a), designCharts(t)...) {
		path := filepath.Join(dir, nc.name+".html")
		if err := nc.chart.WriteFile(path); err != nil {
			t.Fatal(err)
		}
		b.open(t, "file://"+path, 1)
		if ink := b.ink(t); len(ink) != 1 || ink[0] < 2000 {
			t.Errorf("%s: %v drawn pixels, want a drawn chart (over 2000)", nc.name, ink)
		}
		if tip := b.tooltip(t, 0, 0, -1); !strings.ContainsAny(tip, "0123456789") || !strings.ContainsAny(tip, "%p") {
			t.Errorf("%s: tooltip %q shows no numbers", nc.name, tip)
		}
		shot := filepath.Join(dir, nc.name+".png")
		b.screenshot(t, 0, shot)
		t.Logf("screenshot: %s", shot)
	}
	b.offline(t)
}

// TestChartTooltipsShowNumbers hovers data items and reads the tooltips.
func TestChartTooltipsShowNumbers(t *testing.T) {
	a := seedTrial(t, "coated", "uncoated")
	dir := chartsDir(t)
	charts := analysisCharts(t, a)
	page := filepath.Join(dir, "all-analysis-charts.html")
	cs := make([]notebookui.Displayable, len(charts))
	for i, nc := range charts {
		cs[i] = nc.chart
	}
	if err := notebookui.WriteHTMLFile(page, "propscope charts", cs...); err != nil {
		t.Fatal(err)
	}
	b := newOfflineBrowser(t)
	b.open(t, "file://"+page, len(charts))
	wilson := a.Groups[0].Intervals[0]
	if tip := b.tooltip(t, 0, 0, 0); !strings.Contains(tip, "41 of 50") || !strings.Contains(tip, fmt.Sprintf("%.2f%%", 100*wilson.Lower)) {
		t.Errorf("rates tooltip %q lacks the counts or the %s lower limit", tip, wilson.MethodName)
	}
	first := a.DifferenceIntervals[0]
	if tip := b.tooltip(t, 1, 0, 0); !strings.Contains(tip, first.MethodName) || !strings.Contains(tip, fmt.Sprintf("%.2f pp", 100*first.Width())) {
		t.Errorf("difference tooltip %q lacks the method or its width", tip)
	}
	if tip := b.tooltip(t, 2, 0, -1); !strings.Contains(tip, "pp") || !strings.Contains(tip, "p-value") {
		t.Errorf("curve tooltip %q lacks the difference", tip)
	}
	if tip := b.tooltip(t, 3, 0, -1); !strings.Contains(tip, "coated") || !strings.Contains(tip, "density") || !strings.Contains(tip, "%") {
		t.Errorf("posterior tooltip %q lacks the group, the density or the share", tip)
	}
	b.offline(t)
}

// TestChartsHostileLabels shows labels built to break out of HTML or script
// and checks in the browser that nothing ran and the text shows as typed.
func TestChartsHostileLabels(t *testing.T) {
	first := `<img src=x onerror="window.__pwned=1;alert(1)">`
	second := `</script><script>window.__pwned=2;alert(2)</script>`
	a := seedTrial(t, first, second)
	charts := analysisCharts(t, a)
	cs := make([]notebookui.Displayable, len(charts))
	for i, nc := range charts {
		cs[i] = nc.chart
	}
	page := filepath.Join(chartsDir(t), "hostile-labels.html")
	if err := notebookui.WriteHTMLFile(page, "hostile labels", cs...); err != nil {
		t.Fatal(err)
	}
	b := newOfflineBrowser(t)
	b.open(t, "file://"+page, len(charts))
	tip := b.tooltip(t, 0, 0, 0)
	if !strings.Contains(tip, first) {
		t.Errorf("rates tooltip %q does not show the label as text", tip)
	}
	pwned, err := chromedp.Run(b.ctx, chromedp.Evaluate[bool](`window.__pwned !== undefined || document.querySelector('figure img') !== null`))
	if err != nil {
		t.Fatal(err)
	}
	if pwned {
		t.Error("a label ran as code or became an element")
	}
	b.offline(t)
}
