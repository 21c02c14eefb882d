package notebookui

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"

	"github.com/propscope/propscope/proportions"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions/operating"
)

// coverageBands are the colour classes of the coverage map, as distances
// from the nominal level (in probability), with ColorBrewer's PuOr diverging
// scheme (Brewer, colorbrewer2.org; marked colour-blind safe there):
// oranges for coverage short of nominal, light grey for within a point of
// it, purples for conservative.
var coverageBands = []struct {
	from, to float64 // distance from nominal; ±Inf for open ends
	color    string
	label    string
}{
	{math.Inf(-1), -0.05, "#B35806", "more than 5 points short"},
	{-0.05, -0.02, "#E08214", "2 to 5 points short"},
	{-0.02, -0.01, "#FDB863", "1 to 2 points short"},
	{-0.01, 0.01, "#E8E8E8", "within 1 point of nominal"},
	{0.01, 0.02, "#B2ABD2", "1 to 2 points over"},
	{0.02, math.Inf(1), "#5E3C99", "more than 2 points over"},
}

// coveragePieces returns the visual map pieces for a nominal level. Piece
// bounds are rounded to 1e−9 so that echarts compares clean numbers.
func coveragePieces(nominal float64) []any {
	pieces := make([]any, 0, len(coverageBands))
	for _, b := range coverageBands {
		p := map[string]any{"color": b.color, "label": b.label}
		if !math.IsInf(b.from, 0) {
			p["gte"] = round9(nominal + b.from)
		}
		if !math.IsInf(b.to, 0) {
			p["lt"] = round9(nominal + b.to)
		}
		pieces = append(pieces, p)
	}
	return pieces
}

func round9(v float64) float64 { return math.Round(v*1e9) / 1e9 }

// round7 keeps seven decimals of a probability drawn on a chart (a
// hundred-thousandth of a percentage point, far below what the chart or its
// tooltip shows): a coverage map holds ten thousand cells, and full
// precision would double the size of the notebook.
func round7(v float64) float64 { return math.Round(v*1e7) / 1e7 }

// coverageMapTooltip shows the rates, the coverage and how the misses
// split. Data items are [i, j, coverage, below, above, π1, π2].
const coverageMapTooltip = `function (p) {
  var v = p.value;
  return 'π1 = ' + pct(v[5], 0) + ', π2 = ' + pct(v[6], 0) + '<br>coverage ' + pct(v[2], 2) +
    '<br>interval entirely below the truth ' + pct(v[3], 2) + '<br>entirely above ' + pct(v[4], 2);
}`

