package notebookui

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions/planning"
)

// clusteredPowerTooltip lists every cluster size's power at the number of
// clusters under the pointer. Points are [clusters, power, effective units].
const clusteredPowerTooltip = `function (ps) {
  var s = ps[0].value[0] + ' clusters per group';
  ps.forEach(function (p) { s += '<br>' + p.marker + esc(p.seriesName) + ': ' + pct(p.value[1], 1) + ' (worth ' + Math.round(p.value[2]) + ' independent units)'; });
  return s;
}`

// ClusteredPowerChart draws the power of a clustered plan (from
// planning.ClusteredPowerByClusters) against the number of clusters per
// group, one line per cluster size, with the plan's target power as a
// labelled line; the table gives, per size, the fewest clusters drawn that
// reach the target. Bigger clusters add less and less once the design
// effect dominates, which the lines show. Options read: WithHeight.
func ClusteredPowerChart(g planning.ClusteredPowerGrid, options ...ChartOption) (*Chart, error) {
	if len(g.Lines) == 0 || len(g.Lines[0].Points) == 0 {
		return nil, fmt.Errorf("clustered power chart: %w: no points", errNoIntervals)
	}
	s := newChartSettings(options)
	target := g.Plan.Power
	title := "Power against the number of clusters"
	subtitle := fmt.Sprintf("%s; intracluster correlation %v", g.Plan, g.Correlation)
	if g.SizeVariation > 0 {
		subtitle += fmt.Sprintf(", cluster size variation %v", g.SizeVariation)
	}
	table := dataTable{Caption: fmt.Sprintf("Clusters per group reaching the target power of %s", fmtPct(target)),
		Header: []string{"cluster size", "design effect", "fewest clusters drawn reaching target", "power there"}}
	var series, legend []any
	for i, l := range g.Lines {
		name := fmt.Sprintf("clusters of %s units", strconv.FormatFloat(l.ClusterSize, 'g', 4, 64))
		data := make([][]float64, len(l.Points))
		row := []string{strconv.FormatFloat(l.ClusterSize, 'g', 4, 64), signless(l.DesignEffect, 2), "not reached", ""}
		for k, p := range l.Points {
			data[k] = []float64{float64(p.Clusters), round6(p.Power), round6(p.EffectiveSize)}
			if row[3] == "" && target > 0 && p.Power >= target {
				row[2], row[3] = fmt.Sprintf("%d", p.Clusters), fmtPct(p.Power)
			}
		}
		line := map[string]any{"type": "line", "name": name, "data": data, "showSymbol": len(data) <= 60, "symbol": markerShape(i),
			"symbolSize": 5, "lineStyle": map[string]any{"color": paletteColor(i), "width": 2, "type": lineStyle(i)},
			"itemStyle": map[string]any{"color": paletteColor(i)}}
		if i == 0 && target > 0 {
			line["markLine"] = targetLine(target, g.Plan.Alpha, false)
		}
		series = append(series, line)
		legend = append(legend, map[string]any{"name": name, "icon": markerShape(i)})
		table.Rows = append(table.Rows, row)
	}
	option := powerOverSizes(title, subtitle, axisName("clusters per group", "clusters"), series, legend, clusteredPowerTooltip)
	notes := []string{g.Caution, "Power by the normal approximation at the effective sizes clusters × size ÷ design effect (" + strings.TrimSuffix(g.Citation, ".") + ")."}
	return newChart("clustered-power", title, subtitle, s.heightOr(defaultHeight), option, table, notes)
}
