package notebookui

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"html"
	"strconv"
	"strings"
)

// Chart is one chart of propscope results, ready to show: in a notebook
// (its HTML, with the chart engine loaded once per notebook by
// [ChartEngine]), as a self-contained HTML page for a write-up, or as plain
// text and Markdown (the numbers behind the chart as a table) where no
// browser runs.
//
// A Chart is built by one of the chart functions (RatesChart,
// DifferenceIntervalsChart, ConfidenceCurveChart, ...) from result data; it
// never recomputes statistics. Its ID is derived from its content, so the
// same data always give byte-identical output (golden files), while
// different charts on one page never clash.
type Chart struct {
	id       string
	kind     string
	title    string
	subtitle string
	height   int
	option   map[string]any
	table    dataTable
	notes    []string
	// optionJSON is the option marshalled once, when the chart is sealed
	// (the ID, the HTML and the JSON form all start from it; the option is
	// not changed after that).
	optionJSON []byte
}

// dataTable is the data behind a chart, shown beside it for readers who
// cannot see the canvas, in text output and in Markdown.
type dataTable struct {
	Caption string     `json:"caption"`
	Header  []string   `json:"header"`
	Rows    [][]string `json:"rows"`
}

// ID returns the chart's deterministic identifier, also the id of its
// drawing element in HTML.
func (c *Chart) ID() string { return c.id }

// Kind returns "chart" (see [Displayable]); [Chart.Name] tells which.
func (c *Chart) Kind() string { return "chart" }

// Name returns which chart this is, such as "rates" or
// "confidence-curve".
func (c *Chart) Name() string { return c.kind }

// Title returns the chart's title.
func (c *Chart) Title() string { return c.title }

// Notes returns the sentences printed under the chart (for example why a
// method is marked as recommended).
func (c *Chart) Notes() []string { return append([]string(nil), c.notes...) }

// funcMarker brackets JavaScript function source inside option strings in
// the go-echarts convention (see opts.FuncOpts). This package no longer
// gives it any meaning: a string holding it, whoever wrote it, is data and
// is emitted as a JSON string. It is kept only so that tests can feed it
// as hostile text.
const funcMarker = "__f__"

// How code reaches the chart option, and why user text never can.
//
// go-echarts marks code as a string wrapped in funcMarker, and a page that
// turns such strings into code cannot tell our callbacks from a group
// label that happens to be wrapped the same way: a label read from a CSV
// file ran as script. So the decision is made by Go type, not by content:
// only a value of the private type jsCode, which only this package's
// constant sources are turned into (see jsFunc), becomes code. Strings of
// any content, including funcMarker, stay JSON string literals.
//
// jsCode marshals to a JSON string token that starts with the escape `\/`
// (see codeToken). encoding/json writes a '/' in a string unescaped and a
// backslash as `\\`, so no Go string, whatever it holds, marshals to a
// token that starts with `"\/`; after marshalling, a scan of the JSON's
// string tokens (substituteCode) finds exactly the jsCode values by their
// raw bytes and either pastes their source as code (optionScript) or keeps
// it as a plain string (OptionJSON).

// jsCode is JavaScript source written in this package (a callback or a
// renderer). Only jsFunc makes one.
type jsCode struct{ src string }

// codeToken is how a jsCode token starts in marshalled JSON: a quote and
// the escape `\/`, which encoding/json never writes for a string's content.
const codeToken = `"\/propscope-code\/`

// MarshalJSON writes the source as a JSON string behind codeToken.
func (c jsCode) MarshalJSON() ([]byte, error) {
	b, err := json.Marshal(c.src)
	if err != nil {
		return nil, err
	}
	return append([]byte(codeToken), b[1:]...), nil
}

// substituteCode scans marshalled JSON and replaces each jsCode token by
// its source (asCode) or by the source as an ordinary JSON string. Every
// other string token, whatever it contains, is copied unchanged. The scan
// follows JSON's grammar for strings (a backslash escapes the next byte),
// so a token's start is never taken from the middle of another string.
func substituteCode(b []byte, asCode bool) ([]byte, error) {
	out := make([]byte, 0, len(b))
	for i := 0; i < len(b); {
		if b[i] != '"' {
			out = append(out, b[i])
			i++
			continue
		}
		j := i + 1
		for j < len(b) && b[j] != '"' {
			if b[j] == '\\' {
				j++
			}
			j++
		}
		if j >= len(b) {
			return nil, fmt.Errorf("unterminated string in chart option")
		}
		tok := b[i : j+1]
		i = j + 1
		if !bytes.HasPrefix(tok, []byte(codeToken)) {
			out = append(out, tok...)
			continue
		}
		var s string
		if err := json.Unmarshal(tok, &s); err != nil {
			return nil, fmt.Errorf("chart callback: %w", err)
		}
		src := strings.TrimPrefix(s, "/propscope-code/")
		if asCode && strings.Contains(strings.ToLower(src), "</script") {
			// Our callbacks are constants and never hold this; the check
			// keeps a future edit from ending the script element.
			return nil, fmt.Errorf("chart callback holds </script")
		}
		if asCode {
			out = append(out, src...)
			continue
		}
		q, err := json.Marshal(src)
		if err != nil {
			return nil, err
		}
		out = append(out, q...)
	}
	return out, nil
}

