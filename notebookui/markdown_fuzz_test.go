package notebookui

import (
	"bytes"
	"fmt"
	"strings"
	"sync"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"
)

// markdownRenderer turns our Markdown into HTML the way a reader's tools
// would: goldmark (CommonMark) with GitHub's extensions (tables,
// strikethrough, bare-URL links, task lists) and footnotes, raw HTML not
// passed through (goldmark's default), so any tag in its output was made by
// Markdown syntax.
var markdownRenderer = goldmark.New(goldmark.WithExtensions(extension.GFM, extension.Footnote, extension.DefinitionList))

func markdownHTML(t testing.TB, md string) string {
	t.Helper()
	var b bytes.Buffer
	if err := markdownRenderer.Convert([]byte(md), &b); err != nil {
		t.Fatalf("goldmark: %v", err)
	}
	return b.String()
}

// markdownLabelSeeds aim at every Markdown construct a label could open.
var markdownLabelSeeds = []string{
	"# heading", "## two", "#", "> quote", "- item", "+ item", "* item", "1. first", "2) second", "10. x",
	"***", "---", "___", "===", "    indented code", "\tcode", "```go", "~~~", "`code`", "~~struck~~",
	"*em*", "_em_", "**strong**", "__strong__", "a|b", "|", "| --- |",
	"[x](javascript:alert(1))", "![x](http://example.com/x.png)", "[x]: http://example.com", "[^1]", "[ ] task", "[x] done",
	"<https://example.com>", "https://example.com/x", "www.example.com", "ftp://example.com", "mail@example.com",
	"mailto:a@example.com", "<b>bold</b>", "<img src=x onerror=alert(1)>", "<!-- c -->", "&copy; &#169;", "&amp;",
	"two\nlines", "line\r\nbreak", "trailing  ", "back\\", "\\*", "term\n: definition", "a *b", "a_b_c",
	markerPayload, "", " ", "\u00a0", "\u200b", "x\u2028y",
}

// markdownBenign is the Markdown of the views with plain labels, rendered.
var markdownBenign struct {
	once      sync.Once
	skeletons []string
}

// FuzzMarkdownLabels renders every view's Markdown with arbitrary labels
// through goldmark and compares the HTML's elements with those of the same
// views with plain labels: a label must not open a heading, list, quote,
// code, emphasis, table cell, link, image or any HTML. Labels are taken as
// proportions.NewComparison takes them (a blank label gets a default, so
// it never reaches a view).
func FuzzMarkdownLabels(f *testing.F) {
	for i, s := range markdownLabelSeeds {
		f.Add(s, markdownLabelSeeds[(i+3)%len(markdownLabelSeeds)], markdownLabelSeeds[(i+11)%len(markdownLabelSeeds)])
	}
	f.Fuzz(func(t *testing.T, first, second, event string) {
		checkMarkdownLabels(t, capLabel(first), capLabel(second), capLabel(event))
	})
}

// checkMarkdownLabels is the body of FuzzMarkdownLabels (also run by
// TestLongMarkdownLabels and timed by BenchmarkMarkdownLabels); see
// fuzzLabelBytes for why the fuzz target cuts its labels.
func checkMarkdownLabels(t testing.TB, first, second, event string) {
	t.Helper()
	markdownBenign.once.Do(func() {
		_, ds := labelViews(t, "alpha", "beta", "gamma")
		for _, d := range ds {
			sk, err := skeleton(markdownHTML(t, d.Markdown()))
			if err != nil {
				t.Fatal(err)
			}
			markdownBenign.skeletons = append(markdownBenign.skeletons, sk)
		}
	})
	first, second, event = orDefault(first, "group 1"), orDefault(second, "group 2"), orDefault(event, "event")
	names, ds := labelViews(t, first, second, event)
	for i, d := range ds {
		md := d.Markdown()
		got, err := skeleton(markdownHTML(t, md))
		if err != nil {
			t.Fatalf("%s: %v", names[i], err)
		}
		if want := markdownBenign.skeletons[i]; got != want {
			t.Fatalf("%s: the labels %q, %q, %q changed the Markdown's elements:\n%s\nMarkdown:\n%s",
				names[i], first, second, event, firstDifference(want, got), md)
		}
	}
}

// TestLongMarkdownLabels is FuzzMarkdownLabels' check on the Markdown
// seeds repeated to 64 kB each, the lengths the fuzz target cuts off.
func TestLongMarkdownLabels(t *testing.T) {
	if testing.Short() {
		t.Skip("renders labels of 64 kB")
	}
	long := func(i int) string {
		s := markdownLabelSeeds[i%len(markdownLabelSeeds)] + " " + markdownLabelSeeds[(i+7)%len(markdownLabelSeeds)] + " x"
		return strings.Repeat(s, 64<<10/len(s)+1)[:64<<10]
	}
	for i := 0; i < 3; i++ {
		checkMarkdownLabels(t, long(i), long(i+13), long(i+29))
	}
}

// BenchmarkMarkdownLabels times one execution of FuzzMarkdownLabels' body
// at growing label lengths.
func BenchmarkMarkdownLabels(b *testing.B) {
	b.Log("target: linear in the label length (a fixed cost per byte), so that capped fuzz inputs keep a steady rate")
	for _, n := range []int{8, 256, 4096} {
		label := strings.Repeat("*a* [b](c) <d> #e `f` ", n/22+1)[:n]
		b.Run(fmt.Sprintf("label=%dB", n), func(b *testing.B) {
			for b.Loop() {
				checkMarkdownLabels(b, label, label+"2", label+"e")
			}
		})
	}
}

func orDefault(s, def string) string {
	if strings.TrimSpace(s) == "" {
		return def
	}
	return s
}

// TestMarkdownShowsLabelsAsText checks that escaping keeps the text: each
// label shows in goldmark's HTML as the characters typed (HTML-escaped as
// goldmark writes text), with a newline shown as a space.
func TestMarkdownShowsLabelsAsText(t *testing.T) {
	for _, label := range []string{"# heading", "[x](javascript:alert(1))", "![x](http://example.com/x.png)",
		"a|b", "*em* _em_", "https://example.com/x", "1. first", "<b>bold</b>", "www.example.com", "mail@example.com"} {
		c := sampleAnalysis(label, "beta")
		card := ResultCard{Analysis: c, lookup: fixedReferences}
		h := markdownHTML(t, card.Markdown())
		want := strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&quot;").Replace(label)
		if !strings.Contains(h, want) {
			t.Errorf("label %q: the card's Markdown, rendered, does not show %q:\n%s", label, want, h)
		}
	}
}
