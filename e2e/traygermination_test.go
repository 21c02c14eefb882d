package e2e

import (
	"context"
	"testing"
)

func init() {
	pageChecks["tray-germination"] = checkTrayGermination
	outputChecks["tray-germination"] = wantOutputKinds(map[string]int{"result-card": 1, "cluster-card": 1, "chart": 1})
}

// checkTrayGermination asserts what a reader of the tray notebook sees: the
// unit-level card with the warning that the seeds came in trays, the
// cluster card beside it, and the simulated coverage chart drawn.
//
// Expected values worked out independently of propscope, by hand from the
// trays in the notebook: 203 of 250 and 175 of 250 germinated, shares 81.2%
// and 70.0%, difference +11.2 points; 20 trays (10 per coating); the
// tray-by-tray Student t on the trays' own rates (means 0.812 and 0.700,
// variances 0.13456/9 and 0.132/9, pooled standard error 0.05442) is
// t = 2.058 (arithmetic).
func checkTrayGermination(t *testing.T, ctx context.Context) {
	if n := eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="result-card"]').length`); n != 1 {
		t.Fatalf("want one result card, found %d", n)
	}
	wantText(t, "the unit-level card", cardText(t, ctx, 0),
		"polymer", "clay", "203", "175", "250", "81.2%", "70.0%", "+11.2",
		"20 trays and are analysed here as if independent", "Before acting on this:")
	card := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="cluster-card"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the cluster card", card,
		"polymer", "clay", "20 trays", "Accounting for the trays", "Intracluster correlation", "Design effect",
		"Zou–Donner", "+11.2", "Tray by tray", "t = 2.058", "Before acting on this:")
	if n := eval[int](t, ctx, `document.querySelectorAll('figure[data-kind="simulated-coverage"] [data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want the simulated coverage chart drawn once, found %d", n)
	}
	caption := eval[string](t, ctx, `(() => { const f = document.querySelector('figure[data-kind="simulated-coverage"] figcaption'); return f ? f.textContent : ""; })()`)
	wantText(t, "the chart's notes", caption, "2000 simulated studies", "Monte Carlo standard errors", "Zou–Donner", "Wald")
	screenshotOf(t, ctx, "tray-germination-chart", `figure[data-kind="simulated-coverage"]`)
}
