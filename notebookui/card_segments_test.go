package notebookui

import (
	"encoding/json"
	"html"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/segments"
)

// segmentsFixture is an invented germination check across eight
// nurseries: primed against untreated seed, one nursery that sowed no
// untreated seed, two small ones.
func segmentsFixture(t testing.TB) SegmentsCard {
	t.Helper()
	rows := []proportions.BreakdownRow{
		{Value: "Hillside", Counts: proportions.Counts{X1: 86, N1: 100, X2: 71, N2: 100}},
		{Value: "Riverbank", Counts: proportions.Counts{X1: 45, N1: 60, X2: 44, N2: 60}},
		{Value: "North field", Counts: proportions.Counts{X1: 150, N1: 200, X2: 120, N2: 210}},
		{Value: "Glasshouse 2", Counts: proportions.Counts{X1: 30, N1: 40}},
		{Value: "Orchard", Counts: proportions.Counts{X1: 4, N1: 6, X2: 3, N2: 7}},
		{Value: "Terrace", Counts: proportions.Counts{X1: 70, N1: 90, X2: 72, N2: 90}},
		{Value: "Seed bank", Counts: proportions.Counts{X1: 9, N1: 9, X2: 5, N2: 8}},
		{Value: "Valley", Counts: proportions.Counts{X1: 118, N1: 150, X2: 90, N2: 150}},
	}
	b, err := proportions.NewBreakdown("nursery", proportions.Labels{First: "primed", Second: "untreated", Event: "germinated"}, rows)
	if err != nil {
		t.Fatal(err)
	}
	r, err := segments.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	return SegmentsCard{Result: r, Shown: 5}
}

func TestSegmentsGolden(t *testing.T) {
	checkGolden(t, "segments", segmentsFixture(t))
}

// The card states the number of segments, m and the adjustment in every
// form, flags the empty and sparse segments, lists the orders, and
// carries the caution; its numbers are worded by hand from the fixture.
func TestSegmentsCardShowsTheAnalysis(t *testing.T) {
	c := segmentsFixture(t)
	r := c.Result
	for form, s := range map[string]string{"HTML": html.UnescapeString(c.HTML()), "Markdown": c.Markdown(), "text": c.Text()} {
		for _, want := range []string{
			"8 segments", "7 tested (m)", "1 empty", // Glasshouse 2 has no untreated seed
			"adjusted for 7 segments by Holm", "family-wise error rate",
			"+15.0", // Hillside: 0.86 − 0.71 in points
			// Hillside's Holm-adjusted p: the third smallest of 7, so
			// 5 × 0.009829 (the fixture's SciPy score p-value) = 0.0491.
			"0.0491",
			"1.0000",       // Riverbank's, capped at 1
			"30/40 vs 0/0", // the empty segment's counts
			"no trials in untreated",
			"sparse",         // Orchard, Seed bank
			"m = 7 segments", // the note on the empty segment
			"qualified statistician", "Before acting on this",
		} {
			if !strings.Contains(s, want) {
				t.Errorf("%s lacks %q", form, want)
			}
		}
	}
	h := c.HTML()
	if strings.Contains(h, "<script") {
		t.Error("the card carries a script")
	}
	for _, order := range []string{"adjusted p-value, smallest first", "size of the difference, largest first", "units in the segment, most first"} {
		if strings.Count(h, order) < 2 { // the link and the heading
			t.Errorf("HTML lacks the order %q", order)
		}
	}
	// Three orders of at most Shown rows, plus the flagged table: a
	// header each, and the rows.
	flagged := 1 + r.SparseCount
	if got, want := strings.Count(h, "<tr>"), 3*(1+c.Shown)+1+flagged; got != want {
		t.Errorf("HTML has %d rows, want %d", got, want)
	}
	// The first listed segment by adjusted p is the one with the smallest
	// adjusted p-value.
	best := r.ByAdjustedP()[0]
	i := strings.Index(h, "<tbody>")
	if j := strings.Index(h[i:], r.Segments[best].Value); j < 0 || j > 200 {
		t.Errorf("the first row is not %s", r.Segments[best].Value)
	}
	raw, err := c.JSON()
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Kind     string           `json:"kind"`
		Summary  map[string]any   `json:"summary"`
		Segments []map[string]any `json:"segments"`
	}
	if err := json.Unmarshal(raw, &back); err != nil {
		t.Fatal(err)
	}
	if back.Kind != "segments-card" || back.Summary["tested"] != 7.0 || back.Summary["adjustment"] != "holm" || len(back.Segments) != c.Shown {
		t.Errorf("JSON: %s", raw)
	}
	if _, err := Bundle(c); err != nil {
		t.Error(err)
	}
}

