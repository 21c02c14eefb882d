package notebookui

import (
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions/planning"
)

func TestPowerBySizeChartOption(t *testing.T) {
	d := planning.NewPlan(planning.Equality, 0.60, 0.75)
	curve, err := planning.PowerByTrials(d, 20, 250)
	if err != nil {
		t.Fatal(err)
	}
	ch, err := PowerChart([]planning.PowerCurve{curve})
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, ch)
	checkCommon(t, m, "units", "%")
	s := seriesList(t, m)[0]
	data := s["data"].([]any)
	if len(data) != len(curve.Points) {
		t.Fatalf("%d points drawn, curve has %d", len(data), len(curve.Points))
	}
	for i, p := range curve.Points {
		v := values(t, data[i])
		if v[0] != float64(p.N1) || v[1] != p.Power || v[2] != float64(p.N2) {
			t.Fatalf("point %d = %v, want (%d, %v, %d)", i, v, p.N1, p.Power, p.N2)
		}
	}
	// The marked size must be the planning's own sample size for the same
	// design: the asymptotic power curve and the sample-size formula agree.
	ss, err := planning.SampleSize(d)
	if err != nil {
		t.Fatal(err)
	}
	marks := s["markPoint"].(map[string]any)["data"].([]any)
	if got := marks[0].(map[string]any)["value"].(float64); got != float64(ss.N1) {
		t.Errorf("marked n1 = %v, sample size n1 = %d", got, ss.N1)
	}
	line := s["markLine"].(map[string]any)["data"].([]any)[0].(map[string]any)
	if line["yAxis"] != 0.8 {
		t.Errorf("target line at %v, want 0.8", line["yAxis"])
	}
}

func TestReachIndexSawTooth(t *testing.T) {
	pts := func(powers ...float64) []planning.PowerPoint {
		out := make([]planning.PowerPoint, len(powers))
		for i, p := range powers {
			out[i] = planning.PowerPoint{N1: int64(10 + i), Power: p}
		}
		return out
	}
	for _, tc := range []struct {
		powers       []float64
		first, stays int
	}{
		{[]float64{0.70, 0.81, 0.79, 0.82, 0.83}, 1, 3},
		{[]float64{0.70, 0.75, 0.80, 0.90}, 2, 2},
		{[]float64{0.70, 0.81, 0.79}, 1, -1},
		{[]float64{0.1, 0.2}, -1, -1},
	} {
		first, stays := reachIndex(pts(tc.powers...), 0.8)
		if first != tc.first || stays != tc.stays {
			t.Errorf("%v: first %d stays %d, want %d %d", tc.powers, first, stays, tc.first, tc.stays)
		}
	}
}

func TestPowerByDifferenceChartOption(t *testing.T) {
	d := planning.NewPlan(planning.NonInferiority, 0.85, 0.85)
	d.Margin = -0.1
	curve, err := planning.PowerByDifference(d, 200, 200, 0.7, 0.95, 51)
	if err != nil {
		t.Fatal(err)
	}
	ch, err := PowerChart([]planning.PowerCurve{curve})
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, ch)
	checkCommon(t, m, "percentage points", "%")
	s := seriesList(t, m)[0]
	for i, item := range s["data"].([]any) {
		v := values(t, item)
		p := curve.Points[i]
		if v[0] != p.Difference || v[1] != p.Power || v[2] != p.Rate1 {
			t.Fatalf("point %d = %v, want (%v, %v, %v)", i, v, p.Difference, p.Power, p.Rate1)
		}
	}
	found := map[string]float64{}
	for _, l := range s["markLine"].(map[string]any)["data"].([]any) {
		pair, ok := l.([]any) // a vertical line: from (x, 0) to (x, 1)
		if !ok {
			continue
		}
		from, to := pair[0].(map[string]any), pair[1].(map[string]any)
		x0, x1 := values(t, from["coord"]), values(t, to["coord"])
		if x0[0] != x1[0] || x0[1] != 0 || x1[1] != 1 {
			t.Errorf("line %v is not vertical across the power axis", pair)
		}
		found[from["name"].(string)] = x0[0]
	}
	if found["margin"] != -0.1 || found["anticipated"] != 0 {
		t.Errorf("vertical lines %v, want the margin -0.1 and the anticipated difference 0", found)
	}
	// The axis fits the curve and the marks: no more than 5% of the span
	// left empty at either end.
	lo, hi := math.Min(curve.Points[0].Difference, -0.1), curve.Points[len(curve.Points)-1].Difference
	ax := m["xAxis"].([]any)[0].(map[string]any)
	slack := 0.05 * (hi - lo)
	if min, max := ax["min"].(float64), ax["max"].(float64); min > lo || max < hi || lo-min > slack || max-hi > slack {
		t.Errorf("x axis %v to %v for a curve and marks from %v to %v", min, max, lo, hi)
	}
}

func TestPowerChartErrors(t *testing.T) {
	d := planning.NewPlan(planning.Equality, 0.60, 0.75)
	byN, _ := planning.PowerByTrials(d, 20, 40)
	byD, _ := planning.PowerByDifference(d, 50, 50, 0.5, 0.9, 5)
	if _, err := PowerChart([]planning.PowerCurve{byN, byD}); !errors.Is(err, errMixedCurves) {
		t.Errorf("mixed axes: %v", err)
	}
	if _, err := PowerChart(nil); err == nil {
		t.Error("no curves: no error")
	}
}
