package bayes

import (
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// Caution is the standing reminder attached to every Bayesian analysis.
const Caution = "A posterior probability rests on the prior and the model (independent units, one rate per group); " +
	"a high probability that one rate is higher says nothing about whether the difference matters: judge its size " +
	"against what matters in your setting. Where health or safety decisions follow, they rest on the applicable " +
	"regulations and the advice of a qualified statistician, not on this output alone."

// DefaultLevel is the posterior probability inside the intervals when
// none is given.
const DefaultLevel = 0.95

// Option sets a choice of the Bayesian analysis.
type Option func(*settings)

type settings struct {
	prior1, prior2 Prior
	level          float64
	margin         float64
	region         *Region
	batch          int64
	better         proportions.Better
}

// WithPrior sets the same prior on both groups (default DefaultPrior).
func WithPrior(p Prior) Option { return func(s *settings) { s.prior1, s.prior2 = p, p } }

// WithPriors sets a prior for each group.
func WithPriors(first, second Prior) Option {
	return func(s *settings) { s.prior1, s.prior2 = first, second }
}

// WithLevel sets the posterior probability inside the intervals, from
// proportions.MinLevel to proportions.MaxLevel (default 0.95).
func WithLevel(level float64) Option { return func(s *settings) { s.level = level } }

// WithMargin sets the margin δ of P(π1 − π2 > δ), in (−1, 1) (default 0).
func WithMargin(delta float64) Option { return func(s *settings) { s.margin = delta } }

// WithEquivalence sets the equivalence region: the differences π1 − π2
// from lower to upper that the user counts as no difference in practice
// (none by default; then no probability inside it is reported).
func WithEquivalence(lower, upper float64) Option {
	return func(s *settings) { s.region = &Region{Lower: lower, Upper: upper} }
}

// WithBatch sets the size of the future batch of each group (default
// DefaultBatch, at most MaxBatch).
func WithBatch(units int64) Option { return func(s *settings) { s.batch = units } }

// WithBetter says which way a rate is good (default
// proportions.HigherIsBetter); the expected loss and "beats" follow it.
func WithBetter(b proportions.Better) Option { return func(s *settings) { s.better = b } }

// Region is an equivalence region on the difference π1 − π2.
type Region struct {
	Lower float64 `json:"lower"`
	Upper float64 `json:"upper"`
}

// GroupPosterior is one group's prior, data and posterior.
type GroupPosterior struct {
	Group     proportions.Group `json:"group"`
	Prior     Prior             `json:"prior"`
	Posterior Posterior         `json:"posterior"`
	Mean      float64           `json:"mean"`
	// Lower and Upper: the equal-tailed posterior interval of the rate.
	Lower float64 `json:"lower"`
	Upper float64 `json:"upper"`
}

// EffectSummary is the posterior of one effect: its median, the
// equal-tailed and the highest-density interval at the analysis's level,
// and the largest error estimate among them.
type EffectSummary struct {
	Scale               proportions.Scale `json:"scale"`
	Median              float64           `json:"median"`
	Lower               float64           `json:"lower"`
	Upper               float64           `json:"upper"`
	HighestDensityLower float64           `json:"highest_density_lower"`
	HighestDensityUpper float64           `json:"highest_density_upper"`
	ErrorBound          float64           `json:"error_bound"`
}

// ExpectedLoss is the expected shortfall in rate from choosing each group:
// for the first, E[max(π2 − π1, 0)] when higher is better (E[max(π1 − π2, 0)]
// when lower is better), and the mirror for the second.
type ExpectedLoss struct {
	First  float64 `json:"first"`
	Second float64 `json:"second"`
}

// Prediction is the posterior predictive of a future batch of each group
// and the chance that group 1's batch beats group 2's (more events when
// higher is better, fewer when lower is better), or ties it.
type Prediction struct {
	Batch                 int64         `json:"batch"`
	Groups                [2]Predictive `json:"groups"`
	ProbabilityFirstBeats float64       `json:"probability_first_beats"`
	ProbabilityTie        float64       `json:"probability_tie"`
}

// SensitivityRow is the main numbers under one choice of priors (the same
// on both groups for the standard ones): P(π1 > π2), the posterior median
// and equal-tailed interval of π1 − π2, and the probability inside the
// equivalence region (nil without one).
type SensitivityRow struct {
	Priors                 [2]Prior `json:"priors"`
	ProbabilityFirstHigher float64  `json:"probability_first_higher"`
	Median                 float64  `json:"median"`
	Lower                  float64  `json:"lower"`
	Upper                  float64  `json:"upper"`
	ProbabilityEquivalent  *float64 `json:"probability_equivalent"`
}

// Analysis is the Bayesian analysis of a comparison (from Analyze).
type Analysis struct {
	Comparison proportions.Comparison `json:"comparison"`
	Better     proportions.Better     `json:"better"`
	Level      float64                `json:"level"`
	Groups     [2]GroupPosterior      `json:"groups"`
	// ProbabilityFirstHigher is P(π1 > π2); Exact tells whether the exact
	// finite sum gave it.
	ProbabilityFirstHigher float64 `json:"probability_first_higher"`
	Exact                  bool    `json:"exact"`
	Margin                 float64 `json:"margin"`
	// ProbabilityBeyondMargin is P(π1 − π2 > Margin).
	ProbabilityBeyondMargin float64 `json:"probability_beyond_margin"`
	// EquivalenceRegion and ProbabilityEquivalent, P(lower < π1 − π2 <
	// upper), are nil without a region.
	EquivalenceRegion     *Region          `json:"equivalence_region"`
	ProbabilityEquivalent *float64         `json:"probability_equivalent"`
	Effects               []EffectSummary  `json:"effects"`
	ExpectedLoss          ExpectedLoss     `json:"expected_loss"`
	Prediction            Prediction       `json:"prediction"`
	Sensitivity           []SensitivityRow `json:"sensitivity"`
	// ErrorBound is the largest error estimate among the probabilities.
	ErrorBound float64 `json:"error_bound"`
	Caution    string  `json:"caution"`
}

// Analyze runs the Bayesian analysis of a comparison. Bad options return
// an error wrapping ErrPrior, ErrRegion, ErrBatch or proportions.ErrLevel,
// ErrMargin, ErrBetter, saying what is allowed. A posterior the integrals
// cannot handle in about a second is refused before any work (see
// checkPosterior): one of more than 10⁸ units (counts plus prior strength)
// wraps proportions.ErrTooLarge, one with a shape below 0.05 wraps ErrPrior.
func Analyze(c proportions.Comparison, options ...Option) (Analysis, error) {
	s := settings{prior1: DefaultPrior(), prior2: DefaultPrior(), level: DefaultLevel, batch: DefaultBatch}
	for _, o := range options {
		o(&s)
	}
	if err := c.Counts().Validate(); err != nil {
		return Analysis{}, err
	}
	for _, p := range []Prior{s.prior1, s.prior2} {
		if err := p.Validate(); err != nil {
			return Analysis{}, err
		}
	}
	if err := proportions.ValidateLevel(s.level); err != nil {
		return Analysis{}, fmt.Errorf("interval probability: %w", err)
	}
	if !(s.margin > -1 && s.margin < 1) {
		return Analysis{}, fmt.Errorf("margin %v: %w; a margin on the difference lies strictly between −1 and 1", s.margin, proportions.ErrMargin)
	}
	if r := s.region; r != nil && !(r.Lower > -1 && r.Lower < r.Upper && r.Upper < 1) {
		return Analysis{}, fmt.Errorf("equivalence region %v to %v: %w; give lower < upper, both strictly between −1 and 1", r.Lower, r.Upper, ErrRegion)
	}
	if err := s.better.Validate(); err != nil {
		return Analysis{}, err
	}
	if s.batch < 1 || s.batch > MaxBatch {
		return Analysis{}, fmt.Errorf("batch of %d: %w; a future batch has 1 to %d units", s.batch, ErrBatch, MaxBatch)
	}
	a := Analysis{Comparison: c, Better: s.better, Level: s.level, Margin: s.margin, EquivalenceRegion: s.region,
		Effects: []EffectSummary{}, Sensitivity: []SensitivityRow{}, Caution: Caution}
	post := [2]Posterior{}
	for i, g := range []proportions.Group{c.First, c.Second} {
		p := []Prior{s.prior1, s.prior2}[i]
		post[i] = p.Update(g.Events, g.Trials)
		if err := checkPosterior(g.Label, post[i]); err != nil {
			return Analysis{}, err
		}
		gp := GroupPosterior{Group: g, Prior: p, Posterior: post[i], Mean: post[i].Mean()}
		gp.Lower, gp.Upper = rateInterval(post[i], s.level)
		a.Groups[i] = gp
	}
	var errMax float64
	var er float64
	// one posterior of the difference serves every number of the section
	// (its outer rule and inner table are the costly part)
	diff, err := NewEffect(proportions.Difference, post[0], post[1])
	if err != nil {
		return Analysis{}, err
	}
	a.ProbabilityFirstHigher, _, er, a.Exact = probabilityFirstHigher(post[0], post[1], diff)
	errMax = math.Max(errMax, er)
	if s.margin == 0 {
		a.ProbabilityBeyondMargin = a.ProbabilityFirstHigher
	} else {
		_, a.ProbabilityBeyondMargin, er = diff.Tails(s.margin)
		errMax = math.Max(errMax, er)
	}
	if r := s.region; r != nil {
		p, er := inside(diff, *r)
		a.ProbabilityEquivalent = &p
		errMax = math.Max(errMax, er)
	}
	for _, sc := range []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio} {
		e := diff
		if sc != proportions.Difference {
			e, _ = diff.onScale(sc)
		}
		sum, err := summarize(e, s.level)
		if err != nil {
			return Analysis{}, err
		}
		a.Effects = append(a.Effects, sum)
	}
	a.ExpectedLoss, er = expectedLoss(post[0], post[1], s.better)
	errMax = math.Max(errMax, er)

	d1, err := post[0].Predict(s.batch)
	if err != nil {
		return Analysis{}, err
	}
	d2, _ := post[1].Predict(s.batch)
	d1.Lower, d1.Upper = d1.quantile((1-s.level)/2), d1.quantile((1+s.level)/2)
	d2.Lower, d2.Upper = d2.quantile((1-s.level)/2), d2.quantile((1+s.level)/2)
	a.Prediction = Prediction{Batch: s.batch, Groups: [2]Predictive{d1, d2}}
	if s.better == proportions.LowerIsBetter {
		var p float64
		p, a.Prediction.ProbabilityTie = compareBatches(d2, d1)
		a.Prediction.ProbabilityFirstBeats = p
	} else {
		a.Prediction.ProbabilityFirstBeats, a.Prediction.ProbabilityTie = compareBatches(d1, d2)
	}

	priors := standardPriors()
	if s.prior1 != s.prior2 || !isStandard(s.prior1) {
		priors = append(priors, s.prior1) // the user's: row 3 takes both groups' priors
	}
	for i, p := range priors {
		p1, p2 := p, p
		if i == 3 {
			p1, p2 = s.prior1, s.prior2
		}
		if p1 == s.prior1 && p2 == s.prior2 { // the analysis's own priors: its numbers
			d := a.Effects[0]
			a.Sensitivity = append(a.Sensitivity, SensitivityRow{Priors: [2]Prior{p1, p2},
				ProbabilityFirstHigher: a.ProbabilityFirstHigher, Median: d.Median, Lower: d.Lower, Upper: d.Upper,
				ProbabilityEquivalent: copyOf(a.ProbabilityEquivalent)})
			continue
		}
		row, er, err := sensitivityRow(c, p1, p2, s)
		if err != nil {
			return Analysis{}, err
		}
		errMax = math.Max(errMax, er)
		a.Sensitivity = append(a.Sensitivity, row)
	}
	a.ErrorBound = errMax
	return a, nil
}

