// Package quad integrates smooth functions of one variable over a finite
// interval by adaptive Gauss–Legendre quadrature with an error estimate. It
// speaks no statistics: the Bayesian posteriors in proportions/bayes build
// their distribution functions and densities on it.
//
// Each panel is integrated with the 10- and the 20-point Gauss–Legendre
// rules (Gauss CF (1814), "Methodus nova integralium valores per
// approximationem inveniendi", Commentationes Societatis Regiae
// Scientiarum Gottingensis Recentiores 3; nodes and weights from gonum's
// quad.Legendre, computed once). The 20-point value is kept and
// |G20 − G10| is the panel's error estimate: for an integrand analytic
// around the panel, G10's error shrinks like ρ^−20 and G20's like ρ^−40, so
// the difference overstates G20's error by orders of magnitude; it is an
// estimate, not a proof, for integrands with singular derivatives. The
// panel with the largest estimate is halved until the sum of the
// estimates is below the tolerance or the panel budget is spent.
package quad

import (
	"math"

	gquad "gonum.org/v1/gonum/integrate/quad"
)

var (
	x10, w10 [10]float64
	x20, w20 [20]float64
)

func init() {
	gquad.Legendre{}.FixedLocations(x10[:], w10[:], -1, 1)
	gquad.Legendre{}.FixedLocations(x20[:], w20[:], -1, 1)
}

// MaxPanels is the most panels one integral is cut into.
const MaxPanels = 200

// Result is an integral and its error estimate; Evals counts the calls of
// the integrand.
type Result struct {
	Value, Err float64
	Evals      int
	Converged  bool
}

type panel struct{ a, b, v, e float64 }

func rule(f func(float64) float64, a, b float64) (v, e float64) {
	c, h := (a+b)/2, (b-a)/2
	var s10, s20 float64
	for i := range x10 {
		s10 += w10[i] * f(c+h*x10[i])
	}
	for i := range x20 {
		s20 += w20[i] * f(c+h*x20[i])
	}
	return h * s20, math.Abs(h * (s20 - s10))
}

// Integrate returns ∫ f over [a, b], cut first at the given breakpoints
// (those outside (a, b) are ignored), to an estimated error of at most
// max(absTol, relTol·|value|). f must return finite values inside (a, b);
// the rules never evaluate it at a or b. The estimate is only as good as
// the first panels' view of f: a narrow peak between the nodes or a jump
// inside a panel can go unseen, so callers pass a window around the mass
// and breakpoints at kinks.
func Integrate(f func(float64) float64, a, b float64, breaks []float64, absTol, relTol float64) Result {
	var buf [MaxPanels]panel
	ps := buf[:0]
	cuts := [16]float64{}
	cs := append(cuts[:0], a)
	for _, x := range breaks {
		if x > a && x < b && len(cs) < len(cuts)-1 {
			cs = append(cs, x)
		}
	}
	cs = append(cs, b)
	// keep the cuts increasing (breakpoints may come in any order)
	for i := 1; i < len(cs); i++ {
		for j := i; j > 0 && cs[j] < cs[j-1]; j-- {
			cs[j], cs[j-1] = cs[j-1], cs[j]
		}
	}
	evals := 0
	for i := 0; i+1 < len(cs); i++ {
		if cs[i+1] > cs[i] {
			v, e := rule(f, cs[i], cs[i+1])
			evals += 30
			ps = append(ps, panel{cs[i], cs[i+1], v, e})
		}
	}
	for {
		var total, err float64
		worst := 0
		for i, p := range ps {
			total += p.v
			err += p.e
			if p.e > ps[worst].e {
				worst = i
			}
		}
		if err <= math.Max(absTol, relTol*math.Abs(total)) {
			return Result{Value: total, Err: err, Evals: evals, Converged: true}
		}
		if len(ps)+1 > MaxPanels {
			return Result{Value: total, Err: err, Evals: evals, Converged: false}
		}
		p := ps[worst]
		m := (p.a + p.b) / 2
		if m <= p.a || m >= p.b { // the panel cannot be cut further
			return Result{Value: total, Err: err, Evals: evals, Converged: false}
		}
		v1, e1 := rule(f, p.a, m)
		v2, e2 := rule(f, m, p.b)
		evals += 60
		ps[worst] = panel{p.a, m, v1, e1}
		ps = append(ps, panel{m, p.b, v2, e2})
	}
}

// Nodes returns copies of the 10- and 20-point Gauss–Legendre nodes and
// weights on [−1, 1] that Integrate uses, for callers that lay out a fixed
// composite rule once and reuse it for many integrands.
func Nodes() (n10, c10 [10]float64, n20, c20 [20]float64) { return x10, w10, x20, w20 }
