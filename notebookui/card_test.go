package notebookui

import (
	"bytes"
	"encoding/gob"
	"encoding/json"
	"flag"
	"html"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/janpfeifer/gonb/gonbui/protocol"
	"github.com/propscope/propscope/proportions"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/golden")

func fixtureCard() ResultCard {
	return ResultCard{Analysis: germinationAnalysis(), lookup: fixedReferences}
}

// TestGolden compares the card's three forms with reviewed files. Run
// `go test ./notebookui -update` after an intended change and read the diff.
// checkGolden compares a card's HTML, Markdown and text with the golden
// files base.html, base.md and base.txt in testdata/golden/notebookui, or
// rewrites them under -update.
func checkGolden(t *testing.T, base string, c Displayable) {
	t.Helper()
	for name, got := range map[string]string{base + ".html": c.HTML(), base + ".md": c.Markdown(), base + ".txt": c.Text()} {
		path := filepath.Join("..", "testdata", "golden", "notebookui", name)
		if *update {
			if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test ./notebookui -update to create it)", err)
		}
		if got != string(want) {
			t.Errorf("%s differs from the golden file; run go test ./notebookui -update and review the diff.\ngot:\n%s", name, got)
		}
	}
}

func TestGolden(t *testing.T) {
	checkGolden(t, "germination", fixtureCard())
}

