package proportions

import (
	"context"
	"fmt"
	"math"
	"strconv"
)

// Unconditional exact tests (Barnard, Boschloo): the p-value is the largest
// probability, over the unknown common success probability (the nuisance
// parameter), of the tables at least as extreme as the observed one:
//
//	p = sup over π of P(T(X1, X2) at least as extreme as T(x1, x2) | π1 = π2 + δ0 = π + δ0),
//
// with X1 ~ Binomial(n1, π1) and X2 ~ Binomial(n2, π2) independent. How the
// supremum is found is described in unconditional_sup.go; the cost is
// O(n1·n2) once to build the region of extreme tables plus
// O((n1 + n2)·√(n1 + n2)) to search the nuisance parameter (each evaluation
// is one prefix-sum difference per run of the region, see
// unconditional_region.go). UnconditionalMaxTables caps the design.

// OrderingStatistic is the statistic that decides which tables are at
// least as extreme as the observed one in an unconditional exact test.
type OrderingStatistic int

const (
	// PooledScore orders by the score statistic (p1 − p2 − δ0)/SE at the
	// restricted estimates; with δ0 = 0 this is the pooled z of Barnard's
	// test as used by Suissa & Shuster (1985).
	PooledScore OrderingStatistic = iota
	// UnpooledWald orders by (p1 − p2 − δ0)/√(p1(1−p1)/n1 + p2(1−p2)/n2).
	UnpooledWald
	// FisherPValue orders by Fisher's exact p-value (Boschloo's test).
	FisherPValue
)

// TwoSidedRule says how an unconditional test makes a two-sided p-value.
type TwoSidedRule int

const (
	// TwoSidedOrdered (the default) takes the tables at least as extreme in
	// either direction under a two-sided statistic: |z| ≥ |z_obs| for the z
	// statistics, two-sided Fisher p ≤ observed for Boschloo's test, and
	// maximises their total probability over the nuisance parameter.
	TwoSidedOrdered TwoSidedRule = iota
	// TwoSidedDoubled is twice the smaller one-sided p-value, capped at 1
	// (each one-sided p maximised on its own), the convention of some
	// references.
	TwoSidedDoubled
)

// UnconditionalMaxTables is the largest number of tables (n1+1)·(n2+1) an
// unconditional exact test or interval accepts: about 4·10⁸, a design of
// 20 000 per group, which takes tens of seconds and a few hundred MB.
// Larger designs are refused with an error wrapping ErrTooLarge (from the
// test's Check); there the exact and the asymptotic tests agree closely.
const UnconditionalMaxTables = 4e8

// unconditionalTrialLimit is the TrialLimit (n1 + n2) at which one test takes
// about a second on one core, measured with the benchmarks.
const unconditionalTrialLimit = 6000

// UnconditionalVariant describes an unconditional exact test.
type UnconditionalVariant struct {
	Statistic OrderingStatistic
	TwoSided  TwoSidedRule
	// BergerBoosGamma, when positive, restricts the supremum to a
	// 1 − γ Clopper–Pearson confidence interval for the nuisance parameter
	// and adds γ to the p-value: Berger RL, Boos DD (1994), "P values
	// maximised over a confidence set for the nuisance parameter", Journal
	// of the American Statistical Association 89:1012–1016. The interval is
	// for the pooled proportion (x1+x2)/(n1+n2) when δ0 = 0 and for π2 from
	// the second group otherwise. Berger and Boos suggest γ = 0.001.
	BergerBoosGamma float64
}

// BarnardTest is Barnard's unconditional exact test with the pooled score
// statistic z = (p1 − p2)/√(p̄(1−p̄)(1/n1 + 1/n2)), p̄ = (x1+x2)/(n1+n2):
// Barnard GA (1947), "Significance tests for 2×2 tables", Biometrika
// 34:123–138, with the score ordering of Suissa S, Shuster JJ (1985),
// "Exact unconditional sample sizes for the 2×2 binomial trial", Journal of
// the Royal Statistical Society A 148:317–327. A non-zero null difference
// δ0 uses the score statistic at the restricted estimates (Farrington &
// Manning 1990) and maximises over π2 with π1 = π2 + δ0: the exact
// unconditional test of Chan ISF (1998), "Exact tests of equivalence and
// efficacy with a non-zero lower bound for comparative studies",
// Statistics in Medicine 17:1403–1413. Two-sided: |z| ≥ |z_obs|.
var BarnardTest = TestMethod{
	Key: "barnard-test", Name: "Barnard (score)", Citation: citeBarnardScore, Definition: defBarnardScore,
	Scale: Difference, Margins: true, Exact: true, TrialLimit: unconditionalTrialLimit,
	Check: checkUnconditionalSize, Run: unconditionalRunner(UnconditionalVariant{Statistic: PooledScore}),
	RunContext: unconditionalContextRunner(UnconditionalVariant{Statistic: PooledScore}), Cost: unconditionalCoster(UnconditionalVariant{Statistic: PooledScore}),
	Window: unconditionalWindow(UnconditionalVariant{Statistic: PooledScore}),
}

