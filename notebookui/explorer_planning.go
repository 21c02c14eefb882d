package notebookui

import (
	"encoding/json"
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/planning"
)

// PlanningExplorer lets the reader move the inputs of a study plan (the
// goal, the two anticipated rates, the margin and the target power) and
// see the required group sizes (planning.SampleSize) and the power
// curve against group size (planning.PowerByTrials, drawn by PowerChart)
// follow. The other fields of the plan (scale, α for the starting goal,
// allocation, drop-out, variance rule, continuity correction) stay as
// given.
//
// Build it as a literal; Plan is required (planning.NewPlan gives
// one with the usual defaults).
type PlanningExplorer struct {
	// Plan is the starting plan.
	Plan planning.Plan
}

// Slider ranges of the planning explorer.
const (
	// planRateSteps: rates move in steps of 0.1 percentage point.
	planRateSteps = 1000
	// planMarginReach is the largest margin on the difference scale, in
	// tenths of a percentage point (±50 points).
	planMarginReach = 500
	// Ratio-scale margins move in hundredths from 0.10 to 10.
	planRatioMin, planRatioMax = 10, 1000
)

func (e PlanningExplorer) validate() error {
	d := e.Plan
	if d.Scale != proportions.Difference && d.Scale != proportions.Ratio {
		return fmt.Errorf("planning explorer: scale %s: %w; plan on the difference or the ratio scale", d.Scale, proportions.ErrUnsupported)
	}
	for _, r := range []float64{d.Rate1, d.Rate2} {
		if !(r > 0 && r < 1) {
			return fmt.Errorf("planning explorer: anticipated rate %v: %w; a rate must lie strictly between 0 and 1", r, proportions.ErrPlan)
		}
	}
	if !(d.Power >= 0.5 && d.Power < 1) {
		return fmt.Errorf("planning explorer: target power %v: %w; the slider runs from 50%% to 99%%", d.Power, proportions.ErrPlan)
	}
	if d.Goal < planning.Equality || d.Goal > planning.Equivalence {
		return fmt.Errorf("planning explorer: goal %d: %w; use Equality, Superiority, NonInferiority or Equivalence", int(d.Goal), proportions.ErrPlan)
	}
	return nil
}

// Run shows the explorer: live in a notebook with a front end, the
// starting plan as a static view under nbconvert or outside a notebook
// (see WhatIfExplorer.Run for the modes).
func (e PlanningExplorer) Run(opts ...LiveOption) error {
	if err := e.validate(); err != nil {
		return err
	}
	return run(planningModel{e}, opts)
}

// Frame returns what the explorer shows for a plan (its goal, rates,
// margin and power; the other fields are those of e.Plan), as the live
// explorer would draw it. The values are rounded to the sliders' steps.
func (e PlanningExplorer) Frame(d planning.Plan) (Frame, error) {
	if err := e.validate(); err != nil {
		return Frame{}, err
	}
	m := planningModel{e}
	return frameOf(m, m.positions(d)), nil
}

type planningModel struct{ e PlanningExplorer }

var planGoals = []planning.Goal{planning.Equality, planning.Superiority, planning.NonInferiority, planning.Equivalence}

func (planningModel) name() string  { return "planning" }
func (planningModel) title() string { return "Study plan: required group size and power" }

// positions maps a plan to slider positions.
func (m planningModel) positions(d planning.Plan) []int {
	cs := m.controls()
	pos := []int{int(d.Goal), rateStep(d.Rate1), rateStep(d.Rate2), m.marginStep(d.Margin), int(math.Round(100 * d.Power))}
	for i := range pos {
		pos[i] = cs[i].clamp(pos[i])
	}
	return pos
}

func rateStep(r float64) int { return int(math.Round(r * planRateSteps)) }

func (m planningModel) ratio() bool { return m.e.Plan.Scale == proportions.Ratio }

func (m planningModel) marginStep(v float64) int {
	if m.ratio() {
		if v == 0 {
			return 100
		}
		return int(math.Round(100 * v))
	}
	return int(math.Round(v * 1000))
}

func (m planningModel) marginValue(pos int) float64 {
	if m.ratio() {
		return float64(pos) / 100
	}
	return float64(pos) / 1000
}

func (m planningModel) controls() []control {
	d := m.e.Plan
	goals := make([]string, len(planGoals))
	for i, g := range planGoals {
		goals[i] = g.String()
	}
	rate := func(p int) string { return trimPct(float64(p) / planRateSteps) }
	margin := control{key: "margin", label: "margin δ (π1 − π2)", min: -planMarginReach, max: planMarginReach,
		show: func(p int) string { return signedPP(m.marginValue(p)) }}
	if m.ratio() {
		margin = control{key: "margin", label: "margin ρ (π1 / π2)", min: planRatioMin, max: planRatioMax,
			show: func(p int) string { return strconv.FormatFloat(m.marginValue(p), 'f', 2, 64) }}
	}
	margin.value = m.marginStep(d.Margin)
	return []control{
		{key: "goal", label: "goal", options: goals, value: int(d.Goal)},
		{key: "rate1", label: "anticipated rate π1", min: 1, max: planRateSteps - 1, value: rateStep(d.Rate1), show: rate},
		{key: "rate2", label: "anticipated rate π2", min: 1, max: planRateSteps - 1, value: rateStep(d.Rate2), show: rate},
		margin,
		{key: "power", label: "target power", min: 50, max: 99, value: int(math.Round(100 * d.Power)),
			show: func(p int) string { return strconv.Itoa(p) + "%" }},
	}
}

// unused marks the margin of a test of equality, which has none.
func (m planningModel) unused(pos []int, i int) bool {
	return i == 3 && planGoals[pos[0]] == planning.Equality
}

