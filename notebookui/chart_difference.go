package notebookui

import (
	"fmt"
	"math"
	"strings"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// ChartOption adjusts a chart. Each chart function documents which options
// it reads; the others are ignored.
type ChartOption func(*chartSettings)

type chartSettings struct {
	recommended string
	reason      string
	height      int
	zoomFrom    float64
	zoomTo      float64
}

func newChartSettings(options []ChartOption) chartSettings {
	var s chartSettings
	for _, o := range options {
		if o != nil {
			o(&s)
		}
	}
	return s
}

// WithHighlightedMethod marks the interval method with the given key as the
// recommended one, with a one-sentence reason shown under the chart (for
// example the reason given by the coverage-based recommendation for the
// design).
func WithHighlightedMethod(methodKey, reason string) ChartOption {
	return func(s *chartSettings) { s.recommended, s.reason = methodKey, reason }
}

// WithRecommendation marks the best-ranked method of a coverage-based
// recommendation (see operating.Recommend) with its one-sentence reason. A nil
// or empty recommendation leaves the default.
func WithRecommendation(r *operating.Recommendation) ChartOption {
	return func(s *chartSettings) {
		if r == nil {
			return
		}
		best, ok := r.Best()
		if !ok {
			return
		}
		s.recommended = best.Method
		s.reason = fmt.Sprintf("%s is recommended for a design of %d and %d units at %s: %s",
			best.MethodName, r.Design.N1, r.Design.N2, fmtLevel(r.Design.Level), best.Reason)
	}
}

// WithHeight sets the chart's height in pixels (the width follows the page).
func WithHeight(px int) ChartOption {
	return func(s *chartSettings) {
		if px > 0 {
			s.height = px
		}
	}
}

// WithZoom opens the chart zoomed to the part of its horizontal axis from
// `from` to `to` (in the axis's own units: rates and differences as
// proportions, such as 0 to 0.1 for rates up to 10%); the reader can zoom
// out with the slider under the chart.
func WithZoom(from, to float64) ChartOption {
	return func(s *chartSettings) {
		if to > from {
			s.zoomFrom, s.zoomTo = from, to
		}
	}
}

// zoom returns the dataZoom components for a horizontal window, or nil.
func (s chartSettings) zoom(from, to float64, label string) []any {
	if s.zoomTo > s.zoomFrom {
		from, to = s.zoomFrom, s.zoomTo
	}
	if !(to > from) {
		return nil
	}
	return []any{
		map[string]any{"type": "inside", "xAxisIndex": 0, "startValue": from, "endValue": to, "filterMode": "none"},
		map[string]any{"type": "slider", "xAxisIndex": 0, "startValue": from, "endValue": to, "filterMode": "none",
			"height": 16, "bottom": 10, "labelFormatter": jsFunc(label)},
	}
}

func (s chartSettings) heightOr(px int) int {
	if s.height > 0 {
		return s.height
	}
	return px
}

// DifferenceIntervalsChart draws every interval method of the analysis for
// the difference π1 − π2 side by side (in percentage points), with the null
// value (no difference, or the margin being tested) as a labelled line and
// the recommended method drawn thicker, in its own colour and with a text
// mark. Limits that a method put outside [−1, 1] end in an arrow: they were
// clipped to the parameter space.
//
// Options read: WithHighlightedMethod or WithRecommendation (default: the
// analysis's headline interval, the one that matches its test), WithHeight.
func DifferenceIntervalsChart(a proportions.Analysis, options ...ChartOption) (*Chart, error) {
	if len(a.DifferenceIntervals) == 0 {
		return nil, fmt.Errorf("difference intervals chart: %w: the analysis has no interval for the difference", errNoIntervals)
	}
	s := newChartSettings(options)
	rec, reason, mark := s.recommended, s.reason, "recommended"
	if rec == "" {
		// Nothing was recommended: the mark says what the card leads with.
		rec, mark = a.Interval.Method, "headline"
		reason = fmt.Sprintf("%s is marked as the headline: it is the interval that matches the headline test (it excludes the null value exactly when the test rejects); no coverage-based recommendation was computed for this design.", a.Interval.MethodName)
	} else if rec != a.Interval.Method && a.Interval.MethodName != "" {
		reason = joinSentences(reason, fmt.Sprintf("The card's headline interval is %s, the one that matches its test; the recommendation rests on coverage at this design and may name another.", a.Interval.MethodName))
	}
	if _, ok := findInterval(a.DifferenceIntervals, rec); !ok && s.recommended != "" {
		return nil, fmt.Errorf("difference intervals chart: recommended method %q: %w; the analysis has %v",
			rec, proportions.ErrUnknownMethod, intervalKeys(a.DifferenceIntervals))
	}
	first, second := a.Comparison.First.Label, a.Comparison.Second.Label
	level := a.DifferenceIntervals[0].Level
	title := fmt.Sprintf("Difference in share %s: every method", a.Comparison.Event)
	subtitle := fmt.Sprintf("%s − %s, %s intervals", first, second, fmtLevel(level))

	names := make([]any, len(a.DifferenceIntervals))
	data := make([]any, len(a.DifferenceIntervals))
	table := dataTable{
		Caption: fmt.Sprintf("%s intervals for the difference %s − %s", fmtLevel(level), first, second),
		Header:  []string{"method", "estimate", "lower", "upper", "width", "note"},
	}
	lo, hi := a.Null, a.Null
	for i, iv := range a.DifferenceIntervals {
		strong := iv.Method == rec
		color := ColorBlue
		if strong {
			color = ColorVermillion
			names[i] = map[string]any{"value": iv.MethodName, "textStyle": map[string]any{"fontWeight": "bold"}}
		} else {
			names[i] = iv.MethodName
		}
		note := clipNote(iv)
		if iv.Method == a.Interval.Method {
			note = joinNotes(note, "matches the headline test")
		}
		if strong && mark == "recommended" {
			note = joinNotes("recommended", note)
		}
		tip := fmt.Sprintf("<b>%s</b><br>%s interval for %s − %s:<br>%s to %s (width %s)<br>estimate %s",
			esc(iv.MethodName), fmtLevel(iv.Level), esc(first), esc(second), fmtPP(iv.Lower), fmtPP(iv.Upper), fmtWidth(iv.Width()), fmtPP(iv.Estimate))
		if note != "" {
			tip += "<br><i>" + esc(note) + "</i>"
		}
		item := map[string]any{"name": iv.MethodName, "value": whiskerValue(iv.Estimate, i, iv, strong), "tip": tip,
			"itemStyle": map[string]any{"color": color}}
		if strong {
			item["mark"] = mark
		}
		data[i] = item
		lo, hi = math.Min(lo, iv.Lower), math.Max(hi, iv.Upper)
		table.Rows = append(table.Rows, []string{iv.MethodName, fmtPP(iv.Estimate), fmtPP(iv.Lower), fmtPP(iv.Upper), fmtWidth(iv.Width()), note})
	}
	axisMin, axisMax, step := niceRange(lo, hi, -1, 1)

	ch := charts.NewCustom()
	ch.SetGlobalOptions(commonGlobals(title, subtitle)...)
	ch.SetGlobalOptions(
		charts.WithXAxisOpts(opts.XAxis{
			Type: "value", Min: axisMin, Max: axisMax, NameLocation: "middle", NameGap: 30,
			MinInterval: step, MaxInterval: step,
			Name: axisName(fmt.Sprintf("difference in share %s", a.Comparison.Event), "percentage points"),
		}),
		charts.WithYAxisOpts(opts.YAxis{Type: "category", Data: names, Inverse: opts.Bool(true)}),
		charts.WithGridOpts(opts.Grid{Left: "16", Right: "110", Top: "80", Bottom: "56", ContainLabel: opts.Bool(true)}),
	)
	option := optionOf(ch)
	axisFormatter(option, "xAxis", ppAxisLabel)
	option["tooltip"] = map[string]any{"show": true, "confine": true, "trigger": "item", "formatter": jsFunc(tipFormatter)}
	option["legend"] = map[string]any{"show": false}
	option["series"] = []any{map[string]any{
		"type": "custom", "name": "intervals", "data": data,
		"encode":     map[string]any{"x": []int{0, 2, 3}, "y": 1},
		"renderItem": jsFunc(fmt.Sprintf(whiskerRenderer, 0, 1, 0, mark)),
		"markLine":   nullLine(a.Null, first, second),
	}}
	notes := []string{reason}
	if a.Null != 0 {
		notes = append(notes, fmt.Sprintf("The dashed line is the margin under test, %s.", fmtPP(a.Null)))
	}
	height := s.heightOr(150 + 38*len(a.DifferenceIntervals))
	return newChart("difference-intervals", title, subtitle, height, option, table, notes)
}

// nullLine is the mark line for the null value of the difference.
func nullLine(null float64, first, second string) map[string]any {
	label := "no difference"
	if null != 0 {
		label = "margin " + fmtPP(null)
	}
	return map[string]any{
		"silent": true, "symbol": []string{"none", "none"},
		"lineStyle": map[string]any{"color": ColorGrey, "type": "dashed", "width": 1.5},
		"label":     map[string]any{"formatter": label, "position": "start", "color": ColorGrey},
		"data":      []any{map[string]any{"xAxis": null, "name": label}},
	}
}

// clipNote says which limits were clipped to [−1, 1].
func clipNote(iv proportions.Interval) string {
	switch {
	case iv.RawLower < iv.Lower && iv.RawUpper > iv.Upper:
		return fmt.Sprintf("both limits clipped (raw %s and %s)", fmtPP(iv.RawLower), fmtPP(iv.RawUpper))
	case iv.RawLower < iv.Lower:
		return fmt.Sprintf("lower limit clipped from %s", fmtPP(iv.RawLower))
	case iv.RawUpper > iv.Upper:
		return fmt.Sprintf("upper limit clipped from %s", fmtPP(iv.RawUpper))
	}
	return ""
}

func joinNotes(a, b string) string {
	switch {
	case a == "":
		return b
	case b == "":
		return a
	}
	return a + "; " + b
}

func intervalKeys(ivs []proportions.Interval) []string {
	keys := make([]string, len(ivs))
	for i, iv := range ivs {
		keys[i] = iv.Method
	}
	return keys
}

// niceRange pads [lo, hi] by a tenth of its width (at least 2 percentage
// points), rounds outwards to a multiple of a round tick step chosen for
// about six ticks, and stays within [min, max]. It returns the range and
// the step.
func niceRange(lo, hi, min, max float64) (float64, float64, float64) {
	pad := math.Max((hi-lo)*0.1, 0.02)
	lo, hi = lo-pad, hi+pad
	step := niceStep((hi - lo) / 6)
	l := math.Floor(lo/step) * step
	h := math.Ceil(hi/step) * step
	return math.Max(round6(l), min), math.Min(round6(h), max), step
}

// fitRange is an axis range that fits the data: lo to hi with 2% of the
// span either side, within [min, max]. The ends are not rounded out to a
// tick (a curve from −1.5 points does not get an axis from −5): the axis
// labels its round values inside the range and hides the end labels
// (hideEndLabels).
func fitRange(lo, hi, min, max float64) (float64, float64) {
	pad := math.Max((hi-lo)*0.02, 0.001)
	return math.Max(round6(lo-pad), min), math.Min(round6(hi+pad), max)
}

// hideEndLabels hides the labels at the ends of an axis whose range was
// set by fitRange, where the end values are not round.
func hideEndLabels(option map[string]any, axis string) {
	m := firstAxis(option, axis)
	label, _ := m["axisLabel"].(map[string]any)
	if label == nil {
		label = map[string]any{}
	}
	label["showMinLabel"], label["showMaxLabel"] = false, false
	m["axisLabel"] = label
}

// niceStep returns the smallest of 1, 2, 2.5 and 5 times a power of ten
// that is at least raw.
func niceStep(raw float64) float64 {
	if !(raw > 0) {
		return 0.01
	}
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*p >= raw*(1-1e-9) {
			return round6(m * p)
		}
	}
	return round6(10 * p)
}

func round6(v float64) float64 { return math.Round(v*1e6) / 1e6 }

// joinSentences joins two sentences with a space, ending the first with a
// full stop when it has none.
func joinSentences(a, b string) string {
	if a == "" {
		return b
	}
	if !strings.HasSuffix(a, ".") {
		a += "."
	}
	return a + " " + b
}