// OptionJSON returns the echarts option as JSON, with JavaScript callbacks
// (tooltip and label formatters, custom renderers) as strings holding their
// source. Tests and tools read the chart's data from it.
func (c *Chart) OptionJSON() ([]byte, error) {
	b, err := c.marshalledOption()
	if err != nil {
		return nil, err
	}
	out, err := substituteCode(b, false)
	if err != nil {
		return nil, fmt.Errorf("chart %s: %w", c.id, err)
	}
	return out, nil
}

// optionScript returns the option as a JavaScript expression: JSON with
// HTML-significant characters escaped (so user text such as a label
// "</script>" cannot end the script element), and this package's
// callbacks, and nothing else, as code.
func (c *Chart) optionScript() (string, error) {
	b, err := c.marshalledOption() // json.Marshal escapes <, > and & inside strings
	if err != nil {
		return "", err
	}
	out, err := substituteCode(b, true)
	if err != nil {
		return "", fmt.Errorf("chart %s: %w", c.id, err)
	}
	return string(out), nil
}

// marshalledOption returns the option's JSON, marshalled when the chart
// was sealed (or now, for a chart that was not).
func (c *Chart) marshalledOption() ([]byte, error) {
	if c.optionJSON != nil {
		return c.optionJSON, nil
	}
	b, err := json.Marshal(c.option)
	if err != nil {
		return nil, fmt.Errorf("chart %s: %w", c.id, err)
	}
	return b, nil
}

// seal marshals the option once and derives the identifier from the kind
// and that content. A chart builder that changes the option after newChart
// seals the chart again.
func (c *Chart) seal() error {
	b, err := json.Marshal(c.option)
	if err != nil {
		return fmt.Errorf("%s chart: %w", c.kind, err)
	}
	sum := sha256.Sum256(append([]byte(c.kind+"\x00"), b...))
	c.id, c.optionJSON = "propscope-"+c.kind+"-"+hex.EncodeToString(sum[:6]), b
	return nil
}

// newChart finishes a chart: it seals it (see seal).
func newChart(kind, title, subtitle string, height int, option map[string]any, table dataTable, notes []string) (*Chart, error) {
	c := &Chart{kind: kind, title: title, subtitle: subtitle, height: height, option: option, table: table, notes: notes}
	if err := c.seal(); err != nil {
		return nil, err
	}
	return c, nil
}

