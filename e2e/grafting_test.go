package e2e

import (
	"context"
	"testing"
)

func init() {
	pageChecks["grafting-bayes"] = checkGrafting
	outputChecks["grafting-bayes"] = wantOutputKinds(map[string]int{"bayes-card": 1, "chart": 1})
}

// checkGrafting asserts what a reader of the grafting notebook sees: the
// Bayesian card with the prior named, the probability and the caution, and
// the posterior chart drawn. The probability P(π1 > π2) = 0.961 for 46/60
// against 37/60 under uniform priors is the library's; the test of the
// library checks that sum against Fisher's test (Altham) and gonum's
// quadrature.
func checkGrafting(t *testing.T, ctx context.Context) {
	text := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="bayes-card"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the Bayesian card", text,
		"whip-and-tongue", "cleft", "uniform Beta(1, 1) on each group", "0.961", "equivalence region", "Before acting on this:")
	if n := eval[int](t, ctx, `document.querySelectorAll('[data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want one drawn chart, found %d", n)
	}
}
