package notebookui

import (
	"encoding/json"
	"fmt"
	"html/template"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions/bayes"
)

// BayesCard shows a Bayesian view of a comparison (what bayes.Analyze
// returns) as a card of its own, beside the result card and never inside
// it unless asked for: plain sentences with the prior named, the
// posterior of the difference, ratio and odds ratio, the sensitivity
// table and the standing caution. It renders what the analysis holds and
// recomputes nothing. Build one with NewBayesCard, or as a literal.
type BayesCard struct {
	Analysis bayes.Analysis
	// Title replaces the default heading "Bayesian view: <event>: <first>
	// vs <second>".
	Title string
}

// NewBayesCard returns the card for a Bayesian analysis.
func NewBayesCard(a bayes.Analysis) BayesCard { return BayesCard{Analysis: a} }

// Kind is "bayes-card".
func (c BayesCard) Kind() string { return "bayes-card" }

type bayesRow struct{ Cells []string }

type bayesView struct {
	Title, Prior, Caution, ErrorNote string
	Sentences                        []string
	EffectHead, SensitivityHead      []string
	Effects, Sensitivity             []bayesRow
}

func (c BayesCard) view() bayesView {
	a := c.Analysis
	title := c.Title
	if title == "" {
		title = fmt.Sprintf("Bayesian view: %s: %s vs %s", a.Comparison.Event, a.Comparison.First.Label, a.Comparison.Second.Label)
	}
	lvl := strconv.FormatFloat(100*a.Level, 'g', 4, 64) + "%"
	v := bayesView{Title: title, Prior: a.PriorText(), Caution: a.Caution,
		ErrorNote:       fmt.Sprintf("Computed by exact sums and numerical integration, not simulated; largest error estimate of the probabilities %s.", sci(a.ErrorBound, 1)),
		EffectHead:      []string{"Effect", "Median", lvl + " equal-tailed", lvl + " highest-density"},
		SensitivityHead: []string{"Prior", "P(first higher)", "Difference", lvl + " equal-tailed"},
	}
	if len(a.Effects) > 0 {
		v.Sentences = a.Sentences()[1:] // the first names the prior, shown on its own line
	}
	for _, e := range a.Effects {
		f := func(x float64) string { return signless(x, 3) }
		if e.Scale.String() == "difference" {
			f = func(x float64) string { return points(x, 1) + " pp" }
		}
		v.Effects = append(v.Effects, bayesRow{[]string{e.Scale.String(), f(e.Median), f(e.Lower) + " to " + f(e.Upper),
			f(e.HighestDensityLower) + " to " + f(e.HighestDensityUpper)}})
	}
	if a.ProbabilityEquivalent != nil {
		v.SensitivityHead = append(v.SensitivityHead, "P(equivalent)")
	}
	for _, r := range a.Sensitivity {
		cells := []string{r.PriorText(), strconv.FormatFloat(r.ProbabilityFirstHigher, 'f', 3, 64), points(r.Median, 1) + " pp",
			points(r.Lower, 1) + " to " + points(r.Upper, 1) + " pp"}
		if r.ProbabilityEquivalent != nil {
			cells = append(cells, strconv.FormatFloat(*r.ProbabilityEquivalent, 'f', 3, 64))
		}
		v.Sensitivity = append(v.Sensitivity, bayesRow{cells})
	}
	return v
}

var bayesTemplate = template.Must(template.New("bayes").Parse(`<section class="ps-card" data-propscope="bayes-card" aria-label="{{.Title}}">
<style>` + cardCSS + `</style>
<h3 class="ps-title">{{.Title}}</h3>
<p class="ps-lead">Prior: <strong data-role="prior">{{.Prior}}</strong></p>
<ul class="ps-sentences">{{range .Sentences}}
<li>{{.}}</li>{{end}}
</ul>
<h4 class="ps-h">Posterior of each effect</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr>{{range .EffectHead}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Effects}}
<tr>{{range $i, $c := .Cells}}{{if eq $i 0}}<th scope="row">{{$c}}</th>{{else}}<td class="ps-n" data-label="{{index $.EffectHead $i}}">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>
<h4 class="ps-h">Under other priors</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr>{{range .SensitivityHead}}<th scope="col">{{.}}</th>{{end}}</tr></thead>
<tbody>{{range .Sensitivity}}
<tr>{{range $i, $c := .Cells}}{{if eq $i 0}}<th scope="row">{{$c}}</th>{{else}}<td class="ps-n" data-label="{{index $.SensitivityHead $i}}">{{$c}}</td>{{end}}{{end}}</tr>{{end}}
</tbody></table></div>
<p class="ps-muted ps-small">{{.ErrorNote}}</p>
<p class="ps-caution"><strong>Before acting on this:</strong> {{.Caution}}</p>
</section>`))

