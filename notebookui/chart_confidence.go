package notebookui

import (
	"fmt"
	"math"
	"slices"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
)

// ConfidenceCurve is the p-value function of a test for the difference
// δ = π1 − π2: the two-sided p-value of H0: π1 − π2 = δ for the observed
// counts, as δ runs across (−1, 1). Its peak is at the estimate; the
// differences whose p-value exceeds α = 1 − Level form the confidence
// interval at that level that inverts the test, read off as where the
// curve crosses α; the same curve gives the interval at every other level.
type ConfidenceCurve struct {
	// Method and TestName identify the test (its registry key and name).
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	// Level is the confidence level whose interval is read off.
	Level float64 `json:"level"`
	// Deltas and PValues are the curve's points, Deltas increasing.
	Deltas  []float64 `json:"deltas"`
	PValues []float64 `json:"p_values"`
	// Estimate is p1 − p2.
	Estimate float64 `json:"estimate"`
	// Lower and Upper are where the curve crosses α: the interval. A limit
	// at −1 or 1 means the curve stays above α up to that end.
	Lower float64 `json:"lower"`
	Upper float64 `json:"upper"`
	// Null and NullPValue are the null value of the analysis and the
	// curve's value there (the test's p-value).
	Null       float64 `json:"null"`
	NullPValue float64 `json:"null_p_value"`
	// ViewLower and ViewUpper bound the informative part of the curve: the
	// differences with p-value at least 1e−4, widened to hold the null
	// value, plus a margin. Charts open zoomed to it.
	ViewLower float64 `json:"view_lower"`
	ViewUpper float64 `json:"view_upper"`
	// NullLogPValue is the natural log of NullPValue, exact where the
	// p-value underflows.
	NullLogPValue float64 `json:"null_log_p_value"`
}

// DefaultCurvePoints is the number of evenly spaced differences at which
// the confidence curve is evaluated across its informative range (see
// ConfidenceCurve.ViewLower); the crossings, the estimate and the null
// value are added exactly, and a coarse grid covers the rest of (−1, 1).
const DefaultCurvePoints = 401

// coarsePoints is the number of steps of the coarse grid over (−1, 1).
const coarsePoints = 100

// viewFloor is the p-value below which the curve is not informative.
const viewFloor = 1e-4

// ConfidenceCurveOf evaluates the two-sided p-value of the test at
// differences δ across (−1, 1) for the given counts, and reads the interval
// at the level off the curve by bisection between the estimate and each end
// (to 1e−10). The test must be on the difference scale and accept any null
// value (Margins); points is the number of evenly spaced δ across the
// informative range (0 for DefaultCurvePoints, otherwise at least 20). The statistics are the test's
// own Run; this function only evaluates it.
func ConfidenceCurveOf(c proportions.Counts, test proportions.TestMethod, level, null float64, points int) (ConfidenceCurve, error) {
	if err := c.Validate(); err != nil {
		return ConfidenceCurve{}, err
	}
	conf, err := proportions.NewConfidence(level)
	if err != nil {
		return ConfidenceCurve{}, err
	}
	if err := proportions.ValidateNull(proportions.Difference, null); err != nil {
		return ConfidenceCurve{}, err
	}
	if test.Scale != proportions.Difference || !test.Margins || test.Run == nil {
		return ConfidenceCurve{}, fmt.Errorf("confidence curve with %s: %w; it needs a test of the difference that accepts any null value",
			test.Name, proportions.ErrUnsupported)
	}
	switch {
	case points == 0:
		points = DefaultCurvePoints
	case points < 20:
		return ConfidenceCurve{}, fmt.Errorf("confidence curve with %d points: %w; use 0 for the default or at least 20",
			points, proportions.ErrUnsupported)
	}
	p := func(delta float64) float64 {
		return test.Run(c, proportions.Hypothesis{Null: delta, Alternative: proportions.TwoSided, Conf: conf}).PValue
	}
	est := proportions.Difference.Estimate(c)
	alpha := 1 - level
	nullResult := test.Run(c, proportions.Hypothesis{Null: null, Alternative: proportions.TwoSided, Conf: conf})
	cc := ConfidenceCurve{Method: test.Key, MethodName: test.Name, Level: level, Estimate: est, Null: null,
		NullPValue: nullResult.PValue, NullLogPValue: nullResult.LogPValue}
	cc.Lower = crossing(p, alpha, est, -1)
	cc.Upper = crossing(p, alpha, est, 1)

	// Most of (−1, 1) is where p is negligible: spend the points where the
	// curve is informative (p ≥ 1e−4, and the null value), and a coarser
	// grid over the rest so the whole range can still be shown.
	wLo := math.Min(crossing(p, viewFloor, est, -1), null)
	wHi := math.Max(crossing(p, viewFloor, est, 1), null)
	pad := math.Max((wHi-wLo)*0.15, 0.01)
	cc.ViewLower, cc.ViewUpper = math.Max(wLo-pad, -1), math.Min(wHi+pad, 1)
	deltas := make([]float64, 0, points+coarsePoints+4)
	h := (cc.ViewUpper - cc.ViewLower) / float64(points-1)
	for i := range points {
		deltas = append(deltas, round12(cc.ViewLower+float64(i)*h))
	}
	for i := 1; i < coarsePoints; i++ {
		d := round12(-1 + 2*float64(i)/coarsePoints)
		if d < cc.ViewLower || d > cc.ViewUpper {
			deltas = append(deltas, d)
		}
	}
	deltas = append(deltas, est, null)
	for _, v := range []float64{cc.Lower, cc.Upper} {
		if v > -1 && v < 1 {
			deltas = append(deltas, v)
		}
	}
	slices.Sort(deltas)
	deltas = slices.Compact(deltas)
	cc.Deltas = deltas
	cc.PValues = make([]float64, len(deltas))
	for i, d := range deltas {
		cc.PValues[i] = p(d)
	}
	return cc, nil
}

