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
// rule changes the cost, not the accuracy.

// companionMass is the outer mass below which a panel gets no 10-node
// companion (its error counts as twice its mass) and droppedMass the mass
// below which it is not evaluated at all.
const (
	companionMass = 1e-13
	droppedMass   = 1e-17
	panelWidth    = 2.5 // curvature widths of the outer log-odds density
)

type fnode struct{ o, oc, w float64 } // rate, 1 − rate, weight times outer density

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
	var r fixedRule
	r.panels = make([]fpanel, 0, n)
	for i := 0; i < n; i++ {
		pa := lo + float64(i)*h
		c, half := pa+h/2, h/2
		var p fpanel
		for k := range gx20 {
			t := c + half*gx20[k]
			o, oc := logistic(t)
			l, _ := out.ell(t)
			w := half * gw20[k] * math.Exp(l)
			p.n20[k] = fnode{o, oc, w}
			p.mass += w
		}
		switch {
		case p.mass < droppedMass:
			r.loose += 2 * p.mass
			continue
		case p.mass < companionMass:
			r.loose += 2 * p.mass
		default:
			p.n10 = make([]fnode, 10)
			for k := range gx10 {
				t := c + half*gx10[k]
				o, oc := logistic(t)
				l, _ := out.ell(t)
				p.n10[k] = fnode{o, oc, half * gw10[k] * math.Exp(l)}
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
