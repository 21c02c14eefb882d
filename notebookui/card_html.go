package notebookui

import (
	"html/template"
	"strings"
)

// renderHTML lays out the view with html/template, which escapes every
// string by its context (text, attribute), so labels such as
// `<script>` or `" onerror="` show literally and never run.
func renderHTML(v cardView) string {
	var b strings.Builder
	if err := cardTemplate.Execute(&b, v); err != nil {
		// The template only reads strings and slices of the view, so an
		// error is a bug in it; show that rather than half a card.
		return "<pre>" + template.HTMLEscapeString("result card: "+err.Error()) + "</pre>"
	}
	return b.String()
}

var cardTemplate = template.Must(template.New("card").Parse(cardHTML))

// cardHTML is the card's markup. Structure: a <section> with real headings
// and tables (column headers with scope), decisions and warnings spelled
// out in words, and a <details> holding every interval method.
const cardHTML = `<section class="ps-card" data-propscope="result-card" aria-label="{{.Title}}">
<style>` + cardCSS + `</style>
<h3 class="ps-title">{{.Title}}</h3>
<div class="ps-headline">
<p class="ps-lead">Difference in the share {{.Event}}, <span class="ps-label">{{.First}}</span> minus <span class="ps-label">{{.Second}}</span></p>
<p class="ps-big"><span class="ps-diff" data-role="difference">{{.Difference}}</span> <span class="ps-unit">percentage points</span></p>
<p class="ps-ci">{{.Level}} confidence interval: <strong data-role="interval">{{.Lower}} to {{.Upper}}</strong> points <span class="ps-muted">({{.Method}})</span></p>
{{with .Strip}}<svg class="ps-strip" width="100%" height="58" role="img" aria-label="{{.Label}}">
<line x1="4%" y1="34" x2="96%" y2="34" class="ps-axis"/>
<line x1="{{.XNull}}" y1="6" x2="{{.XNull}}" y2="42" class="ps-null"/>
<text x="{{.XNull}}" y="56" text-anchor="middle" class="ps-tick">{{.NullText}}</text>
<line x1="{{.X1}}" y1="22" x2="{{.X2}}" y2="22" class="ps-bar"/>
<circle cx="{{.XEst}}" cy="22" r="6" class="ps-dot"/>
<text x="{{.X1}}" y="12" text-anchor="{{.LowerAnchor}}" class="ps-tick">{{.LowerText}}</text>
<text x="{{.X2}}" y="12" text-anchor="{{.UpperAnchor}}" class="ps-tick">{{.UpperText}}</text>
</svg>{{end}}
{{if .Verdict}}<p class="ps-verdict">{{.Verdict}}</p>{{end}}
</div>
<h4 class="ps-h">Each group</h4>
<div class="ps-scroll"><table class="ps-t">
<thead><tr><th scope="col">Group</th><th scope="col" class="ps-n">{{.Groups.EventHeader}}</th><th scope="col" class="ps-n">Out of</th><th scope="col" class="ps-n">{{.Groups.ShareHeader}}</th>{{if .Groups.IntervalHeader}}<th scope="col" class="ps-n">{{.Groups.IntervalHeader}}</th>{{end}}</tr></thead>
<tbody>{{range .Groups.Rows}}
<tr><th scope="row"><span class="ps-clip" title="{{.Label}}">{{.Label}}</span></th><td class="ps-n" data-label="{{$.Groups.EventHeader}}">{{.Events}}</td><td class="ps-n" data-label="Out of">{{.Trials}}</td><td class="ps-n" data-label="{{$.Groups.ShareHeader}}">{{.Share}}</td>{{if $.Groups.IntervalHeader}}<td class="ps-n" data-label="{{$.Groups.IntervalHeader}}">{{.Interval}}</td>{{end}}</tr>{{end}}
</tbody></table></div>
{{if .Tests}}<h4 class="ps-h">Tests</h4>
<p class="ps-muted ps-small">{{.Hypothesis}}</p>
<div class="ps-scroll"><table class="ps-t">
<thead><tr><th scope="col">Test</th><th scope="col" class="ps-n">Statistic</th><th scope="col" class="ps-n">p-value</th><th scope="col">Decision</th></tr></thead>
<tbody>{{range .Tests}}
<tr><th scope="row">{{.Name}}{{if .Headline}} <span class="ps-tag">headline</span>{{end}}</th><td class="ps-n" data-label="Statistic">{{.Statistic}}</td><td class="ps-n" data-label="p-value">{{.P}}</td><td data-label="Decision">{{.Decision}}</td></tr>{{end}}
</tbody></table></div>{{range .StatNotes}}
<p class="ps-muted ps-small">{{.}}</p>{{end}}{{end}}
{{if .Conclusion}}<h4 class="ps-h">What the data say</h4>
<p class="ps-conclusion">{{.Conclusion}}</p>{{end}}
{{if .Warnings}}<h4 class="ps-h">Warnings</h4>
<ul class="ps-warnings">{{range .Warnings}}
<li>{{.}}</li>{{end}}
</ul>{{end}}{{if .NotRun}}
<p class="ps-muted ps-small ps-notrun">{{.NotRun}}</p>{{end}}
{{if .Sections}}<details class="ps-more">
<summary>Every interval method ({{.Level}})</summary>
{{range $s := .Sections}}<div class="ps-scroll"><table class="ps-t">
<caption>{{.Title}} <span class="ps-muted">({{.Unit}})</span></caption>
<thead><tr><th scope="col">Method</th><th scope="col" class="ps-n">Estimate</th><th scope="col" class="ps-n">Lower</th><th scope="col" class="ps-n">Upper</th>{{if .HasNotes}}<th scope="col">Note</th>{{end}}</tr></thead>
<tbody>{{range .Rows}}
<tr><th scope="row">{{.Name}}{{if .Headline}} <span class="ps-tag">headline</span>{{end}}</th><td class="ps-n" data-label="Estimate">{{.Estimate}}</td><td class="ps-n" data-label="Lower">{{.Lower}}</td><td class="ps-n" data-label="Upper">{{.Upper}}</td>{{if $s.HasNotes}}<td data-label="Note">{{.Note}}</td>{{end}}</tr>{{end}}
</tbody></table></div>
{{end}}</details>{{end}}
{{if .References}}<details class="ps-more">
<summary>Methods and their sources ({{len .References}})</summary>
<ol class="ps-refs">{{range .References}}
<li><strong>{{.Name}}</strong> — {{.Citation}}</li>{{end}}
</ol>{{if .Bounds}}
<p class="ps-small">Unconditional tests maximise over the unknown common rate; the exact p-value lies between the p-value and its proven bound:</p>
<ul class="ps-refs">{{range .Bounds}}
<li>{{.}}</li>{{end}}
</ul>{{end}}
</details>{{end}}
<p class="ps-caution"><strong>Before acting on this:</strong> {{.Caution}}</p>
</section>`

