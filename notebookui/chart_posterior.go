package notebookui

import (
	"fmt"
	"math"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/bayes"
)

// posteriorPoints is the number of points of each density curve.
const posteriorPoints = 201

// densityTooltip shows the series (escaped) and the density under the
// pointer; user text reaches it only as the series name, which is data.
const densityTooltip = `function (ps) {
  var out = [];
  for (var i = 0; i < ps.length; i++) {
    var p = ps[i];
    out.push(esc(p.seriesName) + ': density ' + (typeof p.value[1] === 'number' ? p.value[1].toPrecision(4) : String(p.value[1])) +
      ' at ' + (p.axisIndex === 1 || p.seriesIndex === 2 ? pp(p.value[0], 1) : pct(p.value[0], 1)));
  }
  return out.join('<br>');
}`

// PosteriorChart draws, from a Bayesian analysis, the posterior densities
// of the two groups' rates (top, in percent) and the posterior density of
// the difference π1 − π2 (bottom, in percentage points) with its
// equal-tailed interval marked and the equivalence region, when the
// analysis has one, shaded. The densities are evaluated from the
// analysis's posteriors (beta densities, and the difference's density by
// numerical integration); nothing is simulated. Options read: WithHeight.
func PosteriorChart(a bayes.Analysis, options ...ChartOption) (*Chart, error) {
	if len(a.Effects) == 0 {
		return nil, fmt.Errorf("posterior chart: %w: the analysis has no posterior of the difference", errNoIntervals)
	}
	s := newChartSettings(options)
	first, second, event := a.Comparison.First.Label, a.Comparison.Second.Label, a.Comparison.Event
	post := [2]bayes.Posterior{}
	for i, g := range a.Groups {
		post[i] = bayes.NewPosterior(g.Posterior.EventShape, g.Posterior.NonEventShape)
	}
	diff, err := bayes.NewEffect(proportions.Difference, post[0], post[1])
	if err != nil {
		return nil, fmt.Errorf("posterior chart: %w", err)
	}
	title := fmt.Sprintf("What the data and the prior say about the share %s", event)
	subtitle := fmt.Sprintf("posterior densities; prior: %s", a.PriorText())

	// the ranges: from the 0.0005 to the 0.9995 posterior quantile of each
	// curve (and the equivalence region), with a little padding
	rLo, rHi := 1.0, 0.0
	for _, p := range post {
		rLo, rHi = math.Min(rLo, rateQuantile(p, rangeTail)), math.Max(rHi, rateQuantile(p, 1-rangeTail))
	}
	rLo, rHi = paddedRange(rLo, rHi, 0, 1)
	d := a.Effects[0]
	dLo, _, _ := diff.Quantile(rangeTail)
	dHi, _, _ := diff.Quantile(1 - rangeTail)
	if r := a.EquivalenceRegion; r != nil {
		dLo, dHi = math.Min(dLo, r.Lower), math.Max(dHi, r.Upper)
	}
	dLo, dHi = paddedRange(dLo, dHi, -1, 1)

	curve := func(lo, hi float64, f func(float64) float64) [][]float64 {
		pts := make([][]float64, posteriorPoints)
		for i := range pts {
			x := lo + (hi-lo)*float64(i)/(posteriorPoints-1)
			y := f(x)
			if math.IsInf(y, 0) || math.IsNaN(y) {
				y = 0 // an unbounded density at 0 or 1 (a shape below 1) is drawn from its neighbours
			}
			pts[i] = []float64{round6(x), round6(y)}
		}
		return pts
	}
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	option := optionOf(ch)
	option["grid"] = []any{
		map[string]any{"left": "56", "right": "32", "top": "92", "height": "32%", "containLabel": true},
		map[string]any{"left": "56", "right": "32", "bottom": "56", "height": "30%", "containLabel": true},
	}
	option["xAxis"] = []any{
		map[string]any{"type": "value", "gridIndex": 0, "min": rLo, "max": rHi, "name": axisName("share "+event, "%"),
			"nameLocation": "middle", "nameGap": 26, "axisLabel": map[string]any{"formatter": jsFunc(percentAxisLabel)}},
		map[string]any{"type": "value", "gridIndex": 1, "min": dLo, "max": dHi,
			"name":         axisName(fmt.Sprintf("difference %s − %s", first, second), "percentage points"),
			"nameLocation": "middle", "nameGap": 26, "axisLabel": map[string]any{"formatter": jsFunc(ppAxisLabel)}},
	}
	option["yAxis"] = []any{
		map[string]any{"type": "value", "gridIndex": 0, "name": "density", "min": 0},
		map[string]any{"type": "value", "gridIndex": 1, "name": "density", "min": 0},
	}
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(densityTooltip),
		"axisPointer": map[string]any{"type": "line"}}
	line := func(name, color string, axis int, pts [][]float64) map[string]any {
		return map[string]any{"type": "line", "name": name, "data": pts, "showSymbol": false, "smooth": false,
			"xAxisIndex": axis, "yAxisIndex": axis,
			"lineStyle": map[string]any{"color": color, "width": 2.5}, "itemStyle": map[string]any{"color": color},
			"areaStyle": map[string]any{"color": color, "opacity": 0.12}}
	}
	s1 := line(first, ColorBlue, 0, curve(rLo, rHi, post[0].Density))
	s2 := line(second, ColorVermillion, 0, curve(rLo, rHi, post[1].Density))
	dname := "difference"
	s3 := line(dname, ColorGreen, 1, curve(dLo, dHi, func(v float64) float64 { f, _ := diff.Density(v); return f }))
	lvl := fmtLevel(a.Level)
	marks := []any{
		[]any{map[string]any{"coord": []float64{d.Lower, 0}, "name": "lower", "lineStyle": map[string]any{"color": ColorGreen, "type": "dotted", "width": 1.5},
			"label": map[string]any{"formatter": lvl + " lower " + fmtPP(d.Lower), "position": "insideEndTop", "color": ColorGreen}},
			map[string]any{"xAxis": d.Lower, "yAxis": "max"}},
		[]any{map[string]any{"coord": []float64{d.Upper, 0}, "name": "upper", "lineStyle": map[string]any{"color": ColorGreen, "type": "dotted", "width": 1.5},
			"label": map[string]any{"formatter": lvl + " upper " + fmtPP(d.Upper), "position": "insideEndTop", "color": ColorGreen}},
			map[string]any{"xAxis": d.Upper, "yAxis": "max"}},
	}
	s3["markLine"] = map[string]any{"silent": true, "symbol": []string{"none", "none"}, "data": marks}
	table := dataTable{
		Caption: "Posterior summaries (" + lvl + " equal-tailed intervals)",
		Header:  []string{"quantity", "mean or median", lvl + " interval"},
		Rows: [][]string{
			{"share " + event + ", " + first, percent(a.Groups[0].Mean, 1), percent(a.Groups[0].Lower, 1) + " to " + percent(a.Groups[0].Upper, 1)},
			{"share " + event + ", " + second, percent(a.Groups[1].Mean, 1), percent(a.Groups[1].Lower, 1) + " to " + percent(a.Groups[1].Upper, 1)},
			{"difference " + first + " − " + second, fmtPP(d.Median), fmtPP(d.Lower) + " to " + fmtPP(d.Upper)},
		},
	}
	notes := []string{fmt.Sprintf("The probability that %s has the higher rate is %s under the prior named above; "+
		"a high probability is not a large or important difference.", first, strconvProb(a.ProbabilityFirstHigher))}
	if r := a.EquivalenceRegion; r != nil && a.ProbabilityEquivalent != nil {
		region := "equivalence region"
		s3["markArea"] = map[string]any{"silent": true, "itemStyle": map[string]any{"color": "rgba(95,95,95,0.16)"},
			"label": map[string]any{"show": true, "position": "insideTop", "color": ColorGrey, "formatter": region},
			"data":  []any{[]any{map[string]any{"xAxis": r.Lower, "name": region}, map[string]any{"xAxis": r.Upper}}}}
		table.Rows = append(table.Rows, []string{"probability inside the equivalence region " + fmtPP(r.Lower) + " to " + fmtPP(r.Upper),
			strconvProb(*a.ProbabilityEquivalent), ""})
		notes = append(notes, "The shaded band is the equivalence region you set: differences you count as no difference in practice.")
	}
	option["series"] = []any{s1, s2, s3}
	option["legend"] = legendAt([]any{first, second, dname})
	return newChart("posterior", title, subtitle, s.heightOr(defaultHeight+140), option, table, notes)
}

