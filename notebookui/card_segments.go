package notebookui

import (
	"encoding/json"
	"fmt"
	"hash/fnv"
	"html/template"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/segments"
)

// DefaultSegmentsShown is how many segments each view of a segments card
// lists.
const DefaultSegmentsShown = 20

// SegmentsCard shows a per-segment analysis (what segments.Analyze
// returns): the number of segments, m and the adjustment stated first,
// the segments in three orders (by adjusted p-value, by the size of the
// difference, by the number of units), the empty and sparse segments
// flagged, the notes and the standing caution. The orders are rendered in
// advance, each in a fold, and linked: the link's target is inside the
// fold, so a browser opens the fold to show it; the card needs no script.
// Draw the top segments with [SegmentsForestChart]. It renders what the
// result holds and recomputes nothing.
type SegmentsCard struct {
	Result segments.Result
	// Title replaces the default heading "Segments: <event>: <first> vs
	// <second> by <column>".
	Title string
	// Shown is how many segments each order lists (DefaultSegmentsShown
	// when 0); a card of a million segments lists the first few of each.
	Shown int
}

// NewSegmentsCard returns the card for a per-segment analysis.
func NewSegmentsCard(r segments.Result) SegmentsCard { return SegmentsCard{Result: r} }

// Kind is "segments-card".
func (c SegmentsCard) Kind() string { return "segments-card" }

type segmentsOrder struct {
	ID, Name, Heading string
	Open              bool
	Rows              [][]string
}

type segmentsView struct {
	Title, Lead, Adjustment, Simultaneous, Caution string
	Notes                                          []string
	Head                                           []string
	Orders                                         []segmentsOrder
	Flagged                                        [][]string
	FlagHead                                       []string
}

func (c SegmentsCard) shown() int {
	if c.Shown > 0 {
		return c.Shown
	}
	return DefaultSegmentsShown
}

func (c SegmentsCard) view() segmentsView {
	r := c.Result
	s := r.Summary
	title := c.Title
	if title == "" {
		title = fmt.Sprintf("Segments: %s: %s vs %s by %s", s.Event, s.First, s.Second, s.By)
	}
	alpha := levelText(1 - s.Level)
	v := segmentsView{Title: title, Caution: s.Caution, Notes: s.Notes,
		Lead: fmt.Sprintf("%d segments by %s; %d tested (m), %d empty, %d sparse.", s.SegmentCount, s.By, s.Tested, s.EmptyCount, s.SparseCount),
		Adjustment: fmt.Sprintf("p-values adjusted for %d segments by %s (controls the %s): %d of %d reject at %s after adjustment.",
			s.Tested, s.Adjustment.Name(), s.Adjustment.Controls(), s.Rejected, s.Tested, alpha),
		Head: []string{"#", s.By, "Counts", "Difference (pp)", levelText(s.IntervalLevel) + " interval", "p", "Adjusted p",
			"Simultaneous interval", "Flag"},
		FlagHead: []string{"#", s.By, "Counts", "Flag"},
	}
	if !math.IsNaN(s.SimultaneousLevel) {
		v.Simultaneous = fmt.Sprintf("Simultaneous intervals at %s (Bonferroni over %d segments): all of them hold together with at least %s.",
			simultaneousLevelText(s.SimultaneousLevel), s.Tested, levelText(s.IntervalLevel))
	}
	id := c.anchor()
	for k, o := range []struct {
		key, name string
		order     []int
	}{
		{"p", "adjusted p-value, smallest first", r.ByAdjustedP()},
		{"effect", "size of the difference, largest first", r.ByEffect()},
		{"size", "units in the segment, most first", r.BySize()},
	} {
		rows := c.segmentRows(o.order)
		v.Orders = append(v.Orders, segmentsOrder{ID: id + "-" + o.key, Name: o.name, Open: k == 0, Rows: rows,
			Heading: fmt.Sprintf("By %s (%d of the %d tested)", o.name, len(rows), s.Tested)})
	}
	v.Flagged = c.flaggedRows()
	return v
}

// anchor is an id prefix of the card's own, so that two cards on one
// page do not share the targets of their links.
func (c SegmentsCard) anchor() string {
	h := fnv.New32a()
	b, _ := json.Marshal(c.Result.Summary)
	h.Write(b)
	for i, sg := range c.Result.Segments {
		if i == 64 {
			break
		}
		fmt.Fprintf(h, "%s|%v;", sg.Value, sg.Counts)
	}
	return fmt.Sprintf("ps-seg-%08x", h.Sum32())
}

