package e2e

import (
	"context"
	"testing"
)

func init() {
	pageChecks["seed-trays"] = checkSeedTrays
	outputChecks["seed-trays"] = wantOutputKinds(map[string]int{"cluster-card": 1, "result-card": 1, "chart": 1})
}

// checkSeedTrays asserts what a reader of the seed-trays notebook sees: the
// cluster card with what the seeds are worth, the clustered and unit-level
// answers and the caution; the result card of the pooled seeds with the
// ignored-trays warning; the power chart drawn. The worth of 108 seeds is
// the library's; its tests check the design effect against 1 + (m − 1)ρ
// and ρ against SciPy's one-way ANOVA.
func checkSeedTrays(t *testing.T, ctx context.Context) {
	text := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="cluster-card"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the cluster card", text, "primed", "unprimed", "320 units from 16 trays behave like about 108 independent units",
		"Zou–Donner", "As if every unit were independent", "Tray by tray", "Before acting on this:")
	card := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="result-card"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the result card", card, "These units come in 16 trays and are analysed here as if independent")
	if n := eval[int](t, ctx, `document.querySelectorAll('[data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want one drawn chart, found %d", n)
	}
}
