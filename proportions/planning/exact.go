package planning

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// MaxExactTrials is the largest group size for which exact power is
// computed: that of the operating-characteristics engine (package operating).
const MaxExactTrials = operating.MaxDesignTrials

// ExactPowerResult is the exact power of the test the user will run, for a
// plan and group sizes.
type ExactPowerResult struct {
	Plan Plan `json:"plan"`
	// Method is the key of the test, TestName its published name.
	Method     string                   `json:"method"`
	MethodName string                   `json:"method_name"`
	Citation   string                   `json:"citation"`
	Hypotheses []proportions.Hypothesis `json:"hypotheses"`
	N1         int64                    `json:"n1"`
	N2         int64                    `json:"n2"`
	// Power is the exact power; Asymptotic the normal approximation of
	// Power at the same sizes, for comparison.
	Power      float64  `json:"power"`
	Asymptotic float64  `json:"asymptotic_power"`
	Notes      []string `json:"notes"`
	Caution    string   `json:"caution"`
}

// ExactPower returns the exact power of test m, run as the plan says
// (Plan.TestHypotheses: a two-sided test of no effect, a one-sided test
// against the margin, or two one-sided tests for equivalence, each at
// level α), with n1 and n2 units with an outcome and true rates
// Plan.Rate1 and Plan.Rate2:
//
//	power = Σ_{x1=0..n1} Σ_{x2=0..n2} b(x1; n1, π1)·b(x2; n2, π2)·1{the test rejects at (x1, x2)},
//
// b the binomial probability, by running the test on every outcome (tails of
// total probability below 10⁻¹⁶ left out) with the operating-characteristics
// engine (operating.Decision.Power). Barnard's and Boschloo's tests decide
// those outcomes at once through their window decider
// (proportions.TestMethod.Window: one search for the critical value
// instead of one nuisance search per outcome, with the same decisions);
// ExactSampleSize and ExactPowerByTrials also carry each size's critical
// value to the next size. Plan.Power, Allocation,
// Dropout, Variance and ContinuityCorrection are not used (the test decides
// its own statistic). Errors wrap the sentinels of SampleSize
// except ErrUnreachable, ErrUnsupported when the test cannot carry out the
// plan, ErrPlan for sizes outside [1, MaxExactTrials], or the context's
// error when it is cancelled.
//
// Of opts it reads operating.WithProgress: progress in thousandths (see
// ProgressTotal) of the rows of outcomes run, x1 inside the binomial
// window of Plan.Rate1; a test with a window decider
// (proportions.TestMethod.Window) decides every row at once and reports
// at its end.
func ExactPower(ctx context.Context, d Plan, m proportions.TestMethod, n1, n2 int64, opts ...operating.RunOption) (ExactPowerResult, error) {
	dc, err := newDecision(d, m)
	if err != nil {
		return ExactPowerResult{}, err
	}
	if err := checkSizes(n1, n2); err != nil {
		return ExactPowerResult{}, err
	}
	asym, err := Power(d, n1, n2)
	if err != nil {
		return ExactPowerResult{}, err
	}
	if err := guardSearch(fmt.Sprintf("the exact power of %s at n1 = %d, n2 = %d", m.Name, n1, n2),
		exactPowerCost(d, m, dc.Hypotheses, n1, n2), "use the asymptotic Power, a faster test or smaller groups"); err != nil {
		return ExactPowerResult{}, err
	}
	prog := newProgress(opts, 0)
	rows := func(done, total int) {
		prog.total = float64(total)
		prog.add(float64(done) - prog.done)
	}
	p, err := exactPower(ctx, dc, n1, n2, d.Rate1, d.Rate2, operating.WithProgress(rows))
	if err != nil {
		return ExactPowerResult{}, err
	}
	prog.finish()
	return ExactPowerResult{Plan: d, Method: m.Key, MethodName: m.Name, Citation: m.Citation, Hypotheses: dc.Hypotheses,
		N1: n1, N2: n2, Power: p, Asymptotic: asym.Power, Notes: testNotes(m), Caution: Caution}, nil
}

// newDecision validates the plan's fields and rates (not its power) and
// the test, and returns the decision rule for the engine.
func newDecision(d Plan, m proportions.TestMethod) (operating.Decision, error) {
	if err := d.Validate(); err != nil {
		return operating.Decision{}, err
	}
	hs, err := d.TestHypotheses(m)
	if err != nil {
		return operating.Decision{}, err
	}
	return operating.Decision{Test: m, Hypotheses: hs}, nil
}

// exactPower is the engine's exact power, cancelled with ctx; opts go to
// the engine.
func exactPower(ctx context.Context, dc operating.Decision, n1, n2 int64, p1, p2 float64, opts ...operating.RunOption) (float64, error) {
	return dc.PowerContext(ctx, int(n1), int(n2), p1, p2, opts...)
}

