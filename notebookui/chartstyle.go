package notebookui

import (
	"encoding/json"
	"fmt"
	"html"
	"strconv"

	"github.com/go-echarts/go-echarts/v2/charts"
	"github.com/go-echarts/go-echarts/v2/opts"
)

// The chart palette: the eight colours of Okabe & Ito (2008, "Color
// Universal Design — how to make figures and presentations that are
// friendly to colorblind people"), chosen to stay distinct under the common
// colour-vision deficiencies. Charts never carry meaning by colour alone:
// series also differ in marker shape or line style, and recommended or
// reference items carry a text label.
const (
	ColorBlue       = "#0072B2"
	ColorVermillion = "#D55E00"
	ColorGreen      = "#009E73"
	ColorPurple     = "#CC79A7"
	ColorOrange     = "#E69F00"
	ColorSky        = "#56B4E9"
	ColorYellow     = "#F0E442"
	ColorGrey       = "#5F5F5F"
)

// Palette returns the series colours in the order charts use them (a fresh
// slice). Yellow comes last: it is the weakest on white.
func Palette() []string {
	return []string{ColorBlue, ColorVermillion, ColorGreen, ColorPurple, ColorOrange, ColorSky, ColorGrey, ColorYellow}
}

// markerShapes are the marker shapes paired with the palette, so that each
// series is told apart by shape as well as colour.
var markerShapes = [...]string{"circle", "rect", "diamond", "triangle", "pin", "roundRect", "arrow", "circle"}

func markerShape(i int) string { return markerShapes[i%len(markerShapes)] }

// lineStyles pairs line dash patterns with the palette for line charts.
var lineStyles = [...]string{"solid", "dashed", "dotted", "solid", "dashed", "dotted", "solid", "dashed"}

func lineStyle(i int) string { return lineStyles[i%len(lineStyles)] }

func paletteColor(i int) string {
	p := Palette()
	return p[i%len(p)]
}

// chartInset is the left inset, in pixels, of a chart's title and of the
// caption under it, so that they line up.
const chartInset = 12

// Chart sizes in pixels.
const (
	defaultHeight = 420
	talltHeight   = 520
)

// commonGlobals are the options every chart shares: our title layout, the
// palette, no animation (reproducible screenshots), item tooltips, a save
// button and the accessibility description.
func commonGlobals(title, subtitle string) []charts.GlobalOpts {
	return []charts.GlobalOpts{
		charts.WithInitializationOpts(opts.Initialization{Width: "100%", Height: "420px", Theme: "white"}),
		charts.WithTitleOpts(opts.Title{
			Title: title, Subtitle: subtitle, Left: strconv.Itoa(chartInset), Top: "6",
			TitleStyle:    &opts.TextStyle{FontSize: 16, FontWeight: "600"},
			SubtitleStyle: &opts.TextStyle{FontSize: 12},
		}),
		charts.WithAnimation(false),
		charts.WithColorsOpts(opts.Colors(Palette())),
		charts.WithTooltipOpts(opts.Tooltip{Show: opts.Bool(true), Trigger: "item", Enterable: opts.Bool(false)}),
		charts.WithToolboxOpts(opts.Toolbox{Show: opts.Bool(true), Right: "16", Top: "4", Feature: &opts.ToolBoxFeature{
			SaveAsImage: &opts.ToolBoxFeatureSaveAsImage{Show: opts.Bool(true), Title: "save as PNG", Name: "propscope-chart"},
		}}),
		charts.WithAriaOpts(&opts.Aria{Enabled: opts.Bool(true)}),
	}
}

// optionOf validates a go-echarts chart and returns its option map.
func optionOf(ch interface {
	Validate()
	JSON() map[string]interface{}
}) map[string]any {
	ch.Validate()
	return ch.JSON()
}

// jsFunc marks JavaScript source for the option (see Chart.optionScript
// and jsCode). Only constant code of this package goes through it, never
// user text: user text travels as data (JSON strings) and is escaped
// where it is shown. It returns a jsCode, not a string, so that no string
// can ever be mistaken for code.
func jsFunc(src string) jsCode { return jsCode{src: src} }

// axisFormatter sets the label formatter of the first axis of the given
// kind ("xAxis", "yAxis") to this package's constant source src. It is set
// on the option map after go-echarts has built it, rather than with
// opts.FuncOpts, because go-echarts marks code by content (a wrapped
// string), which user text could imitate (see jsCode).
func axisFormatter(option map[string]any, axis, src string) {
	m := firstAxis(option, axis)
	label, _ := m["axisLabel"].(map[string]any)
	if label == nil {
		label = map[string]any{}
	}
	label["formatter"] = jsFunc(src)
	m["axisLabel"] = label
}

// firstAxis returns the first axis of the given kind as a plain map,
// converting go-echarts' typed axis list to maps (through JSON) once.
func firstAxis(option map[string]any, axis string) map[string]any {
	if v, ok := option[axis].([]any); ok && len(v) > 0 {
		if m, ok := v[0].(map[string]any); ok {
			return m
		}
	}
	var list []map[string]any
	if b, err := json.Marshal(option[axis]); err == nil {
		_ = json.Unmarshal(b, &list)
	}
	if len(list) == 0 {
		list = []map[string]any{{}}
	}
	out := make([]any, len(list))
	for i := range list {
		out[i] = list[i]
	}
	option[axis] = out
	return list[0]
}

// esc escapes user text for tooltip HTML.
func esc(s string) string { return html.EscapeString(s) }

// axisName is an axis title with its unit, e.g. "difference (percentage points)".
func axisName(what, unit string) string {
	if unit == "" {
		return what
	}
	return fmt.Sprintf("%s (%s)", what, unit)
}
