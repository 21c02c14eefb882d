package notebookui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
)

// errNoIntervals is returned when the data hold nothing to draw.
var errNoIntervals = proportions.ErrEmptyInput

// whiskerRenderer draws one interval as a horizontal line with end caps and
// a marker at the estimate. Data item value: [estimate, category index,
// lower, upper, emphasis, lower clipped, upper clipped] (the last three 0
// or 1). An emphasised item is drawn thicker and labelled with the item's
// mark word (the last verb: "recommended" or "headline"); a clipped limit (the method's raw limit fell outside the
// parameter space) ends in an open arrow instead of a cap. The %d verbs are
// the series' slot, the number of slots side by side in a category band,
// and the marker shape code.
const whiskerRenderer = `function (params, api) {
  var slot = %d, slots = %d, shape = %d, mark = %q;
  var strong = api.value(4) === 1;
  var mid = api.coord([api.value(0), api.value(1)]);
  var band = api.size([0, 1])[1];
  var step = Math.min(band * 0.75 / slots, 24);
  var y = mid[1] + (slot - (slots - 1) / 2) * step;
  var lo = api.coord([api.value(2), api.value(1)])[0];
  var hi = api.coord([api.value(3), api.value(1)])[0];
  var color = api.visual('color');
  var line = {stroke: color, lineWidth: strong ? 3.5 : 2};
  var r = strong ? 7 : 5.5;
  var x = mid[0];
  var face = {fill: color, stroke: '#fff', lineWidth: 1};
  var marker;
  if (shape === 1) {
    marker = {type: 'rect', shape: {x: x - r * 0.85, y: y - r * 0.85, width: r * 1.7, height: r * 1.7}, style: face};
  } else if (shape === 2) {
    marker = {type: 'polygon', shape: {points: [[x, y - r * 1.2], [x + r * 1.2, y], [x, y + r * 1.2], [x - r * 1.2, y]]}, style: face};
  } else if (shape === 3) {
    marker = {type: 'polygon', shape: {points: [[x, y - r * 1.2], [x + r * 1.1, y + r * 0.9], [x - r * 1.1, y + r * 0.9]]}, style: face};
  } else {
    marker = {type: 'circle', shape: {cx: x, cy: y, r: r}, style: face};
  }
  var end = function (at, clipped, dir) {
    if (clipped) {
      return {type: 'polyline', shape: {points: [[at - dir * 7, y - 5], [at, y], [at - dir * 7, y + 5]]}, style: {stroke: color, lineWidth: 2, fill: null}};
    }
    return {type: 'line', shape: {x1: at, y1: y - 6, x2: at, y2: y + 6}, style: line};
  };
  var children = [
    {type: 'line', shape: {x1: lo, y1: y, x2: hi, y2: y}, style: line},
    end(lo, api.value(5) === 1, -1),
    end(hi, api.value(6) === 1, 1),
    marker
  ];
  if (strong) {
    children.push({type: 'text', x: hi + 10, y: y, style: {text: mark, fill: color, font: 'bold 12px sans-serif', verticalAlign: 'middle'}});
  }
  return {type: 'group', children: children};
}`

// tipFormatter shows the tooltip text prepared (and escaped) in Go.
const tipFormatter = `function (p) { return (p.data && p.data.tip) || ''; }`

// percentAxisLabel prints axis values in [0, 1] as percentages.
const percentAxisLabel = `function (v) { return axisPct(v); }`

// ppAxisLabel prints differences as signed percentage points.
const ppAxisLabel = `function (v) { return axisPP(v); }`

// whiskerShapes maps marker shape names to the renderer's shape codes.
var whiskerShapes = [...]string{"circle", "rect", "diamond", "triangle", "pin"}

// whiskerIcon returns the legend icon matching whisker shape code i.
func whiskerIcon(i int) string { return whiskerShapes[i%len(whiskerShapes)] }

