package operating

import (
	"context"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// TestFactsOfTheTrade checks, on the engine's own exact surfaces, what
// every comparison of these intervals reports (common practice; see
// Newcombe 1998, Statistics in Medicine 17:873–890, and Agresti & Caffo
// 2000, The American Statistician 54:280–288, whose conclusions are
// recalled here from memory, not as numbers): at small n the Wald
// interval undercovers badly when both rates are near 0 or near 1, while
// the Agresti–Caffo interval and the score-based intervals (Newcombe's
// hybrid, Mee, Miettinen–Nurminen) stay near the nominal level. The bounds
// below are deliberately loose: they separate "badly" from "near".
func TestFactsOfTheTrade(t *testing.T) {
	d := Design{N1: 15, N2: 15, Level: 0.95}
	nearZero := Region{Pi1Min: 0.01, Pi1Max: 0.1, Pi2Min: 0.01, Pi2Max: 0.1}
	nearOne := Region{Pi1Min: 0.9, Pi1Max: 0.99, Pi2Min: 0.9, Pi2Max: 0.99}
	interior := Region{Pi1Min: 0.01, Pi1Max: 0.99, Pi2Min: 0.01, Pi2Max: 0.99}
	summaries := func(m proportions.IntervalMethod) (zero, one, all Summary) {
		tab, err := NewOutcomeLimits(context.Background(), m, d)
		if err != nil {
			t.Fatal(err)
		}
		s, err := tab.Surface(context.Background())
		if err != nil {
			t.Fatal(err)
		}
		zero, _ = s.RegionSummary(nearZero)
		one, _ = s.RegionSummary(nearOne)
		all, _ = s.RegionSummary(interior)
		return zero, one, all
	}
	zero, one, _ := summaries(proportions.Wald)
	for name, s := range map[string]Summary{"near 0": zero, "near 1": one} {
		if s.Min > 0.5 || s.Mean > 0.85 {
			t.Errorf("Wald at %v %s: %v; expected bad undercoverage", d, name, s)
		}
	}
	for _, key := range []string{"agresti-caffo", "newcombe", "mee", "miettinen-nurminen"} {
		m, err := proportions.LookupInterval(key)
		if err != nil {
			t.Logf("%s not registered; skipped", key)
			continue
		}
		zero, one, all := summaries(m)
		if all.Mean < 0.945 || all.Mean > 0.965 || all.Min < 0.88 || zero.Mean < 0.95 || one.Mean < 0.95 {
			t.Errorf("%s at %v: interior %v; near 0 mean %.4f; near 1 mean %.4f; expected near-nominal coverage", key, d, all, zero.Mean, one.Mean)
		}
	}
}
