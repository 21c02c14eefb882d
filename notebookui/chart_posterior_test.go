package notebookui

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
)

func posteriorAnalysis(t testing.TB, first, second, event string, options ...bayes.Option) bayes.Analysis {
	t.Helper()
	c, err := proportions.NewComparison(41, 50, 33, 50, proportions.Labels{First: first, Second: second, Event: event})
	if err != nil {
		t.Fatal(err)
	}
	a, err := bayes.Analyze(c, options...)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// The curves are densities: each integrates to about one over its range
// (trapezoid rule on the chart's points), the difference's peak lies near
// the posterior median, and the equivalence region is shaded where set.
func TestPosteriorChartOption(t *testing.T) {
	a := posteriorAnalysis(t, "coated", "bare", "germinated", bayes.WithEquivalence(-0.05, 0.05))
	c, err := PosteriorChart(a)
	if err != nil {
		t.Fatal(err)
	}
	if c.Name() != "posterior" {
		t.Errorf("name %q", c.Name())
	}
	opt := optionOfChart(t, c)
	series := opt["series"].([]any)
	if len(series) != 3 {
		t.Fatalf("%d series, want 3", len(series))
	}
	for i, s := range series {
		pts := s.(map[string]any)["data"].([]any)
		var area, peakX, peakY float64
		for k := 1; k < len(pts); k++ {
			p0, p1 := pts[k-1].([]any), pts[k].([]any)
			x0, y0, x1, y1 := p0[0].(float64), p0[1].(float64), p1[0].(float64), p1[1].(float64)
			area += (x1 - x0) * (y0 + y1) / 2
			if y1 > peakY {
				peakX, peakY = x1, y1
			}
		}
		if math.Abs(area-1) > 2e-3 {
			t.Errorf("series %d: the curve holds %.5f of the probability, want about 1", i, area)
		}
		if i == 2 && math.Abs(peakX-a.Effects[0].Median) > 0.02 {
			t.Errorf("difference peaks at %v, median %v", peakX, a.Effects[0].Median)
		}
	}
	ma, ok := series[2].(map[string]any)["markArea"]
	if !ok || !strings.Contains(mustJSON(t, ma), "-0.05") {
		t.Errorf("equivalence region not shaded: %v", ma)
	}
	if !strings.Contains(c.Text(), "equivalence region") || !strings.Contains(c.HTML(), "uniform Beta(1, 1)") {
		t.Error("table or subtitle lacks the region or the prior")
	}
	// without a region nothing is shaded
	c2, err := PosteriorChart(posteriorAnalysis(t, "coated", "bare", "germinated"))
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := optionOfChart(t, c2)["series"].([]any)[2].(map[string]any)["markArea"]; ok {
		t.Error("a region is shaded though none was set")
	}
}

func mustJSON(t *testing.T, v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func TestPosteriorChartEscapesLabels(t *testing.T) {
	hostile := []string{`</script><script>alert(1)</script>`, `<img src=x onerror=alert(2)>`, `"; alert(3); "`}
	a := posteriorAnalysis(t, hostile[0], hostile[1], hostile[2], bayes.WithEquivalence(-0.05, 0.05))
	c, err := PosteriorChart(a)
	if err != nil {
		t.Fatal(err)
	}
	h := c.HTML()
	if n := strings.Count(h, "</script>"); n != 1 {
		t.Errorf("%d </script> in the HTML, want only its own", n)
	}
	for _, bad := range []string{"<script>alert", "<img src=x", `"; alert(3); "`} {
		if strings.Contains(h, bad) {
			t.Errorf("raw %q in the HTML", bad)
		}
	}
	if !strings.Contains(h, "&lt;img src=x onerror=alert(2)&gt;") {
		t.Error("the label is not shown as escaped text")
	}
	if strings.Contains(c.Markdown(), "<img") {
		t.Error("raw HTML in Markdown")
	}
}

func BenchmarkPosteriorChart(b *testing.B) {
	b.Log("target: a posterior density chart under 20 ms")
	a := posteriorAnalysis(b, "coated", "bare", "germinated", bayes.WithEquivalence(-0.05, 0.05))
	for b.Loop() {
		c, err := PosteriorChart(a)
		if err != nil {
			b.Fatal(err)
		}
		_ = c.HTML()
	}
}

// The axes fit the posteriors: each rate axis holds every group's
// posterior from its 0.0005 to its 0.9995 quantile (gonum's beta quantile
// function, independent of the chart's bisection) and is at most 1.4
// times as wide as that span; the difference axis leaves at most 0.0005
// of the difference's posterior beyond each end (its distribution
// function) and is at most 1.4 times as wide as the span of the normal
// approximation's 0.0005 to 0.9995 quantiles where that approximation is
// close (10⁶ per group), 3 times where the posterior is skewed. The old
// ranges (six standard deviations and at least two percentage points of
// padding) were ten times too wide at 10⁶ per group.
func TestPosteriorChartRangesFit(t *testing.T) {
	for _, k := range [][4]int64{{41, 50, 33, 50}, {500_000, 1_000_000, 499_000, 1_000_000}, {0, 20, 3, 20}, {2, 400, 9, 380}} {
		c, err := proportions.NewComparison(k[0], k[1], k[2], k[3], proportions.Labels{})
		if err != nil {
			t.Fatal(err)
		}
		a, err := bayes.Analyze(c)
		if err != nil {
			t.Fatal(err)
		}
		ch, err := PosteriorChart(a)
		if err != nil {
			t.Fatal(err)
		}
		axes := optionOfChart(t, ch)["xAxis"].([]any)
		ends := func(i int) (float64, float64) {
			ax := axes[i].(map[string]any)
			return ax["min"].(float64), ax["max"].(float64)
		}
		rLo, rHi := ends(0)
		qLo, qHi := 1.0, 0.0
		for _, g := range a.Groups {
			b := distuv.Beta{Alpha: g.Posterior.EventShape, Beta: g.Posterior.NonEventShape}
			qLo, qHi = math.Min(qLo, b.Quantile(0.0005)), math.Max(qHi, b.Quantile(0.9995))
		}
		if rLo > qLo || rHi < qHi || rHi-rLo > 1.4*(qHi-qLo) {
			t.Errorf("%v: rate axis %v to %v, the posteriors' 0.0005 to 0.9995 quantiles %v to %v", k, rLo, rHi, qLo, qHi)
		}
		dLo, dHi := ends(1)
		p1, p2 := a.Groups[0].Posterior, a.Groups[1].Posterior
		diff, _ := bayes.NewEffect(proportions.Difference, bayes.NewPosterior(p1.EventShape, p1.NonEventShape),
			bayes.NewPosterior(p2.EventShape, p2.NonEventShape))
		below, _, _ := diff.Tails(dLo)
		_, above, _ := diff.Tails(dHi)
		sd := math.Sqrt(p1.Variance() + p2.Variance())
		normalSpan := 2 * 3.2905 * sd // z at 0.9995
		widest := 3.0
		if k[1] >= 1_000_000 {
			widest = 1.4
		}
		if below > 0.0005 || above > 0.0005 || dHi-dLo > widest*normalSpan {
			t.Errorf("%v: difference axis %v to %v leaves %.2g below and %.2g above, %.2f normal spans wide",
				k, dLo, dHi, below, above, (dHi-dLo)/normalSpan)
		}
	}
}
