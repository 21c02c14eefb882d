package notebookui

import (
	"encoding/json"
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// sliceSubtitle describes the slice: the design and what is held.
func sliceSubtitle(s sliceSettings) string {
	held := "π2 held at " + trimPct(s.pi2)
	if s.holdDiff {
		held = "difference π1 − π2 held at " + signedPP(s.difference)
	}
	return fmt.Sprintf("n1 = %d, n2 = %d, %s level; %s", s.n1, s.n2, trimPct(s.level), held)
}

// coverageSliceChart draws the slices with CoverageSliceChart and marks the
// reader's point: a vertical line at its position along the slice and a
// dot on each method's curve.
func coverageSliceChart(sl []CoverageSlice, s sliceSettings) (*Chart, error) {
	if len(sl) == 0 {
		return nil, fmt.Errorf("coverage slice chart: %w: no method", errNoIntervals)
	}
	slices := make([]*operating.Slice, len(sl))
	for i, c := range sl {
		slices[i] = c.Slice
	}
	ch, err := CoverageSliceChart(slices, WithHeight(440))
	if err != nil {
		return nil, err
	}
	series, _ := ch.option["series"].([]any)
	x, name := s.pi1, "π1 = "+trimPct(s.pi1)
	if s.holdDiff { // the chart runs along π2 when the difference is held
		x, name = s.pi2, "π2 = "+trimPct(s.pi2)
	}
	for i, c := range sl {
		line, ok := series[i].(map[string]any)
		if !ok {
			continue
		}
		if i == 0 && x >= 0 && x <= 1 {
			ml, _ := line["markLine"].(map[string]any)
			if ml != nil {
				data, _ := ml["data"].([]any)
				ml["data"] = append(data, map[string]any{"xAxis": x, "name": "your point",
					"lineStyle": map[string]any{"color": ColorVermillion, "type": "dotted", "width": 1.5},
					"label":     map[string]any{"formatter": "your point: " + name, "position": "end", "color": ColorVermillion}})
			}
		}
		if c.AtValid {
			line["markPoint"] = map[string]any{"symbol": "circle", "symbolSize": 10, "data": []any{map[string]any{
				"coord": []float64{x, c.At.Coverage}, "name": c.MethodName, "value": fmtPct(c.At.Coverage),
				"itemStyle": map[string]any{"color": paletteColor(i), "borderColor": "#ffffff", "borderWidth": 1.5},
				"label":     map[string]any{"show": len(sl) == 1, "formatter": fmtPct(c.At.Coverage), "position": "top", "color": paletteColor(i)}}}}
		}
	}
	// The marks changed the content: seal it again (option JSON and ID).
	if err := ch.seal(); err != nil {
		return nil, err
	}
	return ch, nil
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
	width := func(w float64) string { return strings.TrimPrefix(fmtPP(w), "+") }
	at, atWidth := "not on the slice", "—"
	if sl.AtValid {
		at, atWidth = fmtPct(sl.At.Coverage), width(sl.At.Width)
	} else if c.s.pi2 < 0 || c.s.pi2 > 1 {
		at = fmt.Sprintf("π2 would be %s: not a rate", trimPct(c.s.pi2))
	}
	return []string{sl.MethodName, at, fmt.Sprintf("%s at π1 = %s, π2 = %s", fmtPct(sl.Min), trimPct(sl.MinPi1), trimPct(sl.MinPi2)), fmtPct(sl.Mean), atWidth, width(sl.MeanWidth)}
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
			html.EscapeString(sl.Method), rawNum(sl.At.Coverage, sl.AtValid), rawNum(sl.Min, true), rawNum(sl.Mean, true), rawNum(sl.MeanWidth, true))
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
		MinPi2    float64               `json:"min_pi2"`
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
		rows[i] = row{sl.Method, sl.MethodName, proportions.JSONFloat(cov), sl.AtValid, sl.Min, sl.MinPi1, sl.MinPi2, sl.Mean, proportions.JSONFloat(w), proportions.JSONFloat(sl.MeanWidth)}
	}
	return json.Marshal(map[string]any{"kind": "coverage-summary", "slice": sliceSubtitle(c.s), "pi1": c.s.pi1, "pi2": c.s.pi2, "methods": rows})
}
