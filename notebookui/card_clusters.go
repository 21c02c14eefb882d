package notebookui

import (
	"encoding/json"
	"fmt"
	"html/template"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
)

// ClusterCard shows a clustered analysis (what clusters.Analyze returns):
// how clustered the data are and what the units are worth, the warning in
// plain words, the answers that account for the clusters beside the
// unit-level answers that do not, the cluster-level check, the other
// warnings and the caution. It renders what the analysis holds and
// recomputes nothing. Build one with NewClusterCard, or as a literal.
type ClusterCard struct {
	Analysis clusters.Analysis
	// Title replaces the default heading "<event>: <first> vs <second>,
	// <n> <clusters>".
	Title string
}

// NewClusterCard returns the card for a clustered analysis.
func NewClusterCard(a clusters.Analysis) ClusterCard { return ClusterCard{Analysis: a} }

// Kind is "cluster-card".
func (c ClusterCard) Kind() string { return "cluster-card" }

// clusterTable is one table of the card: its heading, header and rows.
type clusterTable struct {
	Heading string
	Head    []string
	Rows    []bayesRow
}

type clusterView struct {
	Title, Lead, Conclusion, Caution string
	// Clustered is set when the lead is the clustered-units warning.
	Clustered bool
	Tables    []clusterTable
	Warnings  []proportions.Warning
}

func (c ClusterCard) view() clusterView {
	a := c.Analysis
	d := a.Data
	title := c.Title
	if title == "" {
		title = fmt.Sprintf("%s: %s vs %s, %d %s", d.Event, d.First, d.Second, len(d.Group1)+len(d.Group2), clusterWord(d.By, 2))
	}
	v := clusterView{Title: title, Conclusion: a.Conclusion, Caution: a.Caution,
		Lead: clusters.EffectiveSentence(d, a.EffectiveTotal()) + "."}
	for _, w := range a.Warnings {
		if w.Code == clusters.WarnClustered {
			v.Lead, v.Clustered = w.Message, true // the same sentence with what follows from it
			continue
		}
		v.Warnings = append(v.Warnings, w)
	}
	lvl := func(level float64) string { return strconv.FormatFloat(100*level, 'g', 4, 64) + "% interval" }
	how := clusterTable{Heading: "How clustered", Head: []string{"", "Estimate", lvl(a.Correlation.Level)}}
	for _, r := range append([]clusters.Correlation{a.Correlation}, a.OtherCorrelations...) {
		est, iv := "not estimable", ""
		if r.Defined {
			est = signless(r.Estimate, 3)
		}
		if r.IntervalDefined {
			iv = signless(r.Lower, 3) + " to " + signless(r.Upper, 3)
		}
		how.Rows = append(how.Rows, bayesRow{[]string{"Intracluster correlation, " + r.EstimatorName, est, iv}})
	}
	worth := clusterTable{Heading: "What the units are worth", Head: []string{"Group", "Units", capitalize(clusterWord(d.By, 2)), "Mean size", "Design effect", "Worth about"}}
	for i, e := range a.DesignEffects {
		worth.Rows = append(worth.Rows, bayesRow{[]string{[]string{d.First, d.Second}[i], strconv.FormatInt(e.Trials, 10),
			strconv.FormatInt(e.Clusters, 10), signless(e.MeanSize, 1), signless(e.Value, 2), signless(e.EffectiveSize, 0) + " independent units"}})
	}
	side := clusterTable{Heading: "Difference " + d.First + " − " + d.Second, Head: []string{"", "Method", "Difference", lvl(a.Interval.Level)}}
	side.Rows = append(side.Rows,
		bayesRow{[]string{"Accounting for the " + clusterWord(d.By, 2), a.Interval.MethodName, points(a.Interval.Estimate, 1) + " pp", ppInterval(a.Interval)}},
		bayesRow{[]string{"As if every unit were independent", a.Naive.Interval.MethodName, points(a.Naive.Interval.Estimate, 1) + " pp", ppInterval(a.Naive.Interval)}},
		bayesRow{[]string{capitalize(d.By) + " by " + d.By + " (each " + d.By + " one observation)", a.ClusterLevel.MethodName, points(a.ClusterLevel.Estimate, 1) + " pp", ppInterval(a.ClusterLevel)}},
	)
	tests := clusterTable{Heading: "Tests of no difference", Head: []string{"", "Test", "Statistic", "p"}}
	testRow := func(what string, t proportions.TestResult) bayesRow {
		return bayesRow{[]string{what, t.MethodName, t.StatisticName + " = " + signless(t.Statistic, 3), proportions.FormatP(t.PValue, t.LogPValue)}}
	}
	for _, t := range a.Tests {
		if t.Method != a.ClusterLevelTest.Method {
			tests.Rows = append(tests.Rows, testRow("Accounting for the "+clusterWord(d.By, 2), t))
		}
	}
	tests.Rows = append(tests.Rows, testRow("As if every unit were independent", a.Naive.Test))
	tests.Rows = append(tests.Rows, testRow(capitalize(d.By)+" by "+d.By, a.ClusterLevelTest))
	all := clusterTable{Heading: "Every interval that accounts for the " + clusterWord(d.By, 2), Head: []string{"Method", "Difference", lvl(a.Interval.Level)}}
	for _, iv := range a.Intervals {
		all.Rows = append(all.Rows, bayesRow{[]string{iv.MethodName, points(iv.Estimate, 1) + " pp", ppInterval(iv)}})
	}
	v.Tables = []clusterTable{how, worth, side, tests, all}
	return v
}

