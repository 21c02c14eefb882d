package notebookui

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

func waldSurface(t *testing.T, n1, n2 int) *operating.Surface {
	t.Helper()
	d, err := operating.NewDesign(n1, n2, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := operating.NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		t.Fatal(err)
	}
	grid := []float64{0, 0.1, 0.25, 0.5, 0.9, 1}
	s, err := tab.Surface(context.Background(), operating.WithGrid(grid, grid))
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func TestCoverageMapOption(t *testing.T) {
	s := waldSurface(t, 12, 15)
	ch, err := CoverageMapChart(s)
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, ch)
	checkCommon(t, m, "%")
	series := seriesList(t, m)[0]
	data := series["data"].([]any)
	seen := 0
	for _, item := range data {
		v := values(t, item)
		i, j := int(v[0]), int(v[1])
		p := s.At(i, j)
		if !p.Defined {
			t.Fatalf("undefined point (%d, %d) drawn", i, j)
		}
		if !near7(v[2], p.Coverage) || !near7(v[3], p.Below) || !near7(v[4], p.Above) || v[5] != p.Pi1 || v[6] != p.Pi2 {
			t.Errorf("cell (%d, %d) = %v, surface has %+v", i, j, v, p)
		}
		seen++
	}
	defined := 0
	for _, d := range s.Defined {
		if d {
			defined++
		}
	}
	if seen != defined {
		t.Errorf("%d cells drawn, %d defined points", seen, defined)
	}
	// The classes must tile the line: each piece starts where the previous
	// one ends, the first is open below and the last open above, and the
	// middle class is nominal ± 1 point.
	pieces := m["visualMap"].([]any)[0].(map[string]any)["pieces"].([]any)
	var prev any
	for k, raw := range pieces {
		p := raw.(map[string]any)
		if k == 0 && p["gte"] != nil || k == len(pieces)-1 && p["lt"] != nil {
			t.Errorf("piece %d %v should be open-ended", k, p)
		}
		if k > 0 && p["gte"] != prev {
			t.Errorf("piece %d starts at %v, previous ends at %v", k, p["gte"], prev)
		}
		prev = p["lt"]
		if p["label"] == "within 1 point of nominal" && (math.Abs(p["gte"].(float64)-0.94) > 1e-12 || math.Abs(p["lt"].(float64)-0.96) > 1e-12) {
			t.Errorf("nominal class %v, want [0.94, 0.96)", p)
		}
	}
	mark := series["markPoint"].(map[string]any)["data"].([]any)[0].(map[string]any)
	coord := mark["coord"].([]any)
	sum := s.Summary()
	if p := s.At(int(coord[0].(float64)), int(coord[1].(float64))); p.Coverage != sum.Min {
		t.Errorf("marked cell has coverage %v, the surface's minimum is %v", p.Coverage, sum.Min)
	}
}

func TestCoverageSliceOption(t *testing.T) {
	d, _ := operating.NewDesign(20, 20, 0.95)
	var slices []*operating.Slice
	for _, m := range []proportions.IntervalMethod{proportions.Wald, proportions.Mee} {
		tab, err := operating.NewOutcomeLimits(context.Background(), m, d)
		if err != nil {
			t.Fatal(err)
		}
		s, err := tab.AlongFirst(context.Background(), 0.3, operating.WithSteps(11))
		if err != nil {
			t.Fatal(err)
		}
		slices = append(slices, s)
	}
	ch, err := CoverageSliceChart(slices)
	if err != nil {
		t.Fatal(err)
	}
	m := optionOfChart(t, ch)
	checkCommon(t, m, "%")
	series := seriesList(t, m)
	if len(series) != 2 || series[0]["name"] != proportions.Wald.Name || series[1]["name"] != proportions.Mee.Name {
		t.Fatalf("series %v, want one line per method", series)
	}
	for k, s := range series {
		var defined []operating.Point
		for _, p := range slices[k].Points {
			if p.Defined {
				defined = append(defined, p)
			}
		}
		items := s["data"].([]any)
		if len(items) != len(defined) {
			t.Fatalf("%s: %d points drawn, %d defined", slices[k].MethodName, len(items), len(defined))
		}
		for i, item := range items {
			v := values(t, item)
			p := defined[i]
			if v[0] != p.Pi1 || !near7(v[1], p.Coverage) || !near7(v[4], p.Below) || !near7(v[5], p.Above) {
				t.Errorf("%s point %d = %v, want π1 %v coverage %v", slices[k].MethodName, i, v, p.Pi1, p.Coverage)
			}
		}
	}
	band := series[0]["markArea"].(map[string]any)["data"].([]any)[0].([]any)
	if lo := band[0].(map[string]any)["yAxis"].(float64); math.Abs(lo-0.94) > 1e-12 {
		t.Errorf("band starts at %v, want 0.94", lo)
	}
	// Slices along different lines cannot share a chart.
	tab, _ := operating.NewOutcomeLimits(context.Background(), proportions.Wald, d)
	other, err := tab.AlongEffect(context.Background(), 0.1, operating.WithSteps(11))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := CoverageSliceChart([]*operating.Slice{slices[0], other}); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("mixed slices: %v", err)
	}
	if ch, err := CoverageSliceChart([]*operating.Slice{other}); err != nil || !strings.Contains(ch.Title()+ch.Text(), "+10.00 pp") {
		t.Errorf("slice at a fixed difference: %v", err)
	}
	zoomed, err := CoverageSliceChart(slices, WithZoom(0, 0.1))
	if err != nil {
		t.Fatal(err)
	}
	z := optionOfChart(t, zoomed)["dataZoom"].([]any)[1].(map[string]any)
	if z["startValue"] != 0.0 || z["endValue"] != 0.1 {
		t.Errorf("zoom window %v to %v, want 0 to 0.1", z["startValue"], z["endValue"])
	}
}

// near7 compares a drawn probability (kept to seven decimals) with the
// computed one.
func near7(drawn, computed float64) bool { return math.Abs(drawn-computed) <= 5.000001e-8 }

// TestCoverageMapTitleStatesItsGrid: a map over a narrowed grid says which
// rates it covers; only a grid over (almost) all of 0 to 1 is "over all
// true rates".
func TestCoverageMapTitleStatesItsGrid(t *testing.T) {
	d, err := operating.NewDesign(12, 12, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	tab, err := operating.NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		t.Fatal(err)
	}
	narrow := []float64{0.005, 0.025, 0.05, 0.075, 0.1}
	s, err := tab.Surface(context.Background(), operating.WithGrid(narrow, narrow))
	if err != nil {
		t.Fatal(err)
	}
	ch, err := CoverageMapChart(s)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(ch.Title(), "all true rates") || !strings.Contains(ch.Title(), "π1 from 0.5% to 10%") {
		t.Errorf("narrowed grid, title %q", ch.Title())
	}
	if ch, err := CoverageMapChart(waldSurface(t, 12, 15)); err != nil || !strings.Contains(ch.Title(), "over all true rates") {
		t.Errorf("whole grid, title %q (%v)", ch.Title(), err)
	}
}