// segmentRows lists the first segments of an order, tested ones only.
func (c SegmentsCard) segmentRows(order []int) [][]string {
	r := c.Result
	var rows [][]string
	for _, i := range order {
		if len(rows) == c.shown() {
			break
		}
		s, a := r.Segments[i], r.Adjusted[i]
		if s.Empty {
			continue
		}
		flag := ""
		if s.Sparse {
			flag = "sparse"
		}
		rows = append(rows, []string{strconv.Itoa(s.Number), s.Value, countsText(s.Counts), points(s.Difference, 1),
			points(s.Lower, 1) + " to " + points(s.Upper, 1), pValue(s.PValue), pValue(a.AdjustedPValue),
			points(a.SimultaneousLower, 1) + " to " + points(a.SimultaneousUpper, 1), flag})
	}
	return rows
}

// flaggedRows lists the first empty and sparse segments, in their order.
func (c SegmentsCard) flaggedRows() [][]string {
	s := c.Result.Summary
	var empty, sparse [][]string
	for _, sg := range c.Result.Segments {
		switch {
		case sg.Empty && len(empty) < c.shown():
			group := s.Second
			if sg.Counts.N1 == 0 {
				group = s.First
			}
			empty = append(empty, []string{strconv.Itoa(sg.Number), sg.Value, countsText(sg.Counts),
				"empty: no trials in " + group + "; not tested"})
		case sg.Sparse && len(sparse) < c.shown():
			sparse = append(sparse, []string{strconv.Itoa(sg.Number), sg.Value, countsText(sg.Counts),
				"sparse: smallest expected count " + signless(sg.SmallestExpected, 1)})
		}
	}
	return append(empty, sparse...)
}

// simultaneousLevelText prints a level close to 1 with the decimals it
// needs not to round to 100% ("99.29%", "99.999995%"): levelText's four
// digits would call a Bonferroni level over a thousand segments 100%.
func simultaneousLevelText(level float64) string {
	decimals := 1
	if miss := 100 * (1 - level); miss > 0 {
		decimals = max(decimals, int(math.Ceil(-math.Log10(miss)))+1)
	}
	return strings.TrimRight(strings.TrimRight(strconv.FormatFloat(100*level, 'f', decimals, 64), "0"), ".") + "%"
}

func countsText(c proportions.Counts) string {
	return fmt.Sprintf("%d/%d vs %d/%d", c.X1, c.N1, c.X2, c.N2)
}

var segmentsTemplate = template.Must(template.New("segments").Parse(`<section class="ps-card" data-propscope="segments-card" aria-label="{{.Title}}">
<style>` + cardCSS + `</style>
<h3 class="ps-title">{{.Title}}</h3>
<div class="ps-headline">
<p class="ps-lead" data-role="segments">{{.Lead}}</p>
<p class="ps-lead" data-role="adjustment"><strong>{{.Adjustment}}</strong></p>
{{if .Simultaneous}}<p class="ps-lead ps-muted">{{.Simultaneous}}</p>{{end}}
</div>
{{if .Notes}}<ul class="ps-warnings">{{range .Notes}}
<li>{{.}}</li>{{end}}
</ul>{{end}}
<p class="ps-small">Order: {{range $i, $o := .Orders}}{{if $i}} · {{end}}<a href="#{{$o.ID}}">{{$o.Name}}</a>{{end}}</p>
{{range .Orders}}<details class="ps-more"{{if .Open}} open{{end}}>
<summary>{{.Heading}}</summary>
<div class="ps-scroll" id="{{.ID}}"><table class="ps-t">
<thead><tr>{{range $.Head}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}
<tr>{{range $i, $c := .}}{{if eq $i 1}}<th scope="row"><span class="ps-clip" title="{{$c}}">{{$c}}</span></th>{{else if eq $i 8}}<td data-label="{{index $.Head $i}}">{{if $c}}<span class="ps-tag">{{$c}}</span>{{end}}</td>{{else}}<td class="ps-n" data-label="{{index $.Head $i}}">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>
</details>
{{end}}{{if .Flagged}}<h4 class="ps-h">Flagged segments</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr>{{range .FlagHead}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Flagged}}
<tr>{{range $i, $c := .}}{{if eq $i 1}}<th scope="row"><span class="ps-clip" title="{{$c}}">{{$c}}</span></th>{{else if eq $i 3}}<td data-label="{{index $.FlagHead $i}}">{{$c}}</td>{{else}}<td class="ps-n" data-label="{{index $.FlagHead $i}}">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>
{{end}}<p class="ps-caution"><strong>Before acting on this:</strong> {{.Caution}}</p>
</section>`))