func checkSizes(n1, n2 int64) error {
	for i, n := range []int64{n1, n2} {
		if n < 1 || n > MaxExactTrials {
			return fmt.Errorf("group %d size %d: %w; exact power is computed for 1 to %d units per group", i+1, n, proportions.ErrPlan, MaxExactTrials)
		}
	}
	return nil
}

func testNotes(m proportions.TestMethod) []string {
	if m.Exact {
		return []string{}
	}
	return []string{fmt.Sprintf("%s is an asymptotic test: its actual type I error can exceed α at some rates; the exact power counts its rejections as they are", m.Name)}
}

// ExactSampleSizeResult is the outcome of the exact sample-size search.
//
// Exact power is saw-toothed in n: it can reach the target at some size,
// fall below it at the next, and rise again. First is the smallest group-1
// size (scanning from Search.From) whose power reaches the target; Stable
// is the smallest size from which every size up to Horizon reaches it (the
// safer plan). Curve holds the exact power at every size scanned.
type ExactSampleSizeResult struct {
	Plan       Plan   `json:"plan"`
	Method     string `json:"method"`
	MethodName string `json:"method_name"`
	Citation   string `json:"citation"`
	// Asymptotic is the normal-approximation answer of SampleSize.
	Asymptotic SampleSizeResult `json:"asymptotic"`
	From       int64            `json:"from"`
	Horizon    int64            `json:"horizon"`
	First      GroupSizes       `json:"first"`
	// Stable is the zero GroupSizes with StableFound false when the power at
	// a horizon set in Search falls below the target.
	Stable      GroupSizes `json:"stable"`
	StableFound bool       `json:"stable_found"`
	Curve       PowerCurve `json:"curve"`
	Notes       []string   `json:"notes"`
	Caution     string     `json:"caution"`
}

// GroupSizes is one group-size answer of the exact search.
type GroupSizes struct {
	N1    int64   `json:"n1"`
	N2    int64   `json:"n2"`
	Power float64 `json:"power"`
	// Enrolled1 and Enrolled2 inflate the sizes for drop-out.
	Enrolled1 int64 `json:"enrolled1"`
	Enrolled2 int64 `json:"enrolled2"`
}

// ExactSampleSize finds the smallest group sizes at which the exact power
// (see ExactPower) of test m reaches Plan.Power, scanning n1 = From,
// From+1, ... with n2 = ⌈r·n1⌉, and the smallest size from which the power
// stays at or above the target up to the horizon (see Search for the
// defaults). It reads every field of the plan; Variance and
// ContinuityCorrection shape only the asymptotic answer reported beside.
// Errors are those of SampleSize and ExactPower, ErrUnreachable
// when no size up to Search.MaxN1 reaches the target, ErrTooLarge when the
// asymptotic size is above 1.5·MaxN1 (checked first, to fail fast), and
// ErrPlan for a bad Search.
//
// Of opts it reads operating.WithProgress: progress in thousandths of the
// estimated work (see ProgressTotal), size by size, each size weighted by
// its estimated cost; the estimate runs to the expected end of the scan
// and is revised once the horizon is known.
func ExactSampleSize(ctx context.Context, d Plan, m proportions.TestMethod, s Search, opts ...operating.RunOption) (ExactSampleSizeResult, error) {
	asym, err := SampleSize(d)
	if err != nil {
		return ExactSampleSizeResult{}, err
	}
	if err := s.validate(d); err != nil {
		return ExactSampleSizeResult{}, err
	}
	if maxN := s.maxN1(d); asym.Unrounded > 1.5*float64(maxN) {
		return ExactSampleSizeResult{}, fmt.Errorf("the normal approximation needs n1 = %d: %w; the exact search stops at n1 = %d (Search.MaxN1); at such sizes the approximation is close",
			asym.N1, proportions.ErrTooLarge, maxN)
	}
	dc, err := newDecision(d, m)
	if err != nil {
		return ExactSampleSizeResult{}, err
	}
	dc = dc.Remembering() // each size's critical value starts the next size's search
	if err := guardScan(d, m, dc.Hypotheses, s, asym.N1); err != nil {
		return ExactSampleSizeResult{}, err
	}
	sizeCost := func(n1 int64) float64 { return exactPowerCost(d, m, dc.Hypotheses, n1, d.SecondGroupSize(n1)).Steps }
	from, end := scanRange(d, s, asym.N1)
	var expected float64
	for n := from; n <= end; n++ {
		expected += sizeCost(n)
	}
	prog := newProgress(opts, expected)
	power := func(ctx context.Context, n1, n2 int64) (float64, error) {
		if err := checkSizes(n1, n2); err != nil {
			return 0, err
		}
		return exactPower(ctx, dc, n1, n2, d.Rate1, d.Rate2)
	}
	sc, err := scan(ctx, d, s, power, prog, sizeCost)
	if err != nil {
		return ExactSampleSizeResult{}, err
	}
	res := ExactSampleSizeResult{Plan: d, Method: m.Key, MethodName: m.Name, Citation: m.Citation, Asymptotic: asym,
		From: sc.from, Horizon: sc.horizon, StableFound: sc.stableFound, Caution: Caution,
		Curve: PowerCurve{Plan: d, Basis: "exact power of " + m.Name, Axis: "n1", Points: sc.curve, Caution: Caution}}
	if res.First, err = sizeAt(d, sc.curve, sc.first); err != nil {
		return ExactSampleSizeResult{}, err
	}
	if sc.stableFound {
		if res.Stable, err = sizeAt(d, sc.curve, sc.stable); err != nil {
			return ExactSampleSizeResult{}, err
		}
	}
	res.Notes = append(testNotes(m), searchNotes(res)...)
	prog.finish()
	return res, nil
}