// RatesChart draws each group's proportion with its interval from every
// single-proportion method of the analysis (Wilson first), side by side, so
// the reader sees both rates, their uncertainty and how far the methods
// agree. Rates are shown as percentages.
//
// Options read: WithHeight.
func RatesChart(a proportions.Analysis, options ...ChartOption) (*Chart, error) {
	s := newChartSettings(options)
	if len(a.Groups[0].Intervals) == 0 || len(a.Groups[1].Intervals) == 0 {
		return nil, fmt.Errorf("rates chart: %w: the analysis has no single-group intervals", errNoIntervals)
	}
	labels := []string{a.Groups[0].Group.Label, a.Groups[1].Group.Label}
	event := a.Comparison.Event
	level := a.Groups[0].Intervals[0].Level
	title := fmt.Sprintf("Share %s, by group", event)
	subtitle := fmt.Sprintf("estimate with %s intervals from each method", fmtLevel(level))

	lo, hi := 1.0, 0.0
	for _, g := range a.Groups {
		for _, iv := range g.Intervals {
			lo, hi = math.Min(lo, iv.Lower), math.Max(hi, iv.Upper)
		}
	}
	axisMin, axisMax, step := niceRange(lo, hi, 0, 1)
	ch := charts.NewCustom()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{
			Type: "value", Min: axisMin, Max: axisMax, MinInterval: step, MaxInterval: step,
			Name: axisName("share "+event, "%"), NameLocation: "middle", NameGap: 30,
		}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: labels, Inverse: opts.Bool(true)}),
		charts.WithGridOpts(opts.Grid{Left: "16", Right: "32", Top: "92", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", percentAxisLabel)

	methods := methodOrder(a.Groups)
	table := dataTable{
		Caption: fmt.Sprintf("%s intervals for each group's rate of %s", fmtLevel(level), event),
		Header:  []string{"group", "method", "events", "trials", "estimate", "lower", "upper"},
	}
	var series, legend []any
	for k, key := range methods {
		var name string
		var data []any
		for gi, g := range a.Groups {
			iv, ok := findInterval(g.Intervals, key)
			if !ok {
				continue
			}
			name = iv.MethodName
			tip := fmt.Sprintf("<b>%s</b>: %d of %d %s = %s<br>%s, %s interval: %s to %s",
				esc(g.Group.Label), g.Group.Events, g.Group.Trials, esc(event), fmtPct(g.Rate),
				esc(iv.MethodName), fmtLevel(iv.Level), fmtPct(iv.Lower), fmtPct(iv.Upper))
			data = append(data, map[string]any{"name": g.Group.Label, "value": whiskerValue(g.Rate, gi, iv, false), "tip": tip})
			table.Rows = append(table.Rows, []string{g.Group.Label, iv.MethodName, strconv.FormatInt(g.Group.Events, 10),
				strconv.FormatInt(g.Group.Trials, 10), fmtPct(g.Rate), fmtPct(iv.Lower), fmtPct(iv.Upper)})
		}
		shape := k % len(whiskerShapes)
		series = append(series, map[string]any{
			"type": "custom", "name": name, "data": data, "itemStyle": map[string]any{"color": paletteColor(k)},
			"encode":     map[string]any{"x": []int{0, 2, 3}, "y": 1},
			"renderItem": jsFunc(fmt.Sprintf(whiskerRenderer, k, len(methods), shape, "")),
		})
		legend = append(legend, map[string]any{"name": name, "icon": whiskerIcon(shape)})
	}
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "item", "formatter": jsFunc(tipFormatter)}
	notes := []string{fmt.Sprintf("%s: %d of %d %s (%s); %s: %d of %d %s (%s).",
		labels[0], a.Groups[0].Group.Events, a.Groups[0].Group.Trials, event, fmtPct(a.Groups[0].Rate),
		labels[1], a.Groups[1].Group.Events, a.Groups[1].Group.Trials, event, fmtPct(a.Groups[1].Rate))}
	return newChart("rates", title, subtitle, s.heightOr(190+60*len(methods)), option, table, notes)
}

// methodOrder lists the single-proportion method keys present in either
// group, in the order the analysis gives them.
func methodOrder(groups [2]proportions.GroupEstimate) []string {
	var keys []string
	seen := map[string]bool{}
	for _, g := range groups {
		for _, iv := range g.Intervals {
			if !seen[iv.Method] {
				seen[iv.Method] = true
				keys = append(keys, iv.Method)
			}
		}
	}
	return keys
}

func findInterval(ivs []proportions.Interval, key string) (proportions.Interval, bool) {
	for _, iv := range ivs {
		if iv.Method == key {
			return iv, true
		}
	}
	return proportions.Interval{}, false
}

// whiskerValue is the data value the whisker renderer reads.
func whiskerValue(estimate float64, category int, iv proportions.Interval, strong bool) []float64 {
	return []float64{estimate, float64(category), iv.Lower, iv.Upper, boolFlag(strong),
		boolFlag(iv.RawLower < iv.Lower), boolFlag(iv.RawUpper > iv.Upper)}
}

func boolFlag(b bool) float64 {
	if b {
		return 1
	}
	return 0
}

// legendAt places a legend under the title.
func legendAt(data []any) map[string]any {
	return map[string]any{"data": data, "top": 52, "left": 12, "itemWidth": 14, "itemHeight": 14, "itemGap": 16}
}
