package notebookui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// errMixedCurves is returned when curves to be drawn together do not share
// their axis.
var errMixedCurves = proportions.ErrUnsupported

// powerBySizeTooltip lists every curve's power at the group size under the
// pointer. Points are [n1, power, n2].
const powerBySizeTooltip = `function (ps) {
  var s = 'n1 = ' + ps[0].value[0] + ', n2 = ' + ps[0].value[2] + ' units';
  ps.forEach(function (p) { s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 1); });
  return s;
}`

// powerByDifferenceTooltip lists every curve's power at the true difference
// under the pointer. Points are [π1 − π2, power, π1].
const powerByDifferenceTooltip = `function (ps) {
  var s = 'true difference ' + pp(ps[0].value[0]) + ' (π1 = ' + pct(ps[0].value[2], 1) + ')';
  ps.forEach(function (p) { s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 1); });
  return s;
}`

// PowerChart draws power curves computed by the planning functions
// (planning.PowerByTrials, PowerByDifference, and the exact-power curves):
// against the group size when their Axis is "n1", against the true
// difference π1 − π2 when it is "rate1". Curves drawn together must share
// the axis; give the asymptotic curve and the exact power of the test you
// will run to see the saw-tooth of exact power beside the smooth
// approximation. The target power is a labelled line; on a size chart each
// curve's smallest n reaching it is marked, and, when the curve dips below
// the target again after that, the n from which every size drawn stays
// at or above it. On a difference chart α marks the power at the null
// (the test's size) and the plan's anticipated difference is drawn.
// Options read: WithHeight.
func PowerChart(curves []planning.PowerCurve, options ...ChartOption) (*Chart, error) {
	if len(curves) == 0 || len(curves[0].Points) == 0 {
		return nil, fmt.Errorf("power chart: %w: no curve points", errNoIntervals)
	}
	axis := curves[0].Axis
	for _, c := range curves {
		if c.Axis != axis || len(c.Points) == 0 {
			return nil, fmt.Errorf("power chart: %w: axes %q and %q (or an empty curve); draw each axis in its own chart",
				errMixedCurves, axis, c.Axis)
		}
	}
	switch axis {
	case "n1":
		return powerBySize(curves, newChartSettings(options))
	case "rate1":
		return powerByDifference(curves, newChartSettings(options))
	}
	return nil, fmt.Errorf("power chart: %w: unknown axis %q (want \"n1\" or \"rate1\")", errMixedCurves, axis)
}

// powerSeries is one curve as a line series; the first curve is solid and
// smooth-looking, later ones get other colours and dash patterns.
func powerSeries(i int, c planning.PowerCurve, data [][]float64) map[string]any {
	return map[string]any{
		"type": "line", "name": c.Basis, "data": data, "showSymbol": len(data) <= 60, "symbol": markerShape(i),
		"symbolSize": 5, "step": false,
		"lineStyle": map[string]any{"color": paletteColor(i), "width": 2, "type": lineStyle(i)},
		"itemStyle": map[string]any{"color": paletteColor(i)},
	}
}

