package e2e

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"net/url"
	"path/filepath"
	"strings"
	"testing"

	"github.com/propscope/propscope/e2e/nbrun"
)

// The line-defects notebook shows every chart; these checks read them in
// its outputs and in the browser, and open the exported report again with
// the network blocked.

// lineDefectsCharts are the charts the notebook shows, in order.
var lineDefectsCharts = []string{"rates", "difference-intervals", "confidence-curve", "coverage-slice",
	"coverage-map", "power-by-size", "power-by-difference"}

func init() {
	pageChecks["line-defects"] = checkLineDefects
	outputChecks["line-defects"] = checkLineDefectsOutputs
}

// wilson is Wilson's score interval for x of n at z, written out here from
// its definition (Wilson 1927, JASA 22:209–212; common practice):
// (x + z²/2 ± z·√(x(n − x)/n + z²/4)) / (n + z²).
func wilson(x, n, z float64) (lo, hi float64) {
	mid := x + z*z/2
	half := z * math.Sqrt(x*(n-x)/n+z*z/4)
	return (mid - half) / (n + z*z), (mid + half) / (n + z*z)
}

// checkLineDefectsOutputs checks the outputs' kinds and that the rates
// chart carries the Wilson intervals of the audit's counts (19 of 400 and
// 8 of 400), computed independently above.
func checkLineDefectsOutputs(t *testing.T, r nbrun.Result) {
	outs, err := nbrun.Outputs(r.Executed)
	if err != nil {
		t.Fatal(err)
	}
	var kinds []string
	var charts []map[string]any
	for _, o := range outs {
		kinds = append(kinds, o.Kind)
		if o.Kind != "chart" {
			continue
		}
		var obj map[string]any
		if err := json.Unmarshal(o.Data["application/json"], &obj); err != nil {
			t.Fatalf("cell %d: chart JSON: %v", o.Cell, err)
		}
		charts = append(charts, obj)
	}
	want := append([]string{"chart-engine", "result-card"}, repeat("chart", len(lineDefectsCharts))...)
	if strings.Join(kinds, ",") != strings.Join(want, ",") {
		t.Fatalf("outputs %v, want %v", kinds, want)
	}
	for i, c := range charts {
		if c["chart"] != lineDefectsCharts[i] {
			t.Errorf("chart %d is %v, want %s", i, c["chart"], lineDefectsCharts[i])
		}
	}
	const z = 1.959963984540054 // Φ⁻¹(0.975)
	option := charts[0]["option"].(map[string]any)
	wilsonSeries := option["series"].([]any)[0].(map[string]any)
	for gi, counts := range [][2]float64{{19, 400}, {8, 400}} {
		lo, hi := wilson(counts[0], counts[1], z)
		v := wilsonSeries["data"].([]any)[gi].(map[string]any)["value"].([]any)
		if math.Abs(v[2].(float64)-lo) > 1e-9 || math.Abs(v[3].(float64)-hi) > 1e-9 {
			t.Errorf("%s, group %d: drawn %v to %v, Wilson's formula gives %v to %v", wilsonSeries["name"], gi, v[2], v[3], lo, hi)
		}
	}
}

func repeat(s string, n int) []string {
	out := make([]string, n)
	for i := range out {
		out[i] = s
	}
	return out
}

// checkLineDefects checks the exported report: every chart drawn with ink,
// the rates tooltip showing the counts, the recommendation explained; then
// it opens the same file in a browser with no network and checks that the
// charts still draw, and saves a screenshot of each.
func checkLineDefects(t *testing.T, ctx context.Context) {
	n := len(lineDefectsCharts)
	if got := eval[int](t, ctx, `document.querySelectorAll('[data-propscope-chart]').length`); got != n {
		t.Fatalf("the report holds %d charts, want %d", got, n)
	}
	href := eval[string](t, ctx, `location.href`)
	u, err := url.Parse(href)
	if err != nil {
		t.Fatal(err)
	}
	b := newOfflineBrowser(t)
	b.open(t, href, n)
	for i, ink := range b.ink(t) {
		if ink < 2000 {
			t.Errorf("%s chart: %d drawn pixels, want a drawn chart", lineDefectsCharts[i], ink)
		}
	}
	if tip := b.tooltip(t, 0, 0, 0); !strings.Contains(tip, "19 of 400") {
		t.Errorf("rates tooltip %q lacks line B's counts", tip)
	}
	figs := eval[[]string](t, ctx, `[...document.querySelectorAll('figure.propscope-chart figcaption')].map(f => f.innerText)`)
	if len(figs) < 2 || !strings.Contains(figs[1], "is recommended for a design of 400 and 400 units") {
		t.Errorf("the difference chart does not explain its recommendation: %q", figs)
	}
	b.offline(t)
	dir := chartsDir(t)
	for i, name := range lineDefectsCharts {
		path := filepath.Join(dir, fmt.Sprintf("line-defects-%d-%s.png", i+1, name))
		b.screenshot(t, i, path)
		t.Logf("screenshot: %s", path)
	}
	t.Logf("offline view of %s: %d charts drawn", filepath.Base(u.Path), n)
}