// CoverageMapChart draws the exact coverage of one interval method over a
// grid of true rates (π1 across, π2 up) as a heat map, with colour classes
// centred on the nominal level (oranges short of it, purples over it) and
// the lowest coverage marked. Each cell's tooltip gives its coverage and
// how the misses split between the two sides. The surface is computed by
// package operating; this function only draws it. Options read: WithHeight.
func CoverageMapChart(s *operating.Surface, options ...ChartOption) (*Chart, error) {
	if s == nil || len(s.Pi1) == 0 || len(s.Pi2) == 0 || len(s.Coverage) != len(s.Pi1)*len(s.Pi2) {
		return nil, fmt.Errorf("coverage map: %w: the surface has no grid", errNoIntervals)
	}
	set := newChartSettings(options)
	nominal := s.Design.Level
	sum := s.Summary()
	title := fmt.Sprintf("Exact coverage of %s %s", s.MethodName, gridWords(s.Pi1, s.Pi2))
	subtitle := fmt.Sprintf("%d and %d units per group, nominal %s; each cell is one pair (π1, π2)", s.Design.N1, s.Design.N2, fmtLevel(nominal))

	xs := make([]string, len(s.Pi1))
	for i, v := range s.Pi1 {
		xs[i] = gridValue(v)
	}
	ys := make([]string, len(s.Pi2))
	for j, v := range s.Pi2 {
		ys[j] = gridValue(v)
	}
	data := make([][]float64, 0, len(s.Coverage))
	minI, minJ := -1, -1
	for i := range s.Pi1 {
		for j := range s.Pi2 {
			k := i*len(s.Pi2) + j
			if !s.Defined[k] || math.IsNaN(s.Coverage[k]) {
				continue
			}
			data = append(data, []float64{float64(i), float64(j), round7(s.Coverage[k]), round7(s.Below[k]), round7(s.Above[k]), s.Pi1[i], s.Pi2[j]})
			if minI < 0 || s.Coverage[k] < s.Coverage[minI*len(s.Pi2)+minJ] {
				minI, minJ = i, j
			}
		}
	}
	ch := charts.NewHeatMap()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "category", Data: xs, Name: axisName("true rate π1 in group 1", "%"),
			NameLocation: "middle", NameGap: 28}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: ys, Name: axisName("true rate π2 in group 2", "%"),
			NameLocation: "middle", NameGap: 36}),
		charts.WithGridOpts(opts.Grid{Left: "24", Right: "200", Top: "84", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	// Label the grid values that are round multiples of a step chosen for
	// about eight labels per axis.
	axisLabels(option, "xAxis", gridLabelStep(s.Pi1))
	axisLabels(option, "yAxis", gridLabelStep(s.Pi2))
	series := map[string]any{
		"type": "heatmap", "name": "coverage", "data": data, "progressive": 0,
		"emphasis": map[string]any{"itemStyle": map[string]any{"borderColor": "#000", "borderWidth": 1}},
	}
	if minI >= 0 {
		series["markPoint"] = map[string]any{
			"symbol": "pin", "symbolSize": 40, "itemStyle": map[string]any{"color": "#000000"},
			"data": []any{map[string]any{"coord": []int{minI, minJ}, "name": "lowest", "value": sum.Min,
				"label": map[string]any{"formatter": "lowest " + fmtPct(sum.Min), "position": "right", "color": "#000000",
					"backgroundColor": "#ffffff", "padding": 2, "fontSize": 11}}},
		}
	}
	option["series"] = []any{series}
	option["visualMap"] = []any{map[string]any{
		"type": "piecewise", "dimension": 2, "pieces": coveragePieces(nominal), "orient": "vertical",
		"right": 8, "top": "middle", "itemWidth": 16, "itemHeight": 12, "showLabel": true,
		"outOfRange": map[string]any{"color": "#999999"},
	}}
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "item", "formatter": jsFunc(coverageMapTooltip)}
	option["legend"] = map[string]any{"show": false}
	table := dataTable{Caption: "Summary of the map", Header: []string{"quantity", "value"}, Rows: [][]string{
		{"method", s.MethodName},
		{"design", fmt.Sprintf("n1 = %d, n2 = %d, nominal %s", s.Design.N1, s.Design.N2, fmtLevel(nominal))},
		{"grid", fmt.Sprintf("%d × %d points, %d with a defined truth", len(s.Pi1), len(s.Pi2), sum.Points)},
		{"lowest coverage", fmt.Sprintf("%s at π1 = %s, π2 = %s", fmtPct(sum.Min), fmtPct(sum.MinPi1), fmtPct(sum.MinPi2))},
		{"mean coverage", fmtPct(sum.Mean)},
		{"share of points more than 1 point short", fmtPct(sum.ShareBelow)},
	}}
	notes := []string{fmt.Sprintf("Coverage is the chance that the %s interval contains the true difference, computed exactly "+
		"over every possible outcome of a study with these group sizes; it depends on the design, not on your data.", s.MethodName)}
	return newChart("coverage-map", title, subtitle, set.heightOr(560), option, table, notes)
}

// gridLabelStep is a round step, in percent, for about eight labels over
// the span of a grid of rates.
func gridLabelStep(grid []float64) float64 {
	return niceStep(100 * (grid[len(grid)-1] - grid[0]) / 8)
}

// roundLabels shows a category label (a rate in percent) only when it is a
// multiple of the step; %v is the step.
const roundLabels = `function (index, value) {
  var x = parseFloat(value) / %v;
  return Math.abs(x - Math.round(x)) < 1e-6;
}`

// axisLabels shows only the round grid values on the first axis of the
// given kind in a go-echarts option map.
func axisLabels(option map[string]any, axis string, step float64) {
	label := map[string]any{"interval": jsFunc(fmt.Sprintf(roundLabels, step))}
	switch v := option[axis].(type) {
	case []opts.XAxis:
		m := map[string]any{}
		b, _ := json.Marshal(v[0])
		_ = json.Unmarshal(b, &m)
		m["axisLabel"] = label
		option[axis] = []any{m}
	case []opts.YAxis:
		m := map[string]any{}
		b, _ := json.Marshal(v[0])
		_ = json.Unmarshal(b, &m)
		m["axisLabel"] = label
		option[axis] = []any{m}
	}
}

