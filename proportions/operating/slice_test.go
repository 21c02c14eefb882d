package operating

import (
	"context"
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
