package operating

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// TestSlicesAgainstBruteForce checks both slices against the plain double
// sum, on the difference and the odds-ratio scale.
func TestSlicesAgainstBruteForce(t *testing.T) {
	d := Design{N1: 9, N2: 14, Level: 0.95}
	for _, key := range []string{"wald", "newcombe", "woolf-odds-ratio"} {
		m, err := proportions.LookupInterval(key)
		if err != nil {
			t.Logf("%s not registered; skipped", key)
			continue
		}
		tab, err := NewOutcomeLimits(context.Background(), m, d)
		if err != nil {
			t.Fatal(err)
		}
		theta := 0.15
		if m.Scale != proportions.Difference {
			theta = 2.5
		}
		along, err := tab.AlongEffect(context.Background(), theta, WithSteps(23))
		if err != nil {
			t.Fatal(err)
		}
		first, err := tab.AlongFirst(context.Background(), 0.35, WithSteps(17))
		if err != nil {
			t.Fatal(err)
		}
		if len(along.Points) != 23 || len(first.Points) != 17 {
			t.Fatalf("%d and %d points", len(along.Points), len(first.Points))
		}
		for _, p := range append(along.Points, first.Points...) {
			closePoints(t, key+" slice "+p.String(), p, bruteCoverage(m, d, p.Pi1, p.Pi2), 1e-12)
		}
		for _, p := range along.Points {
			if got, _ := Truth(m.Scale, p.Pi1, p.Pi2); math.Abs(got-theta) > 1e-12*theta {
				t.Errorf("%s: truth %v on the line of %v", key, got, theta)
			}
		}
	}
}

// TestEffectLineRefusesWhatItCannotDraw: EffectLine allocates its k points
// up front, so a huge k is refused (2^40 points ended the program with an
// out-of-memory crash, and 10⁶ + 1 went through while WithSteps refuses
// it), and a scale without a line (an unknown value) is refused rather
// than answered with π1 = 0 everywhere.
func TestEffectLineRefusesWhatItCannotDraw(t *testing.T) {
	for _, k := range []int{1_000_002, 1 << 40} {
		if _, err := EffectLine(proportions.Difference, 0, k); !errors.Is(err, proportions.ErrTooLarge) {
			t.Errorf("%d points: got %v, want an error wrapping ErrTooLarge", k, err)
		}
	}
	if pts, err := EffectLine(proportions.Difference, 0.1, 1_000_001); err != nil || len(pts) != 1_000_001 {
		t.Errorf("1000001 points: %d points, %v", len(pts), err)
	}
	for _, f := range []proportions.Scale{proportions.SingleRate, proportions.Scale(9), proportions.Scale(-1)} {
		if _, err := EffectLine(f, 0.5, 5); !errors.Is(err, proportions.ErrUnsupported) {
			t.Errorf("scale %v: got %v, want an error wrapping ErrUnsupported", f, err)
		}
	}
}
