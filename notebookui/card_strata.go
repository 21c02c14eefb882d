package notebookui

import (
	"encoding/json"
	"fmt"
	"html/template"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/strata"
)

// StrataCard shows a stratified analysis (what strata.Analyze returns):
// the overall answer within strata, one row per stratum, the pooled
// analysis beside the stratified one, whether the effect is the same in
// every stratum, the tests and common estimates, notes, warnings and the
// standing caution. It renders what the analysis holds and recomputes
// nothing. Draw the strata with [StrataForestChart]. Build one with
// NewStrataCard, or as a literal.
type StrataCard struct {
	// Analysis is what the card shows.
	Analysis strata.Analysis
	// Title replaces the default heading "Within each <by>: <event>:
	// <first> vs <second>".
	Title string
}

// NewStrataCard returns the card for a stratified analysis.
func NewStrataCard(a strata.Analysis) StrataCard { return StrataCard{Analysis: a} }

// Kind is "strata-card".
func (c StrataCard) Kind() string { return "strata-card" }

type strataTable struct {
	Caption string
	Head    []string
	Rows    [][]string
}

type strataView struct {
	Title, Headline, HeadlineTest, Conclusion, Caution string
	Tables                                             []strataTable
	Notes, Warnings                                    []string
}

func (c StrataCard) view() strataView {
	a := c.Analysis
	b := a.Breakdown
	title := c.Title
	if title == "" {
		title = fmt.Sprintf("Within each %s: %s: %s vs %s", b.By, b.Event, b.First, b.Second)
	}
	lvl := levelText(a.Interval.Level)
	v := strataView{Title: title, Conclusion: a.Conclusion, Caution: a.Caution, Notes: a.Notes,
		Headline: fmt.Sprintf("Common difference %s − %s: %s pp (%s interval %s to %s pp)", b.First, b.Second,
			points(a.Interval.Estimate, 1), lvl, points(a.Interval.Lower, 1), points(a.Interval.Upper, 1)),
		HeadlineTest: fmt.Sprintf("%s; %s", a.Interval.Name, testLine(a.Test)),
	}
	for _, w := range a.Warnings {
		v.Warnings = append(v.Warnings, w.Message)
	}
	v.Tables = []strataTable{c.strataRows(), c.crudeRows(), homogeneityRows(a), testRows(a.Tests, "Tests of no difference within "+b.By),
		estimateRows(a.Estimates)}
	return v
}

// testLine prints "X² = 3.18, p = 0.0746: no difference shown at 5%".
func testLine(t strata.Test) string {
	d := "no difference shown"
	if t.Reject {
		d = "rejects no difference"
	}
	return fmt.Sprintf("%s %s, p = %s: %s at %s", t.Name, statText(t), proportions.FormatP(t.PValue, t.LogPValue), d, levelText(1-t.Level))
}

func statText(t strata.Test) string {
	s := t.StatisticName + " = " + strings.Replace(strconv.FormatFloat(t.Statistic, 'g', 4, 64), "-", minus, 1)
	if t.DF > 0 {
		s += fmt.Sprintf(" (%d df)", t.DF)
	}
	return s
}