// BarnardWaldTest is Barnard's unconditional exact test ordered by the unpooled
// (Wald) statistic z = (p1 − p2 − δ0)/√(p1(1−p1)/n1 + p2(1−p2)/n2), with
// z = ±∞ when that variance is 0 and p1 − p2 ≠ δ0: Barnard GA (1947),
// Biometrika 34:123–138. Two-sided: |z| ≥ |z_obs|.
var BarnardWaldTest = TestMethod{
	Key: "barnard-wald-test", Name: "Barnard (Wald)", Citation: citeBarnardWald, Definition: defBarnardWald,
	Scale: Difference, Margins: true, Exact: true, TrialLimit: unconditionalTrialLimit,
	Check: checkUnconditionalSize, Run: unconditionalRunner(UnconditionalVariant{Statistic: UnpooledWald}),
	RunContext: unconditionalContextRunner(UnconditionalVariant{Statistic: UnpooledWald}), Cost: unconditionalCoster(UnconditionalVariant{Statistic: UnpooledWald}),
	Window: unconditionalWindow(UnconditionalVariant{Statistic: UnpooledWald}),
}

// BoschlooTest is Boschloo's unconditional exact test: tables are ordered by
// Fisher's exact p-value, and the p-value is the supremum over the common π
// of P(Fisher p ≤ observed Fisher p): Boschloo RD (1970), "Raised
// conditional level of significance for the 2×2-table when testing the
// equality of two probabilities", Statistica Neerlandica 24:1–35. It is
// never larger than Fisher's p-value. Two-sided: ordered by Fisher's
// two-sided p-value (tables no more probable than the observed one within
// their margin).
var BoschlooTest = TestMethod{
	Key: "boschloo-test", Name: "Boschloo", Citation: citeBoschloo, Definition: defBoschloo,
	Scale: Difference, Exact: true, TrialLimit: unconditionalTrialLimit,
	Check: checkUnconditionalSize, Run: unconditionalRunner(UnconditionalVariant{Statistic: FisherPValue}),
	RunContext: unconditionalContextRunner(UnconditionalVariant{Statistic: FisherPValue}), Cost: unconditionalCoster(UnconditionalVariant{Statistic: FisherPValue}),
	Window: unconditionalWindow(UnconditionalVariant{Statistic: FisherPValue}),
}

// BoschlooDoubledTest is Boschloo's test with the two-sided p-value taken as
// twice the smaller one-sided p-value (capped at 1), ordered by Fisher's
// one-sided p-values: the convention of some software and references.
var BoschlooDoubledTest = TestMethod{
	Key: "boschloo-doubled-test", Name: "Boschloo" + doubledName, Citation: citeBoschloo, Definition: defBoschloo + doubledDefinition,
	Scale: Difference, Exact: true, TrialLimit: unconditionalTrialLimit,
	Check: checkUnconditionalSize, Run: unconditionalRunner(UnconditionalVariant{Statistic: FisherPValue, TwoSided: TwoSidedDoubled}),
	RunContext: unconditionalContextRunner(UnconditionalVariant{Statistic: FisherPValue, TwoSided: TwoSidedDoubled}), Cost: unconditionalCoster(UnconditionalVariant{Statistic: FisherPValue, TwoSided: TwoSidedDoubled}),
	Window: unconditionalWindow(UnconditionalVariant{Statistic: FisherPValue, TwoSided: TwoSidedDoubled}),
}

