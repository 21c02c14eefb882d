package e2e

import (
	"context"
	"encoding/json"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/propscope/propscope/e2e/nbrun"
)

func init() {
	pageChecks["line-shift-segments"] = checkLineShiftSegments
	outputChecks["line-shift-segments"] = checkLineShiftSegmentsOutputs
}

// checkLineShiftSegments asserts what a reader of the line × shift notebook
// sees. Expected facts, from the notebook's invented design and not from
// propscope: 8 plants × 12 lines × 3 shifts = 288 segments, all with parts
// from both suppliers (each gets 120 to 199 parts), so m = 288 (arithmetic);
// every part id divisible by 13001 has no result, so the first read stops
// naming the column "defective" and the second skips ⌊parts / 13001⌋ rows
// (the notebook prints the number of parts it wrote); 3 segments are truly
// worse, and the chance expectation printed is 5% of the 285 others, 14
// (arithmetic). The counts of flagged segments are the notebook's own
// printed output: the checks are that they add up, that an adjustment
// never flags more than the unadjusted tests, that the card names Holm,
// the family-wise error rate and m = 288 and reports the count the
// notebook printed for Holm, and that the forest chart is drawn with its
// subtitle naming m and the adjustment.
func checkLineShiftSegments(t *testing.T, ctx context.Context) {
	text := eval[string](t, ctx, `document.body.innerText`)
	m := regexp.MustCompile(`wrote (\d+) inspected parts`).FindStringSubmatch(text)
	if m == nil {
		t.Fatalf("no count of parts written in the page")
	}
	parts, _ := strconv.Atoi(m[1])
	wantText(t, "the page", text,
		`first read: table "inspections"`, `column "defective" is NULL`,
		"read 288 segments, "+strconv.Itoa(parts/13001)+" rows skipped for missing values, 0 segments with a supplier missing",
		"about 14 expected by chance alone", "the 3 truly worse segments, South against North:", "Before acting on this")
	unadjusted := flaggedCounts(t, text, `each segment on its own at 5%: (\d+) of 288 segments look different: (\d) of the 3 truly worse, (\d+) by chance`)
	holm := flaggedCounts(t, text, `after Holm \(controls the family-wise error rate, m = 288\): (\d+) still look different: (\d) of the 3 truly worse, (\d+) by chance`)
	bh := flaggedCounts(t, text, `after Benjamini–Hochberg \(controls the false discovery rate, m = 288\): (\d+) still look different: (\d) of the 3 truly worse, (\d+) by chance`)
	for _, c := range [][3]int{holm, bh} {
		if c[0] > unadjusted[0] || c[1] > unadjusted[1] {
			t.Errorf("an adjustment flags more (%v) than the unadjusted tests (%v)", c, unadjusted)
		}
	}
	// Holm's rejections are a subset of Benjamini–Hochberg's at the same
	// level: Holm's threshold for the i-th smallest p-value, α/(m − i + 1),
	// is never above Benjamini–Hochberg's, iα/m.
	if holm[0] > bh[0] {
		t.Errorf("Holm flags %d segments, Benjamini–Hochberg %d: Holm can never flag more", holm[0], bh[0])
	}
	if n := strings.Count(text, "after Benjamini–Hochberg\n"); n != 3 {
		t.Errorf("%d truly worse segments listed with their p-values, want 3", n)
	}
	checkSegmentsCard(t, ctx, holm[0])
	checkSegmentsForest(t, ctx)
}

// flaggedCounts reads a printed line "… N … T of the 3 truly worse, C by
// chance" and checks that T + C = N.
func flaggedCounts(t *testing.T, text, pattern string) [3]int {
	t.Helper()
	f := regexp.MustCompile(pattern).FindStringSubmatch(text)
	if f == nil {
		t.Fatalf("the page lacks a line matching %q", pattern)
	}
	var c [3]int
	for i := range c {
		c[i], _ = strconv.Atoi(f[i+1])
	}
	if c[1]+c[2] != c[0] {
		t.Errorf("%q: %d truly worse + %d by chance ≠ %d", f[0], c[1], c[2], c[0])
	}
	return c
}

// checkSegmentsCard checks the card's words: the number of segments and m
// (288 by the design), Holm and what it controls, the count the notebook
// printed for Holm, the sparse flags and the caution.
func checkSegmentsCard(t *testing.T, ctx context.Context, holmFlagged int) {
	t.Helper()
	card := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="segments-card"]'); return c ? c.innerText : ""; })()`)
	if card == "" {
		t.Fatal("no segments card on the page")
	}
	wantText(t, "the segments card", card,
		"Segments: defective: South vs North by segment", "288 segments by segment; 288 tested (m), 0 empty",
		"p-values adjusted for 288 segments by Holm (controls the family-wise error rate): "+strconv.Itoa(holmFlagged)+" of 288 reject at 5% after adjustment.",
		"Simultaneous intervals at", "Bonferroni over 288 segments", "By adjusted p-value, smallest first (10 of the 288 tested)",
		"plant 3 / line 01 / night", "sparse", "Before acting on this:")
}

