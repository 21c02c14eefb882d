package operating

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// A costly design is refused before any work: Barnard's test over every
// outcome of 600 per group (each outcome a nuisance search; about 40
// minutes of one core by the method's own per-table cost) and the
// Chan–Zhang interval at 150 per group. The error wraps ErrTooLarge and
// gives the estimate, the limit and the ways out; the refusal comes back
// at once (the progress function is never called).
func TestEngineRefusesCostlyDesigns(t *testing.T) {
	ctx := context.Background()
	h := proportions.Hypothesis{Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}
	called := false
	progress := WithProgress(func(done, total int) { called = true })
	_, errRegion := NewRejectionRegion(ctx, Decision{Test: proportions.BarnardTest, Hypotheses: []proportions.Hypothesis{h}}, 600, 600, progress)
	_, errSize := TypeIError(ctx, proportions.BoschlooTest, 600, 600, h, progress)
	_, errLimits := NewOutcomeLimits(ctx, proportions.ChanZhang, Design{N1: 150, N2: 150, Level: 0.95}, progress)
	for name, err := range map[string]error{"Barnard's rejection region": errRegion, "Boschloo's type I error": errSize, "Chan–Zhang limits": errLimits} {
		if !errors.Is(err, proportions.ErrTooLarge) {
			t.Errorf("%s: error %v, want one wrapping ErrTooLarge", name, err)
			continue
		}
		for _, want := range []string{"would need about", "the limit is about", "smaller design", "WithCostGuard"} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("%s: %q does not say %q", name, err, want)
			}
		}
	}
	if called {
		t.Error("a refused run reported progress: it started working")
	}
}

// Ordinary designs pass: Barnard's test and the Chan–Zhang interval on
// small designs run to the end, and a method without a Cost function is
// never estimated (it costs microseconds per outcome), even at the largest
// design the engine takes.
func TestEngineRunsOrdinaryDesigns(t *testing.T) {
	ctx := context.Background()
	h := proportions.Hypothesis{Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}
	d := Decision{Test: proportions.BarnardTest, Hypotheses: []proportions.Hypothesis{h}}
	if c, ok := DecisionCost(d, 12, 10); !ok || !c.Within(EngineCost) {
		t.Fatalf("Barnard at 12 and 10: estimate %v (%v)", c, ok)
	}
	if _, err := NewRejectionRegion(ctx, d, 12, 10); err != nil {
		t.Errorf("Barnard at 12 and 10: %v", err)
	}
	if _, err := NewOutcomeLimits(ctx, proportions.ChanZhang, Design{N1: 6, N2: 5, Level: 0.95}); err != nil {
		t.Errorf("Chan–Zhang at 6 and 5: %v", err)
	}
	if _, ok := IntervalCost(proportions.Mee, Design{N1: MaxDesignTrials, N2: MaxDesignTrials, Level: 0.95}); ok {
		t.Error("Mee's interval has a cost estimate: it has no Cost function")
	}
	if _, ok := DecisionCost(Decision{Test: proportions.FisherTest, Hypotheses: []proportions.Hypothesis{h}}, 2000, 2000); ok {
		t.Error("Fisher's test has a cost estimate: it has no Cost function")
	}
}

// The guard is the caller's to move: a tiny guard refuses a small design
// that the default passes, and a raised guard lets through a design the
// default refuses (checked on the estimate alone; running it would take
// minutes). The estimate grows with the design as the outcomes times the
// per-table cost: at least fourfold from 100 to 200 per group.
func TestWithCostGuard(t *testing.T) {
	ctx := context.Background()
	h := proportions.Hypothesis{Alternative: proportions.TwoSided, Conf: proportions.Confidence{Level: 0.95}}
	d := Decision{Test: proportions.BarnardTest, Hypotheses: []proportions.Hypothesis{h}}
	tiny := WithCostGuard(proportions.Cost{Steps: 1e3, Bytes: 1 << 20})
	if _, err := NewRejectionRegion(ctx, d, 12, 10, tiny); !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("a guard of 1000 steps: %v, want a refusal", err)
	}
	c500, _ := DecisionCost(d, 500, 500)
	if c500.Within(EngineCost) {
		t.Fatalf("Barnard at 500 per group within the default guard: %v", c500)
	}
	if raised := newConfig([]RunOption{WithCostGuard(c500)}).guardOr(); !c500.Within(raised) {
		t.Errorf("the raised guard %v does not admit %v", raised, c500)
	}
	c100, _ := DecisionCost(d, 100, 100)
	c200, _ := DecisionCost(d, 200, 200)
	if !(c200.Steps >= 4*c100.Steps) {
		t.Errorf("estimates %v at 100 and %v at 200 per group: the outcomes alone grow fourfold", c100, c200)
	}
}