// cardCSS is scoped to .ps-card. Sizes are in em, not rem: classic
// Notebook sets the root font size to 10px. Summaries are list items again
// so that the fold's triangle shows where the page's CSS hides it. Text takes the notebook's own colour
// (JupyterLab's --jp-content-font-color1 when set, else inherited), and
// tints and rules are translucent grey, so the card reads in light and dark
// themes alike. Selectors are specific enough to win over the notebook's
// own .rendered_html table rules (striped rows, right-aligned cells).
//
// Layout rule (narrow screens and long labels): the card is a size
// container; below 34em of card width every table reflows into one block
// per row, each value under its column's name (data-label), so nothing
// scrolls sideways on a phone. Wider tables that still overflow scroll
// inside their box, and a shadow at the hidden edge shows that they do.
// User text never sets a width: labels and captions break anywhere, and a
// row label is cut after three lines with its full text on hover (title).
// The interval strip spans the card and keeps its 12-pixel labels at any
// width. e2e/layout_test.go checks these boxes in Chromium.
const cardCSS = `
.ps-card{container:ps-card/inline-size;color:var(--jp-content-font-color1,inherit);background:transparent;font-family:var(--jp-ui-font-family,system-ui,-apple-system,"Segoe UI",Roboto,"Noto Sans","DejaVu Sans",sans-serif);font-size:14px;line-height:1.45;max-width:60em;margin:.25em 0;padding:1em 1.1em;border:1px solid rgba(128,128,128,.45);border-radius:8px;box-sizing:border-box;overflow-wrap:break-word}
.ps-card *{box-sizing:border-box}
.ps-card .ps-title{font-size:1.2em;font-weight:650;margin:0 0 .6em;padding:0;line-height:1.3}
.ps-card .ps-headline{border-left:4px solid #2a8c7a;padding:.3em 0 .3em .85em;margin:0 0 .9em}
.ps-card .ps-headline p{margin:.15em 0}
.ps-card .ps-lead{font-size:.95em}
.ps-card .ps-label{font-weight:600}
.ps-card .ps-big{font-size:1.9em;font-weight:700;line-height:1.15;font-variant-numeric:tabular-nums}
.ps-card .ps-unit{font-size:.5em;font-weight:500}
.ps-card .ps-ci{font-variant-numeric:tabular-nums}
.ps-card .ps-verdict{margin-top:.35em}
.ps-card svg.ps-strip{display:block;width:100%;height:58px;margin:.35em 0 .1em;overflow:visible}
.ps-card .ps-strip .ps-axis{stroke:currentColor;stroke-opacity:.35;stroke-width:1}
.ps-card .ps-strip .ps-null{stroke:currentColor;stroke-opacity:.7;stroke-width:1.5;stroke-dasharray:4 3}
.ps-card .ps-strip .ps-bar{stroke:#2a8c7a;stroke-width:8;stroke-linecap:round}
.ps-card .ps-strip .ps-dot{fill:currentColor;stroke:none}
.ps-card .ps-strip .ps-tick{fill:currentColor;font-size:12px;font-variant-numeric:tabular-nums}
.ps-card .ps-muted{opacity:.8}
.ps-card .ps-notrun{overflow-wrap:anywhere}
.ps-card .ps-small{font-size:.9em;margin:.1em 0 .35em}
.ps-card .ps-h{font-size:1em;font-weight:650;margin:1em 0 .35em;padding:0}
.ps-card .ps-scroll{overflow-x:auto;width:0;min-width:100%;background:linear-gradient(to right,var(--jp-layout-color0,#fff) 30%,rgba(255,255,255,0)) 0 0/2.5em 100% no-repeat local,linear-gradient(to left,var(--jp-layout-color0,#fff) 30%,rgba(255,255,255,0)) 100% 0/2.5em 100% no-repeat local,radial-gradient(farthest-side at 0 50%,rgba(128,128,128,.45),rgba(128,128,128,0)) 0 0/.9em 100% no-repeat scroll,radial-gradient(farthest-side at 100% 50%,rgba(128,128,128,.45),rgba(128,128,128,0)) 100% 0/.9em 100% no-repeat scroll}
.ps-card .ps-title,.ps-card .ps-lead,.ps-card table.ps-t caption,.ps-card table.ps-t th{overflow-wrap:anywhere}
.ps-card .ps-clip{display:-webkit-box;-webkit-box-orient:vertical;-webkit-line-clamp:3;overflow:hidden;overflow-wrap:anywhere;max-width:18em}
.ps-card table.ps-t{border-collapse:collapse;margin:0 0 .4em;width:auto;min-width:60%;font-size:.95em;table-layout:auto;border:none}
.ps-card table.ps-t caption{text-align:left;font-weight:600;padding:.5em 0 .25em;caption-side:top}
.ps-card table.ps-t th,.ps-card table.ps-t td{text-align:left;padding:.3em .7em .3em 0;border:none;border-bottom:1px solid rgba(128,128,128,.3);vertical-align:top;white-space:normal;max-width:none}
.ps-card table.ps-t thead th{font-weight:600;border-bottom:1.5px solid rgba(128,128,128,.6);background:rgba(128,128,128,.1);padding-left:.4em}
.ps-card table.ps-t tbody th{font-weight:600;padding-left:.4em}
.ps-card table.ps-t tbody tr,.ps-card table.ps-t tbody tr:nth-child(odd),.ps-card table.ps-t tbody tr:nth-child(even){background:transparent}
.ps-card table.ps-t tbody tr:hover{background:rgba(128,128,128,.08)}
.ps-card table.ps-t .ps-n{text-align:right;font-variant-numeric:tabular-nums;white-space:nowrap}
.ps-card .ps-tag{display:inline-block;font-size:.75em;font-weight:600;padding:0 .35em;border:1px solid rgba(128,128,128,.6);border-radius:3px;vertical-align:1px}
.ps-card .ps-conclusion{margin:.2em 0 .4em}
.ps-card .ps-warnings{margin:.2em 0 .4em;padding:0;list-style:none}
.ps-card .ps-warnings li{margin:.3em 0;padding:.35em .6em;border-left:4px solid #c98a12;background:rgba(201,138,18,.1)}
.ps-card details.ps-more{margin:.9em 0 .2em}
.ps-card details.ps-more summary{display:list-item;cursor:pointer;font-weight:650}
.ps-card .ps-refs{margin:.2em 0 .4em;padding-left:1.4em;font-size:.9em}
.ps-card .ps-refs li{margin:.15em 0}
.ps-card .ps-caution{margin:.9em 0 0;padding-top:.5em;border-top:1px solid rgba(128,128,128,.35);font-size:.9em}
@media (max-width:480px){.ps-card{padding:.7em .6em}.ps-card .ps-big{font-size:1.5em}}
@container ps-card (max-width:34em){
.ps-card table.ps-t,.ps-card table.ps-t tbody,.ps-card table.ps-t tr,.ps-card table.ps-t tbody th,.ps-card table.ps-t td{display:block;width:auto;min-width:0}
.ps-card table.ps-t caption{display:block}
.ps-card table.ps-t thead{position:absolute;width:1px;height:1px;overflow:hidden;clip-path:inset(50%);white-space:nowrap}
.ps-card table.ps-t tbody tr{padding:.35em 0;border-bottom:1px solid rgba(128,128,128,.3)}
.ps-card table.ps-t tbody th,.ps-card table.ps-t td{border:none;padding:.05em .4em}
.ps-card table.ps-t td.ps-n{text-align:left;white-space:normal}
.ps-card table.ps-t td[data-label]::before{content:attr(data-label) ": ";font-weight:600;opacity:.8}
.ps-card .ps-clip{max-width:none}
.ps-card table.ps-t td:empty{display:none}
}
`
