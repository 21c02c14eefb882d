package notebookui

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters/simulate"
)

// handCurve is a curve built by hand (no simulation): a naive and an
// adjusted method at three correlations, the labels given.
func handCurve(by, first, second string) *simulate.Curve {
	p := simulate.NewPlan(20, 25, 0.8, 0.7, 0)
	p.Studies = 2000
	p.By, p.Labels = by, proportions.Labels{First: first, Second: second, Event: "germinated"}
	c := &simulate.Curve{Correlations: []float64{0, 0.05, 0.2}}
	for i, rho := range c.Correlations {
		q := p
		q.Design.Correlation = rho
		wald := 0.95 - 0.12*float64(i)
		c.Results = append(c.Results, &simulate.Result{Plan: q, Truth: 0.1, Intervals: []simulate.SimulatedCoverage{
			{Method: "wald", MethodName: "Wald", Studies: 2000, Coverage: wald, StandardError: math.Sqrt(wald * (1 - wald) / 2000)},
			{Method: "zou-donner", MethodName: "Zou–Donner", Adjusted: true, Studies: 2000, Coverage: 0.94, StandardError: 0.0053},
		}})
	}
	return c
}

// The chart draws one line per method, dashed for the naive and solid
// for the adjusted, and the band of ±2 Monte Carlo SEs around nominal:
// 2·√(0.95·0.05/2000) = 0.974 points.
func TestSimulatedCoverageChart(t *testing.T) {
	ch, err := SimulatedCoverageChart(handCurve("tray", "coated", "bare"))
	if err != nil {
		t.Fatal(err)
	}
	if ch.Name() != "simulated-coverage" {
		t.Errorf("name %q", ch.Name())
	}
	opt := optionOfChart(t, ch)
	series := opt["series"].([]any)
	if len(series) != 2 {
		t.Fatalf("%d series, want 2", len(series))
	}
	for i, want := range []string{"dashed", "solid"} {
		s := series[i].(map[string]any)
		if got := s["lineStyle"].(map[string]any)["type"]; got != want {
			t.Errorf("series %d drawn %v, want %s", i, got, want)
		}
		if n := len(s["data"].([]any)); n != 3 {
			t.Errorf("series %d has %d points", i, n)
		}
	}
	area := series[0].(map[string]any)["markArea"].(map[string]any)["data"].([]any)[0].([]any)
	lo, hi := area[0].(map[string]any)["yAxis"].(float64), area[1].(map[string]any)["yAxis"].(float64)
	if math.Abs(lo-(0.95-0.009747)) > 1e-5 || math.Abs(hi-(0.95+0.009747)) > 1e-5 {
		t.Errorf("Monte Carlo band %v to %v, want 95%% ± 0.9747 points", lo, hi)
	}
	if txt := ch.Text(); !strings.Contains(txt, "coated 20 and bare 20 clusters by tray") || !strings.Contains(txt, "71.00% ±") {
		t.Errorf("text:\n%s", txt)
	}
	if _, err := SimulatedCoverageChart(&simulate.Curve{}); !errors.Is(err, errNoIntervals) {
		t.Errorf("empty curve: %v", err)
	}
}

// A real sweep renders: the simulation's own methods, naive and adjusted.
func TestSimulatedCoverageChartFromSweep(t *testing.T) {
	p := simulate.NewPlan(4, 5, 0.6, 0.5, 0)
	p.Studies = 200
	c, err := simulate.Sweep(t.Context(), p, []float64{0, 0.3})
	if err != nil {
		t.Fatal(err)
	}
	ch, err := SimulatedCoverageChart(c)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := len(optionOfChart(t, ch)["series"].([]any)), len(c.Results[0].Intervals); got != want {
		t.Errorf("%d series for %d methods", got, want)
	}
}
