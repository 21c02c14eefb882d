package bayes

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
)

// The tabulated distribution function against closed forms that share
// nothing with it: Beta(α, 1) has P(π ≤ x) = x^α and Beta(1, β) has
// P(π > x) = (1 − x)^β at any real shape, Beta(½, ½) is the arcsine law
// (2/π)·asin(√x), and Beta(3, β) has P(π > x) = P(Binomial(β + 2, x) ≤ 2),
// three terms. The shapes run from ½ to 10⁶ and a half, on both sides of
// the mode, far into both tails; each value must lie within the table's
// own error estimate (plus rounding) of the closed form, and the estimate
// must stay small.
func TestTableAgainstClosedForms(t *testing.T) {
	// each closed form takes x and 1 − x, both to full precision, and
	// takes the logarithm of each from the smaller of the two
	logX := func(x, y float64) float64 {
		if x < 0.5 {
			return math.Log(x)
		}
		return math.Log1p(-y)
	}
	logY := func(x, y float64) float64 { return logX(y, x) }
	type form struct {
		a, b  float64
		below func(x, y float64) float64 // P(π ≤ x)
		above func(x, y float64) float64 // P(π > x)
	}
	power := func(a float64) form {
		return form{a, 1, func(x, y float64) float64 { return math.Exp(a * logX(x, y)) },
			func(x, y float64) float64 { return -math.Expm1(a * logX(x, y)) }}
	}
	mirror := func(b float64) form {
		return form{1, b, func(x, y float64) float64 { return -math.Expm1(b * logY(x, y)) },
			func(x, y float64) float64 { return math.Exp(b * logY(x, y)) }}
	}
	three := func(b float64) form {
		n := b + 2
		le2 := func(x, y float64) float64 { // P(Binomial(n, x) ≤ 2)
			l := logY(x, y)
			return math.Exp(n*l) + n*x*math.Exp((n-1)*l) + n*(n-1)/2*x*x*math.Exp((n-2)*l)
		}
		ge3 := func(x, y float64) float64 { // P(Binomial(n, x) ≥ 3)
			if n*x > 0.1 {
				return 1 - le2(x, y)
			}
			// the terms from k = 3 on, each from the one before
			l := logY(x, y)
			term := n * (n - 1) * (n - 2) / 6 * x * x * x * math.Exp((n-3)*l)
			s := 0.0
			for k := 3.0; term > 1e-20*s && k < n; k++ {
				s += term
				term *= (n - k) / (k + 1) * x / y
			}
			return s
		}
		return form{3, b, ge3, le2}
	}
	arcsine := func(x, y float64) float64 { // (2/π)·asin(√x)
		if x < 0.5 {
			return 2 / math.Pi * math.Asin(math.Sqrt(x))
		}
		return 2 / math.Pi * math.Acos(math.Sqrt(y))
	}
	forms := []form{power(0.5), power(7.5), power(1e6 + 0.5), mirror(0.5), mirror(40.5), mirror(1e6 + 0.5),
		three(9), three(1e6),
		{0.5, 0.5, arcsine, func(x, y float64) float64 { return arcsine(y, x) }}}
	for _, f := range forms {
		p := NewPosterior(f.a, f.b)
		tb := newCDFTable(p)
		if !tb.ok() {
			t.Errorf("Beta(%v, %v): no table", f.a, f.b)
			continue
		}
		if tb.err > 1e-9 {
			t.Errorf("Beta(%v, %v): error estimate %.3g", f.a, f.b, tb.err)
		}
		lo, hi, _ := p.window()
		worst := 0.0
		for i := 0; i <= 4000; i++ {
			x, y := logistic(lo - 1 + (hi-lo+2)*float64(i)/4000)
			below, above := tb.tails(x, y)
			wb, wa := f.below(x, y), f.above(x, y)
			d := math.Max(math.Abs(below-wb), math.Abs(above-wa))
			worst = math.Max(worst, d)
			if d > tb.err+1e-14 {
				t.Errorf("Beta(%v, %v) at %.17g: table %.17g / %.17g, closed form %.17g / %.17g (estimate %.3g)",
					f.a, f.b, x, below, above, wb, wa, tb.err)
				break
			}
		}
		t.Logf("Beta(%v, %v): %d panels, worst %.3g, estimate %.3g", f.a, f.b, len(tb.panels), worst, tb.err)
	}
}

// At 10⁶ per group with the Jeffreys prior (shapes not whole numbers, so
// the integral path), against gonum's fixed Gauss–Legendre rule in the rate
// itself over twelve standard deviations around group 2's mean, with
// gonum's beta distribution inside (whose incomplete beta function stops
// about 10⁻⁹ short at these shapes, hence the tolerance).
func TestMillionAgainstGonumQuadrature(t *testing.T) {
	for _, c := range [][2]int64{{500_000, 499_000}, {500_000, 500_100}, {3, 9}} {
		p1, p2 := Jeffreys().Update(c[0], 1_000_000), Jeffreys().Update(c[1], 1_000_000)
		b1 := distuv.Beta{Alpha: p1.EventShape, Beta: p1.NonEventShape}
		b2 := distuv.Beta{Alpha: p2.EventShape, Beta: p2.NonEventShape}
		m, sd := p2.Mean(), math.Sqrt(p2.Variance())
		ref := func(v float64) float64 { // P(π1 − π2 ≤ v)
			return quad.Fixed(func(y float64) float64 { return b2.Prob(y) * b1.CDF(math.Min(1, math.Max(0, y+v))) },
				math.Max(0, m-12*sd), math.Min(1, m+12*sd), 2000, quad.Legendre{}, 0)
		}
		higher, _, er, exact := ProbabilityFirstHigher(p1, p2)
		if want := 1 - ref(0); exact || math.Abs(higher-want) > 5e-9+er {
			t.Errorf("%v: P(π1 > π2) = %.12g (exact sum %v), gonum %.12g", c, higher, exact, want)
		}
		e, _ := NewEffect(proportions.Difference, p1, p2)
		v := 0.0004
		below, _, er := e.Tails(v)
		if want := ref(v); math.Abs(below-want) > 5e-9+er {
			t.Errorf("%v: P(π1 − π2 ≤ %v) = %.12g, gonum %.12g", c, v, below, want)
		}
	}
}