// chartRuntime is the script around each chart. It draws every element
// carrying the chart's ID that is not drawn yet (the same chart may be shown
// twice on a page), waits up to ten seconds for the engine when the chart
// comes before it, follows the page's text colour (dark themes) and
// redraws on resize. It runs inside a function, so re-running a notebook
// cell never redeclares anything.
const chartRuntime = `(function () {
  var id = %s;
  var esc = function (s) {
    return String(s).replace(/[&<>"']/g, function (c) {
      return {"&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;"}[c];
    });
  };
  // Numbers follow the number style of format.go: the typographic minus,
  // signed differences, fixed decimals, "< 0.0001" for small p-values.
  var minus = function (t) { return String(t).replace("-", "\u2212"); };
  var num = function (v, d) { return (typeof v === "number" && isFinite(v)) ? minus(v.toFixed(d)) : String(v); };
  var pct = function (v, d) { return (typeof v === "number" && isFinite(v)) ? minus((v * 100).toFixed(d === undefined ? 2 : d)) + "%%" : String(v); };
  var signed = function (x, d) {
    var s = Math.abs(x).toFixed(d);
    if (Number(s) === 0) { return s; }
    return (x > 0 ? "+" : "\u2212") + s;
  };
  var pp = function (v, d) {
    if (typeof v !== "number" || !isFinite(v)) { return String(v); }
    return signed(v * 100, d === undefined ? 2 : d) + " pp";
  };
  var pval = function (v) {
    if (typeof v !== "number" || !isFinite(v)) { return String(v); }
    return v < 0.00005 ? "< 0.0001" : Math.min(v, 1).toFixed(4);
  };
  var axisPct = function (v) { return minus(Math.round(v * 1000) / 10) + "%%"; };
  var axisPP = function (v) { var r = Math.round(v * 1000) / 10; return r === 0 ? "0" : (r > 0 ? "+" : "\u2212") + Math.abs(r); };
  var option = function () { return %s; };
  var light = function (color) {
    var m = /rgba?\((\d+),\s*(\d+),\s*(\d+)/.exec(color || "");
    return m ? (0.299 * m[1] + 0.587 * m[2] + 0.114 * m[3]) > 150 : false;
  };
  var draw = function () {
    var ec = window.echarts;
    if (!ec) { return false; }
    var els = document.querySelectorAll('[data-propscope-chart="' + id + '"]');
    for (var i = 0; i < els.length; i++) {
      var el = els[i];
      if (ec.getInstanceByDom(el)) { continue; }
      var chart = ec.init(el, null, {renderer: "canvas"});
      var opt = option();
      var fg = window.getComputedStyle(el).color;
      if (light(fg)) {
        opt.textStyle = {color: fg};
        opt.darkMode = true;
      }
      chart.setOption(opt);
      el.setAttribute("data-propscope-drawn", "true");
      if (window.ResizeObserver) {
        new ResizeObserver((function (c) { return function () { c.resize(); }; })(chart)).observe(el);
      }
    }
    return true;
  };
  if (!draw()) {
    var tries = 0;
    var timer = setInterval(function () {
      if (draw()) { clearInterval(timer); return; }
      if (++tries > 100) {
        clearInterval(timer);
        var els = document.querySelectorAll('[data-propscope-chart="' + id + '"]');
        for (var i = 0; i < els.length; i++) {
          els[i].textContent = "This chart needs the chart engine: show notebookui.ChartEngine() once in an earlier cell, then run this cell again. The numbers are in the table below.";
        }
      }
    }, 100);
  }
})();`

// HTML returns the chart as an HTML fragment: a figure with the drawing
// element, the title, notes, a collapsible table of the numbers, and the
// script that draws it. The chart engine must be on the page once (see
// [ChartEngine] and [EngineScript]); [Chart.Page] is the self-contained form.
func (c *Chart) HTML() string {
	js, err := c.optionScript()
	if err != nil {
		return `<div class="propscope-chart-error">` + html.EscapeString(err.Error()) + `</div>`
	}
	var b strings.Builder
	fmt.Fprintf(&b, `<figure class="propscope-chart" data-kind="%s" style="margin:0.75em 0;max-width:860px;overflow:hidden;">`, html.EscapeString(c.kind))
	fmt.Fprintf(&b, `<div id="%s" data-propscope-chart="%s" role="img" aria-label="%s" style="width:100%%;height:%dpx;"></div>`,
		c.id, c.id, html.EscapeString(c.ariaLabel()), c.height)
	if len(c.notes) > 0 || len(c.table.Rows) > 0 {
		// The caption starts where the chart's title does (chartInset).
		fmt.Fprintf(&b, `<figcaption style="font-size:0.9em;line-height:1.4;padding:0 %dpx;">`, chartInset)
		for _, n := range c.notes {
			b.WriteString(`<p style="margin:0.3em 0;">` + html.EscapeString(n) + `</p>`)
		}
		if len(c.table.Rows) > 0 {
			b.WriteString(`<details><summary>Numbers behind the chart</summary>`)
			b.WriteString(c.table.html())
			b.WriteString(`</details>`)
		}
		b.WriteString(`</figcaption>`)
	}
	b.WriteString(`</figure>`)
	b.WriteString(`<script type="text/javascript">`)
	fmt.Fprintf(&b, chartRuntime, strconv.Quote(c.id), js)
	b.WriteString(`</script>`)
	return b.String()
}

func (c *Chart) ariaLabel() string {
	if c.subtitle == "" {
		return c.title
	}
	return c.title + ". " + c.subtitle
}

// Page returns a complete HTML document holding the chart engine and the
// chart: it opens and draws in a browser with no network.
func (c *Chart) Page() string { return Page(c.title, c) }

// WriteFile writes [Chart.Page] to a file.
func (c *Chart) WriteFile(path string) error {
	if err := WriteHTMLFile(path, c.title, c); err != nil {
		return fmt.Errorf("write chart %s: %w", c.id, err)
	}
	return nil
}

// needsChartEngine marks displayables whose HTML draws with the chart
// engine; [Page] then inlines the engine once.
func (c *Chart) needsChartEngine() {}

