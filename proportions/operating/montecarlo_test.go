package operating

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/propscope/propscope/proportions"
	"gonum.org/v1/gonum/stat/distuv"
)

// TestMonteCarlo checks exact coverage against a seeded simulation: the
// share of simulated studies whose interval covers the truth must lie
// within 4 binomial standard errors of the exact value (common practice
// for simulation checks; a correct engine fails with chance < 1e-4 per
// point, and the seed makes the test deterministic).
func TestMonteCarlo(t *testing.T) {
	const draws = 200_000
	rng := rand.New(rand.NewPCG(20261202, 5))
	cases := []struct {
		m        proportions.IntervalMethod
		n1, n2   int
		pi1, pi2 float64
	}{
		{proportions.Wald, 15, 25, 0.1, 0.3},
		{proportions.Wald, 200, 150, 0.48, 0.52},
		{zigzag, 30, 40, 0.6, 0.4},
	}
	for _, c := range cases {
		d := Design{N1: c.n1, N2: c.n2, Level: 0.95}
		exact, err := Coverage(c.m, d, c.pi1, c.pi2)
		if err != nil {
			t.Fatal(err)
		}
		conf, _ := proportions.NewConfidence(d.Level)
		b1 := distuv.Binomial{N: float64(c.n1), P: c.pi1, Src: rng}
		b2 := distuv.Binomial{N: float64(c.n2), P: c.pi2, Src: rng}
		covered := 0
		for range draws {
			x1, x2 := int64(b1.Rand()), int64(b2.Rand())
			lo, hi := c.m.Limits(proportions.Counts{X1: x1, N1: int64(c.n1), X2: x2, N2: int64(c.n2)}, conf)
			if lo <= c.pi1-c.pi2 && c.pi1-c.pi2 <= hi {
				covered++
			}
		}
		mc := float64(covered) / draws
		se := math.Sqrt(exact.Coverage * (1 - exact.Coverage) / draws)
		if math.Abs(mc-exact.Coverage) > 4*se {
			t.Errorf("%s at %v, (%g, %g): exact %.5f, simulated %.5f (4 SE = %.5f)", c.m.Key, d, c.pi1, c.pi2, exact.Coverage, mc, 4*se)
		}
	}
}

// TestBinomialProbabilities compares the engine's binomial probabilities
// with gonum's distuv.Binomial (a general-purpose reference library) and
// checks that the skipped tails are negligible.
func TestBinomialProbabilities(t *testing.T) {
	for _, n := range []int{1, 7, 50, 1000, 2000} {
		for _, pi := range []float64{1e-9, 0.001, 0.3, 0.5, 0.999, 1 - 1e-9} {
			var b binomial
			b.fill(n, pi, make([]float64, n+1))
			ref := distuv.Binomial{N: float64(n), P: pi}
			for k := b.lo; k <= b.hi; k++ {
				want := ref.Prob(float64(k))
				if want > 1e-290 && math.Abs(b.p[k]-want) > 1e-11*want {
					t.Errorf("b(%d; %d, %g) = %.16g, gonum %.16g", k, n, pi, b.p[k], want)
				}
			}
			// The skipped tails, summed term by term (gonum's own
			// probabilities carry relative errors near 1e-13 at n = 1000,
			// so 1 − Σ kept would not resolve 1e-16).
			var skipped float64
			for k := 0; k <= n; k++ {
				if k < b.lo || k > b.hi {
					skipped += ref.Prob(float64(k))
				}
			}
			if skipped > 1e-15 {
				t.Errorf("n = %d, π = %g: the skipped tails outside [%d, %d] hold %.3g", n, pi, b.lo, b.hi, skipped)
			}
		}
	}
}

// TestSurfaceJSONHasNoNaN: undefined ratio truths become null, infinite
// widths "Infinity", and the JSON parses.
func TestSurfaceJSONHasNoNaN(t *testing.T) {
	m := zigzagRatio
	tab, err := NewOutcomeLimits(context.Background(), m, Design{N1: 5, N2: 6, Level: 0.95})
	if err != nil {
		t.Fatal(err)
	}
	s, err := tab.Surface(context.Background(), WithGrid([]float64{0, 0.5, 1}, []float64{0, 0.5, 1}))
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(s)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(b), "NaN") || !strings.Contains(string(b), "null") {
		t.Errorf("JSON should carry undefined points as null: %s", b)
	}
	var back map[string]any
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	p, _ := tab.At(0, 0)
	if b, err := json.Marshal(p); err != nil || strings.Contains(string(b), "NaN") {
		t.Errorf("point JSON %s, %v", b, err)
	}
}

// TestCancellationAndProgress: a cancelled context stops the work with its
// error, and progress reaches the total.
func TestCancellationAndProgress(t *testing.T) {
	d := Design{N1: 60, N2: 60, Level: 0.95}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := NewOutcomeLimits(ctx, proportions.Wald, d); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled NewTable: %v", err)
	}
	tab, err := NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := tab.Surface(ctx); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled Surface: %v", err)
	}
	last, total := 0, 0
	if _, err := tab.Surface(context.Background(), WithProgress(func(done, all int) {
		if done < last {
			t.Errorf("progress went back from %d to %d", last, done)
		}
		last, total = done, all
	})); err != nil {
		t.Fatal(err)
	}
	if last != total || total < 101*101/2 {
		t.Errorf("progress ended at %d of %d", last, total)
	}
}

// TestBadInput: clear errors wrapping the sentinels.
func TestBadInput(t *testing.T) {
	if _, err := NewDesign(0, 10, 0.95); !errors.Is(err, proportions.ErrNoTrials) {
		t.Errorf("n1 = 0: %v", err)
	}
	if _, err := NewDesign(10, MaxDesignTrials+1, 0.95); !errors.Is(err, proportions.ErrTooLarge) {
		t.Errorf("n2 too large: %v", err)
	}
	if _, err := NewDesign(10, 10, 1); !errors.Is(err, proportions.ErrLevel) {
		t.Errorf("level 1: %v", err)
	}
	d := Design{N1: 10, N2: 10, Level: 0.95}
	for _, pi := range []float64{-0.1, 1.5, math.NaN()} {
		if _, err := Coverage(proportions.Wald, d, pi, 0.5); !errors.Is(err, proportions.ErrPlan) {
			t.Errorf("π1 = %v: %v", pi, err)
		}
	}
	tab, _ := NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if _, err := tab.Surface(context.Background(), WithGrid(nil, []float64{0.5})); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("empty grid: %v", err)
	}
	bad := proportions.IntervalMethod{Key: "bad", Scale: proportions.Difference,
		Limits: func(proportions.Counts, proportions.Confidence) (float64, float64) { return math.NaN(), 0 }}
	if _, err := NewOutcomeLimits(context.Background(), bad, d); err == nil {
		t.Error("a method returning NaN must be reported")
	}
}