// NewUnconditionalTest builds an unconditional exact test as a TestMethod
// (usable with Test, the coverage engine and the cards) for any ordering
// statistic, two-sided rule and Berger–Boos γ. It returns an error wrapping
// ErrUnsupported for an unknown statistic or rule, or a γ outside [0, 0.2].
// The key names the variant, for example "barnard-wald-doubled-bb0.001-test".
func NewUnconditionalTest(d UnconditionalVariant) (TestMethod, error) {
	if d.Statistic < PooledScore || d.Statistic > FisherPValue || d.TwoSided < TwoSidedOrdered || d.TwoSided > TwoSidedDoubled {
		return TestMethod{}, fmt.Errorf("unconditional design %+v: %w; use PooledScore, UnpooledWald or FisherPValue with TwoSidedOrdered or TwoSidedDoubled", d, ErrUnsupported)
	}
	if !(d.BergerBoosGamma >= 0 && d.BergerBoosGamma <= 0.2) {
		return TestMethod{}, fmt.Errorf("Berger–Boos γ %v: %w; use 0 (off) or a small value such as 0.001 (at most 0.2)", d.BergerBoosGamma, ErrUnsupported)
	}
	key, name, def, cite := unconditionalNames(d)
	return TestMethod{
		Key: key, Name: name, Citation: cite, Definition: def,
		Scale: Difference, Margins: d.Statistic != FisherPValue, Exact: true,
		TrialLimit: unconditionalTrialLimit,
		Check:      checkUnconditionalSize,
		Run:        unconditionalRunner(d),
		RunContext: unconditionalContextRunner(d),
		Cost:       unconditionalCoster(d),
		Window:     unconditionalWindow(d),
	}, nil
}

// The published descriptions of the three orderings; the registered tests
// and NewUnconditionalTest share them, so a variant has one name.
const (
	citeBarnardScore  = "Barnard GA (1947). Significance tests for 2×2 tables. Biometrika 34:123–138; score ordering: Suissa S, Shuster JJ (1985). J R Stat Soc A 148:317–327; non-zero margin: Chan ISF (1998). Stat Med 17:1403–1413."
	citeBarnardWald   = "Barnard GA (1947). Significance tests for 2×2 tables. Biometrika 34:123–138."
	citeBoschloo      = "Boschloo RD (1970). Raised conditional level of significance for the 2×2-table when testing the equality of two probabilities. Statistica Neerlandica 24:1–35."
	defBarnardScore   = "p = sup over the common π of P(z ≥ z_obs), z the pooled score statistic (|z| ≥ |z_obs| two-sided)"
	defBarnardWald    = "p = sup over the common π of P(z ≥ z_obs), z the unpooled Wald statistic (|z| ≥ |z_obs| two-sided)"
	defBoschloo       = "p = sup over the common π of P(Fisher p ≤ observed Fisher p)"
	doubledName       = ", doubled one-sided"
	doubledDefinition = "; two-sided p = min(1, 2·smaller one-sided p)"
)

// unconditionalNames returns the registry key (in the "-test" scheme),
// display name, definition and citation of a valid variant.
func unconditionalNames(d UnconditionalVariant) (key, name, def, cite string) {
	key = [...]string{"barnard", "barnard-wald", "boschloo"}[d.Statistic]
	name = [...]string{"Barnard (score)", "Barnard (Wald)", "Boschloo"}[d.Statistic]
	def = [...]string{defBarnardScore, defBarnardWald, defBoschloo}[d.Statistic]
	cite = [...]string{citeBarnardScore, citeBarnardWald, citeBoschloo}[d.Statistic]
	if d.TwoSided == TwoSidedDoubled {
		key, name, def = key+"-doubled", name+doubledName, def+doubledDefinition
	}
	if d.BergerBoosGamma > 0 {
		g := strconv.FormatFloat(d.BergerBoosGamma, 'g', -1, 64)
		key, name = key+"-bb"+g, name+", Berger–Boos γ="+g
		def += "; supremum over a 1−γ Clopper–Pearson interval for the nuisance parameter, plus γ"
		cite += " Berger RL, Boos DD (1994). P values maximised over a confidence set for the nuisance parameter. JASA 89:1012–1016."
	}
	return key + "-test", name, def, cite
}

// unconditionalRunner returns the Run function of a variant: the test
// without cancellation, under MaxCost. A design refused by the size or cost
// guard gives p = 1 — a valid but uninformative p-value — with the
// statistic name saying it was not computed, so direct callers of Run
// never hang (Test and TestContext return the guard's error instead).
func unconditionalRunner(d UnconditionalVariant) func(c Counts, h Hypothesis) TestResult {
	key, name, _, _ := unconditionalNames(d)
	return func(c Counts, h Hypothesis) TestResult {
		r, err := runUnconditional(context.Background(), c, h, d, key, name)
		if err != nil {
			r = TestResult{Method: key, MethodName: name, Scale: Difference, StatisticName: "not computed (design too large)"}
			r.PValue, r.LogPValue = 1, 0
			r.decide(h)
		}
		return r
	}
}

