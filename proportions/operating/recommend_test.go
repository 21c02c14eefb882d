package operating

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// TestRecommend checks that the ranking follows the documented criterion
// and, on the engine's own output, the facts of the trade at 100 per
// group: the Wald interval is last and the Agresti–Caffo interval holds
// the level (common practice; Agresti & Caffo 2000, recalled from memory).
func TestRecommend(t *testing.T) {
	d := Design{N1: 100, N2: 100, Level: 0.95}
	rec, err := Recommend(context.Background(), proportions.Difference, d)
	if err != nil {
		t.Fatal(err)
	}
	if len(rec.Ranking)+len(rec.Skipped) != len(proportions.EnumerableIntervalMethods(proportions.Difference)) {
		t.Errorf("%d ranked and %d skipped of %d methods", len(rec.Ranking), len(rec.Skipped), len(proportions.EnumerableIntervalMethods(proportions.Difference)))
	}
	for i := 1; i < len(rec.Ranking); i++ {
		a, b := rec.Ranking[i-1], rec.Ranking[i]
		if compareRanked(a, b, d.Level) > 0 {
			t.Errorf("%s ranked before %s against the criterion", a.MethodName, b.MethodName)
		}
		if a.HoldsLevel != (a.Summary.Min >= d.Level-DefaultTolerance) || a.Reason == "" || a.Rank != i {
			t.Errorf("inconsistent entry %+v", a)
		}
	}
	if last := rec.Ranking[len(rec.Ranking)-1]; last.Method != "wald" {
		t.Errorf("last is %s; expected Wald\n%s", last.MethodName, rec)
	}
	for _, r := range rec.Ranking {
		if r.Method == "agresti-caffo" && !r.HoldsLevel {
			t.Errorf("Agresti–Caffo should hold the level at %v: %s", d, r.Reason)
		}
	}
	wide, err := Recommend(context.Background(), proportions.Difference, d, WithTolerance(0.9), WithGrid(DefaultGrid()[:50], DefaultGrid()[:50]))
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range wide.Ranking {
		if !r.HoldsLevel {
			t.Errorf("with a 90-point tolerance every method holds: %s", r.Reason)
		}
	}
	if _, err := Recommend(context.Background(), proportions.Difference, d, WithTolerance(-1)); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("negative tolerance: %v", err)
	}
	if _, err := Recommend(context.Background(), proportions.Difference, d, WithTolerance(math.NaN())); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("NaN tolerance: %v", err)
	}
}

// TestRecommendAtALowLevel: at a level below 0.02 the default tolerance
// of 2 points would leave no coverage to hold, and Recommend failed with
// an error about a tolerance nobody set; the default is now half the level
// there. A tolerance set by hand is still checked against the level.
func TestRecommendAtALowLevel(t *testing.T) {
	d, err := NewDesign(8, 8, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	grid := []float64{0.2, 0.5, 0.8}
	rec, err := Recommend(context.Background(), proportions.Difference, d, WithGrid(grid, grid))
	if err != nil {
		t.Fatalf("level 0.01 with the default tolerance: %v", err)
	}
	if rec.Tolerance != 0.005 {
		t.Errorf("default tolerance at level 0.01: %v, want half the level, 0.005", rec.Tolerance)
	}
	if _, err := Recommend(context.Background(), proportions.Difference, d, WithGrid(grid, grid), WithTolerance(0.02)); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("tolerance 0.02 set by hand at level 0.01: %v, want ErrPlan", err)
	}
}
