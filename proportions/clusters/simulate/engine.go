package simulate

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/workpool"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/operating"
)

// Plan is one simulation: the design, how many studies to simulate and the
// seed, the names shown with the results, and which methods to run.
type Plan struct {
	Design  Design `json:"design"`
	Studies int    `json:"studies"`
	// Seed fixes every random number: the same plan and seed give the same
	// results on any number of cores.
	Seed uint64 `json:"seed"`
	// By names the clusters ("tray"); empty means "cluster".
	By string `json:"by"`
	// Labels name the groups and the event, as in an analysis.
	Labels proportions.Labels `json:"labels"`
	// Methods lists the keys of the interval methods and tests to run;
	// empty runs every one of Intervals and Tests.
	Methods []string `json:"methods"`
}

// DefaultStudies is the number of simulated studies NewPlan sets: Monte
// Carlo standard errors of about 0.2 percentage points at 95% coverage.
const DefaultStudies = 10_000

// NewPlan returns a plan for k clusters of n units in each group at the
// given rates and intracluster correlation ρ, at the 95% level, with
// DefaultStudies studies and seed 1.
func NewPlan(k, n int, rate1, rate2, correlation float64) Plan {
	return Plan{Design: Design{Clusters1: k, Clusters2: k, Sizes: []int{n}, Rate1: rate1, Rate2: rate2, Correlation: correlation, Level: 0.95},
		Studies: DefaultStudies, Seed: 1, By: clusters.DefaultColumn}
}

// Validate checks the design and the number of studies; errors wrap
// proportions.ErrSimulation or ErrLevel.
func (p Plan) Validate() error {
	if p.Studies < 1 || p.Studies > MaxStudies {
		return fmt.Errorf("%d simulated studies: %w; run 1 to %d", p.Studies, proportions.ErrSimulation, MaxStudies)
	}
	return p.Design.Validate()
}

// chunkStudies is the fixed number of studies drawn from one random
// stream. The results depend on it (not on the number of workers), so it
// never changes with the machine; at a few tens of milliseconds per chunk
// it also paces progress reports.
const chunkStudies = 256

// checkEvery is how many studies a worker simulates between looks at its
// context, so that a cancel is seen within milliseconds even for large
// clusters.
const checkEvery = 16

// Run simulates the plan's studies and reports, for every interval method,
// its coverage of the true difference and mean width and, for every test,
// how often it rejects equal rates, each with its Monte Carlo standard
// error. It uses every core unless operating.WithWorkers says otherwise,
// reports progress (in studies) to operating.WithProgress, and returns
// ctx's error within milliseconds of a cancel.
func Run(ctx context.Context, p Plan, opts ...operating.RunOption) (*Result, error) {
	r, err := newRunner(p)
	if err != nil {
		return nil, err
	}
	prog := newProgress(operating.ProgressOf(opts...), p.Studies)
	return r.run(ctx, 0, p, operating.WorkersOf(opts...), prog)
}

// runner holds what every study of a plan shares.
type runner struct {
	intervals []IntervalMethod
	tests     []TestMethod
	conf      proportions.Confidence
}

func newRunner(p Plan) (*runner, error) {
	if err := p.Validate(); err != nil {
		return nil, err
	}
	conf, err := proportions.NewConfidence(p.Design.Level)
	if err != nil {
		return nil, err
	}
	ivs, tests, err := pick(p.Methods)
	if err != nil {
		return nil, err
	}
	return &runner{intervals: ivs, tests: tests, conf: conf}, nil
}

// tally is what one chunk of studies adds up, per method.
type tally struct {
	intervals []intervalTally
	tests     []testTally
}

type intervalTally struct {
	defined, covered, below, above int
	width, width2                  float64
}

type testTally struct{ defined, rejected int }

func (r *runner) newTally() tally {
	return tally{intervals: make([]intervalTally, len(r.intervals)), tests: make([]testTally, len(r.tests))}
}

