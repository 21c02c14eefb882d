package e2e

import (
	"context"
	"testing"

	"github.com/propscope/propscope/e2e/nbrun"
)

func init() {
	pageChecks["germination"] = checkGermination
	outputChecks["germination"] = func(t *testing.T, r nbrun.Result) {
		outs, err := nbrun.Outputs(r.Executed)
		if err != nil {
			t.Fatal(err)
		}
		if len(outs) != 1 || outs[0].Kind != "result-card" {
			t.Errorf("want one result-card output, got %+v", outs)
		}
	}
}

// checkGermination asserts what a reader of the germination notebook sees.
//
// Expected values, worked out independently of propscope from the CSV's
// counts (131 of 160 primed, 112 of 160 untreated):
//   - shares 131/160 = 81.875% and 112/160 = 70.0%, difference 11.875 points
//     (arithmetic);
//   - Mee's score interval +2.53 to +21.13 points and the Farrington–Manning
//     score test at 0, z = 2.4847, p = 0.012965: recomputed with SciPy 1.10.1
//     (Debian) by maximising the binomial likelihood under p1 − p2 = δ
//     (optimize.minimize_scalar) and solving z(δ) = ±1.959964 with brentq;
//     a cross-implementation check (status: recomputed);
//   - Fisher's exact two-sided p = 0.018228: scipy.stats.fisher_exact
//     (SciPy 1.10.1), status recomputed.
func checkGermination(t *testing.T, ctx context.Context) {
	if n := eval[int](t, ctx, `document.querySelectorAll('section[data-propscope="result-card"]').length`); n != 1 {
		t.Fatalf("want one result card, found %d", n)
	}
	text := cardText(t, ctx, 0)
	wantText(t, "the card", text,
		"Germinated: primed vs untreated",
		"131", "112", "160",
		"81.9%", "70.0%",
		"+11.9", "percentage points",
		"+2.5 to +21.1",
		"z = 2.485", "0.0130", // p = 0.012965 at four decimals
		"0.0182", // 0.018228 at four decimals
		"rejects equal rates",
		"Before acting on this:",
	)
	// The headline number is big and visible, not hidden in a fold.
	visible := eval[bool](t, ctx, `(() => { const d = document.querySelector('[data-role="difference"]');
		const r = d.getBoundingClientRect(); return r.width > 0 && r.height > 0 && d.innerText === "+11.9"; })()`)
	if !visible {
		t.Error("the headline difference +11.9 is not visible")
	}
	// Every interval method is folded away until the reader opens it.
	closed := eval[bool](t, ctx, `!document.querySelector('section[data-propscope="result-card"] details').open`)
	if !closed {
		t.Error("the table of every interval method should start folded")
	}
	opened := eval[string](t, ctx, `(() => { const d = document.querySelector('section[data-propscope="result-card"] details');
		d.querySelector('summary').click(); return d.open ? d.innerText : ""; })()`)
	wantText(t, "the opened method table", opened, "Wald", "Mee")
	screenshotOf(t, ctx, "germination-card", `section[data-propscope="result-card"]`)
	// At a phone's width the card fits; wide tables scroll inside it.
	setWidth(t, ctx, 360)
	overflow := eval[bool](t, ctx, `(() => { const c = document.querySelector('section[data-propscope="result-card"]');
		return c.getBoundingClientRect().right > document.documentElement.clientWidth + 1; })()`)
	if overflow {
		t.Error("at 360 px the card is wider than the page")
	}
	screenshotOf(t, ctx, "germination-card-narrow", `section[data-propscope="result-card"]`)
	setWidth(t, ctx, 1100)
}
