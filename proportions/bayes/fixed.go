package bayes

import (
	"math"

	"github.com/propscope/propscope/internal/quad"
)

// The fixed rule. Every distribution function and density of an effect
// integrates over the same outer posterior, so the outer part of the
// integrand, exp(ℓ(t)) at each node with the node's rate o and 1 − o, is
// tabulated once per Effect on a composite Gauss–Legendre rule (panels of
// two and a half curvature widths of the outer log-odds density, 20 nodes
// each, and the 10-node companion on the panels that carry mass) and
// reused for every value v. Only the inner incomplete beta function, or
// the inner density, is evaluated per v.
//
// Error estimate of one integral on the fixed rule: the sum over the
// panels with mass above companionMass of |G20 − G10|, plus twice the
// outer mass of every other panel (the integrand lies between 0 and the
// outer density times the inner factor's bound, so such a panel's
// 20-node value and its true value both lie in [0, mass]), plus the
// window's truncation bound. When that estimate is not within the
// tolerances (a kink of the integrand in the body of the outer posterior,
// a sharp inner factor) the adaptive quadrature takes over, so the fixed
// rule changes the cost, not the accuracy. The weights are normalised by
// the window's total mass (see Posterior.relEll), which moves a value by
// at most the window's truncation bound, already part of the estimate.

// companionMass is the outer mass below which a panel gets no 10-node
// companion (its error counts as twice its mass) and droppedMass the mass
// below which it is not evaluated at all.
const (
	companionMass = 1e-13
	droppedMass   = 1e-17
	panelWidth    = 2.5 // curvature widths of the outer log-odds density
)

type fnode struct{ o, oc, t, w float64 } // rate, 1 − rate, log-odds, weight times outer density

type fpanel struct {
	n20  [20]fnode
	n10  []fnode // nil without a companion
	mass float64 // the 20-node integral of the outer density
}

type fixedRule struct {
	panels []fpanel
	loose  float64 // twice the mass of the panels without a companion or not evaluated
}

var gx10, gw10, gx20, gw20 = quad.Nodes()

func newFixedRule(out Posterior, lo, hi float64) fixedRule {
	a, b := out.EventShape, out.NonEventShape
	xm, ym := logistic(math.Log(a / b))
	sdT := 1 / math.Sqrt((a+b)*xm*ym)
	n := int(math.Ceil((hi - lo) / (panelWidth * sdT)))
	n = max(1, min(n, 400))
	h := (hi - lo) / float64(n)
	// the 20-node panels first, on the density relative to its peak
	// (Posterior.relEll), then normalised by their total mass
	all := make([]fpanel, n)
	rel := out.relEllFunc()
	var total float64
	for i := range all {
		c, half := lo+float64(i)*h+h/2, h/2
		p := &all[i]
		for k := range gx20 {
			t := c + half*gx20[k]
			o, oc := logistic(t)
			w := half * gw20[k] * math.Exp(rel(t))
			p.n20[k] = fnode{o, oc, t, w}
			p.mass += w
		}
		total += p.mass
	}
	var r fixedRule
	r.panels = all[:0]
	for i := range all {
		p := all[i]
		for k := range p.n20 {
			p.n20[k].w /= total
		}
		p.mass /= total
		switch {
		case p.mass < droppedMass:
			r.loose += 2 * p.mass
			continue
		case p.mass < companionMass:
			r.loose += 2 * p.mass
		default:
			c, half := lo+float64(i)*h+h/2, h/2
			p.n10 = make([]fnode, 10)
			for k := range gx10 {
				t := c + half*gx10[k]
				o, oc := logistic(t)
				p.n10[k] = fnode{o, oc, t, half * gw10[k] * math.Exp(rel(t)) / total}
			}
		}
		r.panels = append(r.panels, p)
	}
	return r
}

// integrate returns Σ w·g(o, 1 − o) over the rule and its error estimate;
// bound is the largest value g takes (1 for a probability).
func (r *fixedRule) integrate(g func(o, oc float64) float64, bound float64) (v, err float64) {
	for i := range r.panels {
		p := &r.panels[i]
		var s20 float64
		for _, nd := range p.n20 {
			s20 += nd.w * g(nd.o, nd.oc)
		}
		v += s20
		if p.n10 == nil {
			continue
		}
		var s10 float64
		for _, nd := range p.n10 {
			s10 += nd.w * g(nd.o, nd.oc)
		}
		err += math.Abs(s20 - s10)
	}
	return v, err + r.loose*bound
}

// integrate2 is integrate for two integrands computed together (sharing
// the work of each node), with their bounds, and a third integrand summed
// on the 20-node rule alone, without an error estimate (the density's
// slope, which only steers a search).
func (r *fixedRule) integrate2(g func(o, oc float64) (float64, float64, float64), bound1, bound2 float64) (v1, err1, v2, err2, v3 float64) {
	for i := range r.panels {
		p := &r.panels[i]
		var s1, s2 float64
		for _, nd := range p.n20 {
			a, b, c := g(nd.o, nd.oc)
			s1 += nd.w * a
			s2 += nd.w * b
			v3 += nd.w * c
		}
		v1 += s1
		v2 += s2
		if p.n10 == nil {
			continue
		}
		var t1, t2 float64
		for _, nd := range p.n10 {
			a, b, _ := g(nd.o, nd.oc)
			t1 += nd.w * a
			t2 += nd.w * b
		}
		err1 += math.Abs(s1 - t1)
		err2 += math.Abs(s2 - t2)
	}
	return v1, err1 + r.loose*bound1, v2, err2 + r.loose*bound2, v3
}

// integrateLogOdds is integrate for an integrand given as a function of
// the node's log-odds (where the inner threshold is the outer rate itself,
// the tabulated distribution function takes it without two logarithms).
func (r *fixedRule) integrateLogOdds(g func(t float64) float64, bound float64) (v, err float64) {
	for i := range r.panels {
		p := &r.panels[i]
		var s20 float64
		for _, nd := range p.n20 {
			s20 += nd.w * g(nd.t)
		}
		v += s20
		if p.n10 == nil {
			continue
		}
		var s10 float64
		for _, nd := range p.n10 {
			s10 += nd.w * g(nd.t)
		}
		err += math.Abs(s20 - s10)
	}
	return v, err + r.loose*bound
}
