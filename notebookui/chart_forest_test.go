package notebookui

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// forestSeries returns the data items of a forest chart's series.
func forestSeries(t *testing.T, c *Chart) (values [][]float64, option map[string]any) {
	t.Helper()
	b, err := c.OptionJSON()
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &option); err != nil {
		t.Fatal(err)
	}
	for _, d := range option["series"].([]any)[0].(map[string]any)["data"].([]any) {
		var v []float64
		for _, x := range d.(map[string]any)["value"].([]any) {
			v = append(v, x.(float64))
		}
		values = append(values, v)
	}
	return values, option
}

// A difference forest: each drawn row sits on its own category with its
// limits, the summary is flagged as the diamond, a row without an estimate
// is listed on the axis and in the table but not drawn, the square sizes
// follow the weights, and the no-difference line is at 0.
func TestForestChartDifference(t *testing.T) {
	f := Forest{Title: "By block", Effect: "difference", Scale: proportions.Difference, Level: 0.95,
		Rows: []ForestRow{
			{Label: "B1", Estimate: 0.1, Lower: -0.02, Upper: 0.22, Weight: 0.75},
			{Label: "B2", Estimate: math.NaN(), Lower: math.NaN(), Upper: math.NaN(), Note: "no units of one group"},
			{Label: "B3", Estimate: 0.05, Lower: -0.3, Upper: 0.4, Weight: 0.25},
		},
		Summary: &ForestRow{Label: "common", Estimate: 0.09, Lower: 0.01, Upper: 0.17}}
	c, err := ForestChart(f)
	if err != nil {
		t.Fatal(err)
	}
	v, option := forestSeries(t, c)
	if len(v) != 3 {
		t.Fatalf("%d items drawn, want 3 (the row without estimate is not drawn)", len(v))
	}
	want := [][2]float64{{0, 0}, {2, 0}, {3, 1}} // category, summary flag
	for i, w := range want {
		if v[i][1] != w[0] || v[i][7] != w[1] {
			t.Errorf("item %d: category %v summary %v, want %v", i, v[i][1], v[i][7], w)
		}
	}
	if !(v[0][4] > v[1][4]) {
		t.Errorf("square of weight 0.75 (%v px) not larger than of 0.25 (%v px)", v[0][4], v[1][4])
	}
	if v[0][2] != -0.02 || v[0][3] != 0.22 {
		t.Errorf("B1 limits %v, %v", v[0][2], v[0][3])
	}
	cats := option["yAxis"].([]any)[0].(map[string]any)["data"].([]any)
	if len(cats) != 4 || cats[1] != "B2" {
		t.Errorf("categories %v, want the four rows with B2 listed", cats)
	}
	line := option["series"].([]any)[0].(map[string]any)["markLine"].(map[string]any)["data"].([]any)[0].(map[string]any)
	if line["xAxis"] != 0.0 {
		t.Errorf("no-difference line at %v, want 0", line["xAxis"])
	}
	if txt := c.Text(); !strings.Contains(txt, "no units of one group") || !strings.Contains(txt, "B2") {
		t.Errorf("text view lacks the undrawn row:\n%s", txt)
	}
}

// A ratio forest uses a log axis around 1, and a zero or infinite limit is
// drawn at the axis's end, flagged as clipped.
func TestForestChartRatio(t *testing.T) {
	f := Forest{Title: "odds ratios", Effect: "odds ratio", Scale: proportions.OddsRatio,
		Rows: []ForestRow{{Label: "a", Estimate: 2, Lower: 0.8, Upper: 5}, {Label: "b", Estimate: math.Inf(1), Lower: 0.5, Upper: math.Inf(1)}}}
	c, err := ForestChart(f)
	if err != nil {
		t.Fatal(err)
	}
	v, option := forestSeries(t, c)
	x := option["xAxis"].([]any)[0].(map[string]any)
	if x["type"] != "log" || !(x["min"].(float64) < 0.5) || !(x["max"].(float64) > 5) {
		t.Errorf("axis %v, want a log axis around 0.5 to 5", x)
	}
	if v[1][6] != 1 || v[1][3] != x["max"] {
		t.Errorf("infinite upper limit drawn at %v (clipped %v), want the axis end %v", v[1][3], v[1][6], x["max"])
	}
	line := option["series"].([]any)[0].(map[string]any)["markLine"].(map[string]any)["data"].([]any)[0].(map[string]any)
	if line["xAxis"] != 1.0 {
		t.Errorf("no-difference line at %v, want 1", line["xAxis"])
	}
}

func TestForestChartRejects(t *testing.T) {
	if _, err := ForestChart(Forest{Scale: proportions.Difference}); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("no rows: %v, want ErrEmptyInput", err)
	}
	if _, err := ForestChart(Forest{Scale: proportions.SingleRate, Rows: []ForestRow{{Label: "a"}}}); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("rate scale: %v, want ErrUnsupported", err)
	}
}