func powerBySize(curves []planning.PowerCurve, s chartSettings) (*Chart, error) {
	d := curves[0].Plan
	target := d.Power
	title := "Power against group size"
	subtitle := d.String()
	var series, legend []any
	table := dataTable{Caption: fmt.Sprintf("Group sizes reaching the target power of %s", fmtPct(target)),
		Header: []string{"method", "sizes drawn", "first n1 reaching target", "from n1 on, every size drawn reaches it", "power there"}}
	for i, c := range curves {
		data := make([][]float64, len(c.Points))
		for k, p := range c.Points {
			data[k] = []float64{float64(p.N1), p.Power, float64(p.N2)}
		}
		line := powerSeries(i, c, data)
		first, stays := reachIndex(c.Points, target)
		var marks []any
		row := []string{c.Basis, fmt.Sprintf("%d to %d", c.Points[0].N1, c.Points[len(c.Points)-1].N1), "not reached", "not reached", ""}
		if first >= 0 {
			p := c.Points[first]
			marks = append(marks, sizeMark(p, "n1 = "+strconv.FormatInt(p.N1, 10), paletteColor(i)))
			row[2], row[4] = fmt.Sprintf("%d (n2 = %d)", p.N1, p.N2), fmtPct(p.Power)
		}
		if stays >= 0 {
			p := c.Points[stays]
			row[3] = fmt.Sprintf("%d (n2 = %d)", p.N1, p.N2)
			if stays != first {
				marks = append(marks, sizeMark(p, "stays above from n1 = "+strconv.FormatInt(p.N1, 10), paletteColor(i)))
			}
		}
		if len(marks) > 0 {
			mp := map[string]any{"symbol": "pin", "symbolSize": 34, "data": marks}
			if i%2 == 1 {
				// Every other curve's pins point up from below the line, so
				// the marks of curves that reach the target at nearby sizes
				// do not cover each other.
				mp["symbolRotate"] = 180
				mp["symbolOffset"] = []int{0, 17}
				for _, m := range marks {
					m.(map[string]any)["label"].(map[string]any)["position"] = "bottom"
				}
			}
			line["markPoint"] = mp
		}
		if i == 0 {
			line["markLine"] = targetLine(target, d.Alpha, false)
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": c.Basis, "icon": markerShape(i)})
		table.Rows = append(table.Rows, row)
	}
	option := powerOverSizes(title, subtitle, axisName("group 1 size n1", "units"), series, legend, powerBySizeTooltip)
	notes := []string{curves[0].Caution}
	if len(curves) > 1 {
		notes = append([]string{"Exact power moves up and down as n grows (the attainable significance levels jump with the discrete outcomes): " +
			"a size that reaches the target may be followed by one that does not."}, notes...)
	}
	return newChart("power-by-size", title, subtitle, s.heightOr(defaultHeight+40), option, table, notes)
}

func powerByDifference(curves []planning.PowerCurve, s chartSettings) (*Chart, error) {
	d := curves[0].Plan
	first := curves[0].Points[0]
	title := "Power against the true difference"
	subtitle := fmt.Sprintf("%s; n1 = %d, n2 = %d", d.String(), first.N1, first.N2)
	var series, legend []any
	table := dataTable{Caption: "Power at selected true differences",
		Header: []string{"method", "π1", "π1 − π2", "power"}}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, c := range curves {
		data := make([][]float64, len(c.Points))
		for k, p := range c.Points {
			data[k] = []float64{p.Difference, p.Power, p.Rate1}
			lo, hi = math.Min(lo, p.Difference), math.Max(hi, p.Difference)
		}
		line := powerSeries(i, c, data)
		if i == 0 {
			ml := targetLine(d.Power, d.Alpha, true)
			ml["data"] = append(ml["data"].([]any), verticalLine(d.Rate1-d.Rate2, "anticipated", ColorGrey, "dashed",
				"anticipated "+fmtPP(d.Rate1-d.Rate2), "end"))
			if d.Goal != planning.Equality && d.Scale == proportions.Difference && d.Margin != 0 {
				ml["data"] = append(ml["data"].([]any), verticalLine(d.Margin, "margin", ColorPurple, "dotted",
					"margin "+fmtPP(d.Margin), "end"))
			}
			line["markLine"] = ml
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": c.Basis, "icon": markerShape(i)})
		step := max(1, len(c.Points)/10)
		for k := 0; k < len(c.Points); k += step {
			p := c.Points[k]
			table.Rows = append(table.Rows, []string{c.Basis, fmtPct(p.Rate1), fmtPP(p.Difference), fmtPct(p.Power)})
		}
	}
	// The marked differences (anticipated, margin) belong on the axis too.
	for _, v := range []float64{d.Rate1 - d.Rate2, d.Margin} {
		if v != 0 {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	axisMin, axisMax := fitRange(lo, hi, -1, 1)
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: axisMin, Max: axisMax, NameLocation: "middle", NameGap: 30,
			Name: axisName("true difference π1 − π2", "percentage points")}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: 0, Max: 1, Name: axisName("power", "%"), NameLocation: "middle", NameGap: 44}),
		charts.WithGridOpts(opts.Grid{Left: "24", Right: "40", Top: "100", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", ppAxisLabel)
	hideEndLabels(option, "xAxis")
	axisFormatter(option, "yAxis", percentAxisLabel)
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(powerByDifferenceTooltip)}
	notes := []string{fmt.Sprintf("At the null value the power equals the test's size, α = %s for a well-behaved test.", fmtP(d.Alpha)), curves[0].Caution}
	return newChart("power-by-difference", title, subtitle, s.heightOr(defaultHeight+40), option, table, notes)
}

// reachIndex returns the first point whose power reaches the target, and
// the first point from which every later point reaches it (−1 if none).
func reachIndex(points []planning.PowerPoint, target float64) (first, stays int) {
	first, stays = -1, -1
	for k, p := range points {
		if p.Power >= target {
			if first < 0 {
				first = k
			}
			if stays < 0 {
				stays = k
			}
		} else {
			stays = -1
		}
	}
	return first, stays
}

func sizeMark(p planning.PowerPoint, label, color string) map[string]any {
	return map[string]any{"coord": []float64{float64(p.N1), p.Power}, "name": label, "value": p.N1,
		"itemStyle": map[string]any{"color": color},
		"label":     map[string]any{"formatter": label, "position": "top", "distance": 2, "color": color, "fontSize": 11}}
}

// targetColor draws reference lines in near-black, so they never share a
// colour with a curve.
const targetColor = "#222222"

// targetLine marks the target power and, on a difference chart, α.
func targetLine(target, alpha float64, withAlpha bool) map[string]any {
	data := []any{map[string]any{"yAxis": target, "name": "target",
		"lineStyle": map[string]any{"color": targetColor, "type": "dashed", "width": 1.5},
		"label":     map[string]any{"formatter": "target " + fmtPct(target), "position": "insideEndTop", "color": targetColor}}}
	if withAlpha {
		data = append(data, map[string]any{"yAxis": alpha, "name": "α",
			"lineStyle": map[string]any{"color": ColorGrey, "type": "dotted", "width": 1.5},
			"label":     map[string]any{"formatter": "α = " + fmtP(alpha), "position": "insideEndTop", "color": ColorGrey}})
	}
	return map[string]any{"silent": true, "symbol": []string{"none", "none"}, "data": data}
}

// powerOverSizes is the option of a chart of power curves over a whole
// number on the x axis (units or clusters per group): power from 0 to 100%
// on the y axis, one series per curve with its legend entry, and the given
// tooltip callback (a constant of this package, never user text).
func powerOverSizes(title, subtitle, xName string, series, legend []any, tooltip string) map[string]any {
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Name: xName, NameLocation: "middle", NameGap: 30,
			Scale: opts.Bool(true), MinInterval: 1}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: 0, Max: 1, Name: axisName("power", "%"), NameLocation: "middle", NameGap: 44}),
		charts.WithGridOpts(opts.Grid{Left: "24", Right: "40", Top: "100", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "yAxis", percentAxisLabel)
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(tooltip)}
	return option
}