// crossing finds where p crosses alpha between the estimate and the end of
// (−1, 1) in direction dir, by bisection; it returns the end itself when p
// stays above alpha up to there. Bisection needs only that p falls below
// alpha once and stays there, which holds for score-type tests (their
// statistic grows as δ moves away from the estimate).
func crossing(p func(float64) float64, alpha, est, dir float64) float64 {
	const edge = 1 - 1e-12
	end := dir * edge
	if p(end) > alpha {
		return dir
	}
	in, out := est, end
	for i := 0; i < 200 && math.Abs(out-in) > 1e-10; i++ {
		mid := (in + out) / 2
		if p(mid) > alpha {
			in = mid
		} else {
			out = mid
		}
	}
	return (in + out) / 2
}

func round12(v float64) float64 { return math.Round(v*1e12) / 1e12 }

// curveTooltip shows δ and the p-value under the pointer.
const curveTooltip = `function (ps) {
  var p = ps[0];
  return 'difference ' + pp(p.value[0]) + '<br>' + esc(p.seriesName) + ': ' + 'p = ' + pval(p.value[1]);
}`

// ConfidenceCurveChart draws the confidence curve (p-value function) of the
// analysis's headline test for the difference: its two-sided p-value
// against the null difference δ across (−1, 1), the level α = 1 − level as
// a horizontal line, and the interval read off where the curve crosses it
// (shaded, with its limits labelled), the estimate at the peak and the null
// value with its p-value. Differences are in percentage points.
//
// The interval is at the level of the analysis's headline interval (for a
// one-sided analysis that is 1 − 2α, as Analyze documents). Options read:
// WithHeight, WithZoom (default: the part of the curve above 1e−4).
func ConfidenceCurveChart(a proportions.Analysis, options ...ChartOption) (*Chart, error) {
	test, err := proportions.LookupTest(a.Test.Method)
	if err != nil {
		return nil, fmt.Errorf("confidence curve chart: %w", err)
	}
	level := a.Interval.Level
	if level == 0 {
		level = a.Level
	}
	cc, err := ConfidenceCurveOf(a.Comparison.Counts(), test, level, a.Null, 0)
	if err != nil {
		return nil, fmt.Errorf("confidence curve chart: %w", err)
	}
	return ConfidenceCurveChartFrom(cc, a.Comparison, options...)
}