// unconditionalContextRunner returns the RunContext function of a variant.
func unconditionalContextRunner(d UnconditionalVariant) func(ctx context.Context, c Counts, h Hypothesis) (TestResult, error) {
	key, name, _, _ := unconditionalNames(d)
	return func(ctx context.Context, c Counts, h Hypothesis) (TestResult, error) {
		return runUnconditional(ctx, c, h, d, key, name)
	}
}

// unconditionalCoster returns the Cost function of a variant (see
// unconditional_cost.go).
func unconditionalCoster(d UnconditionalVariant) func(c Counts, h Hypothesis) Cost {
	return func(c Counts, h Hypothesis) Cost { return unconditionalCost(c, h, d) }
}

// checkUnconditionalSize refuses designs above UnconditionalMaxTables.
func checkUnconditionalSize(c Counts) error {
	if t := float64(c.N1+1) * float64(c.N2+1); t > UnconditionalMaxTables {
		return fmt.Errorf("%d and %d trials make %.3g tables: %w; exact unconditional methods accept at most %.0g tables ((n1+1)·(n2+1)); use Fisher's exact test or an asymptotic test at this size",
			c.N1, c.N2, t, ErrTooLarge, float64(UnconditionalMaxTables))
	}
	return nil
}

// runUnconditional computes the test. Designs above UnconditionalMaxTables
// or h's cost guard (MaxCost when unset) are refused with an error wrapping
// ErrTooLarge, before any work or, for the log-space search, before it
// starts; a cancelled ctx stops it with ctx's error.
func runUnconditional(ctx context.Context, c Counts, h Hypothesis, d UnconditionalVariant, key, name string) (TestResult, error) {
	r := TestResult{Method: key, MethodName: name, Scale: Difference}
	if err := checkUnconditionalSize(c); err != nil {
		return r, err
	}
	guard := h.costLimit
	if guard == (Cost{}) {
		guard = MaxCost
	}
	if err := unconditionalCost(c, h, d).guard(fmt.Sprintf("%s at %d/%d vs %d/%d (null %v)", name, c.X1, c.N1, c.X2, c.N2, h.Null), guard); err != nil {
		return r, err
	}
	side := func(s regionSide) (logp, nuis, stat, logBound float64, err error) {
		return unconditionalSide(ctx, guard, c, h.Null, d, s)
	}
	var logp, nuis, logBound float64
	var err error
	switch {
	case h.Alternative == TwoSided && d.TwoSided == TwoSidedDoubled:
		lg, ng, sg, bg, errG := side(sideGreater)
		if errG != nil {
			return r, errG
		}
		ll, nl, sl, bl, errL := side(sideLess)
		if errL != nil {
			return r, errL
		}
		logp, nuis, r.Statistic = lg, ng, sg
		if ll < lg {
			logp, nuis, r.Statistic = ll, nl, sl
		}
		// The true value is 2·min(sup_greater, sup_less) ≤ 2·min(bounds).
		logp, logBound = min(logp+math.Ln2, 0), min(min(bg, bl)+math.Ln2, 0)
	case h.Alternative == Greater:
		logp, nuis, r.Statistic, logBound, err = side(sideGreater)
	case h.Alternative == Less:
		logp, nuis, r.Statistic, logBound, err = side(sideLess)
	default:
		logp, nuis, r.Statistic, logBound, err = side(sideBoth)
	}
	if err != nil {
		return r, err
	}
	if g := d.BergerBoosGamma; g > 0 {
		logp = math.Log(min(math.Exp(logp)+g, 1))
		logBound = math.Log(min(math.Exp(logBound)+g, 1))
	}
	bound := max(math.Exp(logBound), math.Exp(logp))
	r.PValueBound = &bound
	r.StatisticName = "z"
	if d.Statistic == FisherPValue {
		r.StatisticName = "Fisher p"
	}
	r.PValue, r.LogPValue, r.Nuisance = math.Exp(logp), logp, &nuis
	r.decide(h)
	return r, nil
}

