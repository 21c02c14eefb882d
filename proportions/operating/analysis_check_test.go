package operating

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// Fact of the trade (common practice; Newcombe 1998, Stat Med 17:873–890,
// and Brown & Li 2005 on coverage): at small n with a rate near 0 the Wald
// interval undercovers badly while the score intervals stay near nominal.
func TestCheckAnalysisFlagsWaldAtSmallN(t *testing.T) {
	c, err := proportions.NewComparison(1, 15, 4, 18, proportions.Labels{First: "A", Second: "B", Event: "defective"})
	if err != nil {
		t.Fatal(err)
	}
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	if err := CheckAnalysis(context.Background(), &a); err != nil {
		t.Fatal(err)
	}
	var flagged []string
	for _, w := range a.Warnings {
		if w.Code == proportions.WarnUndercoverage {
			flagged = append(flagged, w.Message)
		}
	}
	joined := strings.Join(flagged, "\n")
	t.Log(joined)
	if !strings.Contains(joined, "the Wald interval") {
		t.Errorf("Wald not flagged at n = 15/18 with rates near 0: %v", flagged)
	}
	for _, score := range []string{"Miettinen–Nurminen score interval", "Mee score interval", "Agresti–Caffo interval"} {
		if strings.Contains(joined, score) {
			t.Errorf("%s flagged: %v", score, flagged)
		}
	}
}

func TestCheckAnalysisSkipsLargeDesigns(t *testing.T) {
	c, _ := proportions.NewComparison(300, 5000, 280, 5000, proportions.Labels{})
	a, err := proportions.Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	before := len(a.Warnings)
	if err := CheckAnalysis(context.Background(), &a); err != nil || len(a.Warnings) != before {
		t.Errorf("large design: err %v, %d → %d warnings", err, before, len(a.Warnings))
	}
}

// TestCheckAnalysisNil: a nil analysis is an error wrapping ErrEmptyInput,
// not a nil-pointer panic.
func TestCheckAnalysisNil(t *testing.T) {
	if err := CheckAnalysis(context.Background(), nil); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("got %v, want an error wrapping ErrEmptyInput", err)
	}
}

// TestDesignNegativeSize: a negative group size is a negative count
// (ErrNegativeCount), as in proportions, not a group without trials.
func TestDesignNegativeSize(t *testing.T) {
	if _, err := NewDesign(-1, 3, 0.95); !errors.Is(err, proportions.ErrNegativeCount) {
		t.Errorf("NewDesign(-1, 3): got %v, want an error wrapping ErrNegativeCount", err)
	}
	if _, err := NewDesign(3, 0, 0.95); !errors.Is(err, proportions.ErrNoTrials) {
		t.Errorf("NewDesign(3, 0): got %v, want an error wrapping ErrNoTrials", err)
	}
}
