package e2e

import (
	"context"
	"os"

	"encoding/json"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"github.com/propscope/propscope/notebookui"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/segments"
)

// longLabel is a group label no table can hold on one line: one word of
// 180 letters, then more words. It must wrap or be cut with its full text
// on hover, never widen the card.
var longLabel = strings.Repeat("Hydroprimed", 16) + " lettuce seed from the north bench, second sowing, trays 1 to 8"

// layoutBoxes measures, in the page, what the layout rule of the result
// card promises (notebookui/card_html.go): for each card, whether it fits
// the page, which scroll boxes overflow sideways, which headings and
// captions are clipped, the strip's width against the card's and the
// on-screen size and boxes of its labels, and the row labels' cut.
const layoutBoxes = `(() => {
  const out = [];
  const vw = document.documentElement.clientWidth;
  for (const card of document.querySelectorAll('section.ps-card')) {
    const c = card.getBoundingClientRect();
    const r = {kind: card.dataset.propscope, cardRight: c.right, viewport: vw, overflowing: [], clipped: [], tableDisplay: [], strip: null, labels: [], rowLabels: []};
    for (const s of card.querySelectorAll('.ps-scroll')) {
      if (s.scrollWidth > s.clientWidth + 1) {
        r.overflowing.push({caption: (s.querySelector('caption') || {}).innerText || s.querySelector('th').innerText, scroll: s.scrollWidth, client: s.clientWidth});
      }
    }
    for (const h of card.querySelectorAll('caption, h3, h4, summary, tbody th, td, p')) {
      const b = h.getBoundingClientRect();
      if (b.width > 0 && (b.right > c.right + 1 || h.scrollWidth > h.clientWidth + 1 && getComputedStyle(h).overflowX !== 'visible')) {
        r.clipped.push(h.tagName + ' ' + h.innerText.slice(0, 60) + ' ' + b.right + '/' + c.right + ' ' + h.scrollWidth + '/' + h.clientWidth);
      }
    }
    for (const tb of card.querySelectorAll('table.ps-t')) { r.tableDisplay.push(getComputedStyle(tb).display); }
    const svg = card.querySelector('svg.ps-strip');
    if (svg) {
      const p = svg.parentElement, ps = getComputedStyle(p);
      r.strip = {width: svg.getBoundingClientRect().width, inner: p.clientWidth - parseFloat(ps.paddingLeft) - parseFloat(ps.paddingRight)};
      for (const t of svg.querySelectorAll('text')) {
        const b = t.getBoundingClientRect();
        const scale = t.getScreenCTM().a;
        r.labels.push({text: t.textContent, px: scale * parseFloat(getComputedStyle(t).fontSize), left: b.left, right: b.right, top: b.top, bottom: b.bottom, cardLeft: c.left, cardRight: c.right});
      }
    }
    for (const s of card.querySelectorAll('.ps-clip')) {
      const lh = parseFloat(getComputedStyle(s).lineHeight) || 20;
      r.rowLabels.push({title: s.title, height: s.getBoundingClientRect().height, lineHeight: lh});
    }
    out.push(r);
  }
  return JSON.stringify(out);
})()`

type stripLabel struct {
	Text                         string
	Px, Left, Right, Top, Bottom float64
	CardLeft, CardRight          float64
}

type cardBoxes struct {
	Kind                string
	CardRight, Viewport float64
	Overflowing         []map[string]any
	Clipped             []string
	TableDisplay        []string
	Strip               *struct{ Width, Inner float64 }
	Labels              []stripLabel
	RowLabels           []struct {
		Title              string
		Height, LineHeight float64
	}
}