// checkSegmentsForest checks that the forest chart is drawn and says what
// it shows: the segments with the smallest adjusted p-values, ten rows in
// its table of numbers. (The drawn chart's label holds only its title;
// the subtitle is checked in the notebook's output.)
func checkSegmentsForest(t *testing.T, ctx context.Context) {
	t.Helper()
	if n := eval[int](t, ctx, `document.querySelectorAll('[data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want one drawn chart (the forest chart), found %d", n)
	}
	if kind := eval[string](t, ctx, `(() => { const f = document.querySelector('figure.propscope-chart'); return f ? f.dataset.kind : ""; })()`); kind != "forest" {
		t.Errorf("the chart drawn is %q, want the forest chart", kind)
	}
	label := eval[string](t, ctx, `(() => { const e = document.querySelector('figure.propscope-chart [role="img"]'); return e ? e.getAttribute('aria-label') : ""; })()`)
	wantText(t, "the forest chart's title", label, "Difference in share defective by segment: the smallest adjusted p-values")
	caption := eval[string](t, ctx, `(() => { const f = document.querySelector('figure.propscope-chart figcaption'); return f ? f.textContent : ""; })()`)
	wantText(t, "the forest chart's caption", caption, "The 10 of 288 tested segments with the smallest adjusted p-values")
	if rows := eval[int](t, ctx, `document.querySelectorAll('figure.propscope-chart figcaption tbody tr').length`); rows != 10 {
		t.Errorf("the forest chart's table of numbers has %d rows, want the 10 segments drawn", rows)
	}
}

// checkLineShiftSegmentsOutputs checks the executed notebook: one segments
// card and one chart whose subtitle names the number of segments, m and
// Holm, and the card's JSON against Holm's definition (Holm
// 1979, Scandinavian Journal of Statistics 6:65–70), recomputed here from
// the raw p-values the card lists: sorted, p(1) ≤ … ≤ p(k), the adjusted
// value of the i-th is max over j ≤ i of min(1, (m − j + 1)·p(j)). Below an
// adjusted value of 1 the card's order by adjusted p-value is the order by
// raw p-value, so the listed rows up to there are the smallest p-values.
func checkLineShiftSegmentsOutputs(t *testing.T, r nbrun.Result) {
	outs, err := nbrun.Outputs(r.Executed)
	if err != nil {
		t.Fatal(err)
	}
	kinds := map[string]int{}
	var card json.RawMessage
	var chartHTML string
	for _, o := range outs {
		kinds[o.Kind]++
		switch o.Kind {
		case "segments-card":
			card = o.Data["application/json"]
		case "chart":
			chartHTML = notebookText(o.Data["text/html"])
		}
	}
	if kinds["segments-card"] != 1 || kinds["chart"] != 1 {
		t.Fatalf("want one segments-card and one chart output, got %v", kinds)
	}
	wantText(t, "the forest chart's subtitle", chartHTML, "South − North; 288 segments, m = 288 tested, adjusted by Holm",
		"intervals (Bonferroni)")
	var doc struct {
		Summary struct {
			SegmentCount int    `json:"segment_count"`
			Tested       int    `json:"tested"`
			Adjustment   string `json:"adjustment"`
			Rejected     int    `json:"rejected"`
		} `json:"summary"`
		Segments []struct {
			PValue float64 `json:"p_value"`
		} `json:"segments"`
		Adjusted []struct {
			AdjustedPValue float64 `json:"adjusted_p_value"`
			Tested         int     `json:"tested"`
		} `json:"adjusted"`
	}
	if err := json.Unmarshal(card, &doc); err != nil {
		t.Fatalf("segments card JSON: %v", err)
	}
	s := doc.Summary
	if s.SegmentCount != 288 || s.Tested != 288 || s.Adjustment != "holm" {
		t.Errorf("card summary: %d segments, m = %d, adjustment %q; want 288, 288, holm", s.SegmentCount, s.Tested, s.Adjustment)
	}
	if len(doc.Segments) != 10 || len(doc.Adjusted) != 10 {
		t.Fatalf("card JSON lists %d segments and %d adjusted records, want the 10 shown", len(doc.Segments), len(doc.Adjusted))
	}
	// Holm's adjusted values rise with the raw p-value, so the listed rows
	// below 1 are the smallest raw p-values; ties of the adjusted value may
	// list them in another order, hence the sort.
	type pair struct{ p, adjusted float64 }
	var below []pair
	for i, sg := range doc.Segments {
		if a := doc.Adjusted[i].AdjustedPValue; a < 1 {
			below = append(below, pair{sg.PValue, a})
		}
	}
	sort.SliceStable(below, func(i, j int) bool { return below[i].p < below[j].p })
	m := float64(s.Tested)
	running, rejected := 0.0, 0
	for i, q := range below {
		running = math.Max(running, math.Min(1, (m-float64(i))*q.p))
		if math.Abs(q.adjusted-running) > 1e-12*math.Max(1, running) {
			t.Errorf("raw p-value %d from the smallest: Holm-adjusted %v, recomputed %v from the raw p-values", i+1, q.adjusted, running)
		}
		if q.adjusted <= 0.05 {
			rejected++
		}
	}
	if s.Rejected < len(doc.Segments) && rejected != s.Rejected {
		t.Errorf("the card says %d segments reject after Holm, its listed adjusted p-values give %d", s.Rejected, rejected)
	}
}

// notebookText reads an output's text, stored as one string or a list of
// lines.
func notebookText(raw json.RawMessage) string {
	var one string
	if json.Unmarshal(raw, &one) == nil {
		return one
	}
	var lines []string
	if json.Unmarshal(raw, &lines) == nil {
		return strings.Join(lines, "")
	}
	return string(raw)
}
