package bayes

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
)

// The density's slope that steers the highest-density search, from the
// same pass as the tails, against a central difference of the density
// computed independently: gonum's fixed Gauss–Legendre rule in the rate
// (4000 nodes), as in TestAgainstGonumQuadrature. Every scale, both
// orientations (the pairs of posteriors() put either group outside), at the
// 10%, 50% and 90% quantiles of each effect.
func TestDensitySlope(t *testing.T) {
	pairs := append(posteriors(), [2]Posterior{NewPosterior(34, 18), NewPosterior(420, 100)})
	checked := 0
	for _, pp := range pairs {
		p1, p2 := pp[0], pp[1]
		b1 := distuv.Beta{Alpha: p1.EventShape, Beta: p1.NonEventShape}
		b2 := distuv.Beta{Alpha: p2.EventShape, Beta: p2.NonEventShape}
		// the density of the effect at v: ∫ f2(y)·f1(z(y, v))·∂z/∂v dy
		density := map[proportions.Scale]func(v float64) float64{
			proportions.Difference: func(v float64) float64 {
				return quad.Fixed(func(y float64) float64 { return b2.Prob(y) * b1.Prob(y+v) }, 0, 1, 4000, quad.Legendre{}, 0)
			},
			proportions.Ratio: func(v float64) float64 {
				return quad.Fixed(func(y float64) float64 { return b2.Prob(y) * y * b1.Prob(v*y) }, 0, 1, 4000, quad.Legendre{}, 0)
			},
			proportions.OddsRatio: func(v float64) float64 {
				return quad.Fixed(func(y float64) float64 {
					d := 1 - y + v*y
					return b2.Prob(y) * b1.Prob(v*y/d) * y * (1 - y) / (d * d)
				}, 0, 1, 4000, quad.Legendre{}, 0)
			},
		}
		for sc, dens := range density {
			e, err := NewEffect(sc, p1, p2)
			if err != nil {
				t.Fatal(err)
			}
			for _, q := range []float64{0.1, 0.5, 0.9} {
				v, _, err := e.Quantile(q)
				if err != nil {
					t.Fatal(err)
				}
				_, _, f, slope := e.tailDensity(v, false)
				if math.IsNaN(slope) { // the pass fell back to adaptive quadrature: no slope, finite differences instead
					continue
				}
				checked++
				// w: the effect's width at v (sd of the difference, v times
				// the sd of the log for the ratios)
				_, w := e.approx()
				if sc != proportions.Difference {
					w *= v
				}
				h := 1e-3 * w
				want := (dens(v+h) - dens(v-h)) / (2 * h)
				// a central difference errs by about h²·f‴/6, some 10⁻⁷ of the
				// slope's scale f/w
				if math.Abs(slope-want) > 1e-5*math.Abs(f)/w+1e-6*math.Abs(want) {
					t.Errorf("%v %v at %.6g: slope %.10g, difference of gonum's density %.10g", pp, sc, v, slope, want)
				}
			}
		}
	}
	if checked < 15 {
		t.Errorf("only %d slopes came from the tabulated pass; the check needs at least 15", checked)
	}
	t.Logf("%d slopes checked", checked)
}

// The highest-density interval by its definition (Box and Tiao 1973,
// §2.8): it holds the probability asked for, and the density is the same
// at both ends (for a density with one peak, inside the range); measured
// with the library's density and distribution function (themselves
// checked against gonum in TestAgainstGonumQuadrature), on every scale,
// the pairs of posteriors() and two more, one of them at 10⁶ per group.
func TestHighestDensityDefinition(t *testing.T) {
	pairs := append(posteriors(), [2]Posterior{NewPosterior(34, 18), NewPosterior(420, 100)},
		[2]Posterior{NewPosterior(500000.5, 500000.5), NewPosterior(499000.5, 501000.5)})
	for _, pp := range pairs {
		for _, sc := range []proportions.Scale{proportions.Difference, proportions.Ratio, proportions.OddsRatio} {
			e, _ := NewEffect(sc, pp[0], pp[1])
			for _, level := range []float64{0.8, 0.95} {
				lo, hi, er, err := e.HighestDensity(level)
				if err != nil {
					t.Fatal(err)
				}
				below, _ := e.CDF(lo)
				_, above, _ := e.Tails(hi)
				if mass := 1 - below - above; math.Abs(mass-level) > 1e-9 {
					t.Errorf("%v %v %v: mass %.12g", pp, sc, level, mass)
				}
				if (sc == proportions.Difference && lo <= -1+1e-9) || (sc != proportions.Difference && lo <= 1e-9*hi) {
					continue // the peak at the end of the range: no equal densities
				}
				fl, _ := e.Density(lo)
				fh, _ := e.Density(hi)
				// an end within er of its place moves the density by about
				// er·|f′|, and |f′| ≲ f/width
				_, w := e.approx()
				if sc != proportions.Difference {
					w *= math.Min(lo, 1)
				}
				if math.Abs(fl-fh) > 1e-7*math.Max(fl, fh)+2*er/w*math.Max(fl, fh) {
					t.Errorf("%v %v %v: densities at the ends %.12g and %.12g (ends %.12g, %.12g ± %.2g)", pp, sc, level, fl, fh, lo, hi, er)
				}
			}
		}
	}
}