// TestCardShowsTheAnalysis checks the key numbers, worded by hand from the
// fixture's values, in every form.
func TestCardShowsTheAnalysis(t *testing.T) {
	c := fixtureCard()
	want := []string{
		"primed", "untreated", "germinated",
		"+15.0", "percentage points", // 0.86 − 0.71
		"+3.6 to +26.1",  // Mee limits 0.0362, 0.2606 in points
		"86.0%", "71.0%", // the groups' shares
		"77.9% to 91.5%",   // Wilson for 86/100
		"61.5% to 79.0%",   // Wilson for 71/100
		"z = 2.582",        // score statistic, 3 decimals
		"0.0098", "0.0153", // p-values 0.009829 and 0.01534 at four decimals
		"rejects equal rates",
		"+3.80", "+26.20", // Wald limits at two decimals
		"An example warning, shown as written.",
		"Farrington CP, Manning G (1990)",
		"Significance is not importance",
	}
	// Read each form as its reader would: HTML entities decoded, Markdown's
	// backslash escapes removed.
	for form, s := range map[string]string{
		"html":     html.UnescapeString(c.HTML()),
		"markdown": strings.ReplaceAll(c.Markdown(), `\`, ""),
		"text":     c.Text(),
	} {
		for _, w := range want {
			if !strings.Contains(s, w) {
				t.Errorf("%s form lacks %q", form, w)
			}
		}
	}
}

func TestNonRejectionIsNotReadAsEquality(t *testing.T) {
	a := germinationAnalysis()
	a.Test.Reject = false
	for i := range a.Tests {
		a.Tests[i].Reject = false
	}
	c := ResultCard{Analysis: a, lookup: fixedReferences}
	for _, s := range []string{c.HTML(), c.Text(), c.Markdown()} {
		if !strings.Contains(s, "does not reject equal rates") {
			t.Error("decision not worded as a non-rejection")
		}
		for _, bad := range []string{"accept", "no difference", "are equal", "the same rate"} {
			if strings.Contains(strings.ToLower(s), bad) {
				t.Errorf("card reads a non-rejection as equality: contains %q", bad)
			}
		}
	}
}

// hostile are labels that try to break out of HTML text, attributes and
// Markdown.
var hostile = proportions.Comparison{
	First:  proportions.Group{Label: `<script>window.__pwned=1</script>`, Events: 3, Trials: 10},
	Second: proportions.Group{Label: `<img src=x onerror="window.__pwned=2">`, Events: 5, Trials: 10},
	Event:  `"><svg onload=window.__pwned=3>'`,
}

func hostileCard() ResultCard {
	a := germinationAnalysis()
	a.Comparison = hostile
	a.Groups[0].Group, a.Groups[1].Group = hostile.First, hostile.Second
	a.Conclusion = "<b>bold?</b> " + hostile.First.Label
	a.Warnings = []proportions.Warning{{Code: "x", Message: hostile.Second.Label}}
	return ResultCard{Analysis: a, lookup: fixedReferences}
}

func TestHostileLabelsAreEscaped(t *testing.T) {
	c := hostileCard()
	h := c.HTML()
	for _, raw := range []string{"<script>window", "<img", "<svg onload", "onerror=\"", "<b>"} {
		if strings.Contains(h, raw) {
			t.Errorf("HTML contains the raw user string %q", raw)
		}
	}
	for _, escaped := range []string{"&lt;script&gt;", "&lt;img src=x onerror=&#34;window.__pwned=2&#34;&gt;", "&lt;svg onload"} {
		if !strings.Contains(h, escaped) {
			t.Errorf("HTML lacks the escaped text %q", escaped)
		}
	}
	md := c.Markdown()
	for _, raw := range []string{"<script", "<img", "<svg", "<b>"} {
		if strings.Contains(md, raw) {
			t.Errorf("Markdown contains the raw user string %q", raw)
		}
	}
	// Plain text shows the labels exactly as given.
	if !strings.Contains(c.Text(), hostile.First.Label) {
		t.Error("text form does not show the label literally")
	}
}

func TestMarkdownEscape(t *testing.T) {
	for in, want := range map[string]string{
		"a|b":           `a\|b`,
		"*x* _y_":       `\*x\* \_y\_`,
		"<i>&":          "&lt;i&gt;&amp;",
		"[l](http://x)": `\[l\](http\://x)`, // a bare URL would become a link (GitHub's Markdown)
		"two\nlines":    "two lines",
		"# h":           `\# h`,
		"- item":        `\- item`,
		"1. first":      `1\. first`,
		"86.0%":         "86.0%",
		"+15.00":        "+15.00",
		"  code  ":      "code",
		"www.x.org":     `www\.x.org`,
		"a@b.org":       `a\@b.org`,
	} {
		if got := mdEscape(in); got != want {
			t.Errorf("mdEscape(%q) = %q, want %q", in, got, want)
		}
	}
}

func TestFormatting(t *testing.T) {
	for _, c := range []struct{ got, want string }{
		{points(0.15, 1), "+15.0"},
		{points(-0.0321, 1), "−3.2"},
		{points(-0.00001, 1), "0.0"}, // no "−0.0"
		{points(0, 2), "0.00"},
		{percent(0.86, 1), "86.0%"},
		{percent(1, 1), "100.0%"},
		{ratio(2.5), "2.500"},
		{levelText(0.95), "95%"},
		{levelText(0.025), "2.5%"},
	} {
		if c.got != c.want {
			t.Errorf("got %q, want %q", c.got, c.want)
		}
	}
}

func TestJSONForm(t *testing.T) {
	raw, err := fixtureCard().JSON()
	if err != nil {
		t.Fatal(err)
	}
	var back struct {
		Kind     string               `json:"kind"`
		Analysis proportions.Analysis `json:"analysis"`
	}
	if err := json.Unmarshal(raw, &back); err != nil {
		t.Fatal(err)
	}
	if back.Kind != "result-card" || back.Analysis.Comparison.First.Events != 86 || back.Analysis.Interval.Upper != 0.2606 {
		t.Errorf("JSON round trip lost data: %+v", back)
	}
}

// TestBundleTravelsByGob encodes the display bundle as GoNB does (gob, as
// `any` values) and decodes it again: unregistered container types would
// make the kernel drop the output.
func TestBundleTravelsByGob(t *testing.T) {
	bundle, err := Bundle(fixtureCard())
	if err != nil {
		t.Fatal(err)
	}
	for _, mime := range []string{"text/html", "text/plain", "application/json"} {
		if _, ok := bundle[mime]; !ok {
			t.Errorf("bundle lacks %s", mime)
		}
	}
	data := map[protocol.MIMEType]any{}
	for k, v := range bundle {
		data[protocol.MIMEType(k)] = v
	}
	var buf bytes.Buffer
	msg := &protocol.DisplayData{Data: data, Metadata: map[string]any{"propscope": "result-card"}}
	if err := gob.NewEncoder(&buf).Encode(msg); err != nil {
		t.Fatalf("gob cannot carry the bundle: %v", err)
	}
	var got protocol.DisplayData
	if err := gob.NewDecoder(&buf).Decode(&got); err != nil {
		t.Fatal(err)
	}
	obj, ok := got.Data["application/json"].(map[string]any)
	if !ok || obj["kind"] != "result-card" {
		t.Errorf("application/json did not arrive as an object: %#v", got.Data["application/json"])
	}
}

func TestDisplayOutsideKernelPrintsText(t *testing.T) {
	if InKernel() {
		t.Skip("running inside GoNB")
	}
	var buf bytes.Buffer
	c := fixtureCard()
	if err := DisplayTo(&buf, c); err != nil {
		t.Fatal(err)
	}
	if buf.String() != c.Text()+"\n" {
		t.Error("DisplayTo did not write the text form")
	}
}

func TestRegistryReferences(t *testing.T) {
	// Wald is registered in package proportions; its Citation must reach
	// the card through the registry lookup.
	a := germinationAnalysis()
	c := NewResultCard(a)
	if !strings.Contains(c.Text(), proportions.Wald.Citation[:30]) {
		t.Error("card does not show the registry's citation for Wald")
	}
}

func TestWriteHTMLFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "sub", "card.html")
	c := fixtureCard()
	if err := c.WriteHTMLFile(path); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	if !strings.HasPrefix(page, "<!DOCTYPE html>") || !strings.Contains(page, c.HTML()) {
		t.Error("page is not a complete document holding the card")
	}
	for _, external := range []string{"<script", "<link", "src=", "@import", "url("} {
		if strings.Contains(page, external) {
			t.Errorf("page loads something from outside or runs a script: %q", external)
		}
	}
}

