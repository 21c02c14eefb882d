package simulate

import (
	"context"
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/propscope/propscope/internal/canceltest"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

func mustRun(t *testing.T, p Plan, opts ...operating.RunOption) *Result {
	t.Helper()
	r, err := Run(t.Context(), p, opts...)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// At ρ = 0 the clustered design is plain binomial sampling of 100 units per
// group, so every naive interval's simulated coverage and mean width, and
// every naive test's rejection rate at equal rates, must match the exact
// figures that package operating computes by enumerating every outcome
// (within 4 Monte Carlo standard errors, fixed seed).
func TestZeroCorrelationMatchesExactEnumeration(t *testing.T) {
	p := NewPlan(10, 10, 0.3, 0.15, 0)
	p.Studies = 40_000
	res := mustRun(t, p)
	d := operating.Design{N1: 100, N2: 100, Level: 0.95}
	naive := 0
	for _, c := range res.Intervals {
		if c.Adjusted {
			continue
		}
		naive++
		m, err := proportions.LookupInterval(c.Method)
		if err != nil {
			t.Fatal(err)
		}
		exact, err := operating.Coverage(m, d, 0.3, 0.15)
		if err != nil {
			t.Fatal(err)
		}
		within4(t, c.MethodName+" coverage", c.Coverage, exact.Coverage, math.Sqrt(exact.Coverage*(1-exact.Coverage)/float64(c.Studies)))
		within4(t, c.MethodName+" mean width", c.MeanWidth, exact.Width, c.WidthError)
	}
	p.Design.Rate2 = 0.3
	p.Seed = 2
	res = mustRun(t, p)
	for _, s := range res.Tests {
		if s.Adjusted {
			continue
		}
		naive++
		m, err := proportions.LookupTest(s.Method)
		if err != nil {
			t.Fatal(err)
		}
		h, err := m.Hypothesis(proportions.Settings{Level: 0.95})
		if err != nil {
			t.Fatal(err)
		}
		size, err := operating.Power(m, 100, 100, h, 0.3, 0.3)
		if err != nil {
			t.Fatal(err)
		}
		within4(t, s.MethodName+" type I error", s.RejectionRate, size, math.Sqrt(size*(1-size)/float64(s.Studies)))
	}
	if naive < 10 {
		t.Errorf("only %d naive methods compared", naive)
	}
}

// As the clusters grow more alike the naive Wald interval covers less:
// coverage falls from ρ = 0 to 0.02 to 0.1 by more than 4 combined Monte
// Carlo SEs, and at ρ = 0.1 it is near the large-sample prediction
// 2Φ(z/√deff) − 1 with Kish's design effect deff = 1 + (m − 1)ρ (Kish
// 1965, "Survey Sampling", Wiley): 71.2% for clusters of 25; the
// prediction ignores that ρ is spread over only 20 clusters, so it is
// allowed 3 points beside the 4 SEs. The adjusted intervals stay within 2
// points (operating.DefaultTolerance) plus 4 SEs of the nominal 95% at
// ρ = 0.1, and the adjusted tests' type I error within 2 points plus 4 SEs
// of 5%.
func TestNaiveWaldUndercoversAdjustedHold(t *testing.T) {
	p := NewPlan(20, 25, 0.8, 0.7, 0)
	p.Studies = 20_000
	c, err := Sweep(t.Context(), p, []float64{0, 0.02, 0.1})
	if err != nil {
		t.Fatal(err)
	}
	var wald []SimulatedCoverage
	for _, r := range c.Results {
		w, ok := r.Interval(proportions.Wald.Key)
		if !ok {
			t.Fatal("no Wald interval in the simulation")
		}
		wald = append(wald, w)
	}
	for i := 1; i < len(wald); i++ {
		drop := wald[i-1].Coverage - wald[i].Coverage
		if se := math.Hypot(wald[i-1].StandardError, wald[i].StandardError); drop < 4*se {
			t.Errorf("Wald coverage %s at ρ = %g, %s at ρ = %g: want a drop beyond 4 × %.3g", pctf(wald[i-1].Coverage), c.Correlations[i-1], pctf(wald[i].Coverage), c.Correlations[i], se)
		}
	}
	deff := 1 + 24*0.1
	predicted := 2*normalCDF(1.959963984540054/math.Sqrt(deff)) - 1
	if got := wald[2]; math.Abs(got.Coverage-predicted) > 4*got.StandardError+0.03 {
		t.Errorf("Wald coverage at ρ = 0.1: %s, large-sample prediction %s", pctf(got.Coverage), pctf(predicted))
	}
	last := c.Results[2]
	adjusted := 0
	for _, iv := range last.Intervals {
		if !iv.Adjusted {
			continue
		}
		adjusted++
		if math.Abs(iv.Coverage-0.95) > operating.DefaultTolerance+4*iv.StandardError {
			t.Errorf("%s at ρ = 0.1: coverage %s, want near 95%%", iv.MethodName, pctf(iv.Coverage))
		}
		t.Logf("%s at ρ = 0.1: %s", iv.MethodName, iv)
	}
	q := p
	q.Design.Rate2, q.Design.Correlation, q.Seed = 0.8, 0.1, 5
	for _, s := range mustRun(t, q).Tests {
		if !s.Adjusted {
			continue
		}
		adjusted++
		if math.Abs(s.RejectionRate-0.05) > operating.DefaultTolerance+4*s.StandardError {
			t.Errorf("%s at ρ = 0.1: type I error %s, want near 5%%", s.MethodName, pctf(s.RejectionRate))
		}
		t.Logf("%s at ρ = 0.1: type I error %s", s.MethodName, s)
	}
	if adjusted < 4 {
		t.Errorf("only %d adjusted methods checked", adjusted)
	}
}

// normalCDF is Φ from the error function.
func normalCDF(z float64) float64 { return 0.5 * math.Erfc(-z/math.Sqrt2) }

// The same plan and seed give the same numbers on 1, 2 and 5 workers (and
// a different seed different numbers), unequal cluster sizes included.
func TestSameSeedSameResultsOnAnyWorkers(t *testing.T) {
	p := NewPlan(6, 0, 0.6, 0.4, 0.08)
	p.Design.Sizes = []int{5, 12, 30}
	p.Studies = 3000
	one := mustRun(t, p, operating.WithWorkers(1))
	for _, w := range []int{2, 5} {
		if got := mustRun(t, p, operating.WithWorkers(w)); !reflect.DeepEqual(got, one) {
			t.Errorf("%d workers differ from 1:\n%v\n%v", w, got, one)
		}
	}
	p.Seed++
	if got := mustRun(t, p); reflect.DeepEqual(got.Intervals, one.Intervals) {
		t.Error("another seed gave the same numbers")
	}
}

// The Monte Carlo standard error is honest: over 30 seeds of 1000 studies
// the spread of the simulated Wald coverage matches the reported SE (the
// ratio of the two lies inside the central 99.9% of √(χ²₂₉/29), 0.63 to
// 1.42, when the streams are independent and the SE right).
func TestMonteCarloErrorMatchesSpread(t *testing.T) {
	p := NewPlan(10, 20, 0.7, 0.6, 0.05)
	p.Studies = 1000
	p.Methods = []string{proportions.Wald.Key}
	var covs []float64
	var se float64
	for seed := range uint64(30) {
		p.Seed = 100 + seed
		w, _ := mustRun(t, p).Interval(proportions.Wald.Key)
		covs = append(covs, w.Coverage)
		se += w.StandardError / 30
	}
	_, v, _, _ := moments(covs)
	if ratio := math.Sqrt(v) / se; ratio < 0.63 || ratio > 1.42 {
		t.Errorf("spread of coverage over seeds %.4f, mean reported SE %.4f: ratio %.2f", math.Sqrt(v), se, ratio)
	}
}

func TestProgressReachesTotal(t *testing.T) {
	p := NewPlan(5, 10, 0.5, 0.5, 0.1)
	p.Studies = 2000
	last, calls := 0, 0
	mustRun(t, p, operating.WithProgress(func(done, total int) {
		if done < last || total != 2000 {
			t.Errorf("progress %d of %d after %d", done, total, last)
		}
		last, calls = done, calls+1
	}))
	if last != 2000 || calls < 2 {
		t.Errorf("progress ended at %d after %d calls", last, calls)
	}
}

func TestCancelReturnsPromptly(t *testing.T) {
	p := NewPlan(20, 25, 0.8, 0.7, 0.05)
	p.Studies = MaxStudies
	canceltest.Check(t, 50*time.Millisecond, func(ctx context.Context) error {
		_, err := Run(ctx, p)
		return err
	})
	canceltest.Check(t, 50*time.Millisecond, func(ctx context.Context) error {
		_, err := Sweep(ctx, p, []float64{0, 0.1})
		return err
	})
}

func TestBadPlansRefused(t *testing.T) {
	good := NewPlan(10, 10, 0.5, 0.4, 0.05)
	for _, tc := range []struct {
		change func(p *Plan)
		want   error
		says   string
	}{
		{func(p *Plan) { p.Design.Clusters1 = 1 }, proportions.ErrSimulation, "2 to"},
		{func(p *Plan) { p.Design.Sizes = nil }, proportions.ErrSimulation, "no cluster sizes"},
		{func(p *Plan) { p.Design.Sizes = []int{10, 0} }, proportions.ErrSimulation, "entry 2"},
		{func(p *Plan) { p.Design.Rate2 = 1.2 }, proportions.ErrSimulation, "group 2"},
		{func(p *Plan) { p.Design.Rate1 = math.NaN() }, proportions.ErrSimulation, "group 1"},
		{func(p *Plan) { p.Design.Correlation = 1 }, proportions.ErrSimulation, "between 0 and 0.99"},
		{func(p *Plan) { p.Design.Correlation = -0.1 }, proportions.ErrSimulation, "ρ"},
		{func(p *Plan) { p.Design.Level = 1 }, proportions.ErrLevel, ""},
		{func(p *Plan) { p.Studies = 0 }, proportions.ErrSimulation, "simulated studies"},
		{func(p *Plan) { p.Methods = []string{"wald", "no-such"} }, proportions.ErrUnknownMethod, `"no-such"`},
	} {
		p := good
		p.Design.Sizes = []int{10}
		tc.change(&p)
		_, err := Run(t.Context(), p)
		if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.says) {
			t.Errorf("Run(%+v) = %v, want %v saying %q", p, err, tc.want, tc.says)
		}
	}
	if _, err := Sweep(t.Context(), good, nil); !errors.Is(err, proportions.ErrSimulation) {
		t.Errorf("Sweep with no values: %v", err)
	}
	if _, err := Sweep(t.Context(), good, []float64{0.1, 2}); !errors.Is(err, proportions.ErrSimulation) || !strings.Contains(err.Error(), "2 of the sweep") {
		t.Errorf("Sweep with ρ = 2: %v", err)
	}
}