func isStandard(p Prior) bool {
	for _, q := range standardPriors() {
		if p == q {
			return true
		}
	}
	return false
}

// rateInterval is the equal-tailed interval of one rate, by bisection on
// the incomplete beta function (to 10⁻¹⁴).
func rateInterval(p Posterior, level float64) (lo, hi float64) {
	q := func(target float64) float64 {
		l, h := 0.0, 1.0
		for i := 0; i < 200 && h-l > 1e-14*math.Max(h, 1e-300); i++ {
			m := (l + h) / 2
			if p.Below(m) < target {
				l = m
			} else {
				h = m
			}
		}
		return (l + h) / 2
	}
	return q((1 - level) / 2), q((1 + level) / 2)
}

func inside(diff *Effect, r Region) (float64, float64) {
	below, e1 := diff.tail1(r.Lower, false)
	above, e2 := diff.tail1(r.Upper, true)
	return clamp01(1 - below - above), e1 + e2
}

func summarize(e *Effect, level float64) (EffectSummary, error) {
	med, em, err := e.Quantile(0.5)
	if err != nil {
		return EffectSummary{}, err
	}
	lo, hi, ee, err := e.EqualTailed(level)
	if err != nil {
		return EffectSummary{}, err
	}
	hl, hh, he, err := e.highestDensityFrom(level, lo, hi, ee)
	if err != nil {
		return EffectSummary{}, err
	}
	return EffectSummary{Scale: e.Scale, Median: med, Lower: lo, Upper: hi, HighestDensityLower: hl, HighestDensityUpper: hh,
		ErrorBound: math.Max(em, math.Max(ee, he))}, nil
}