// guardScan estimates the exact sample-size search before it starts, from
// Search.From (default 1) to where it is expected to end: the default
// horizon past the normal approximation's n1, or Search.Horizon when set.
// Above ExactSearchCost it is refused, with the cost of a scan started
// near the approximation as the way out.
func guardScan(d Plan, m proportions.TestMethod, h []proportions.Hypothesis, s Search, asymN1 int64) error {
	from, end := scanRange(d, s, asymN1)
	cost := scanCost(d, m, h, from, end)
	if cost.Within(ExactSearchCost) {
		return nil
	}
	near := max(int64(0.8*float64(asymN1)), 1)
	hint := fmt.Sprintf("the normal approximation needs n1 = %d; ", asymN1)
	if near > from {
		hint += fmt.Sprintf("a scan from Search.From = %d would need %v; ", near, scanCost(d, m, h, near, end))
	}
	hint += "or use the asymptotic SampleSize or a faster test"
	return guardSearch(fmt.Sprintf("the exact sample-size search with %s from n1 = %d to about %d", m.Name, from, end), cost, hint)
}

// scanRange is where the scan is expected to start and end: from
// Search.From (default 1) to the default horizon past the normal
// approximation's n1, or to Search.Horizon when set, within the cap.
func scanRange(d Plan, s Search, asymN1 int64) (from, end int64) {
	from = max(s.From, 1)
	end = max(asymN1+10, int64(math.Ceil(1.25*float64(asymN1))))
	if s.Horizon > 0 {
		end = max(s.Horizon, asymN1)
	}
	return from, max(min(end, s.maxN1(d)), from)
}

// sizeAt picks the curve point at n1, with its enrolment (an error
// wrapping ErrTooLarge when a drop-out share near 1 puts it above
// MaxTrials).
func sizeAt(d Plan, curve []PowerPoint, n1 int64) (GroupSizes, error) {
	for _, p := range curve {
		if p.N1 == n1 {
			e1, err := d.EnrolledUnits(p.N1)
			if err != nil {
				return GroupSizes{}, err
			}
			e2, err := d.EnrolledUnits(p.N2)
			if err != nil {
				return GroupSizes{}, err
			}
			return GroupSizes{N1: p.N1, N2: p.N2, Power: p.Power, Enrolled1: e1, Enrolled2: e2}, nil
		}
	}
	return GroupSizes{}, nil
}

func searchNotes(r ExactSampleSizeResult) []string {
	var notes []string
	if r.From > 1 {
		notes = append(notes, fmt.Sprintf("the scan started at n1 = %d: a smaller size might also reach the target", r.From))
	}
	if !r.StableFound {
		notes = append(notes, fmt.Sprintf("the exact power at the horizon n1 = %d is below the target: no size is stable up to it", r.Horizon))
	} else if r.Stable.N1 > r.First.N1 {
		notes = append(notes, fmt.Sprintf("exact power dips below the target again after n1 = %d; from n1 = %d it stays at or above it up to %d", r.First.N1, r.Stable.N1, r.Horizon))
	}
	return notes
}