// rangeTail is the posterior probability left out beyond each end of the
// posterior chart's axes (before padding).
const rangeTail = 0.0005

// rateQuantile returns the q-quantile of a rate's beta posterior, by
// bisection on its distribution function (to 10⁻⁹ of the rate).
func rateQuantile(p bayes.Posterior, q float64) float64 {
	lo, hi := 0.0, 1.0
	for hi-lo > 1e-9*math.Max(hi, 1e-6) {
		if m := (lo + hi) / 2; p.Below(m) < q {
			lo = m
		} else {
			hi = m
		}
	}
	return (lo + hi) / 2
}

// paddedRange widens [lo, hi] by 5% of its width on each side, then to
// the grid of a twentieth of a nice step, inside [min, max]: close to the
// data at any sample size, where niceRange's fixed 0.02 would swamp a
// posterior a few tenths of a percentage point wide.
func paddedRange(lo, hi, min, max float64) (float64, float64) {
	pad := 0.05 * (hi - lo)
	lo, hi = lo-pad, hi+pad
	step := niceStep((hi - lo) / 20)
	return math.Max(min, round6(math.Floor(lo/step)*step)), math.Min(max, round6(math.Ceil(hi/step)*step))
}

func strconvProb(p float64) string {
	switch {
	case p > 0.999:
		return "above 0.999"
	case p < 0.001:
		return "below 0.001"
	}
	return fmt.Sprintf("%.3f", p)
}