// coverageSliceTooltip lists each method's coverage at the rates under the
// pointer. Points are [x, coverage, π1, π2, below, above].
const coverageSliceTooltip = `function (ps) {
  var v = ps[0].value;
  var s = 'π1 = ' + pct(v[2], 1) + ', π2 = ' + pct(v[3], 1) + ' (difference ' + pp(v[2] - v[3], 1) + ')';
  ps.forEach(function (p) {
    s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 2) +
      ' <span style="opacity:0.7">(misses ' + pct(p.value[4], 1) + ' below, ' + pct(p.value[5], 1) + ' above)</span>';
  });
  return s;
}`

// CoverageSliceChart draws the exact coverage of several interval methods
// along one slice of true rates (computed by package operating, for example with
// Table.AlongFirst or Table.AlongEffect), one line per method, with the
// nominal level as a line inside a band of ±1 percentage point. The slices
// must share their design and their line of rates. A slice along the first
// rate runs across π1; a slice at a fixed effect runs across π2.
// Options read: WithHeight, WithZoom (to open on part of the rates).
func CoverageSliceChart(slices []*operating.Slice, options ...ChartOption) (*Chart, error) {
	if len(slices) == 0 || slices[0] == nil || len(slices[0].Points) == 0 {
		return nil, fmt.Errorf("coverage slice: %w: no coverage points", errNoIntervals)
	}
	set := newChartSettings(options)
	along, fixed, err := sliceAxis(slices)
	if err != nil {
		return nil, err
	}
	d := slices[0].Design
	nominal := d.Level
	title := "Exact coverage along a slice of true rates"
	subtitle := fmt.Sprintf("%d and %d units per group, nominal %s; %s", d.N1, d.N2, fmtLevel(nominal), fixed)
	var series, legend []any
	table := dataTable{Caption: "Coverage along the slice", Header: []string{"method", "lowest", "where", "mean", "points more than 1 point short"}}
	low := nominal - 0.05
	for i, c := range slices {
		data := make([][]float64, 0, len(c.Points))
		minK, sum, n, short := -1, 0.0, 0, 0
		for k, p := range c.Points {
			if !p.Defined || math.IsNaN(p.Coverage) {
				continue
			}
			x := p.Pi1
			if along == "pi2" {
				x = p.Pi2
			}
			data = append(data, []float64{x, round7(p.Coverage), p.Pi1, p.Pi2, round7(p.Below), round7(p.Above)})
			if minK < 0 || p.Coverage < c.Points[minK].Coverage {
				minK = k
			}
			sum, n = sum+p.Coverage, n+1
			if p.Coverage < nominal-operating.ShortfallMargin {
				short++
			}
			low = math.Min(low, p.Coverage)
		}
		line := map[string]any{
			"type": "line", "name": c.MethodName, "data": data, "showSymbol": false,
			"lineStyle": map[string]any{"color": paletteColor(i), "width": 2, "type": lineStyle(i)},
			"itemStyle": map[string]any{"color": paletteColor(i)},
		}
		if i == 0 {
			line["markArea"] = map[string]any{"silent": true, "itemStyle": map[string]any{"color": "rgba(0,0,0,0.07)"},
				// The band is named in the note, not on the plot,
				// where its label would sit on the lines.
				"label": map[string]any{"show": false},
				"data": []any{[]any{map[string]any{"yAxis": nominal - operating.ShortfallMargin, "name": "nominal ± 1 point"},
					map[string]any{"yAxis": math.Min(nominal+operating.ShortfallMargin, 1)}}}}
			line["markLine"] = map[string]any{"silent": true, "symbol": []string{"none", "none"}, "data": []any{
				map[string]any{"yAxis": nominal, "name": "nominal",
					"lineStyle": map[string]any{"color": "#000000", "type": "solid", "width": 1},
					// Right of the plot, beside the line's end, where no
					// coverage line runs.
					"label": map[string]any{"formatter": "nominal\n" + fmtLevel(nominal), "position": "end", "color": "#000000"}}}}
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": c.MethodName, "icon": "path://M0,6 L24,6 L24,9 L0,9 Z"})
		if minK >= 0 {
			p := c.Points[minK]
			table.Rows = append(table.Rows, []string{c.MethodName, fmtPct(p.Coverage), fmt.Sprintf("π1 = %s, π2 = %s", fmtPct(p.Pi1), fmtPct(p.Pi2)),
				fmtPct(sum / float64(n)), fmt.Sprintf("%d of %d", short, n)})
		}
	}
	xName := axisName("true rate π1 in group 1", "%")
	if along == "pi2" {
		xName = axisName("true rate π2 in group 2", "%")
	}
	yMin := math.Max(0, math.Floor(low*20)/20)
	yStep := niceStep((1 - yMin) / 6)
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: 0, Max: 1, Name: xName, NameLocation: "middle", NameGap: 30}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: yMin, Max: 1, MinInterval: yStep, MaxInterval: yStep, Name: axisName("exact coverage", "%"),
			NameLocation: "middle", NameGap: 46}),
		charts.WithGridOpts(opts.Grid{Left: "24", Right: sliceRight, Top: "110", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", percentAxisLabel)
	axisFormatter(option, "yAxis", percentAxisLabel)
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(coverageSliceTooltip)}
	if z := set.zoom(0, 0, percentAxisLabel); z != nil {
		option["dataZoom"] = z
		option["grid"] = []any{map[string]any{"left": "24", "right": sliceRight, "top": "110", "bottom": "80", "containLabel": true}}
	}
	notes := []string{"Each line is the chance that a method's interval contains the true difference, computed exactly over every " +
		"possible outcome of a study of this size. The grey band is the nominal level ± 1 percentage point; lines that dip below it miss the truth more often than their label promises."}
	return newChart("coverage-slice", title, subtitle, set.heightOr(defaultHeight+60), option, table, notes)
}

