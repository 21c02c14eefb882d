package notebookui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
)

// ForestRow is one row of a forest chart: a label (a block, a segment, a
// site), an estimate with its interval, and optionally a weight (the row's
// share of a combined estimate, drawn as the size of its square; 0 draws
// the plain marker). A row whose estimate is NaN is listed but not drawn
// (a block without units of one group); Note says why, in the table and
// the tooltip.
type ForestRow struct {
	Label    string  // the row's name on the axis (user text, shown as data)
	Estimate float64 // the row's estimate on the Forest's scale; NaN: not drawn
	Lower    float64 // the interval's lower limit (0 or −Inf is drawn at the axis end)
	Upper    float64 // the interval's upper limit (+Inf is drawn at the axis end)
	Weight   float64 // the row's share of the combined estimate, 0 to 1; 0 for none
	Note     string  // a remark shown in the table and the tooltip
}

// Forest is the data of a forest chart, independent of where the rows come
// from: the stratified analysis fills it from its strata, a per-segment
// analysis from its segments. Scale says how to draw the effect (a
// difference in percentage points around 0; a ratio or odds ratio on a
// logarithmic axis around 1). Summary, when set, is drawn under the rows
// as a diamond spanning its interval.
type Forest struct {
	Title    string // the chart's title
	Subtitle string // the line under the title (groups, level)
	// Effect names what is estimated, for the axis, such as "difference in
	// share germinated, primed − untreated".
	Effect  string
	Scale   proportions.Scale // Difference, Ratio or OddsRatio
	Level   float64           // the intervals' level, for the table's caption; 0 to leave it out
	Rows    []ForestRow       // the rows, top to bottom
	Summary *ForestRow        // the combined estimate, drawn last as a diamond; nil for none
	Notes   []string          // sentences printed under the chart
}

// forestRenderer draws a row as a horizontal interval with a square whose
// size follows the weight, or the summary row as a diamond from its lower
// to its upper limit. value = [estimate, row, lower, upper, size (px),
// lower clipped, upper clipped, summary].
const forestRenderer = `function (params, api) {
  var y = api.coord([api.value(0), api.value(1)])[1];
  var x = api.coord([api.value(0), api.value(1)])[0];
  var lo = api.coord([api.value(2), api.value(1)])[0];
  var hi = api.coord([api.value(3), api.value(1)])[0];
  var color = api.visual('color');
  if (api.value(7) === 1) {
    var h = Math.min(api.size([0, 1])[1] * 0.35, 11);
    return {type: 'polygon', shape: {points: [[lo, y], [x, y - h], [hi, y], [x, y + h]]},
      style: {fill: color, stroke: color, lineWidth: 1}};
  }
  var r = api.value(4);
  var line = {stroke: color, lineWidth: 1.8};
  var end = function (at, clipped, dir) {
    if (clipped) {
      return {type: 'polyline', shape: {points: [[at - dir * 7, y - 5], [at, y], [at - dir * 7, y + 5]]}, style: {stroke: color, lineWidth: 1.8, fill: null}};
    }
    return {type: 'line', shape: {x1: at, y1: y - 5, x2: at, y2: y + 5}, style: line};
  };
  return {type: 'group', children: [
    {type: 'line', shape: {x1: lo, y1: y, x2: hi, y2: y}, style: line},
    end(lo, api.value(5) === 1, -1),
    end(hi, api.value(6) === 1, 1),
    {type: 'rect', shape: {x: x - r, y: y - r, width: 2 * r, height: 2 * r}, style: {fill: color, stroke: '#fff', lineWidth: 1}}
  ]};
}`

// logAxisLabel prints ratios on a logarithmic axis.
const logAxisLabel = `function (v) { return String(Math.round(v * 1000) / 1000); }`