func TestStripPlacesTheIntervalOnTheAxis(t *testing.T) {
	s := stripOf(germinationAnalysis())
	if s == nil {
		t.Fatal("no picture for a finite interval")
	}
	num := func(v string) float64 {
		f, err := strconv.ParseFloat(strings.TrimSuffix(v, "%"), 64)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	// Null 0 < lower 3.62 < estimate 15 < upper 26.06 (points), left to right.
	xs := []float64{num(s.XNull), num(s.X1), num(s.XEst), num(s.X2)}
	for i := 1; i < len(xs); i++ {
		if !(xs[i-1] < xs[i]) {
			t.Errorf("positions out of order: %v", xs)
		}
	}
	if xs[0] < stripLeft || xs[3] > stripRight {
		t.Errorf("positions leave the axis: %v", xs)
	}
	// Distances are proportional: (est − lower)/(upper − lower) = (15 − 3.62)/(26.06 − 3.62).
	if got, want := (xs[2]-xs[1])/(xs[3]-xs[1]), (0.15-0.0362)/(0.2606-0.0362); math.Abs(got-want) > 0.01 {
		t.Errorf("estimate sits at %.3f of the bar, want %.3f", got, want)
	}
	if !strings.Contains(s.Label, "+3.6 to +26.1") {
		t.Errorf("aria-label %q does not spell out the interval", s.Label)
	}
	a := germinationAnalysis()
	a.Interval.MethodName = ""
	if stripOf(a) != nil {
		t.Error("a picture was drawn without a headline interval")
	}
}

func TestClippedIntervalIsExplained(t *testing.T) {
	a := germinationAnalysis()
	// A Wald interval of 1.02 cut to 1 (the limit rule in proportions/interval.go).
	a.DifferenceIntervals[1].Upper, a.DifferenceIntervals[1].RawUpper, a.DifferenceIntervals[1].Clipped = 1, 1.02, true
	c := ResultCard{Analysis: a, lookup: fixedReferences}
	for form, s := range map[string]string{"html": html.UnescapeString(c.HTML()), "text": c.Text()} {
		if !strings.Contains(s, "cut to the possible range; formula gave +3.80 to +102.00") {
			t.Errorf("%s form does not explain the clipped limit", form)
		}
		if !strings.Contains(s, "Note") {
			t.Errorf("%s form lacks the Note column", form)
		}
	}
	if strings.Contains(fixtureCard().Text(), "Note") {
		t.Error("the Note column shows although no interval has a note")
	}
}

func TestOneSidedNullIsWordedAsASide(t *testing.T) {
	a := germinationAnalysis()
	a.Alternative, a.Null = proportions.Greater, -0.05
	a.Test.Alternative, a.Test.Null = proportions.Greater, -0.05
	c := ResultCard{Analysis: a, lookup: fixedReferences}
	text := html.UnescapeString(c.HTML())
	for _, want := range []string{
		"rejects a difference of −5.0 points or less",
		"Null hypothesis: primed − untreated ≤ −5.0 points; alternative: primed − untreated > −5.0 (greater)",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("one-sided card lacks %q", want)
		}
	}
	if got := capitalize("état"); got != "État" {
		t.Errorf("capitalize(état) = %q", got)
	}
}

