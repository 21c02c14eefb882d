package e2e

import (
	"context"
	"testing"
)

func init() {
	pageChecks["blocked-germination"] = checkBlockedGermination
	outputChecks["blocked-germination"] = wantOutputKinds(map[string]int{"strata-card": 1, "chart": 1})
}

// checkBlockedGermination asserts what a reader of the blocked trial sees:
// the stratified card with the within-block answer, the lost block
// flagged, the reversal warning beside the pooled answer, the homogeneity
// section and the caution; and the forest chart drawn. The pooled
// difference is worked by hand from the notebook's counts: primed 249 of
// 420 (59.3%), untreated 295 of 400 (73.75%), −14.5 points; within every
// block primed is ahead by 8.8 to 12.5 points.
func checkBlockedGermination(t *testing.T, ctx context.Context) {
	text := eval[string](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="strata-card"]'); return c ? c.innerText : ""; })()`)
	wantText(t, "the stratified card", text,
		"Within each block: germinated: primed vs untreated", "Common difference primed − untreated",
		"B9", "not used (a group has no units)", "The direction reverses", "−14.5",
		"Same effect in every block?", "Cochran–Mantel–Haenszel", "Before acting on this:")
	if n := eval[int](t, ctx, `document.querySelectorAll('[data-propscope-drawn="true"]').length`); n != 1 {
		t.Errorf("want one drawn chart (the forest chart), found %d", n)
	}
	if kind := eval[string](t, ctx, `(() => { const f = document.querySelector('figure.propscope-chart'); return f ? f.dataset.kind : ""; })()`); kind != "forest" {
		t.Errorf("the chart drawn is %q, want the forest chart", kind)
	}
}