// ExactPowerByTrials returns the exact power of test m for every n1 from n1From
// to n1To (in equal steps when that is more than MaxCurvePoints
// sizes), n2 = ⌈r·n1⌉: the saw-tooth as data for a chart. Plan.Power is
// not used. Of opts it reads operating.WithProgress: progress in
// thousandths of the estimated work (see ProgressTotal), size by size,
// each weighted by its estimated cost.
func ExactPowerByTrials(ctx context.Context, d Plan, m proportions.TestMethod, n1From, n1To int64, opts ...operating.RunOption) (PowerCurve, error) {
	dc, err := newDecision(d, m)
	if err != nil {
		return PowerCurve{}, err
	}
	grid, err := PowerByTrials(d, n1From, n1To) // validates the range, gives the sizes
	if err != nil {
		return PowerCurve{}, err
	}
	grid.Basis = "exact power of " + m.Name
	dc = dc.Remembering() // each size's critical value starts the next size's search
	var cost proportions.Cost
	costs := make([]float64, len(grid.Points))
	for i, p := range grid.Points {
		c := exactPowerCost(d, m, dc.Hypotheses, p.N1, p.N2)
		costs[i] = c.Steps
		cost = proportions.Cost{Steps: cost.Steps + c.Steps, Bytes: max(cost.Bytes, c.Bytes)}
	}
	if err := guardSearch(fmt.Sprintf("the exact power of %s at %d sizes from n1 = %d to %d", m.Name, len(grid.Points), n1From, n1To),
		cost, "use the asymptotic PowerByTrials, a faster test or a narrower range"); err != nil {
		return PowerCurve{}, err
	}
	prog := newProgress(opts, cost.Steps)
	for i, p := range grid.Points {
		if err := checkSizes(p.N1, p.N2); err != nil {
			return PowerCurve{}, err
		}
		if grid.Points[i].Power, err = exactPower(ctx, dc, p.N1, p.N2, d.Rate1, d.Rate2); err != nil {
			return PowerCurve{}, err
		}
		prog.add(costs[i])
	}
	prog.finish()
	return grid, nil
}

// ExactPowerByDifference returns the exact power of test m with n1 and n2
// units against the first group's true rate, at points rates evenly spaced
// from rate1From to rate1To, π2 = Plan.Rate2 fixed. The test runs once on
// every outcome (operating.NewRejectionRegion, which stops when ctx is
// cancelled); each rate then costs one sum over the region's runs. Of
// opts it reads operating.WithProgress: progress in thousandths of the
// work (see ProgressTotal), by rows of outcomes of the region; the others
// go to the engine (operating.WithCostGuard raises its cost guard, above
// which a costly test is refused with an error wrapping
// proportions.ErrTooLarge).
func ExactPowerByDifference(ctx context.Context, d Plan, m proportions.TestMethod, n1, n2 int64, rate1From, rate1To float64, points int, opts ...operating.RunOption) (PowerCurve, error) {
	dc, err := newDecision(d, m)
	if err != nil {
		return PowerCurve{}, err
	}
	if err := checkSizes(n1, n2); err != nil {
		return PowerCurve{}, err
	}
	grid, err := PowerByDifference(d, n1, n2, rate1From, rate1To, points)
	if err != nil {
		return PowerCurve{}, err
	}
	prog := newProgress(opts, float64(n1+1))
	rows := func(done, _ int) { prog.add(float64(done) - prog.done) }
	// the caller's options reach the engine (its cost guard, raised by
	// operating.WithCostGuard, and its workers), progress in our units
	region, err := operating.NewRejectionRegion(ctx, dc, int(n1), int(n2), append(slices.Clone(opts), operating.WithProgress(rows))...)
	if err != nil {
		return PowerCurve{}, err
	}
	grid.Basis = "exact power of " + m.Name
	for i, p := range grid.Points {
		if grid.Points[i].Power, err = region.Power(p.Rate1, d.Rate2); err != nil {
			return PowerCurve{}, err
		}
	}
	prog.finish()
	return grid, nil
}

// String prints the exact power in a few lines.
func (r ExactPowerResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Exact power %.4f of %s with %d + %d units (normal approximation %.4f)\n  plan: %s\n",
		r.Power, r.MethodName, r.N1, r.N2, r.Asymptotic, r.Plan)
	writeNotes(&b, r.Notes, r.Caution)
	return b.String()
}

// String prints the search result in a few lines.
func (r ExactSampleSizeResult) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "Exact sample size for %s with %s\n", r.Plan, r.MethodName)
	fmt.Fprintf(&b, "  smallest size reaching the target: %d + %d (power %.4f)\n", r.First.N1, r.First.N2, r.First.Power)
	if r.StableFound {
		fmt.Fprintf(&b, "  stays at or above it from: %d + %d (power %.4f), checked up to n1 = %d\n", r.Stable.N1, r.Stable.N2, r.Stable.Power, r.Horizon)
		if r.Plan.Dropout > 0 {
			fmt.Fprintf(&b, "  enrol %d + %d for the stable size\n", r.Stable.Enrolled1, r.Stable.Enrolled2)
		}
	}
	fmt.Fprintf(&b, "  normal approximation: %d + %d (%s)\n", r.Asymptotic.N1, r.Asymptotic.N2, r.Asymptotic.Approximation)
	writeNotes(&b, r.Notes, r.Caution)
	return b.String()
}