// unconditionalSide returns the log of the maximised tail probability for
// one region, the nuisance value π2 where it is attained, the observed
// ordering statistic, and the log of the proven upper bound on the
// supremum (unconditional_bound.go); ctx's error when ctx ends, and an
// error wrapping ErrTooLarge when the log-space search would exceed the
// guard.
func unconditionalSide(ctx context.Context, guard Cost, c Counts, delta float64, d UnconditionalVariant, side regionSide) (logp, nuisance, stat, logBound float64, err error) {
	obs := observedStatistic(c, delta, d.Statistic, side)
	stat = obs
	if d.Statistic == FisherPValue {
		stat = math.Exp(obs)
	}
	a, b := nuisanceRange(c, delta, d.BergerBoosGamma)
	logp, nuisance, logBound, err = sideSupremum(ctx, guard, c.N1, c.N2, obs, delta, d.Statistic, side, a, b, nil)
	return logp, nuisance, stat, logBound, err
}

// observedStatistic is what a side's region depends on: the z statistic
// for the z orderings, the log of the Fisher p-value for Boschloo's.
func observedStatistic(c Counts, delta float64, stat OrderingStatistic, side regionSide) float64 {
	if stat == FisherPValue {
		return fisherObserved(c, side)
	}
	return zObserved(c, delta, stat == PooledScore)
}

// sideSupremum builds the region of the tables at least as extreme as the
// observed statistic obs and returns the log of its largest tail over the
// nuisance range [a, b], where it is attained, and the log of the proven
// bound. It is the whole computation of one side of a test after the
// observed statistic, so outcomes with equal statistics get equal results
// (the window decisions rely on it). work, when not nil, is scratch reused
// between calls of one design.
func sideSupremum(ctx context.Context, guard Cost, n1, n2 int64, obs, delta float64, stat OrderingStatistic, side regionSide, a, b float64, work *tailWork) (logp, nuisance, logBound float64, err error) {
	reg := regionAt(ctx, n1, n2, obs, delta, stat, side)
	if err := ctx.Err(); err != nil {
		return 0, 0, 0, err
	}
	return regionSupremum(ctx, guard, &reg, delta, a, b, work)
}

// regionSupremum is the nuisance search of sideSupremum on a built region.
func regionSupremum(ctx context.Context, guard Cost, reg *region, delta, a, b float64, work *tailWork) (logp, nuisance, logBound float64, err error) {
	if work == nil {
		work = newTailWork(reg.n1, reg.n2)
	}
	s := nuisanceSearch{work: work, reg: reg, delta: delta, a: a, b: b, ctx: ctx, guard: guard}
	logp, nuisance, logBound = s.provenSupremum()
	if s.err != nil {
		return 0, 0, 0, s.err
	}
	return logp, nuisance, logBound, nil
}

// regionAt builds a side's region for the observed statistic obs.
func regionAt(ctx context.Context, n1, n2 int64, obs, delta float64, stat OrderingStatistic, side regionSide) region {
	if stat == FisherPValue {
		return fisherRegionAt(ctx, n1, n2, obs, side)
	}
	return zRegionAt(ctx, n1, n2, obs, delta, stat == PooledScore, side)
}

// nuisanceRange returns the range of π2 searched: all π2 with π1 = π2 + δ0
// in [0, 1], narrowed by the Berger–Boos interval when γ > 0.
func nuisanceRange(c Counts, delta, gamma float64) (a, b float64) {
	a, b = max(0, -delta), min(1, 1-delta)
	if gamma <= 0 {
		return a, b
	}
	x, n := c.X2, c.N2
	if delta == 0 {
		x, n = c.X1+c.X2, c.N1+c.N2
	}
	lo, hi := clopperPearson(x, n, gamma)
	return max(a, lo), min(b, max(hi, max(a, lo)))
}

// clopperPearson returns the 1 − γ Clopper–Pearson interval for x events
// of n: the γ/2 quantile of Beta(x, n−x+1) and the 1−γ/2 quantile of
// Beta(x+1, n−x) (Clopper CJ, Pearson ES (1934), Biometrika 26:404–413),
// from the same beta quantile as ClopperPearson, which stays accurate at
// the small γ the Berger–Boos restriction uses.
func clopperPearson(x, n int64, gamma float64) (lo, hi float64) {
	return clopperPearsonLimits(x, n, Confidence{Level: 1 - gamma})
}
