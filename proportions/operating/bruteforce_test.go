package operating

import (
	"context"
	"math"
	"slices"
	"testing"

	"github.com/propscope/propscope/proportions"
	"gonum.org/v1/gonum/stat/distuv"
)

// bruteCoverage is the textbook double sum over every outcome, with
// binomial probabilities from gonum's distuv.Binomial: an independent
// computation of what the engine returns.
func bruteCoverage(m proportions.IntervalMethod, d Design, pi1, pi2 float64) Point {
	conf, _ := proportions.NewConfidence(d.Level)
	theta, ok := Truth(m.Scale, pi1, pi2)
	if !ok {
		return undefinedPoint(pi1, pi2)
	}
	b1 := distuv.Binomial{N: float64(d.N1), P: pi1}
	b2 := distuv.Binomial{N: float64(d.N2), P: pi2}
	blo, bhi := m.Scale.Bounds()
	var p Point
	var bounded float64
	for x1 := 0; x1 <= d.N1; x1++ {
		for x2 := 0; x2 <= d.N2; x2++ {
			w := binomProb(b1, x1) * binomProb(b2, x2)
			lo, hi := m.Limits(proportions.Counts{X1: int64(x1), N1: int64(d.N1), X2: int64(x2), N2: int64(d.N2)}, conf)
			switch {
			case hi < theta:
				p.Below += w
			case lo > theta:
				p.Above += w
			default:
				p.Coverage += w
			}
			rlo, rhi := max(lo, blo), min(hi, bhi)
			if m.Scale == proportions.Difference {
				p.Width += w * (rhi - rlo)
			} else if rlo > 0 && !math.IsInf(rhi, 1) {
				p.Width += w * math.Log(rhi/rlo)
				bounded += w
			} else {
				p.Unbounded += w
			}
		}
	}
	if m.Scale != proportions.Difference {
		// The documented convention: +Inf when every interval is unbounded.
		if bounded > 0 {
			p.Width /= bounded
		} else {
			p.Width = math.Inf(1)
		}
	}
	p.Pi1, p.Pi2, p.Truth, p.Defined = pi1, pi2, theta, true
	return p
}

// binomProb handles π = 0 and 1, where gonum's Binomial has no density.
func binomProb(b distuv.Binomial, x int) float64 {
	switch {
	case b.P == 0:
		return b2f(x == 0)
	case b.P == 1:
		return b2f(float64(x) == b.N)
	}
	return b.Prob(float64(x))
}

func b2f(v bool) float64 {
	if v {
		return 1
	}
	return 0
}

// zigzag is a test-only interval for the difference whose limits jump up
// and down along each row, so that rows split into many monotone pieces
// and the covered outcomes form several runs: the general case the engine
// must handle exactly.
var zigzag = proportions.IntervalMethod{
	Key: "zigzag", Name: "zigzag (test only)", Scale: proportions.Difference,
	Limits: func(c proportions.Counts, conf proportions.Confidence) (float64, float64) {
		d := c.P1() - c.P2()
		h1 := 0.05 + 0.15*math.Abs(math.Sin(7*float64(c.X1)+3*float64(c.X2)))
		h2 := 0.05 + 0.15*math.Abs(math.Cos(5*float64(c.X1)-4*float64(c.X2)))
		return d - h1, d + h2
	},
}

// zigzagRatio does the same on the ratio scale, with unbounded intervals
// at zero counts.
var zigzagRatio = proportions.IntervalMethod{
	Key: "zigzag-ratio", Name: "zigzag ratio (test only)", Scale: proportions.Ratio,
	Limits: func(c proportions.Counts, conf proportions.Confidence) (float64, float64) {
		if c.X2 == 0 {
			return 0.5 * float64(c.X1) / float64(c.N1), math.Inf(1)
		}
		if c.X1 == 0 {
			return 0, 2 / float64(c.X2)
		}
		r := c.P1() / c.P2()
		f := 1.2 + math.Abs(math.Sin(float64(3*c.X1+c.X2)))
		return r / f, r * (1.1 + math.Abs(math.Cos(float64(c.X1-2*c.X2))))
	},
}

