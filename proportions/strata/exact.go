package strata

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/internal/root"
	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// Keys of the exact conditional methods.
const (
	ExactTestKey      = "exact-conditional-test"
	ExactOddsRatioKey = "exact-conditional-odds-ratio"
)

const (
	birch      = "Birch MW (1964). The detection of partial association, I: the 2×2 case. Journal of the Royal Statistical Society B 26:313–324."
	gart       = "Gart JJ (1970). Point and interval estimation of the common odds ratio in the combination of 2×2 tables with fixed marginals. Biometrika 57:471–475."
	mehtaPatel = "Mehta CR, Patel NR, Gray R (1985). Computing an exact confidence interval for the common odds ratio in several 2×2 contingency tables. Journal of the American Statistical Association 80:969–973."
)

// sumDistribution is the exact conditional distribution of S = Σx1, the
// first group's events summed over the strata, given every stratum's
// margins. Within a stratum x1 follows Fisher's noncentral hypergeometric
// distribution, P(x1 = k) ∝ C(n1, k)·C(n2, m1−k)·ψᵏ, and with a common odds
// ratio ψ the strata are independent, so
//
//	P(S = s) ∝ c(s)·ψˢ,  c = the convolution over strata of C(n1, k)·C(n2, m1−k).
//
// logC holds log c(lo + i) up to a constant, computed in log space so that
// nothing overflows or underflows whatever the counts.
type sumDistribution struct {
	lo   int64
	logC []float64
}

// sumCostPerPair is the steps of one pair of terms of the log-space
// convolution: two passes (maximum, then exp and add) with an exp each.
const sumCostPerPair = 40

// ExactCost is the estimated cost of the exact conditional test and
// interval for the rows of b that have both groups: the log-space
// convolution of their conditional distributions (about Σ over strata of
// the support so far times the stratum's support, in pairs of terms) and
// the searches of the interval. The analysis compares it with
// proportions.AnalysisCost, or proportions.MaxCost with ScopeAll.
func ExactCost(b proportions.Breakdown) proportions.Cost { return exactCost(usable(b)) }

// exactCost estimates the work of the convolution and of the searches of
// the interval (about two hundred evaluations of the distribution), and the
// memory of the three arrays of the longest support.
func exactCost(ts []table) proportions.Cost {
	var steps, length float64
	for _, t := range ts {
		lo, hi := special.HypergeomSupport(t.counts.N1, t.counts.N2, t.counts.X1+t.counts.X2)
		l := float64(hi - lo + 1)
		if length == 0 {
			length = l
			steps += 60 * l
			continue
		}
		steps += sumCostPerPair*length*l + 60*l
		length += l - 1
	}
	steps += 200 * 30 * length
	return proportions.Cost{Steps: steps, Bytes: 3 * 8 * length}
}

// newSumDistribution convolves the strata's conditional distributions. It
// looks at ctx between strata and every few thousand terms within one.
func newSumDistribution(ctx context.Context, ts []table) (sumDistribution, error) {
	var d sumDistribution
	for i, t := range ts {
		lo, hi := special.HypergeomSupport(t.counts.N1, t.counts.N2, t.counts.X1+t.counts.X2)
		terms := make([]float64, hi-lo+1)
		for k := lo; k <= hi; k++ {
			terms[k-lo] = special.LogHypergeomPMF(k, t.counts.N1, t.counts.N2, t.counts.X1+t.counts.X2)
		}
		if i == 0 {
			d = sumDistribution{lo: lo, logC: terms}
			continue
		}
		out, err := convolveLog(ctx, d.logC, terms)
		if err != nil {
			return sumDistribution{}, err
		}
		d = sumDistribution{lo: d.lo + lo, logC: out}
	}
	return d, nil
}