// layoutPage writes a page with the cards a reader meets at the edges of
// the layout: result cards with every method (the widest tables), a
// zero-cell table (the longest statistic notes) and a very long group
// label, a Bayesian card, a cluster card with the long label, and a
// segments card with the long label as a segment's value.
func layoutPage(t *testing.T) string {
	t.Helper()
	var cards []notebookui.Displayable
	for _, c := range []struct {
		x1, n1, x2, n2 int64
		labels         proportions.Labels
	}{
		{131, 160, 112, 160, proportions.Labels{First: "primed", Second: "untreated", Event: "germinated"}},
		{0, 20, 20, 20, proportions.Labels{First: "coated", Second: "bare", Event: "germinated"}},
		{41, 50, 33, 50, proportions.Labels{First: longLabel, Second: "bare", Event: "germinated"}},
	} {
		cmp, err := proportions.NewComparison(c.x1, c.n1, c.x2, c.n2, c.labels)
		if err != nil {
			t.Fatal(err)
		}
		a, err := proportions.Analyze(cmp, proportions.WithScope(proportions.ScopeAll))
		if err != nil {
			t.Fatal(err)
		}
		cards = append(cards, notebookui.NewResultCard(a))
		if c.x1 == 41 {
			b, err := bayes.Analyze(cmp, bayes.WithEquivalence(-0.05, 0.05))
			if err != nil {
				t.Fatal(err)
			}
			cards = append(cards, notebookui.NewBayesCard(b))
		}
	}
	// Sixteen trays of twenty seeds, with a long coating name.
	var g1, g2 []clusters.Cluster
	for i, x := range []int64{17, 15, 18, 12, 16, 19, 14, 17} {
		g1 = append(g1, clusters.Cluster{Value: fmt.Sprintf("C%d", i+1), Events: x, Trials: 20})
		g2 = append(g2, clusters.Cluster{Value: fmt.Sprintf("B%d", i+1), Events: x - int64(i%4), Trials: 20})
	}
	d, err := clusters.New("tray", proportions.Labels{First: longLabel, Second: "bare", Event: "germinated"}, g1, g2)
	if err != nil {
		t.Fatal(err)
	}
	ca, err := clusters.Analyze(d)
	if err != nil {
		t.Fatal(err)
	}
	cards = append(cards, notebookui.NewClusterCard(ca))
	// Segments, one named by the long label, one without untreated seed.
	rows := []proportions.BreakdownRow{
		{Value: longLabel, Counts: proportions.Counts{X1: 41, N1: 50, X2: 33, N2: 50}},
		{Value: "north field", Counts: proportions.Counts{X1: 150, N1: 200, X2: 120, N2: 210}},
		{Value: "orchard", Counts: proportions.Counts{X1: 4, N1: 6, X2: 3, N2: 7}},
		{Value: "glasshouse", Counts: proportions.Counts{X1: 30, N1: 40}},
	}
	bd, err := proportions.NewBreakdown("nursery", proportions.Labels{First: "primed", Second: "untreated", Event: "germinated"}, rows)
	if err != nil {
		t.Fatal(err)
	}
	sr, err := segments.Analyze(bd)
	if err != nil {
		t.Fatal(err)
	}
	cards = append(cards, notebookui.NewSegmentsCard(sr))
	page := filepath.Join(outDir, "card-layout.html")
	if err := notebookui.WriteHTMLFile(page, "result cards at the edges of the layout", cards...); err != nil {
		t.Fatal(err)
	}
	return page
}