func closePoints(t *testing.T, what string, got, want Point, tol float64) {
	t.Helper()
	if got.Defined != want.Defined {
		t.Errorf("%s: defined %v, want %v", what, got.Defined, want.Defined)
		return
	}
	if !want.Defined {
		return
	}
	check := func(name string, g, w float64) {
		tol := tol
		if name == "width" {
			tol = max(tol, 1e-8)
		}
		if !(math.Abs(g-w) <= tol*math.Max(1, math.Abs(w))) && !(math.IsInf(g, 1) && math.IsInf(w, 1)) {
			t.Errorf("%s: %s = %.15g, brute force %.15g", what, name, g, w)
		}
	}
	check("coverage", got.Coverage, want.Coverage)
	check("below", got.Below, want.Below)
	check("above", got.Above, want.Above)
	// The engine copies the mirror images of a Symmetric method's
	// intervals; the score intervals' root searches make a direct
	// computation differ from the mirror image by up to about 1e-9, which
	// moves expected widths by as much (coverage would move only if a
	// limit fell that close to the truth).
	check("width", got.Width, want.Width)

	check("unbounded", got.Unbounded, want.Unbounded)
}

// TestAgainstBruteForce compares the surface, Table.At and Coverage with
// the plain double sum for every registered interval method and two
// test-only methods whose rows are far from monotone, on small unequal
// designs, at rates that include 0, 1 and points where ratio truths are
// 0, ∞ or undefined.
func TestAgainstBruteForce(t *testing.T) {
	methods := append(slices.Concat(proportions.EnumerableIntervalMethods(proportions.Difference), proportions.EnumerableIntervalMethods(proportions.Ratio), proportions.EnumerableIntervalMethods(proportions.OddsRatio)), zigzag, zigzagRatio)
	grid := []float64{0, 0.003, 0.1, 0.25, 0.5, 0.5, 0.77, 0.95, 1}
	for _, d := range []Design{{N1: 7, N2: 11, Level: 0.95}, {N1: 20, N2: 13, Level: 0.9}, {N1: 10, N2: 10, Level: 0.95}} {
		for _, m := range methods {
			tab, err := NewOutcomeLimits(context.Background(), m, d)
			if err != nil {
				t.Fatalf("%s %v: %v", m.Key, d, err)
			}
			s, err := tab.Surface(context.Background(), WithGrid(grid, grid))
			if err != nil {
				t.Fatal(err)
			}
			for i, p1 := range grid {
				for j, p2 := range grid {
					want := bruteCoverage(m, d, p1, p2)
					what := m.Key + " " + d.String() + " " + want.String()
					closePoints(t, "surface "+what, s.At(i, j), want, 1e-12)
					if (i+j)%4 == 0 {
						at, err := tab.At(p1, p2)
						if err != nil {
							t.Fatal(err)
						}
						closePoints(t, "Table.At "+what, at, want, 1e-12)
						one, err := Coverage(m, d, p1, p2)
						if err != nil {
							t.Fatal(err)
						}
						closePoints(t, "Coverage "+what, one, want, 1e-12)
					}
				}
			}
		}
	}
}

// TestPiecesAndRuns checks the claim behind the speed: for the Wald
// interval nearly every row is one monotone piece (so the covered x2 form
// one run), while the zigzag method is cut into many pieces and is still
// exact (TestAgainstBruteForce).
func TestPiecesAndRuns(t *testing.T) {
	d := Design{N1: 200, N2: 200, Level: 0.95}
	wald, err := NewOutcomeLimits(context.Background(), proportions.Wald, d)
	if err != nil {
		t.Fatal(err)
	}
	if p := wald.Pieces(); p > d.N1+1+10 {
		t.Errorf("Wald at %v: %d pieces for %d rows; expected nearly one per row", d, p, d.N1+1)
	}
	// What the registered methods look like (logged with -v): the rows
	// of the usual methods are single pieces but for a few near zero counts.
	small := Design{N1: 60, N2: 60, Level: 0.95}
	for _, m := range slices.Concat(proportions.EnumerableIntervalMethods(proportions.Difference), proportions.EnumerableIntervalMethods(proportions.Ratio), proportions.EnumerableIntervalMethods(proportions.OddsRatio)) {
		if m.TrialLimit > 0 && int64(small.N1+small.N2) > m.TrialLimit {
			continue
		}
		tab, err := NewOutcomeLimits(context.Background(), m, small)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%-22s %v: %d pieces in %d rows", m.Key, small, tab.Pieces(), small.N1+1)
	}
	zz, err := NewOutcomeLimits(context.Background(), zigzag, d)
	if err != nil {
		t.Fatal(err)
	}
	if p := zz.Pieces(); p < 10*(d.N1+1) {
		t.Errorf("zigzag: only %d pieces; the test method should break rows apart", p)
	}
}
