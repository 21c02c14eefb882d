package notebookui

import (
	"encoding/json"
	"html"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/strata"
)

// blockedTrial is the invented blocked field trial of the notebook
// blocked-germination.ipynb: primed seed sown mostly in the poor blocks,
// so that pooled over the blocks it looks worse than untreated seed while
// within every block it germinates better; block 9 lost its untreated plot.
func blockedTrial(t *testing.T) strata.Analysis {
	t.Helper()
	counts := [][4]int64{{19, 20, 68, 80}, {18, 20, 64, 80}, {19, 20, 66, 80}, {18, 20, 65, 80},
		{42, 80, 8, 20}, {38, 80, 7, 20}, {44, 80, 9, 20}, {40, 80, 8, 20}, {11, 20, 0, 0}}
	var rows []proportions.BreakdownRow
	for i, c := range counts {
		rows = append(rows, proportions.BreakdownRow{Value: "B" + string(rune('1'+i)), Counts: proportions.Counts{X1: c[0], N1: c[1], X2: c[2], N2: c[3]}})
	}
	b, err := proportions.NewBreakdown("block", proportions.Labels{First: "primed", Second: "untreated", Event: "germinated"}, rows)
	if err != nil {
		t.Fatal(err)
	}
	a, err := strata.Analyze(b)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// TestStrataGolden compares the stratified card's three forms with
// reviewed files (go test ./notebookui -update rewrites them).
func TestStrataGolden(t *testing.T) {
	checkGolden(t, "blocked-germination", NewStrataCard(blockedTrial(t)))
}

// The card shows the overall answer, every block (the lost one flagged),
// the pooled analysis beside the stratified one with the reversal named,
// homogeneity and the caution, in every form. The pooled shares are worked
// by hand: primed 74 + 164 = 238 of 400 (59.5%), untreated 263 + 32 = 295
// of 400 (73.75%) in the used blocks, plus block 9's 11 of 20 primed:
// 249 of 420 (59.3%) against 295 of 400, a difference of −14.5 points.
func TestStrataCardShowsTheAnalysis(t *testing.T) {
	c := NewStrataCard(blockedTrial(t))
	want := []string{"Within each block: germinated: primed vs untreated", "Common difference primed − untreated",
		"B9", "not used (a group has no units)", "19 of 20 (95.0%)", "68 of 80 (85.0%)",
		"pooled, ignoring the block", "−14.5", "The direction reverses", "Same effect in every block?",
		"Breslow–Day with Tarone's correction", "Cochran–Mantel–Haenszel", "Exact conditional odds ratio",
		"Before acting on this", "qualified statistician"}
	for form, s := range map[string]string{
		"html": html.UnescapeString(c.HTML()), "markdown": strings.ReplaceAll(c.Markdown(), `\`, ""), "text": c.Text(),
	} {
		for _, w := range want {
			if !strings.Contains(s, w) {
				t.Errorf("%s lacks %q", form, w)
			}
		}
	}
	if strings.Contains(c.HTML(), "<script") {
		t.Error("the card carries a script")
	}
	raw, err := c.JSON()
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Kind     string `json:"kind"`
		Analysis struct {
			Strata []json.RawMessage `json:"strata"`
		} `json:"analysis"`
	}
	if err := json.Unmarshal(raw, &back); err != nil || back.Kind != "strata-card" || len(back.Analysis.Strata) != 9 {
		t.Errorf("JSON: kind %q, %d strata, %v", back.Kind, len(back.Analysis.Strata), err)
	}
	if _, err := Bundle(c); err != nil {
		t.Error(err)
	}
}

// The forest chart of the analysis draws the eight used blocks and the
// diamond, lists the lost block, and places each block at its own
// difference.
func TestStrataForestChart(t *testing.T) {
	a := blockedTrial(t)
	ch, err := StrataForestChart(a)
	if err != nil {
		t.Fatal(err)
	}
	v, _ := forestSeries(t, ch)
	if len(v) != 9 || v[8][7] != 1 {
		t.Fatalf("%d items (want 8 blocks and the diamond last): %v", len(v), v)
	}
	if d := 19.0/20 - 68.0/80; v[0][0] < d-1e-15 || v[0][0] > d+1e-15 {
		t.Errorf("B1 drawn at %v, want 19/20 − 68/80", v[0][0])
	}
	if !strings.Contains(ch.Text(), "B9") {
		t.Error("the lost block is not listed")
	}
}