// plan builds the plan at the positions. The starting goal keeps the
// starting α; another goal takes NewPlan's α for it. Which way is better
// (lower for defect rates, say) always stays the starting plan's.
func (m planningModel) plan(pos []int) planning.Plan {
	d := m.e.Plan
	goal := planGoals[pos[0]]
	if goal != d.Goal {
		d.Alpha = planning.NewPlan(goal, 0.5, 0.5).Alpha
		d.Goal = goal
	}
	d.Rate1 = float64(pos[1]) / planRateSteps
	d.Rate2 = float64(pos[2]) / planRateSteps
	d.Margin = m.marginValue(pos[3])
	if goal == planning.Equality {
		d.Margin = 0
	}
	d.Power = float64(pos[4]) / 100
	if d.Goal != planning.Equality && d.ContinuityCorrection && d.Margin != d.Scale.NoEffect() {
		d.ContinuityCorrection = false // published for a zero margin only
	}
	return d
}

// render computes the sample size and the power curve for the plan; a
// plan with no finite answer (equal rates in a test of equality, a margin
// of the wrong sign) is shown as the planning package's explanation.
func (m planningModel) render(pos []int) Displayable {
	d := m.plan(pos)
	res, err := planning.SampleSize(d)
	if err != nil {
		return message{kind: "planning", text: "No sample size for these settings: " + err.Error()}
	}
	curve, err := planning.PowerByTrials(d, 2, max(2*res.N1, 10))
	if err != nil {
		return message{kind: "planning", text: "No power curve for these settings: " + err.Error()}
	}
	ch, err := PowerChart([]planning.PowerCurve{curve}, WithHeight(380))
	if err != nil {
		return message{kind: "planning", text: "The power curve cannot be drawn: " + err.Error()}
	}
	return views{planFigures{res}, ch}
}

// planFigures shows a sample-size result: the group sizes, the power they
// reach, the method and formula, notes and the planning caution.
type planFigures struct{ r planning.SampleSizeResult }

func (p planFigures) Kind() string { return "plan" }

func (p planFigures) rows() [][2]string {
	r := p.r
	rows := [][2]string{
		{"required group sizes", fmt.Sprintf("n1 = %d, n2 = %d (total %d)", r.N1, r.N2, r.Total)},
	}
	if r.Plan.Dropout > 0 {
		rows = append(rows, [2]string{"to enrol (drop-out " + trimPct(r.Plan.Dropout) + ")",
			fmt.Sprintf("%d + %d = %d", r.Enrolled1, r.Enrolled2, r.EnrolledTotal)})
	}
	rows = append(rows,
		[2]string{"power at these sizes", percent(r.Power, 1)},
		[2]string{"plan", r.Plan.String()},
		[2]string{"method", r.Approximation},
		[2]string{"formula", r.Formula},
	)
	return rows
}

func (p planFigures) HTML() string {
	r := p.r
	var b strings.Builder
	fmt.Fprintf(&b, `<div class="propscope-plan" data-n1="%d" data-n2="%d" data-power="%s" style="margin:.3rem 0 .5rem;">`, r.N1, r.N2, strconv.FormatFloat(r.Power, 'f', 6, 64))
	fmt.Fprintf(&b, `<div style="font-size:1.6em;font-weight:700;font-variant-numeric:tabular-nums;" data-role="required-n">n1 = %d, n2 = %d</div>`, r.N1, r.N2)
	b.WriteString(`<table style="border-collapse:collapse;font-size:.9em;margin:.3rem 0;">`)
	for _, row := range p.rows()[1:] {
		fmt.Fprintf(&b, `<tr><th scope="row" style="text-align:left;font-weight:600;padding:2px 12px 2px 0;vertical-align:top;">%s</th><td style="text-align:left;padding:2px 0;">%s</td></tr>`,
			html.EscapeString(row[0]), html.EscapeString(row[1]))
	}
	b.WriteString(`</table>`)
	for _, n := range r.Notes {
		fmt.Fprintf(&b, `<p style="margin:.2rem 0;font-size:.9em;">Note: %s</p>`, html.EscapeString(n))
	}
	// The planning caution is under the power chart that follows.
	b.WriteString(`</div>`)
	return b.String()
}

func (p planFigures) Markdown() string {
	var b strings.Builder
	b.WriteString("| | |\n| --- | --- |\n")
	for _, row := range p.rows() {
		b.WriteString("| " + mdEscape(row[0]) + " | " + mdEscape(row[1]) + " |\n")
	}
	for _, n := range p.r.Notes {
		b.WriteString("\nNote: " + mdEscape(n) + "\n")
	}
	return b.String()
}

func (p planFigures) Text() string { return p.r.String() }

func (p planFigures) JSON() ([]byte, error) {
	return json.Marshal(struct {
		Kind   string                    `json:"kind"`
		Result planning.SampleSizeResult `json:"sample_size"`
	}{"plan", p.r})
}

// trimPct prints a share as a percentage with at most one decimal
// ("12.5%", "80%").
func trimPct(v float64) string {
	return strings.Replace(strconv.FormatFloat(math.Round(v*1000)/10, 'f', -1, 64), "-", minus, 1) + "%"
}

// signedPP prints a difference in percentage points with a sign and at
// most one decimal ("−5 pp", "+2.5 pp").
func signedPP(v float64) string {
	s := strconv.FormatFloat(math.Abs(math.Round(v*1000)/10), 'f', -1, 64)
	switch {
	case s == "0":
		return "0 pp"
	case v < 0:
		return minus + s + " pp"
	}
	return "+" + s + " pp"
}