// sliceRight is the room right of the coverage-slice plot for the
// nominal line's label.
const sliceRight = "72"

// sliceAxis checks that the slices share design and line, and tells which
// rate varies along them.
func sliceAxis(slices []*operating.Slice) (along, fixed string, err error) {
	s0 := slices[0]
	for _, s := range slices {
		if s == nil || s.Design != s0.Design || s.Along != s0.Along || s.Fixed != s0.Fixed || s.Scale != s0.Scale {
			return "", "", fmt.Errorf("coverage slice: %w: the slices differ in design or line of rates; draw each in its own chart",
				proportions.ErrUnsupported)
		}
	}
	switch {
	case s0.Along == "first":
		return "pi1", "along π1 at π2 = " + fmtPct(s0.Fixed), nil
	case s0.Along == "effect" && s0.Scale == proportions.Difference:
		return "pi2", "along π2 at a true difference of " + fmtPP(s0.Fixed), nil
	case s0.Along == "effect":
		return "pi2", fmt.Sprintf("along π2 at a true %s of %s", s0.Scale, strconv.FormatFloat(s0.Fixed, 'g', 4, 64)), nil
	}
	return "", "", fmt.Errorf("coverage slice: %w: unknown line %q", proportions.ErrUnsupported, s0.Along)
}

// gridValue prints a grid rate as a percentage with up to four significant
// digits, as the axis shows it ("2.5", "40").
func gridValue(v float64) string { return strconv.FormatFloat(100*v, 'g', 4, 64) }

// gridSpan is how close to 0 and 1 a grid may stop and still be said to
// cover every true rate (the engine's grids stop short of 0 and 1).
const gridSpan = 0.05

// gridWords states the grid a coverage map covers: "over all true rates"
// only when both rates run over (almost) the whole of 0 to 1, otherwise
// the ranges ("for π1 from 0.5% to 10% and π2 from 0.5% to 10%").
func gridWords(pi1, pi2 []float64) string {
	whole := func(g []float64) bool { return g[0] <= gridSpan && g[len(g)-1] >= 1-gridSpan }
	if whole(pi1) && whole(pi2) {
		return "over all true rates"
	}
	span := func(g []float64) string { return "from " + gridValue(g[0]) + "% to " + gridValue(g[len(g)-1]) + "%" }
	return "for π1 " + span(pi1) + " and π2 " + span(pi2)
}