// run simulates the plan on the random streams of one stream index (the
// point of a sweep) and sums the chunks in their order, so the floating-point
// sums do not depend on which worker finished first.
func (r *runner) run(ctx context.Context, stream uint64, p Plan, workers int, prog *progress) (*Result, error) {
	chunks := (p.Studies + chunkStudies - 1) / chunkStudies
	tallies := make([]tally, chunks)
	err := parallel(ctx, workers, chunks, func(i int) error {
		n := min(chunkStudies, p.Studies-i*chunkStudies)
		t, err := chunk(ctx, r, p.Design, newSampler(p.Seed, stream, uint64(i)), n)
		if err != nil {
			return err
		}
		tallies[i] = t
		prog.Add(n)
		return nil
	})
	if err != nil {
		return nil, err
	}
	total := r.newTally()
	for _, t := range tallies {
		for k := range total.intervals {
			a, b := &total.intervals[k], t.intervals[k]
			a.defined, a.covered, a.below, a.above = a.defined+b.defined, a.covered+b.covered, a.below+b.below, a.above+b.above
			a.width, a.width2 = a.width+b.width, a.width2+b.width2
		}
		for k := range total.tests {
			total.tests[k].defined += t.tests[k].defined
			total.tests[k].rejected += t.tests[k].rejected
		}
	}
	return r.result(p, total), nil
}

// chunk simulates n studies from one stream and tallies every method.
func chunk(ctx context.Context, r *runner, d Design, s *sampler, n int) (tally, error) {
	t := r.newTally()
	truth := d.Truth()
	a1, b1, fixed1 := d.shapes(d.Rate1)
	a2, b2, fixed2 := d.shapes(d.Rate2)
	for study := range n {
		if study%checkEvery == 0 {
			if err := ctx.Err(); err != nil {
				return tally{}, err
			}
		}
		sum := clusters.Summary{
			Group1: draw(s, d, d.Clusters1, d.Rate1, a1, b1, fixed1),
			Group2: draw(s, d, d.Clusters2, d.Rate2, a2, b2, fixed2),
		}
		for k, m := range r.intervals {
			lo, hi, ok := m.Limits(&sum, r.conf)
			if !ok || math.IsNaN(lo) || math.IsNaN(hi) {
				continue
			}
			t.intervals[k].add(lo, hi, truth)
		}
		for k, m := range r.tests {
			rej, ok := m.Rejects(&sum, r.conf)
			if !ok {
				continue
			}
			t.tests[k].defined++
			if rej {
				t.tests[k].rejected++
			}
		}
	}
	return t, nil
}

// add counts one interval: covered when lower ≤ truth ≤ upper.
func (a *intervalTally) add(lo, hi, truth float64) {
	a.defined++
	switch {
	case hi < truth:
		a.below++
	case lo > truth:
		a.above++
	default:
		a.covered++
	}
	w := hi - lo
	a.width += w
	a.width2 += w * w
}

// draw simulates one group's k clusters and returns their sums: each
// cluster's rate from Beta(a, b) (the group's rate itself when fixed),
// then its events from the binomial at that rate.
func draw(s *sampler, d Design, k int, rate, a, b float64, fixed bool) clusters.GroupSummary {
	var g clusters.GroupSummary
	for i := range k {
		p := rate
		if !fixed {
			p = s.beta(a, b)
		}
		n := d.size(i)
		g.Add(s.binomial(n, p), n)
	}
	return g
}

// parallel runs job(i) for i in [0, n) on up to workers goroutines (all
// cores when workers ≤ 0) and returns the first error; the others stop at
// their next job.
func parallel(ctx context.Context, workers, n int, job func(i int) error) error {
	return workpool.Run(ctx, workers, n, job)
}

// progress serialises progress reports from the workers.
type progress = workpool.Reporter

func newProgress(f operating.Progress, total int) *progress { return workpool.NewReporter(f, total) }
