package notebookui

import (
	"encoding/json"
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
)

// coverageSliceTooltip lists every method's coverage at the π1 under the
// pointer. Points are [π1, coverage, π2].
const coverageSliceTooltip = `function (ps) {
  var s = 'π1 = ' + pct(ps[0].value[0], 0) + ', π2 = ' + pct(ps[0].value[2], 0);
  ps.forEach(function (p) { if (p.value[1] !== null) { s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 2); } });
  return s;
}`

// sliceSubtitle describes the slice: the design and what is held.
func sliceSubtitle(s sliceSettings) string {
	held := "π2 held at " + trimPct(s.pi2)
	if s.holdDiff {
		held = "difference π1 − π2 held at " + signedPP(s.difference)
	}
	return fmt.Sprintf("n1 = %d, n2 = %d, %s level; %s", s.n1, s.n2, trimPct(s.level), held)
}

// coverageSliceChart draws the exact coverage of each method along the
// slice against π1, with the nominal level as a labelled line and the
// chosen π1 marked.
func coverageSliceChart(sl []CoverageSlice, s sliceSettings) (*Chart, error) {
	if len(sl) == 0 {
		return nil, fmt.Errorf("coverage slice chart: %w: no method", errNoIntervals)
	}
	title := "Exact coverage along the slice"
	subtitle := sliceSubtitle(s)
	lowest := s.level
	var series, legend []any
	table := dataTable{Caption: "Exact coverage at every tenth point of the slice",
		Header: []string{"method", "π1", "π2", "coverage", "interval entirely below the truth", "entirely above"}}
	for i, c := range sl {
		data := make([][]any, len(c.Points))
		for k, p := range c.Points {
			var cov any // null where the truth is not defined: a gap in the line
			if p.Defined {
				cov = p.Coverage
				lowest = math.Min(lowest, p.Coverage)
			}
			data[k] = []any{p.Pi1, cov, p.Pi2}
			if k%10 == 0 && p.Defined {
				table.Rows = append(table.Rows, []string{c.Name, trimPct(p.Pi1), trimPct(p.Pi2), fmtPct(p.Coverage), fmtPct(p.Below), fmtPct(p.Above)})
			}
		}
		line := map[string]any{
			"type": "line", "name": c.Name, "data": data, "showSymbol": false, "symbol": markerShape(i), "connectNulls": false,
			"lineStyle": map[string]any{"color": paletteColor(i), "width": 1.8, "type": lineStyle(i)},
			"itemStyle": map[string]any{"color": paletteColor(i)},
		}
		if c.AtValid {
			line["markPoint"] = map[string]any{"symbol": "circle", "symbolSize": 9, "data": []any{map[string]any{
				"coord": []float64{c.At.Pi1, c.At.Coverage}, "name": c.Name, "value": fmtPct(c.At.Coverage),
				"itemStyle": map[string]any{"color": paletteColor(i), "borderColor": "#fff", "borderWidth": 1},
				"label":     map[string]any{"show": len(sl) == 1, "formatter": fmtPct(c.At.Coverage), "position": "top", "color": paletteColor(i)}}}}
		}
		if i == 0 {
			line["markLine"] = sliceMarks(s)
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": c.Name, "icon": markerShape(i)})
	}
	yMin := math.Max(0, math.Floor((lowest-0.02)*50)/50)
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: 0, Max: 1, Name: axisName("true rate π1", "%"), NameLocation: "middle", NameGap: 30,
			AxisLabel: &opts.AxisLabel{Formatter: opts.FuncOpts(percentAxisLabel)}}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: yMin, Max: 1, Name: axisName("exact coverage", "%"), NameLocation: "middle", NameGap: 48,
			AxisLabel: &opts.AxisLabel{Formatter: opts.FuncOpts(percentAxisLabel)}}),
		charts.WithGridOpts(opts.Grid{Left: "24", Right: "40", Top: "100", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "trigger": "axis", "formatter": jsFunc(coverageSliceTooltip)}
	notes := []string{fmt.Sprintf("Coverage is the chance that the interval contains the true value when the true rates are (π1, π2); "+
		"it is computed exactly over every outcome of the design, not simulated. A good method stays close to the nominal %s "+
		"without dipping far below it; its wiggles come from the discreteness of the counts.", trimPct(s.level))}
	return newChart("coverage-slice", title, subtitle, 400, option, table, notes)
}

// sliceMarks draws the nominal level and the chosen π1.
func sliceMarks(s sliceSettings) map[string]any {
	return map[string]any{"silent": true, "symbol": []string{"none", "none"}, "data": []any{
		map[string]any{"yAxis": s.level, "name": "nominal",
			"lineStyle": map[string]any{"color": ColorGrey, "type": "dashed", "width": 1.5},
			"label":     map[string]any{"formatter": "nominal " + trimPct(s.level), "position": "insideEndTop", "color": ColorGrey}},
		map[string]any{"xAxis": s.pi1, "name": "your π1",
			"lineStyle": map[string]any{"color": ColorVermillion, "type": "dotted", "width": 1.5},
			"label":     map[string]any{"formatter": "π1 = " + trimPct(s.pi1), "position": "end", "color": ColorVermillion}},
	}}
}

