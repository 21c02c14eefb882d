package e2e

import (
	"context"
	"testing"

	"github.com/propscope/propscope/e2e/nbrun"
)

func init() {
	pageChecks["tray-germination"] = checkTrayGermination
	outputChecks["tray-germination"] = func(t *testing.T, r nbrun.Result) {
		outs, err := nbrun.Outputs(r.Executed)
		if err != nil {
			t.Fatal(err)
		}
		kinds := map[string]int{}
		for _, o := range outs {
			kinds[o.Kind]++
		}
		if kinds["result-card"] != 1 || kinds["chart"] != 1 {
			t.Errorf("want one result-card and one chart output, got %v", kinds)
		}
	}
}

// checkTrayGermination asserts what a reader of the tray notebook sees: the
// unit-level card with the warning that the seeds came in trays, the
// clustered analysis beside it, and the simulated coverage chart drawn.
//
// Expected values worked out independently of propscope: 203 of 250 and 175
// of 250 germinated (the sums of the trays in the notebook), shares 81.2%
// and 70.0%, difference +11.2 points (arithmetic); 20 trays (10 per
// coating).
func checkTrayGermination(t *testing.T, ctx context.Context) {
	if n := eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="result-card"]').length`); n != 1 {
		t.Fatalf("want one result card, found %d", n)
	}
	wantText(t, "the unit-level card", cardText(t, ctx, 0),
		"polymer", "clay", "203", "175", "250", "81.2%", "70.0%", "+11.2",
		"20 trays and are analysed here as if independent", "Before acting on this:")
	page := eval[string](t, ctx, `document.body.innerText`)
	wantText(t, "the clustered analysis", page,
		"Clustered comparison: germinated: polymer 203/250 in 10 trays vs clay 175/250 in 10 trays",
		"Accounting for the trays", "ANOVA estimator", "design effect", "Zou–Donner", "Tray by tray")
	if n := eval[int](t, ctx, `document.querySelectorAll('figure[data-kind="simulated-coverage"] [data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want the simulated coverage chart drawn once, found %d", n)
	}
	caption := eval[string](t, ctx, `(() => { const f = document.querySelector('figure[data-kind="simulated-coverage"] figcaption'); return f ? f.textContent : ""; })()`)
	wantText(t, "the chart's notes", caption, "2000 simulated studies", "Monte Carlo standard errors", "Zou–Donner", "Wald")
	screenshotOf(t, ctx, "tray-germination-chart", `figure[data-kind="simulated-coverage"]`)
}