// The card says which methods the analysis's scope left out, by their
// published names, and how to add them; an analysis of every method says
// nothing.
func TestCardNamesMethodsNotRun(t *testing.T) {
	c, err := proportions.NewComparison(2, 14, 7, 15, proportions.Labels{First: "coated", Second: "bare", Event: "sprouted"})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		scope proportions.MethodScope
		want  []string
	}{
		{proportions.ScopeQuick, []string{"Quick analysis", "Barnard", "Boschloo", "Chan", "every method"}},
		{proportions.ScopeLargeSample, []string{"Large-sample analysis", "Fisher exact", "Barnard"}},
		{proportions.ScopeAll, nil},
	} {
		a, err := proportions.Analyze(c, proportions.WithScope(tc.scope))
		if err != nil {
			t.Fatal(err)
		}
		card := NewResultCard(a)
		for _, form := range []string{card.Text(), card.Markdown(), card.HTML()} {
			form = strings.Join(strings.Fields(form), " ") // the text form wraps lines
			has := strings.Contains(form, "Left out")
			if tc.want == nil && has {
				t.Errorf("scope %v: the card names methods not run:\n%s", tc.scope, form)
			}
			for _, w := range tc.want {
				if !strings.Contains(form, w) {
					t.Errorf("scope %v: card lacks %q", tc.scope, w)
				}
			}
		}
	}
}

// TestCardShowsProvenBounds: with every method, the unconditional tests'
// proven bounds appear in the folded sources of the HTML card (inside the
// <details>), and in the text and Markdown forms, each at least its
// p-value; the quick analysis, without those tests, shows none.
func TestCardShowsProvenBounds(t *testing.T) {
	c, err := proportions.NewComparison(2, 14, 7, 15, proportions.Labels{First: "coated", Second: "bare", Event: "sprouted"})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c, proportions.WithScope(proportions.ScopeAll))
	if err != nil {
		t.Fatal(err)
	}
	var lines []string
	for _, tr := range a.Tests {
		if tr.PValueBound == nil {
			continue
		}
		if *tr.PValueBound < tr.PValue {
			t.Errorf("%s: bound %v below p = %v", tr.MethodName, *tr.PValueBound, tr.PValue)
		}
		lines = append(lines, tr.MethodName+": p = "+strconv.FormatFloat(tr.PValue, 'g', 10, 64)+", proven bound ")
	}
	if len(lines) == 0 {
		t.Fatal("no unconditional test carries a bound")
	}
	card := NewResultCard(a)
	html := card.HTML()
	folded := html[strings.LastIndex(html, "<details"):]
	for _, l := range lines {
		for name, form := range map[string]string{"folded HTML": folded, "text": card.Text(), "Markdown": card.Markdown()} {
			if !strings.Contains(form, strings.ReplaceAll(l, "(", `\(`)) && !strings.Contains(form, l) {
				t.Errorf("%s lacks %q", name, l)
			}
		}
	}
	quick, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(NewResultCard(quick).HTML(), "proven bound") {
		t.Error("the quick analysis shows a proven bound")
	}
}