// ConfidenceCurveChartFrom draws a confidence curve computed by [ConfidenceCurveOf] for
// the comparison whose labels it uses. Options read: WithHeight, WithZoom.
func ConfidenceCurveChartFrom(cc ConfidenceCurve, cmp proportions.Comparison, options ...ChartOption) (*Chart, error) {
	if len(cc.Deltas) == 0 || len(cc.Deltas) != len(cc.PValues) {
		return nil, fmt.Errorf("confidence curve chart: %w: the curve has no points", errNoIntervals)
	}
	s := newChartSettings(options)
	alpha := 1 - cc.Level
	first, second := cmp.First.Label, cmp.Second.Label
	title := fmt.Sprintf("How compatible is each difference with the data? (%s)", cc.MethodName)
	subtitle := fmt.Sprintf("p-value of “%s − %s = δ” for every δ; the %s interval is where the curve is above %s",
		first, second, fmtLevel(cc.Level), fmtP(alpha))

	points := make([][]float64, len(cc.Deltas))
	for i := range cc.Deltas {
		points[i] = []float64{cc.Deltas[i], cc.PValues[i]}
	}
	ch := charts.NewLine()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{
			Type: "value", Min: -1, Max: 1, NameLocation: "middle", NameGap: 30,
			Name: axisName(fmt.Sprintf("difference δ in share %s, %s − %s", cmp.Event, first, second), "percentage points"),
		}),
		charts.WithYAxisOpts(opts.YAxis{Type: "value", Min: 0, Max: 1, Name: "two-sided p-value (probability)",
			NameLocation: "middle", NameGap: 40}),
		charts.WithGridOpts(opts.Grid{Left: "44", Right: "40", Top: "92", Bottom: "84", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", ppAxisLabel)
	viewLo, viewHi, _ := niceRange(cc.ViewLower, cc.ViewUpper, -1, 1)
	option["dataZoom"] = s.zoom(viewLo, viewHi, ppAxisLabel)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "axis", "formatter": jsFunc(curveTooltip),
		"axisPointer": map[string]any{"type": "line"}}
	ivLabel := fmt.Sprintf("%s interval", fmtLevel(cc.Level))
	curve := map[string]any{
		"type": "line", "name": "p-value", "data": points, "showSymbol": false, "smooth": false,
		"lineStyle": map[string]any{"color": ColorBlue, "width": 2.5}, "itemStyle": map[string]any{"color": ColorBlue},
		"markArea": map[string]any{
			"silent":    true,
			"itemStyle": map[string]any{"color": "rgba(86,180,233,0.18)"},
			"label":     map[string]any{"show": true, "position": "insideBottom", "distance": 18, "color": ColorBlue, "formatter": ivLabel},
			"data":      []any{[]any{map[string]any{"xAxis": cc.Lower, "name": ivLabel}, map[string]any{"xAxis": cc.Upper}}},
		},
		"markLine": map[string]any{
			"silent": true, "symbol": []string{"none", "none"},
			"data": []any{
				map[string]any{"yAxis": alpha, "name": "α", "lineStyle": map[string]any{"color": ColorVermillion, "type": "dashed", "width": 1.5},
					"label": map[string]any{"formatter": "α = " + fmtP(alpha), "position": "insideEndTop", "color": ColorVermillion}},
				verticalLine(cc.Lower, "lower", ColorBlue, "dotted", "lower "+fmtPP(cc.Lower), "insideMiddleBottom"),
				verticalLine(cc.Upper, "upper", ColorBlue, "dotted", "upper "+fmtPP(cc.Upper), "insideMiddleTop"),
				verticalLine(cc.Null, "null", ColorGrey, "dashed",
					nullName(cc.Null)+": "+pClause(cc.NullPValue), "insideEndTop"),
			},
		},
	}
	peak := map[string]any{
		"type": "scatter", "name": "estimate", "symbol": "diamond", "symbolSize": 12,
		"itemStyle": map[string]any{"color": ColorVermillion},
		"data":      []any{map[string]any{"value": []float64{cc.Estimate, 1}, "name": "estimate"}},
		"label": map[string]any{"show": true, "position": "right", "color": ColorVermillion,
			"formatter": "estimate " + fmtPP(cc.Estimate)},
		"tooltip": map[string]any{"show": false},
	}
	option["series"] = []any{curve, peak}
	option["legend"] = legendAt([]any{map[string]any{"name": "p-value", "icon": "path://M0,6 L24,6 L24,8 L0,8 Z"},
		map[string]any{"name": "estimate", "icon": "diamond"}})
	table := dataTable{
		Caption: "Read off the curve",
		Header:  []string{"quantity", "value"},
		Rows: [][]string{
			{"test", cc.MethodName},
			{"estimate " + first + " − " + second, fmtPP(cc.Estimate)},
			{ivLabel + " (where p > " + fmtP(alpha) + ")", fmtPP(cc.Lower) + " to " + fmtPP(cc.Upper)},
			{"p-value at " + nullName(cc.Null) + " (" + fmtPP(cc.Null) + ")", pValue(cc.NullPValue)},
		},
	}
	notes := []string{fmt.Sprintf("Differences inside the shaded band are compatible with the data at the %s level; "+
		"a high p-value is not evidence that a difference is true, only that the data do not rule it out.", fmtLevel(cc.Level))}
	return newChart("confidence-curve", title, subtitle, s.heightOr(defaultHeight+20), option, table, notes)
}

func nullName(null float64) string {
	if null == 0 {
		return "no difference"
	}
	return "margin"
}

// verticalLine is a mark line from the bottom to the top of a p-value axis
// at x, given by its two end points: echarts placed lines given only as
// {xAxis: x} on this dense series a little off their value.
func verticalLine(x float64, name, color, dash, label, position string) []any {
	style := map[string]any{"color": color, "type": dash, "width": 1.5}
	return []any{
		map[string]any{"coord": []float64{x, 0}, "name": name, "lineStyle": style,
			"label": map[string]any{"formatter": label, "position": position, "color": color}},
		map[string]any{"coord": []float64{x, 1}},
	}
}