// ppInterval prints an interval's limits in percentage points.
func ppInterval(iv proportions.Interval) string {
	return points(iv.Lower, 1) + " to " + points(iv.Upper, 1) + " pp"
}

// clusterWord is the cluster column's name, with an "s" for more than one.
func clusterWord(by string, n int) string {
	if n == 1 || strings.HasSuffix(by, "s") {
		return by
	}
	return by + "s"
}

var clusterTemplate = template.Must(template.New("clusters").Parse(`<section class="ps-card" data-propscope="cluster-card" aria-label="{{.Title}}">
<style>` + cardCSS + `</style>
<h3 class="ps-title">{{.Title}}</h3>
{{if .Clustered}}<ul class="ps-warnings"><li data-role="worth" data-code="clustered-units">{{.Lead}}</li></ul>{{else}}<p class="ps-lead" data-role="worth">{{.Lead}}</p>{{end}}
<p class="ps-lead">{{.Conclusion}}</p>
{{range .Tables}}<h4 class="ps-h">{{.Heading}}</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr>{{range .Head}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}
<tr>{{range $i, $c := .Cells}}{{if eq $i 0}}<th scope="row">{{$c}}</th>{{else}}<td class="ps-n">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>
{{end}}{{if .Warnings}}<h4 class="ps-h">Warnings</h4>
<ul class="ps-warnings">{{range .Warnings}}
<li data-code="{{.Code}}">{{.Message}}</li>{{end}}
</ul>
{{end}}<p class="ps-caution"><strong>Before acting on this:</strong> {{.Caution}}</p>
</section>`))

// HTML returns the card as a self-contained HTML fragment (scoped style,
// no scripts); every label, cluster name and the event name are escaped.
func (c ClusterCard) HTML() string {
	var b strings.Builder
	if err := clusterTemplate.Execute(&b, c.view()); err != nil {
		return "<pre>" + template.HTMLEscapeString("cluster card: "+err.Error()) + "</pre>"
	}
	return b.String()
}

// Markdown returns the card as Markdown; user strings show literally.
func (c ClusterCard) Markdown() string {
	v := c.view()
	var b strings.Builder
	fmt.Fprintf(&b, "### %s\n\n**%s**\n\n%s\n", mdEscape(v.Title), mdEscape(v.Lead), mdEscape(v.Conclusion))
	for _, t := range v.Tables {
		fmt.Fprintf(&b, "\n#### %s\n\n|", mdEscape(t.Heading))
		for _, h := range t.Head {
			b.WriteString(" " + mdEscape(h) + " |")
		}
		b.WriteString("\n|")
		for range t.Head {
			b.WriteString("---|")
		}
		for _, r := range t.Rows {
			b.WriteString("\n|")
			for _, cell := range r.Cells {
				b.WriteString(" " + mdEscape(cell) + " |")
			}
		}
		b.WriteString("\n")
	}
	if len(v.Warnings) > 0 {
		b.WriteString("\n#### Warnings\n\n")
		for _, w := range v.Warnings {
			fmt.Fprintf(&b, "- %s\n", mdEscape(w.Message))
		}
	}
	fmt.Fprintf(&b, "\n> **Before acting on this:** %s\n", mdEscape(v.Caution))
	return b.String()
}

// Text returns the card as plain text.
func (c ClusterCard) Text() string {
	v := c.view()
	var b strings.Builder
	b.WriteString(v.Title + "\n")
	b.WriteString(wrap(v.Lead, "  ", textWidth))
	b.WriteString(wrap(v.Conclusion, "  ", textWidth))
	for _, t := range v.Tables {
		b.WriteString(t.Heading + "\n")
		b.WriteString(textTable(cells{header: t.Head, rows: rowsOf(t.Rows), numeric: numericAfterFirst(len(t.Head))}, "  "))
	}
	if len(v.Warnings) > 0 {
		b.WriteString("Warnings\n")
		for _, w := range v.Warnings {
			b.WriteString(wrap("- "+w.Message, "  ", textWidth))
		}
	}
	b.WriteString(wrap("Before acting on this: "+v.Caution, "", textWidth))
	return b.String()
}

// String returns Text.
func (c ClusterCard) String() string { return c.Text() }

type clusterCardJSON struct {
	Kind     string            `json:"kind"`
	Version  int               `json:"version"`
	Analysis clusters.Analysis `json:"analysis"`
}

// JSON returns {"kind": "cluster-card", "version": 1, "analysis": {...}},
// the analysis in the form clusters.schema.json describes.
func (c ClusterCard) JSON() ([]byte, error) {
	return json.Marshal(clusterCardJSON{Kind: c.Kind(), Version: 1, Analysis: c.Analysis})
}

// Display shows the card (see Display).
func (c ClusterCard) Display() error { return Display(c) }