// TestCardLayout opens result cards in Chromium at a desktop width, a
// phone's 360 px and 218 px, and checks the layout boxes: the card fits
// the page, on narrow screens every table reflows (nothing scrolls
// sideways, no heading or caption is clipped), the interval strip spans
// the card with labels of at least 11 px that do not overlap, and a very
// long label is cut after three lines with its full text on hover.
func TestCardLayout(t *testing.T) {
	page := layoutPage(t)
	ctx := browse(t)
	open(t, ctx, page)
	for _, width := range []int64{1100, 360, 218} {
		setWidth(t, ctx, width)
		var cards []cardBoxes
		if err := json.Unmarshal([]byte(eval[string](t, ctx, layoutBoxes)), &cards); err != nil {
			t.Fatal(err)
		}
		if len(cards) != 6 {
			t.Fatalf("%d cards on the page, want 6 (three result cards, a Bayesian card, a cluster card, a segments card)", len(cards))
		}
		for i, c := range cards {
			where := fmt.Sprintf("at %d px, card %d (%s)", width, i+1, c.Kind)
			if c.CardRight > c.Viewport+1 {
				t.Errorf("%s is wider than the page (%v > %v)", where, c.CardRight, c.Viewport)
			}
			if len(c.Clipped) > 0 {
				t.Errorf("%s: clipped text %q", where, c.Clipped)
			}
			if width <= 360 && len(c.Overflowing) > 0 {
				t.Errorf("%s: tables scroll sideways instead of reflowing: %v", where, c.Overflowing)
			}
			if width == 1100 && len(c.TableDisplay) > 0 && c.TableDisplay[0] != "table" {
				t.Errorf("%s: tables reflow at a desktop width (%v)", where, c.TableDisplay)
			}
			if c.Kind == "result-card" {
				checkStrip(t, where, c)
			}
			for _, l := range c.RowLabels {
				if len(l.Title) > 100 && (l.Title != longLabel || l.Height > 3.5*l.LineHeight) {
					t.Errorf("%s: the long label takes %.0f px (line %.0f px), hover text %d characters", where, l.Height, l.LineHeight, len(l.Title))
				}
			}
		}
		screenshot(t, ctx, fmt.Sprintf("card-layout-%d", width))
		// The top of the page as a reader first sees it, and the long
		// label's card.
		viewportShot(t, ctx, fmt.Sprintf("card-layout-%d-top", width), 0)
		viewportShot(t, ctx, fmt.Sprintf("card-layout-%d-long-label", width), 2)
		viewportShot(t, ctx, fmt.Sprintf("card-layout-%d-cluster-card", width), 4)
		viewportShot(t, ctx, fmt.Sprintf("card-layout-%d-segments-card", width), 5)
	}
	setWidth(t, ctx, 1100)
}

// checkStrip: the strip spans the card's width, its labels are at least
// 11 px on screen, stay inside the card and do not overlap.
func checkStrip(t *testing.T, where string, c cardBoxes) {
	t.Helper()
	if c.Strip == nil {
		t.Errorf("%s: no interval strip", where)
		return
	}
	if c.Strip.Width < 0.95*c.Strip.Inner {
		t.Errorf("%s: the strip takes %.0f of the %.0f px beside it", where, c.Strip.Width, c.Strip.Inner)
	}
	for i, l := range c.Labels {
		if l.Px < 11 {
			t.Errorf("%s: strip label %q is %.1f px on screen", where, l.Text, l.Px)
		}
		if l.Left < l.CardLeft-1 || l.Right > l.CardRight+1 {
			t.Errorf("%s: strip label %q leaves the card (%.0f–%.0f, card %.0f–%.0f)", where, l.Text, l.Left, l.Right, l.CardLeft, l.CardRight)
		}
		for _, m := range c.Labels[i+1:] {
			if l.Left < m.Right && m.Left < l.Right && l.Top < m.Bottom && m.Top < l.Bottom {
				t.Errorf("%s: strip labels %q and %q overlap", where, l.Text, m.Text)
			}
		}
	}
}

// viewportShot scrolls the n-th result card to the top and writes what the
// viewport shows (1400 px high) as a PNG.
func viewportShot(t *testing.T, ctx context.Context, name string, n int) {
	t.Helper()
	eval[bool](t, ctx, fmt.Sprintf(`(() => { document.querySelectorAll('section.ps-card')[%d].scrollIntoView(); return true; })()`, n))
	png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatalf("screenshot %s: %v", name, err)
	}
	path := filepath.Join(outDir, name+".png")
	if err := os.WriteFile(path, png, 0o644); err != nil {
		t.Fatal(err)
	}
	abs, _ := filepath.Abs(path)
	t.Logf("screenshot: %s", abs)
}
