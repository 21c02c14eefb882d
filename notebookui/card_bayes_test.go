package notebookui

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
)

func bayesFixture(t *testing.T, c proportions.Comparison, options ...bayes.Option) BayesCard {
	t.Helper()
	a, err := bayes.Analyze(c, options...)
	if err != nil {
		t.Fatal(err)
	}
	return NewBayesCard(a)
}

// The card says what the analysis holds in words: the prior named, the
// probability, the equivalence region, every sensitivity row and the
// caution, in every form.
func TestBayesCardShowsTheAnalysis(t *testing.T) {
	c, _ := proportions.NewComparison(41, 50, 33, 50, proportions.Labels{First: "coated", Second: "bare", Event: "germinated"})
	card := bayesFixture(t, c, bayes.WithEquivalence(-0.05, 0.05))
	a := card.Analysis
	for form, s := range map[string]string{"HTML": card.HTML(), "Markdown": card.Markdown(), "text": card.Text()} {
		for _, want := range []string{"uniform Beta(1, 1) on each group", "0.964", "equivalence region", "jeffreys Beta(0.5, 0.5)",
			"neutral Beta(0.3333, 0.3333)", "highest-density", "qualified statistician", "Before acting on this"} {
			if !strings.Contains(s, want) {
				t.Errorf("%s lacks %q", form, want)
			}
		}
	}
	if strings.Count(card.HTML(), "<tr>") != 1+len(a.Effects)+1+len(a.Sensitivity) {
		t.Errorf("HTML rows: want a header and a row per effect and per sensitivity row")
	}
	if strings.Contains(card.HTML(), "<script") {
		t.Error("the card carries a script")
	}
	raw, err := card.JSON()
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Kind     string         `json:"kind"`
		Analysis bayes.Analysis `json:"analysis"`
	}
	if err := json.Unmarshal(raw, &back); err != nil {
		t.Fatal(err)
	}
	if back.Kind != "bayes-card" || back.Analysis.ProbabilityFirstHigher != a.ProbabilityFirstHigher {
		t.Errorf("JSON round trip lost data: %s", raw[:200])
	}
	if _, err := Bundle(card); err != nil {
		t.Error(err)
	}
}

func TestBayesCardEscapesHostileLabels(t *testing.T) {
	card := bayesFixture(t, hostile, bayes.WithMargin(0.05))
	h := card.HTML()
	for _, raw := range []string{"<script>window", "<img", "<svg onload", "onerror=\""} {
		if strings.Contains(h, raw) {
			t.Errorf("HTML contains the raw user string %q", raw)
		}
	}
	for _, escaped := range []string{"&lt;script&gt;", "&lt;img src=x onerror=&#34;window.__pwned=2&#34;&gt;", "&lt;svg onload"} {
		if !strings.Contains(h, escaped) {
			t.Errorf("HTML lacks the escaped text %q", escaped)
		}
	}
	md := card.Markdown()
	for _, raw := range []string{"<script", "<img", "<svg"} {
		if strings.Contains(md, raw) {
			t.Errorf("Markdown contains the raw user string %q", raw)
		}
	}
	if !strings.Contains(card.Text(), hostile.First.Label) {
		t.Error("text form does not show the label literally")
	}
}

// Labels from the fuzzer never reach the card's HTML or Markdown raw.
func FuzzBayesCardLabels(f *testing.F) {
	f.Add(hostile.First.Label, hostile.Second.Label, hostile.Event)
	f.Add("a|b*c", "[x](y)", "`e`")
	base, _ := bayes.Analyze(proportions.Comparison{First: proportions.Group{Label: "a", Events: 3, Trials: 10},
		Second: proportions.Group{Label: "b", Events: 5, Trials: 10}, Event: "e"})
	f.Fuzz(func(t *testing.T, first, second, event string) {
		a := base
		// each label between markers, so that a raw label cannot match the
		// card's own markup
		first, second, event = "⟦"+first+"⟧", "⟦"+second+"⟧", "⟦"+event+"⟧"
		a.Comparison.First.Label, a.Comparison.Second.Label, a.Comparison.Event = first, second, event
		card := NewBayesCard(a)
		h := card.HTML()
		for _, l := range []string{first, second, event} {
			if strings.ContainsAny(l, "<>&\"'") && strings.Contains(h, l) {
				t.Errorf("HTML holds the raw label %q", l)
			}
		}
		if md := card.Markdown(); strings.Contains(md, "<") {
			t.Errorf("Markdown holds a raw <")
		}
	})
}