// ForestChart draws a forest chart: one row per stratum or segment with
// its estimate and interval (a square sized by the weight), the summary row
// as a diamond, and the line of no difference (0 for a difference, 1 for a
// ratio or odds ratio). Limits beyond the axis (a ratio of 0 or ∞, a
// difference clipped at ±1) end in an arrow. Rows without an estimate are
// listed with their note and not drawn.
//
// Options read: WithHeight.
func ForestChart(f Forest, options ...ChartOption) (*Chart, error) {
	if len(f.Rows) == 0 && f.Summary == nil {
		return nil, fmt.Errorf("forest chart: %w: no rows to draw", errNoIntervals)
	}
	if f.Scale == proportions.SingleRate {
		return nil, fmt.Errorf("forest chart: scale %v: %w; draw a difference, a ratio or an odds ratio", f.Scale, proportions.ErrUnsupported)
	}
	s := newChartSettings(options)
	rows := append([]ForestRow(nil), f.Rows...)
	if f.Summary != nil {
		rows = append(rows, *f.Summary)
	}
	ax := newForestAxis(f.Scale, rows)
	names := make([]any, len(rows))
	data := make([]any, 0, len(rows))
	table := dataTable{Caption: f.Title, Header: []string{"row", "estimate", "lower", "upper", "weight", "note"}}
	if f.Level > 0 {
		table.Caption = fmt.Sprintf("%s (%s intervals)", f.Title, fmtLevel(f.Level))
	}
	maxWeight := 0.0
	for _, r := range f.Rows {
		maxWeight = math.Max(maxWeight, r.Weight)
	}
	for i, r := range rows {
		summary := f.Summary != nil && i == len(rows)-1
		names[i] = r.Label
		if summary {
			names[i] = map[string]any{"value": r.Label, "textStyle": map[string]any{"fontWeight": "bold"}}
		}
		weight := ""
		if r.Weight > 0 {
			weight = strconv.FormatFloat(100*r.Weight, 'f', 1, 64) + "%"
		}
		table.Rows = append(table.Rows, []string{r.Label, ax.format(r.Estimate), ax.format(r.Lower), ax.format(r.Upper), weight, r.Note})
		if math.IsNaN(r.Estimate) || math.IsNaN(r.Lower) || math.IsNaN(r.Upper) {
			continue
		}
		lo, loClip := ax.clip(r.Lower)
		hi, hiClip := ax.clip(r.Upper)
		est, _ := ax.clip(r.Estimate)
		size := 5.0
		if maxWeight > 0 && r.Weight > 0 {
			size = 3 + 6*math.Sqrt(r.Weight/maxWeight)
		}
		color := ColorBlue
		if summary {
			color = ColorVermillion
		}
		tip := fmt.Sprintf("<b>%s</b><br>%s<br>estimate %s<br>interval %s to %s", esc(r.Label), esc(f.Effect),
			ax.format(r.Estimate), ax.format(r.Lower), ax.format(r.Upper))
		if weight != "" {
			tip += "<br>weight " + weight
		}
		if r.Note != "" {
			tip += "<br><i>" + esc(r.Note) + "</i>"
		}
		data = append(data, map[string]any{"name": r.Label, "tip": tip, "itemStyle": map[string]any{"color": color},
			"value": []float64{est, float64(i), lo, hi, size, boolFlag(loClip || r.Lower < ax.min), boolFlag(hiClip || r.Upper > ax.max), boolFlag(summary)}})
	}
	ch := charts.NewCustom()
	ch.SetGlobalOptions(commonGlobals(f.Title, f.Subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: ax.kind, Min: ax.min, Max: ax.max, Name: axisName(f.Effect, ax.unit), NameLocation: "middle", NameGap: 30}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: names, Inverse: opts.Bool(true)}),
		charts.WithGridOpts(opts.Grid{Left: "16", Right: "40", Top: "80", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", ax.label)
	// The category axis stays at the left edge; by default echarts draws it
	// through the value 0, on top of the no-difference line.
	y := firstAxis(option, "yAxis")
	y["axisLine"] = map[string]any{"onZero": false}
	y["axisTick"] = map[string]any{"show": false}
	if ax.kind == "log" {
		firstAxis(option, "xAxis")["logBase"] = 2
	}
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "item", "formatter": jsFunc(tipFormatter)}
	option["legend"] = map[string]any{"show": false}
	option["series"] = []any{map[string]any{
		"type": "custom", "name": "rows", "data": data,
		"encode":     map[string]any{"x": []int{0, 2, 3}, "y": 1},
		"renderItem": jsFunc(forestRenderer),
		"markLine":   noEffectLine(ax.none),
	}}
	return newChart("forest", f.Title, f.Subtitle, s.heightOr(150+34*len(rows)), option, table, append([]string(nil), f.Notes...))
}

// noEffectLine marks the value of no difference.
func noEffectLine(at float64) map[string]any {
	return map[string]any{
		"silent": true, "symbol": []string{"none", "none"},
		"lineStyle": map[string]any{"color": ColorGrey, "type": "dashed", "width": 1.5},
		"label":     map[string]any{"formatter": "no difference", "position": "start", "color": ColorGrey},
		"data":      []any{map[string]any{"xAxis": at, "name": "no difference"}},
	}
}

// forestAxis is the horizontal axis of a forest chart.
type forestAxis struct {
	kind, unit, label string
	min, max, none    float64
	ratio             bool
}

// newForestAxis chooses the axis: percentage points inside [−1, 1] for a
// difference; for a ratio or odds ratio a base-2 logarithmic axis between
// powers of two around the finite, non-zero limits (0 and ∞ are drawn at
// the axis's ends, as clipped).
func newForestAxis(scale proportions.Scale, rows []ForestRow) forestAxis {
	if scale == proportions.Difference {
		lo, hi := 0.0, 0.0
		for _, r := range rows {
			for _, v := range []float64{r.Lower, r.Upper, r.Estimate} {
				if !math.IsNaN(v) {
					lo, hi = math.Min(lo, v), math.Max(hi, v)
				}
			}
		}
		min, max, _ := niceRange(lo, hi, -1, 1)
		return forestAxis{kind: "value", unit: "percentage points", label: ppAxisLabel, min: min, max: max}
	}
	lo, hi := 1.0, 1.0
	for _, r := range rows {
		for _, v := range []float64{r.Lower, r.Upper, r.Estimate} {
			if v > 0 && !math.IsInf(v, 1) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	min := math.Pow(2, math.Floor(math.Log2(lo)-0.25))
	max := math.Pow(2, math.Ceil(math.Log2(hi)+0.25))
	return forestAxis{kind: "log", unit: "log scale", label: logAxisLabel, min: min, max: max, none: 1, ratio: true}
}

// clip returns v inside the axis and whether it was moved.
func (a forestAxis) clip(v float64) (float64, bool) {
	switch {
	case v < a.min:
		return a.min, true
	case v > a.max:
		return a.max, true
	}
	return v, false
}

// format prints a value of the axis's effect.
func (a forestAxis) format(v float64) string {
	if a.ratio {
		return proportions.FormatValue(v)
	}
	return fmtPP(v)
}