// convolveLog returns log Σ_{i+j=k} exp(a[i] + b[j]) for every k, each
// sum taken relative to its largest term. It looks at ctx about every 10⁵
// pairs of terms, so a cancel is seen within a millisecond or so.
func convolveLog(ctx context.Context, a, b []float64) ([]float64, error) {
	every := max(1, (1<<17)/len(b))
	peak := make([]float64, len(a)+len(b)-1)
	for k := range peak {
		peak[k] = math.Inf(-1)
	}
	for i, ai := range a {
		if i%every == every-1 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		row := peak[i : i+len(b)]
		for j, bj := range b {
			if v := ai + bj; v > row[j] {
				row[j] = v
			}
		}
	}
	sums := make([]float64, len(peak))
	for i, ai := range a {
		if i%every == every-1 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		row, top := sums[i:i+len(b)], peak[i:i+len(b)]
		for j, bj := range b {
			row[j] += math.Exp(ai + bj - top[j])
		}
	}
	for k := range sums {
		peak[k] += math.Log(sums[k])
	}
	return peak, nil
}

// hi returns the largest possible sum.
func (d sumDistribution) hi() int64 { return d.lo + int64(len(d.logC)) - 1 }

// logWeights returns log c(s) + s·θ − its maximum, for every s, into w.
func (d sumDistribution) logWeights(theta float64, w []float64) []float64 {
	w = w[:0]
	peak := math.Inf(-1)
	for i, c := range d.logC {
		v := c + float64(i)*theta
		w = append(w, v)
		peak = math.Max(peak, v)
	}
	for i := range w {
		w[i] -= peak
	}
	return w
}

// tails returns log P(S ≤ s) and log P(S ≥ s) under log ψ = θ.
func (d sumDistribution) tails(theta float64, s int64, w []float64) (logBelow, logAbove float64) {
	w = d.logWeights(theta, w)
	at := int(s - d.lo)
	total := logSumExp(w)
	return logSumExp(w[:at+1]) - total, logSumExp(w[at:]) - total
}

// mean returns E[S] under log ψ = θ.
func (d sumDistribution) mean(theta float64, w []float64) float64 {
	w = d.logWeights(theta, w)
	var tot, m float64
	for i, v := range w {
		e := math.Exp(v)
		tot += e
		m += float64(i) * e
	}
	return float64(d.lo) + m/tot
}

func logSumExp(v []float64) float64 {
	peak := math.Inf(-1)
	for _, x := range v {
		peak = math.Max(peak, x)
	}
	if math.IsInf(peak, -1) {
		return peak
	}
	s := 0.0
	for _, x := range v {
		s += math.Exp(x - peak)
	}
	return peak + math.Log(s)
}

// exactTest is the exact conditional test of a common odds ratio of 1
// (no association in any stratum): under ψ = 1, S = Σx1 has the
// distribution P(S = s) ∝ c(s) (see sumDistribution), and
//
//	greater: p = P(S ≥ s_obs);  less: p = P(S ≤ s_obs);
//	two-sided: p = the probability of the sums no more probable than the
//	observed one, P(S = s) ≤ P(S = s_obs)·(1 + 10⁻⁷),
//
// the rule of Fisher's test (proportions.FisherTest), to which it reduces
// with one stratum. Birch MW (1964), "The detection of partial
// association, I: the 2×2 case", Journal of the Royal Statistical Society B
// 26:313–324.
func exactTest(d sumDistribution, s int64, alt proportions.Alternative) Test {
	t := Test{Key: ExactTestKey, Name: "Exact conditional (common odds ratio 1)", StatisticName: "Σx1", Statistic: float64(s),
		Alternative: alt, Citation: birch,
		Definition: "S = Σx1 given every stratum's margins, P(S = s) ∝ the convolution of C(n1,k)·C(n2,m1−k); one-sided p = P(S ≥ s) or P(S ≤ s); two-sided: total probability of the sums with P ≤ P(observed)·(1+1e−7)"}
	w := d.logWeights(0, nil)
	at := int(s - d.lo)
	total := logSumExp(w)
	switch alt {
	case proportions.Greater:
		t.LogPValue = logSumExp(w[at:]) - total
	case proportions.Less:
		t.LogPValue = logSumExp(w[:at+1]) - total
	default:
		limit := w[at] + math.Log1p(proportions.FisherTieTolerance)
		sel := make([]float64, 0, len(w))
		for _, v := range w {
			if v <= limit {
				sel = append(sel, v)
			}
		}
		t.LogPValue = logSumExp(sel) - total
	}
	t.LogPValue = math.Min(0, t.LogPValue)
	t.PValue = math.Exp(t.LogPValue)
	return t
}