func TestSegmentsCardEscapesHostileText(t *testing.T) {
	c := segmentsFixture(t)
	c.Result.First, c.Result.Second, c.Result.Event = hostile.First.Label, hostile.Second.Label, hostile.Event
	c.Result.By = `<img src=x onerror="window.__pwned=3">`
	for i := range c.Result.Segments {
		c.Result.Segments[i].Value = `<svg onload=alert(1)>|*[x](y)` + c.Result.Segments[i].Value
	}
	h := c.HTML()
	for _, raw := range []string{"<script>window", "<img", "<svg onload", "onerror=\""} {
		if strings.Contains(h, raw) {
			t.Errorf("HTML contains the raw user string %q", raw)
		}
	}
	if !strings.Contains(h, "&lt;svg onload=alert(1)&gt;") {
		t.Error("HTML lacks the escaped value")
	}
	md := c.Markdown()
	for _, raw := range []string{"<script", "<img", "<svg", "[x](y)"} {
		if strings.Contains(md, raw) {
			t.Errorf("Markdown contains the raw user string %q", raw)
		}
	}
	if !strings.Contains(c.Text(), "<svg onload=alert(1)>") {
		t.Error("text form does not show the value literally")
	}
}

// The forest chart draws the segments with the smallest adjusted p-values,
// in that order, each with its simultaneous interval, and says what it
// left out.
func TestSegmentsForestChart(t *testing.T) {
	r := segmentsFixture(t).Result
	ch, err := SegmentsForestChart(r, 3)
	if err != nil {
		t.Fatal(err)
	}
	order := r.ByAdjustedP()
	text := ch.Text()
	for k, i := range order[:3] {
		s, a := r.Segments[i], r.Adjusted[i]
		if !strings.Contains(text, s.Value) {
			t.Errorf("row %d: %s not drawn", k+1, s.Value)
		}
		// The limits as the chart's table prints them, in points.
		for _, lim := range []float64{a.SimultaneousLower, a.SimultaneousUpper} {
			if !strings.Contains(text, points(lim, 2)) {
				t.Errorf("%s: simultaneous limit %s not in the chart's table:\n%s", s.Value, points(lim, 2), text)
			}
		}
	}
	if strings.Contains(text, r.Segments[order[3]].Value) {
		t.Errorf("a fourth segment is drawn")
	}
	for _, want := range []string{"8 segments", "m = 7", "Holm", "3 of 7 tested segments", "1 segment with a group without trials is not drawn"} {
		if !strings.Contains(text, want) && !strings.Contains(ch.HTML(), want) {
			t.Errorf("the chart does not say %q", want)
		}
	}
}

// A Bonferroni level over many segments keeps the digits that tell it
// from 100% (worked by hand: 1 − 0.05/7 = 0.992857…, 1 − 0.05/10⁶ =
// 0.99999995).
func TestSimultaneousLevelText(t *testing.T) {
	for _, k := range []struct {
		level float64
		want  string
	}{{1 - 0.05/7, "99.29%"}, {1 - 0.05/1e6, "99.999995%"}, {1 - 0.05/1000, "99.995%"}, {0.95, "95%"}} {
		if got := simultaneousLevelText(k.level); got != k.want {
			t.Errorf("level %v: %q, want %q", k.level, got, k.want)
		}
	}
}