// HTML returns the card as a self-contained HTML fragment (scoped style,
// no scripts); every label and segment value is escaped.
func (c SegmentsCard) HTML() string {
	var b strings.Builder
	if err := segmentsTemplate.Execute(&b, c.view()); err != nil {
		return "<pre>" + template.HTMLEscapeString("segments card: "+err.Error()) + "</pre>"
	}
	return b.String()
}

// Markdown returns the card as Markdown, the segments by adjusted p-value;
// user strings show literally.
func (c SegmentsCard) Markdown() string {
	v := c.view()
	var b strings.Builder
	fmt.Fprintf(&b, "### %s\n\n%s\n\n**%s**\n\n", mdEscape(v.Title), mdEscape(v.Lead), mdEscape(v.Adjustment))
	if v.Simultaneous != "" {
		fmt.Fprintf(&b, "%s\n\n", mdEscape(v.Simultaneous))
	}
	for _, n := range v.Notes {
		fmt.Fprintf(&b, "- %s\n", mdEscape(n))
	}
	table := func(head []string, rows [][]string) {
		b.WriteString("\n|")
		for _, h := range head {
			b.WriteString(" " + mdEscape(h) + " |")
		}
		b.WriteString("\n|")
		for range head {
			b.WriteString("---|")
		}
		for _, r := range rows {
			b.WriteString("\n|")
			for _, c := range r {
				b.WriteString(" " + mdEscape(c) + " |")
			}
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "\n#### %s\n", mdEscape(v.Orders[0].Heading))
	table(v.Head, v.Orders[0].Rows)
	if len(v.Flagged) > 0 {
		b.WriteString("\n#### Flagged segments\n")
		table(v.FlagHead, v.Flagged)
	}
	fmt.Fprintf(&b, "\n> **Before acting on this:** %s\n", mdEscape(v.Caution))
	return b.String()
}

// Text returns the card as plain text, the segments by adjusted p-value.
func (c SegmentsCard) Text() string {
	v := c.view()
	var b strings.Builder
	b.WriteString(v.Title + "\n")
	for _, s := range []string{v.Lead, v.Adjustment, v.Simultaneous} {
		if s != "" {
			b.WriteString(wrap(s, "  ", textWidth))
		}
	}
	for _, n := range v.Notes {
		b.WriteString(wrap("! "+n, "  ", textWidth))
	}
	b.WriteString(v.Orders[0].Heading + "\n")
	b.WriteString(textTable(cells{header: v.Head, rows: v.Orders[0].Rows,
		numeric: []bool{true, false, true, true, true, true, true, true, false}}, "  "))
	if len(v.Flagged) > 0 {
		b.WriteString("Flagged segments\n")
		b.WriteString(textTable(cells{header: v.FlagHead, rows: v.Flagged, numeric: []bool{true, false, true, false}}, "  "))
	}
	b.WriteString(wrap("Before acting on this: "+v.Caution, "", textWidth))
	return b.String()
}

// String returns Text.
func (c SegmentsCard) String() string { return c.Text() }

type segmentsCardJSON struct {
	Kind     string              `json:"kind"`
	Version  int                 `json:"version"`
	Summary  segments.Summary    `json:"summary"`
	Segments []segments.Segment  `json:"segments"`
	Adjusted []segments.Adjusted `json:"adjusted"`
}

// JSON returns {"kind": "segments-card", "version": 1, "summary": {...},
// "segments": [...], "adjusted": [...]}: the summary and, by adjusted
// p-value, the segments the card lists (not every segment: a card of a
// million segments would otherwise carry them all into the notebook; the
// whole result marshals on its own, see segments.schema.json).
func (c SegmentsCard) JSON() ([]byte, error) {
	out := segmentsCardJSON{Kind: c.Kind(), Version: 1, Summary: c.Result.Summary}
	for _, i := range c.Result.ByAdjustedP() {
		if len(out.Segments) == c.shown() {
			break
		}
		out.Segments = append(out.Segments, c.Result.Segments[i])
		out.Adjusted = append(out.Adjusted, c.Result.Adjusted[i])
	}
	out.Segments, out.Adjusted = jsonlist.NonNil(out.Segments), jsonlist.NonNil(out.Adjusted)
	return json.Marshal(out)
}

// Display shows the card (see Display).
func (c SegmentsCard) Display() error { return Display(c) }