// exactOddsRatio is the exact conditional interval for the common odds
// ratio and the conditional maximum-likelihood estimate: the lower limit
// ψL solves P(S ≥ s_obs; ψL) = α/2, the upper limit ψU solves
// P(S ≤ s_obs; ψU) = α/2, and the estimate solves E[S; ψ] = s_obs, with
// S = Σx1 distributed as in sumDistribution. It inverts the two one-sided
// exact conditional tests, so it covers at least at the nominal level.
// Gart JJ (1970), "Point and interval estimation of the common odds ratio
// in the combination of 2×2 tables with fixed marginals", Biometrika
// 57:471–475; computed from the exact distribution of S as in Mehta CR,
// Patel NR, Gray R (1985), Journal of the American Statistical Association
// 80:969–973. With one stratum it is Cornfield's exact interval
// (proportions.CornfieldExact). ψL = 0 (and the estimate 0) when s_obs is
// the smallest possible sum, ψU = ∞ (and the estimate ∞) when it is the
// largest; when only one sum is possible the interval is [0, ∞] and the
// estimate not estimable.
func exactOddsRatio(d sumDistribution, s int64, conf proportions.Confidence, start float64) Estimate {
	e := Estimate{Key: ExactOddsRatioKey, Name: "Exact conditional odds ratio", Scale: proportions.OddsRatio, Level: conf.Level,
		Citation:   gart + " Computation: " + mehtaPatel,
		Definition: "ψL with P(S ≥ s; ψL) = α/2, ψU with P(S ≤ s; ψU) = α/2, S = Σx1 given the margins (a convolution of noncentral hypergeometric distributions); estimate: E[S; ψ] = s",
		Lower:      0, Upper: math.Inf(1)}
	lo, hi := d.lo, d.hi()
	if lo == hi {
		e.Estimate = math.NaN()
		return e
	}
	w := make([]float64, 0, len(d.logC))
	if math.IsNaN(start) || math.IsInf(start, 0) {
		start = 0
	}
	half := math.Log(conf.Alpha() / 2)
	switch s {
	case lo:
		e.Estimate = 0
	case hi:
		e.Estimate = math.Inf(1)
	default:
		x := float64(s)
		e.Estimate = math.Exp(root.DecreasingCrossing(func(t float64) float64 { return x - d.mean(t, w) }, start, 1))
	}
	if s > lo {
		e.Lower = math.Exp(root.DecreasingCrossing(func(t float64) float64 {
			_, above := d.tails(t, s, w)
			return half - above
		}, start, 1))
	}
	if s < hi {
		e.Upper = math.Exp(root.DecreasingCrossing(func(t float64) float64 {
			below, _ := d.tails(t, s, w)
			return below - half
		}, start, 1))
	}
	return e
}

// exactMethods runs the exact conditional test and interval, refusing a
// breakdown whose cost exceeds guard with an error wrapping ErrTooLarge.
func exactMethods(ctx context.Context, ts []table, alt proportions.Alternative, conf proportions.Confidence, level float64, start float64, guard proportions.Cost) (Test, Estimate, error) {
	if c := exactCost(ts); !c.Within(guard) {
		return Test{}, Estimate{}, fmt.Errorf("the exact conditional test and interval over %d strata would need %v: %w; the limit is %v; "+
			"use the Cochran–Mantel–Haenszel test and the Mantel–Haenszel odds ratio at this size", len(ts), c, proportions.ErrTooLarge, guard)
	}
	d, err := newSumDistribution(ctx, ts)
	if err != nil {
		return Test{}, Estimate{}, err
	}
	s := int64(sum(ts, func(t table) float64 { return t.a }))
	t := exactTest(d, s, alt)
	t.decide(level)
	return t, exactOddsRatio(d, s, conf, start), nil
}