// JSON returns the chart as a JSON object: its kind, ID, title, notes, the
// numbers behind it (caption, header, rows) and the echarts option (with
// callbacks as source strings).
func (c *Chart) JSON() ([]byte, error) {
	opt, err := c.OptionJSON()
	if err != nil {
		return nil, err
	}
	return json.Marshal(struct {
		Kind   string          `json:"kind"`
		Chart  string          `json:"chart"`
		ID     string          `json:"id"`
		Title  string          `json:"title"`
		Sub    string          `json:"subtitle,omitempty"`
		Notes  []string        `json:"notes,omitempty"`
		Table  dataTable       `json:"data"`
		Option json.RawMessage `json:"option"`
	}{"chart", c.kind, c.id, c.title, c.subtitle, c.notes, c.table, opt})
}

// Text returns the chart as plain text: title, notes and the numbers.
func (c *Chart) Text() string {
	var b strings.Builder
	b.WriteString(c.title + "\n")
	if c.subtitle != "" {
		b.WriteString(c.subtitle + "\n")
	}
	for _, n := range c.notes {
		b.WriteString(n + "\n")
	}
	if len(c.table.Rows) > 0 {
		b.WriteString("\n" + c.table.text())
	}
	return b.String()
}

// String is [Chart.Text].
func (c *Chart) String() string { return c.Text() }

// Markdown returns the chart's title, notes and numbers as Markdown, for
// write-ups where the interactive chart cannot go.
func (c *Chart) Markdown() string {
	var b strings.Builder
	b.WriteString("**" + mdEscape(c.title) + "**\n\n")
	if c.subtitle != "" {
		b.WriteString(mdEscape(c.subtitle) + "\n\n")
	}
	for _, n := range c.notes {
		b.WriteString(mdEscape(n) + "\n\n")
	}
	if len(c.table.Rows) > 0 {
		b.WriteString(c.table.markdown())
	}
	return b.String()
}

func (t dataTable) html() string {
	var b strings.Builder
	b.WriteString(`<table style="border-collapse:collapse;margin:0.4em 0;font-variant-numeric:tabular-nums;">`)
	if t.Caption != "" {
		b.WriteString(`<caption style="text-align:left;font-weight:600;">` + html.EscapeString(t.Caption) + `</caption>`)
	}
	b.WriteString(`<thead><tr>`)
	for _, h := range t.Header {
		b.WriteString(`<th scope="col" style="text-align:left;padding:2px 10px 2px 0;border-bottom:1px solid currentColor;">` + html.EscapeString(h) + `</th>`)
	}
	b.WriteString(`</tr></thead><tbody>`)
	for _, r := range t.Rows {
		b.WriteString(`<tr>`)
		for i, v := range r {
			if i == 0 {
				b.WriteString(`<th scope="row" style="text-align:left;font-weight:normal;padding:2px 10px 2px 0;">` + html.EscapeString(v) + `</th>`)
				continue
			}
			b.WriteString(`<td style="padding:2px 10px 2px 0;">` + html.EscapeString(v) + `</td>`)
		}
		b.WriteString(`</tr>`)
	}
	b.WriteString(`</tbody></table>`)
	return b.String()
}

func (t dataTable) text() string {
	widths := make([]int, len(t.Header))
	for i, h := range t.Header {
		widths[i] = len([]rune(h))
	}
	for _, r := range t.Rows {
		for i, v := range r {
			if i < len(widths) && len([]rune(v)) > widths[i] {
				widths[i] = len([]rune(v))
			}
		}
	}
	var b strings.Builder
	if t.Caption != "" {
		b.WriteString(t.Caption + "\n")
	}
	line := func(cells []string) {
		for i, v := range cells {
			if i > 0 {
				b.WriteString("  ")
			}
			b.WriteString(v)
			if i < len(cells)-1 {
				b.WriteString(strings.Repeat(" ", widths[i]-len([]rune(v))))
			}
		}
		b.WriteString("\n")
	}
	line(t.Header)
	for _, r := range t.Rows {
		line(r)
	}
	return b.String()
}

func (t dataTable) markdown() string {
	var b strings.Builder
	if t.Caption != "" {
		b.WriteString(mdEscape(t.Caption) + "\n\n")
	}
	row := func(cells []string) {
		b.WriteString("|")
		for _, v := range cells {
			b.WriteString(" " + mdEscape(v) + " |")
		}
		b.WriteString("\n")
	}
	row(t.Header)
	b.WriteString("|" + strings.Repeat(" --- |", len(t.Header)) + "\n")
	for _, r := range t.Rows {
		row(r)
	}
	return b.String()
}

// Display shows the chart: in a GoNB cell as one output holding its HTML,
// text and JSON (see [Display]); elsewhere it prints [Chart.Text]. Show
// [ChartEngine] once before the first chart of a notebook.
func (c *Chart) Display() error { return Display(c) }