func (c StrataCard) strataRows() strataTable {
	a := c.Analysis
	b := a.Breakdown
	t := strataTable{Caption: "Each " + b.By + " on its own",
		Head: []string{b.By, b.First, b.Second, "difference (pp)", levelText(a.Interval.Level) + " interval (pp)", "weight"}}
	share := func(x, n int64) string {
		if n == 0 {
			return "no units"
		}
		return fmt.Sprintf("%d of %d (%s%%)", x, n, signless(100*float64(x)/float64(n), 1))
	}
	for _, s := range a.Strata {
		row := []string{s.Value, share(s.Counts.X1, s.Counts.N1), share(s.Counts.X2, s.Counts.N2)}
		if !s.Used {
			row = append(row, "not used (a group has no units)", "—", "—")
		} else {
			row = append(row, points(s.Difference, 1), points(s.Lower, 1)+" to "+points(s.Upper, 1), signless(100*s.Weight, 1)+"%")
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

func (c StrataCard) crudeRows() strataTable {
	a := c.Analysis
	by := a.Breakdown.By
	t := strataTable{Caption: "Pooled beside within each " + by,
		Head: []string{"analysis", "difference (pp)", levelText(a.Interval.Level) + " interval (pp)", "test", "p"}}
	cr := a.Crude
	t.Rows = append(t.Rows,
		[]string{"pooled, ignoring the " + by, points(cr.Difference, 1), points(cr.Interval.Lower, 1) + " to " + points(cr.Interval.Upper, 1),
			cr.Test.MethodName, proportions.FormatP(cr.Test.PValue, cr.Test.LogPValue)},
		[]string{"within each " + by + " (common)", points(a.Interval.Estimate, 1), points(a.Interval.Lower, 1) + " to " + points(a.Interval.Upper, 1),
			a.Test.Name, proportions.FormatP(a.Test.PValue, a.Test.LogPValue)})
	return t
}

func homogeneityRows(a strata.Analysis) strataTable {
	t := strataTable{Caption: "Same effect in every " + a.Breakdown.By + "?", Head: []string{"test", "statistic", "p", "reading"}}
	for _, h := range a.Homogeneity {
		r := "no difference between " + a.Breakdown.By + " values shown"
		if h.Reject {
			r = "the effect differs between " + a.Breakdown.By + " values"
		}
		t.Rows = append(t.Rows, []string{h.Name, statText(h), proportions.FormatP(h.PValue, h.LogPValue), r})
	}
	return t
}

func testRows(ts []strata.Test, caption string) strataTable {
	t := strataTable{Caption: caption, Head: []string{"test", "statistic", "p", "decision"}}
	for _, x := range ts {
		d := "no difference shown"
		if x.Reject {
			d = "rejects no difference"
		}
		t.Rows = append(t.Rows, []string{x.Name, statText(x), proportions.FormatP(x.PValue, x.LogPValue) + " (" + x.Alternative.String() + ")", d})
	}
	return t
}

func estimateRows(es []strata.Estimate) strataTable {
	t := strataTable{Caption: "Common estimates", Head: []string{"method", "scale", "estimate", "interval"}}
	for _, e := range es {
		f := ratio
		if e.Scale == proportions.Difference {
			f = func(v float64) string { return points(v, 2) + " pp" }
		}
		t.Rows = append(t.Rows, []string{e.Name, e.Scale.String(), f(e.Estimate), f(e.Lower) + " to " + f(e.Upper)})
	}
	return t
}

var strataTemplate = template.Must(template.New("strata").Parse(`<section class="ps-card" data-propscope="strata-card" aria-label="{{.Title}}">
<style>` + cardCSS + `</style>
<h3 class="ps-title">{{.Title}}</h3>
<p class="ps-lead"><strong data-role="headline">{{.Headline}}</strong></p>
<p class="ps-muted ps-small">{{.HeadlineTest}}</p>
<h4 class="ps-h">What the data say</h4>
<p class="ps-conclusion">{{.Conclusion}}</p>
{{if .Warnings}}<h4 class="ps-h">Warnings</h4>
<ul class="ps-warnings">{{range .Warnings}}
<li><strong>Warning:</strong> {{.}}</li>{{end}}
</ul>{{end}}
{{range .Tables}}{{if .Rows}}<h4 class="ps-h">{{.Caption}}</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr>{{range .Head}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}
<tr>{{range $i, $c := .}}{{if eq $i 0}}<th scope="row">{{$c}}</th>{{else}}<td class="ps-n">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>{{end}}{{end}}
{{range .Notes}}<p class="ps-muted ps-small">{{.}}</p>
{{end}}<p class="ps-caution"><strong>Before acting on this:</strong> {{.Caution}}</p>
</section>`))

// HTML returns the card as a self-contained HTML fragment (scoped style,
// no scripts); every label, value and the event name are escaped.
func (c StrataCard) HTML() string {
	var b strings.Builder
	if err := strataTemplate.Execute(&b, c.view()); err != nil {
		return "<pre>" + template.HTMLEscapeString("strata card: "+err.Error()) + "</pre>"
	}
	return b.String()
}

// Markdown returns the card as Markdown; user strings show literally.
func (c StrataCard) Markdown() string {
	v := c.view()
	var b strings.Builder
	fmt.Fprintf(&b, "### %s\n\n**%s**\n\n%s\n\n%s\n", mdEscape(v.Title), mdEscape(v.Headline), mdEscape(v.HeadlineTest), mdEscape(v.Conclusion))
	for _, w := range v.Warnings {
		fmt.Fprintf(&b, "\n- **Warning:** %s", mdEscape(w))
	}
	for _, t := range v.Tables {
		if len(t.Rows) == 0 {
			continue
		}
		fmt.Fprintf(&b, "\n\n#### %s\n\n|", mdEscape(t.Caption))
		for _, h := range t.Head {
			b.WriteString(" " + mdEscape(h) + " |")
		}
		b.WriteString("\n|")
		for range t.Head {
			b.WriteString("---|")
		}
		for _, r := range t.Rows {
			b.WriteString("\n|")
			for _, x := range r {
				b.WriteString(" " + mdEscape(x) + " |")
			}
		}
	}
	b.WriteString("\n")
	for _, n := range v.Notes {
		fmt.Fprintf(&b, "\n%s\n", mdEscape(n))
	}
	fmt.Fprintf(&b, "\n> **Before acting on this:** %s\n", mdEscape(v.Caution))
	return b.String()
}

// Text returns the card as plain text.
func (c StrataCard) Text() string {
	v := c.view()
	var b strings.Builder
	b.WriteString(v.Title + "\n")
	b.WriteString(wrap(v.Headline, "  ", textWidth))
	b.WriteString(wrap(v.HeadlineTest, "  ", textWidth))
	b.WriteString(wrap(v.Conclusion, "", textWidth))
	for _, w := range v.Warnings {
		b.WriteString(wrap("Warning: "+w, "", textWidth))
	}
	for _, t := range v.Tables {
		if len(t.Rows) == 0 {
			continue
		}
		b.WriteString(t.Caption + "\n")
		b.WriteString(textTable(cells{header: t.Head, rows: t.Rows, numeric: numericAfterFirst(len(t.Head))}, "  "))
	}
	for _, n := range v.Notes {
		b.WriteString(wrap(n, "", textWidth))
	}
	b.WriteString(wrap("Before acting on this: "+v.Caution, "", textWidth))
	return b.String()
}

// String returns Text.
func (c StrataCard) String() string { return c.Text() }

type strataCardJSON struct {
	Kind     string          `json:"kind"`
	Version  int             `json:"version"`
	Analysis strata.Analysis `json:"analysis"`
}

// JSON returns {"kind": "strata-card", "version": 1, "analysis": {...}},
// the analysis in the form stratified.schema.json describes.
func (c StrataCard) JSON() ([]byte, error) {
	return json.Marshal(strataCardJSON{Kind: c.Kind(), Version: 1, Analysis: c.Analysis})
}

// Display shows the card (see Display).
func (c StrataCard) Display() error { return Display(c) }

// StrataForestChart draws the strata of a stratified analysis as a forest
// chart: each used stratum's difference with its own interval (Mee's
// score interval), its square sized by its Mantel–Haenszel weight, unused
// strata listed with a note, and the common difference (the headline
// interval) as the diamond.
//
// Options read: WithHeight.
func StrataForestChart(a strata.Analysis, options ...ChartOption) (*Chart, error) {
	b := a.Breakdown
	f := Forest{
		Title:    fmt.Sprintf("Difference in share %s within each %s", b.Event, b.By),
		Subtitle: fmt.Sprintf("%s − %s, %s intervals; diamond: common difference", b.First, b.Second, levelText(a.Interval.Level)),
		Effect:   fmt.Sprintf("difference in share %s, %s − %s", b.Event, b.First, b.Second),
		Scale:    proportions.Difference, Level: a.Interval.Level,
		Summary: &ForestRow{Label: "common difference", Estimate: a.Interval.Estimate,
			Lower: a.Interval.Lower, Upper: a.Interval.Upper, Note: a.Interval.Name},
		Notes: []string{fmt.Sprintf("Pooled over every %s, ignoring it, the difference is %s pp.", b.By, points(a.Crude.Difference, 1))},
	}
	for _, s := range a.Strata {
		r := ForestRow{Label: s.Value, Estimate: s.Difference, Lower: s.Lower, Upper: s.Upper, Weight: s.Weight}
		if !s.Used {
			r.Estimate, r.Lower, r.Upper, r.Note = math.NaN(), math.NaN(), math.NaN(), "not used: a group has no units"
		}
		f.Rows = append(f.Rows, r)
	}
	return ForestChart(f, options...)
}