// coverageSummary is the table under the chart: per method the coverage
// at the chosen point, the lowest and mean coverage along the slice and
// the expected widths.
type coverageSummary struct {
	slices []CoverageSlice
	s      sliceSettings
}

func (c coverageSummary) Kind() string { return "coverage-summary" }

func (c coverageSummary) header() []string {
	at := fmt.Sprintf("at π1 = %s, π2 = %s", trimPct(c.s.pi1), trimPct(c.s.pi2))
	return []string{"method", "coverage " + at, "lowest along the slice", "mean along the slice", "expected width " + at, "mean expected width"}
}

// cells are one method's figures as shown.
func (c coverageSummary) cells(sl CoverageSlice) []string {
	width := func(w float64) string {
		if sl.Family == proportions.Difference {
			return strings.TrimPrefix(fmtPP(w), "+")
		}
		return strconv.FormatFloat(w, 'f', 3, 64) + " (log scale)"
	}
	at, atWidth := "not on the slice", "—"
	if sl.AtValid {
		at, atWidth = fmtPct(sl.At.Coverage), width(sl.At.Width)
	} else if c.s.pi2 < 0 || c.s.pi2 > 1 {
		at = fmt.Sprintf("π2 would be %s: not a rate", trimPct(c.s.pi2))
	}
	return []string{sl.Name, at, fmt.Sprintf("%s at π1 = %s", fmtPct(sl.Min), trimPct(sl.MinPi1)), fmtPct(sl.Mean), atWidth, width(sl.MeanWidth)}
}

func (c coverageSummary) HTML() string {
	var b strings.Builder
	b.WriteString(`<div class="propscope-coverage-summary" style="overflow-x:auto;max-width:100%;">`)
	b.WriteString(`<table style="border-collapse:collapse;font-size:.9em;margin:.3rem 0;font-variant-numeric:tabular-nums;">`)
	b.WriteString(`<caption style="text-align:left;font-weight:600;padding:.2rem 0;">Exact coverage and width: ` + html.EscapeString(sliceSubtitle(c.s)) + `</caption><thead><tr>`)
	for _, h := range c.header() {
		b.WriteString(`<th scope="col" style="text-align:left;padding:3px 12px 3px 0;border-bottom:1px solid currentColor;">` + html.EscapeString(h) + `</th>`)
	}
	b.WriteString(`</tr></thead><tbody>`)
	for _, sl := range c.slices {
		fmt.Fprintf(&b, `<tr data-method="%s" data-coverage="%s" data-min="%s" data-mean="%s" data-mean-width="%s">`,
			html.EscapeString(sl.Key), rawNum(sl.At.Coverage, sl.AtValid), rawNum(sl.Min, true), rawNum(sl.Mean, true), rawNum(sl.MeanWidth, true))
		for i, v := range c.cells(sl) {
			tag := "td"
			if i == 0 {
				tag = `th scope="row"`
			}
			fmt.Fprintf(&b, `<%s style="text-align:left;font-weight:normal;padding:3px 12px 3px 0;">%s</%s>`, tag, html.EscapeString(v), strings.Fields(tag)[0])
		}
		b.WriteString(`</tr>`)
	}
	b.WriteString(`</tbody></table></div>`)
	return b.String()
}

// rawNum prints a number for a data attribute (full precision), or "" when
// it does not apply.
func rawNum(v float64, ok bool) string {
	if !ok || math.IsNaN(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

func (c coverageSummary) table() dataTable {
	t := dataTable{Caption: "Exact coverage and width: " + sliceSubtitle(c.s), Header: c.header()}
	for _, sl := range c.slices {
		t.Rows = append(t.Rows, c.cells(sl))
	}
	return t
}

func (c coverageSummary) Markdown() string { return c.table().markdown() }
func (c coverageSummary) Text() string     { return c.table().text() }

func (c coverageSummary) JSON() ([]byte, error) {
	type row struct {
		Method    string                `json:"method"`
		Name      string                `json:"name"`
		Coverage  proportions.JSONFloat `json:"coverage_at_point"`
		OnSlice   bool                  `json:"point_on_slice"`
		Min       float64               `json:"min"`
		MinPi1    float64               `json:"min_pi1"`
		Mean      float64               `json:"mean"`
		Width     proportions.JSONFloat `json:"width_at_point"`
		MeanWidth proportions.JSONFloat `json:"mean_width"`
	}
	rows := make([]row, len(c.slices))
	for i, sl := range c.slices {
		cov, w := math.NaN(), math.NaN()
		if sl.AtValid {
			cov, w = sl.At.Coverage, sl.At.Width
		}
		rows[i] = row{sl.Key, sl.Name, proportions.JSONFloat(cov), sl.AtValid, sl.Min, sl.MinPi1, sl.Mean, proportions.JSONFloat(w), proportions.JSONFloat(sl.MeanWidth)}
	}
	return json.Marshal(map[string]any{"kind": "coverage-summary", "slice": sliceSubtitle(c.s), "pi1": c.s.pi1, "pi2": c.s.pi2, "methods": rows})
}
