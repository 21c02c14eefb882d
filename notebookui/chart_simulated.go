package notebookui

import (
	"fmt"
	"math"
	"strconv"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions/clusters/simulate"
)

// simulatedCoverageTooltip lists each method's simulated coverage at the
// correlation under the pointer with its Monte Carlo SE. Points are
// [ρ, coverage, standard error, studies].
const simulatedCoverageTooltip = `function (ps) {
  var s = 'intracluster correlation ρ = ' + num(ps[0].value[0], 3);
  ps.forEach(function (p) {
    s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 2) +
      ' <span style="opacity:0.7">± ' + num(100 * p.value[2], 2) + ' points (Monte Carlo SE)</span>';
  });
  return s;
}`

// SimulatedCoverageChart draws the simulated coverage of every interval
// method against the intracluster correlation ρ (a simulate.Curve from
// simulate.Sweep): adjusted methods as solid lines, the unit-level ones run on
// the pooled counts as dashed lines, the nominal level as a line inside
// the Monte Carlo band, the range of ±2 Monte Carlo SEs around nominal
// within which a method that holds its level lands about 95% of the time.
// The table gives every point with its SE. Options read: WithHeight.
func SimulatedCoverageChart(c *simulate.Curve, options ...ChartOption) (*Chart, error) {
	if c == nil || len(c.Results) == 0 || len(c.Results) != len(c.Correlations) || len(c.Results[0].Intervals) == 0 {
		return nil, fmt.Errorf("simulated coverage: %w: no simulated intervals", errNoIntervals)
	}
	set := newChartSettings(options)
	p := c.Results[0].Plan
	nominal := p.Design.Level
	title := "Simulated coverage as the clusters grow alike"
	subtitle := simulationSubtitle(p)
	band := 2 * math.Sqrt(nominal*(1-nominal)/float64(p.Studies))
	low := nominal - 0.05
	table := dataTable{Caption: "Simulated coverage ± Monte Carlo SE, by intracluster correlation ρ", Header: []string{"method", "accounts for clusters"}}
	for _, rho := range c.Correlations {
		table.Header = append(table.Header, "ρ = "+strconv.FormatFloat(rho, 'g', 4, 64))
	}
	var series, legend []any
	for i, m := range c.Results[0].Intervals {
		data := make([][]float64, 0, len(c.Results))
		row := []string{m.MethodName, yesNo(m.Adjusted)}
		for k, r := range c.Results {
			iv, ok := r.Interval(m.Method)
			if !ok || iv.Studies == 0 {
				row = append(row, "no interval")
				continue
			}
			data = append(data, []float64{c.Correlations[k], round7(iv.Coverage), round7(iv.StandardError), float64(iv.Studies)})
			low = math.Min(low, iv.Coverage)
			row = append(row, fmt.Sprintf("%s ± %s", fmtPct(iv.Coverage), strconv.FormatFloat(100*iv.StandardError, 'f', 2, 64)))
		}
		table.Rows = append(table.Rows, row)
		style := "dashed"
		if m.Adjusted {
			style = "solid"
		}
		name := m.MethodName
		if !m.Adjusted {
			name += " (unit-level)"
		}
		line := map[string]any{
			"type": "line", "name": name, "data": data, "showSymbol": true, "symbol": markerShape(i), "symbolSize": 6,
			"lineStyle": map[string]any{"color": paletteColor(i), "width": 2, "type": style},
			"itemStyle": map[string]any{"color": paletteColor(i)},
		}
		if i == 0 {
			line["markArea"] = map[string]any{"silent": true, "itemStyle": map[string]any{"color": "rgba(0,0,0,0.08)"},
				"data": []any{[]any{map[string]any{"yAxis": round9(nominal - band)},
					map[string]any{"yAxis": round9(math.Min(nominal+band, 1))}}}}
			line["markLine"] = map[string]any{"silent": true, "symbol": []string{"none", "none"}, "data": []any{
				map[string]any{"yAxis": nominal, "name": "nominal",
					"lineStyle": map[string]any{"color": "#000000", "type": "solid", "width": 1},
					"label":     map[string]any{"formatter": "nominal " + fmtLevel(nominal) + " ± 2 Monte Carlo SE", "position": "insideEndTop", "color": "#000000"}}}}
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": name})
	}
	yStep := niceStep((1 - math.Max(0, math.Floor(low*20)/20)) / 6)
	yMin := math.Max(0, math.Floor(low/yStep+1e-9)*yStep)
	xMax := c.Correlations[len(c.Correlations)-1]
	for _, rho := range c.Correlations {
		xMax = math.Max(xMax, rho)
	}
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{Type: "value", Min: 0, Max: niceCeil(xMax), Name: "intracluster correlation ρ", NameLocation: "middle", NameGap: 30}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: yMin, Max: 1, MinInterval: yStep, MaxInterval: yStep, Name: axisName("simulated coverage", "%"),
			NameLocation: "middle", NameGap: 46}),
		// The legend wraps at about four methods a row: the plot starts below it.
		charts.WithGridOpts(opts.Grid{Left: "24", Right: "40", Top: strconv.Itoa(90 + 24*((len(series)+3)/4)), Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "yAxis", percentAxisLabel)
	option["series"] = series
	option["legend"] = legendAt(legend)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(simulatedCoverageTooltip)}
	notes := []string{
		fmt.Sprintf("Each point is the share of %d simulated studies whose interval contained the true difference; solid lines account for the clusters, dashed lines are unit-level methods run on the pooled counts as if every unit were independent.", p.Studies),
		fmt.Sprintf("The grey band is the nominal %s ± 2 Monte Carlo standard errors (%s points): a method that holds its level falls inside it about 95%% of the time; lines well below it miss the truth more often than their label promises.",
			fmtLevel(nominal), strconv.FormatFloat(100*band, 'f', 2, 64)),
	}
	return newChart("simulated-coverage", title, subtitle, set.heightOr(defaultHeight+24*((len(series)+3)/4)+40), option, table, notes)
}

// simulationSubtitle describes the design: the groups' clusters, their
// sizes, the true rates, the level and the seed.
func simulationSubtitle(p simulate.Plan) string {
	d := p.Design
	by := p.By
	if by == "" {
		by = "cluster"
	}
	first, second := p.Labels.First, p.Labels.Second
	if first == "" {
		first = "group 1"
	}
	if second == "" {
		second = "group 2"
	}
	units := strconv.Itoa(d.Sizes[0]) + " units each"
	if len(d.Sizes) > 1 {
		units = "units "
		for i, n := range d.Sizes {
			if i > 0 {
				units += ", "
			}
			units += strconv.Itoa(n)
		}
		units += " in turn"
	}
	return fmt.Sprintf("%s %d and %s %d clusters by %s, %s; true rates %s and %s; %s level, seed %d",
		first, d.Clusters1, second, d.Clusters2, by, units, trimPct(d.Rate1), trimPct(d.Rate2), fmtLevel(d.Level), p.Seed)
}

// yesNo prints a flag in a table.
func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no (unit-level)"
}

// niceCeil rounds an axis end up to a round tenth (or hundredth below 0.1).
func niceCeil(v float64) float64 {
	if v <= 0 {
		return 0.1
	}
	step := 0.1
	if v < 0.1 {
		step = 0.01
	}
	return math.Ceil(v/step-1e-9) * step
}