// HTML returns the card as a self-contained HTML fragment (scoped style,
// no scripts); every label and the event name are escaped.
func (c BayesCard) HTML() string {
	var b strings.Builder
	if err := bayesTemplate.Execute(&b, c.view()); err != nil {
		return "<pre>" + template.HTMLEscapeString("bayes card: "+err.Error()) + "</pre>"
	}
	return b.String()
}

// Markdown returns the card as Markdown; user strings show literally.
func (c BayesCard) Markdown() string {
	v := c.view()
	var b strings.Builder
	fmt.Fprintf(&b, "### %s\n\nPrior: **%s**\n\n", mdEscape(v.Title), mdEscape(v.Prior))
	for _, s := range v.Sentences {
		fmt.Fprintf(&b, "- %s\n", mdEscape(s))
	}
	table := func(head []string, rows []bayesRow) {
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
			for _, c := range r.Cells {
				b.WriteString(" " + mdEscape(c) + " |")
			}
		}
		b.WriteString("\n")
	}
	b.WriteString("\n#### Posterior of each effect\n")
	table(v.EffectHead, v.Effects)
	b.WriteString("\n#### Under other priors\n")
	table(v.SensitivityHead, v.Sensitivity)
	fmt.Fprintf(&b, "\n%s\n\n> **Before acting on this:** %s\n", mdEscape(v.ErrorNote), mdEscape(v.Caution))
	return b.String()
}

// Text returns the card as plain text.
func (c BayesCard) Text() string {
	v := c.view()
	var b strings.Builder
	b.WriteString(v.Title + "\n")
	b.WriteString(wrap("Prior: "+v.Prior+".", "  ", textWidth))
	for _, s := range v.Sentences {
		b.WriteString(wrap(s, "  ", textWidth))
	}
	b.WriteString("Posterior of each effect\n")
	b.WriteString(textTable(cells{header: v.EffectHead, rows: rowsOf(v.Effects), numeric: numericAfterFirst(len(v.EffectHead))}, "  "))
	b.WriteString("Under other priors\n")
	b.WriteString(textTable(cells{header: v.SensitivityHead, rows: rowsOf(v.Sensitivity), numeric: numericAfterFirst(len(v.SensitivityHead))}, "  "))
	b.WriteString(wrap(v.ErrorNote, "", textWidth))
	b.WriteString(wrap("Before acting on this: "+v.Caution, "", textWidth))
	return b.String()
}

func numericAfterFirst(n int) []bool {
	out := make([]bool, n)
	for i := 1; i < n; i++ {
		out[i] = true
	}
	return out
}

func rowsOf(rs []bayesRow) [][]string {
	out := make([][]string, len(rs))
	for i, r := range rs {
		out[i] = r.Cells
	}
	return out
}

// String returns Text.
func (c BayesCard) String() string { return c.Text() }

type bayesCardJSON struct {
	Kind     string         `json:"kind"`
	Version  int            `json:"version"`
	Analysis bayes.Analysis `json:"analysis"`
}

// JSON returns {"kind": "bayes-card", "version": 1, "analysis": {...}},
// the analysis in the form bayes.schema.json describes.
func (c BayesCard) JSON() ([]byte, error) {
	return json.Marshal(bayesCardJSON{Kind: c.Kind(), Version: 1, Analysis: c.Analysis})
}

// Display shows the card (see Display).
func (c BayesCard) Display() error { return Display(c) }