// expectedLoss uses π·f(π; α, β) = α/(α+β)·f(π; α+1, β), so that
// E[π2·1{π2 > π1}] = μ2·P(π2' > π1) with π2' ~ Beta(α2+1, β2), and
// E[max(π2 − π1, 0)] = μ2·P(π2' > π1) − μ1·P(π2 > π1'); every probability
// comes from ProbabilityFirstHigher.
func expectedLoss(p1, p2 Posterior, better proportions.Better) (ExpectedLoss, float64) {
	shortfall := func(x, y Posterior) (float64, float64) { // E[max(y − x, 0)]
		yUp := NewPosterior(y.EventShape+1, y.NonEventShape)
		xUp := NewPosterior(x.EventShape+1, x.NonEventShape)
		h1, _, e1, _ := ProbabilityFirstHigher(yUp, x)
		h2, _, e2, _ := ProbabilityFirstHigher(y, xUp)
		return math.Max(0, y.Mean()*h1-x.Mean()*h2), y.Mean()*e1 + x.Mean()*e2
	}
	if better == proportions.LowerIsBetter {
		l1, e1 := shortfall(p2, p1)
		l2, e2 := shortfall(p1, p2)
		return ExpectedLoss{First: l1, Second: l2}, math.Max(e1, e2)
	}
	l1, e1 := shortfall(p1, p2)
	l2, e2 := shortfall(p2, p1)
	return ExpectedLoss{First: l1, Second: l2}, math.Max(e1, e2)
}

func sensitivityRow(c proportions.Comparison, p1, p2 Prior, s settings) (SensitivityRow, float64, error) {
	q1, q2 := p1.Update(c.First.Events, c.First.Trials), p2.Update(c.Second.Events, c.Second.Trials)
	row := SensitivityRow{Priors: [2]Prior{p1, p2}}
	var errMax, er float64
	diff := newEffect(proportions.Difference, q1, q2)
	row.ProbabilityFirstHigher, _, er, _ = probabilityFirstHigher(q1, q2, diff)
	errMax = er
	med, em, err := diff.Quantile(0.5)
	if err != nil {
		return row, 0, err
	}
	row.Median = med
	row.Lower, row.Upper, er, _ = diff.EqualTailed(s.level)
	errMax = math.Max(errMax, math.Max(er, em))
	if s.region != nil {
		p, er := inside(diff, *s.region)
		row.ProbabilityEquivalent = &p
		errMax = math.Max(errMax, er)
	}
	return row, errMax, nil
}

func copyOf(p *float64) *float64 {
	if p == nil {
		return nil
	}
	v := *p
	return &v
}
