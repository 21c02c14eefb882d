package special

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// betaRef is one lower-tail beta quantile from
// testdata/reference/betaquantile-mpmath.json.
type betaRef struct {
	A, B, Q   float64
	X         string
	OneMinusX string `json:"one_minus_x"`
}

func loadBetaRefs(t *testing.T) []betaRef {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join("..", "..", "testdata", "reference", "betaquantile-mpmath.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Status string
		Checks []betaRef
	}
	if err := json.Unmarshal(raw, &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Status != "reference-library" || len(doc.Checks) < 500 {
		t.Fatalf("betaquantile-mpmath.json: status %q, %d checks", doc.Status, len(doc.Checks))
	}
	return doc.Checks
}

func parseRef(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func betaRelErr(got, want float64) float64 { return math.Abs(got-want) / math.Abs(want) }

// Hard check against 60-digit quantiles computed with mpmath, a
// general-purpose arbitrary-precision library (betaquantile_mpmath.py):
// both x and 1 − x to 1e-14 relative, which covers small and huge n (up to
// 2^50), both ends, the exact shapes 1 and the switch to the series branch.
// Shapes of ½ put x^½ in the tail probability and double its relative
// error, so they get 2e-14.
func TestBetaQuantileMpmath(t *testing.T) {
	worst, worstY := 0.0, 0.0
	var worstRef betaRef
	for _, r := range loadBetaRefs(t) {
		tl := NewBetaTail(r.Q, -NormalQuantile(r.Q))
		x, y := BetaLowerQuantile(r.A, r.B, &tl)
		wx, wy := parseRef(t, r.X), parseRef(t, r.OneMinusX)
		tol := 1e-14
		if math.Min(r.A, r.B) <= 1.5 {
			tol = 2e-14
		}
		ex, ey := betaRelErr(x, wx), betaRelErr(y, wy)
		if !(ex <= tol && ey <= tol) {
			t.Errorf("Beta(%v, %v) quantile %v: x = %.17g, 1−x = %.17g; mpmath %s, %s (relative errors %.2g, %.2g)",
				r.A, r.B, r.Q, x, y, r.X, r.OneMinusX, ex, ey)
		}
		if e := math.Max(ex, ey); e > worst {
			worst, worstRef = e, r
		}
		worstY = math.Max(worstY, math.Min(ex, ey))
	}
	t.Logf("worst relative error %.2g at Beta(%v, %v), q = %v", worst, worstRef.A, worstRef.B, worstRef.Q)
}

// betaGonumTolerance is the relative accuracy to expect of gonum's
// mathext.RegIncBeta at (a, b): its prefactor comes from log-gamma values
// of size up to about 2·lgamma(a+b), whose rounding (observed up to about
// 2.5e-16 of that size; 4e-16 allowed) becomes relative error — the loss logpmf.go avoids. A value
// of I near 1 (the complement side) is further limited to about 2e-16/q.
func betaGonumTolerance(a, b, q float64, complement bool) float64 {
	la, _ := math.Lgamma(a)
	lb, _ := math.Lgamma(b)
	ln, _ := math.Lgamma(a + b)
	tol := 1e-10 + 4e-16*(math.Abs(la)+math.Abs(lb)+math.Abs(ln))
	if complement {
		tol += 4e-16 / q
	}
	return tol
}

// betaResidual is |I − q|/q for the lower-tail quantile x (with y = 1 − x)
// of Beta(a, b), evaluated by gonum on the side where x is accurate.
func betaResidual(a, b, q, x, y float64) float64 {
	if x <= 0.5 {
		return math.Abs(mathext.RegIncBeta(a, b, x)-q) / q
	}
	return math.Abs(mathext.RegIncBeta(b, a, y)-(1-q)) / q
}

// Cross-check with gonum (a general-purpose library: distuv.Beta.Quantile
// is cephes' incbi, mathext.RegIncBeta cephes' incbet) over a dense grid of
// n from 1 to 10⁶, x across 0..n with its ends, and levels 0.5 to 0.999999,
// for both intervals' shapes. Each limit must satisfy the defining equation
// I = q by gonum's RegIncBeta to gonum's accuracy, and agree with gonum's
// quantile to 1e-12 absolute or 1e-10 relative, or to what that accuracy
// allows (tolerance in probability over the density), unless gonum's
// quantile fails its own defining equation by more than ours does (gonum's
// incbi breaks down at extreme upper quantiles of skewed shapes, such as the
// 99.9999% Clopper–Pearson upper limit at x = 0, n ≥ 100, which it puts
// near 1).
func TestBetaQuantileGonumGrid(t *testing.T) {
	ns := []int64{1, 2, 3, 4, 5, 6, 8, 10, 13, 17, 20, 25, 30, 40, 50, 60, 80, 100, 130, 170, 200, 300,
		400, 500, 700, 1000, 1500, 2000, 3000, 5000, 7000, 10000, 20000, 30000, 50000, 100000,
		200000, 300000, 500000, 1000000}
	fracs := []float64{0.001, 0.01, 0.05, 0.1, 0.2, 0.3, 0.5, 0.7, 0.9, 0.95, 0.99, 0.999}
	levels := []float64{0.5, 0.8, 0.9, 0.95, 0.99, 0.999, 0.999999}
	var worstAgree, worstAbs, worstResid float64
	var worstAgreeAt string
	checked, explained, gonumWrong := 0, 0, 0
	for _, n := range ns {
		xs := map[int64]bool{0: true, 1: true, 2: true, 3: true, n - 3: true, n - 2: true, n - 1: true, n: true}
		for _, f := range fracs {
			xs[int64(math.Round(f*float64(n)))] = true
		}
		for x := range xs {
			if x < 0 || x > n {
				continue
			}
			fx, fn := float64(x), float64(n)
			for _, level := range levels {
				conf := newTestConf(level)
				q := conf.Alpha() / 2
				// Each limit as a lower-tail problem (a, b): the upper
				// limits are 1 minus lower-tail quantiles of the reflected
				// shapes. gonum gets the original formulation.
				for _, c := range []struct {
					name       string
					a, b       float64 // lower-tail problem
					upper      bool
					ga, gb, gq float64 // gonum's quantile call
					skip       bool
				}{
					{"Clopper–Pearson lower", fx, fn - fx + 1, false, fx, fn - fx + 1, q, x == 0},
					{"Clopper–Pearson upper", fn - fx, fx + 1, true, fx + 1, fn - fx, 1 - q, x == n},
					{"Jeffreys lower", fx + 0.5, fn - fx + 0.5, false, fx + 0.5, fn - fx + 0.5, q, x == 0},
					{"Jeffreys upper", fn - fx + 0.5, fx + 0.5, true, fx + 0.5, fn - fx + 0.5, 1 - q, x == n},
				} {
					if c.skip {
						continue
					}
					tl := NewBetaTail(q, conf.Z)
					qx, qy := BetaLowerQuantile(c.a, c.b, &tl)
					v := qx // the limit
					if c.upper {
						v = qy
					}
					checked++
					tolI := betaGonumTolerance(c.a, c.b, q, qx > 0.5)
					res := betaResidual(c.a, c.b, q, qx, qy)
					worstResid = math.Max(worstResid, res)
					if !(res <= tolI) {
						t.Errorf("%s %d/%d at %v: %.17g gives |I − q|/q = %.3g by gonum's RegIncBeta (tolerance %.3g)",
							c.name, x, n, level, v, res, tolI)
						continue
					}
					g := distuv.Beta{Alpha: c.ga, Beta: c.gb}.Quantile(c.gq)
					// gonum returns the limit itself, so near 1 its distance from
					// 1 has absolute precision only; that distance is checked by
					// the defining equation above and by TestBetaQuantileMpmath.
					diff, scale := math.Abs(v-g), v
					if diff <= 1e-12 || diff <= 1e-10*scale {
						if diff/scale > worstAgree {
							worstAgree = diff / scale
							worstAgreeAt = fmt.Sprintf("%s %d/%d at %v: %.17g, gonum %.17g", c.name, x, n, level, v, g)
						}
						worstAbs = math.Max(worstAbs, diff)
						continue
					}
					dens := math.Exp(distuv.Beta{Alpha: c.ga, Beta: c.gb}.LogProb(v))
					if diff <= tolI*q/dens {
						explained++
						continue
					}
					gx, gy := g, 1-g
					if c.upper {
						gx, gy = 1-g, g
					}
					if gres := betaResidual(c.a, c.b, q, gx, gy); gres > 10*res && gres > tolI {
						gonumWrong++
						if gonumWrong <= 5 {
							t.Logf("gonum's quantile fails its equation: %s %d/%d at %v: gonum %.17g (|I − q|/q = %.3g), ours %.17g (%.3g)",
								c.name, x, n, level, g, gres, v, res)
						}
						continue
					}
					t.Errorf("%s %d/%d at %v: %.17g, gonum %.17g (difference %.3g, allowed %.3g)",
						c.name, x, n, level, v, g, diff, tolI*q/dens)
				}
			}
		}
	}
	t.Logf("%d limits: worst agreement with gonum %.2g absolute, %.2g relative (%s); worst |I − q|/q by gonum %.2g; %d differences within gonum's RegIncBeta accuracy, %d where gonum's quantile is the wrong one",
		checked, worstAbs, worstAgree, worstAgreeAt, worstResid, explained, gonumWrong)
	if checked < 15000 {
		t.Errorf("only %d limits checked", checked)
	}
}

// The series branch is tried for min(a, b) ≥ betaSeriesMinShape and a
// deviate inside its reach; on both sides of each switch (and along it) it
// must agree with the continued-fraction branch, an independent method, to
// 2e-15 in x and in 1 − x.
func TestBetaQuantileSeriesSwitch(t *testing.T) {
	m0 := float64(betaSeriesMinShape)
	type pair struct{ a, b float64 }
	var shapes []pair
	for _, m := range []float64{m0 - 1, m0 - 0.5, m0, m0 + 0.5, m0 + 1, 100, 1000, 20000} {
		for _, r := range []float64{1, 1.5, 3, 30, 1e4} {
			shapes = append(shapes, pair{m, math.Round(m*r) + m - math.Trunc(m)}, pair{math.Round(m*r) + m - math.Trunc(m), m})
		}
	}
	sides := [2]int{}
	for _, s := range shapes {
		m := math.Min(s.a, s.b)
		// deviates on both sides of the reach (z+1)² = betaSeriesMaxRatio2·4πm,
		// and usual ones
		zr := math.Sqrt(betaSeriesMaxRatio2*4*math.Pi*m) - 1
		for _, z := range []float64{0.6745, 1.96, 3.29, 4.89, zr * 0.98, zr * 1.02} {
			q := 0.5 * math.Erfc(z/math.Sqrt2)
			if !(q > 1e-300) {
				continue
			}
			tl := NewBetaTail(q, z)
			applies := betaSeriesApplies(s.a, s.b, tl.z)
			if applies {
				sides[1]++
			} else {
				sides[0]++
			}
			x, y := BetaLowerQuantile(s.a, s.b, &tl)
			fx, fy := betaQuantileByFraction(s.a, s.b, &tl)
			if betaRelErr(x, fx) > 2e-15 || betaRelErr(y, fy) > 2e-15 {
				t.Errorf("Beta(%v, %v) at q = %.3g (series %v): (%.17g, %.17g), continued fractions (%.17g, %.17g)",
					s.a, s.b, q, applies, x, y, fx, fy)
			}
		}
	}
	if sides[0] < 20 || sides[1] < 20 {
		t.Errorf("switch not exercised on both sides: %v", sides)
	}
}

// The series branch must refuse, not answer wrongly, when its starting
// point w = −z is far from the root: a tail whose z belongs to another q.
func TestBetaQuantileSeriesRefusesFarStart(t *testing.T) {
	refusals := 0
	for _, ab := range [][2]float64{{50, 70}, {400, 600}, {5000, 100000}} {
		for _, zs := range [][2]float64{{1.96, 1.0}, {1.96, 3.0}, {3.29, 1.96}, {0.6745, 2.5}} {
			// a tail whose Φ(−z), φ(z) are right for z but q is another's
			good := NewBetaTail(0.5*math.Erfc(zs[1]/math.Sqrt2), zs[1])
			far := NewBetaTail(0.5*math.Erfc(zs[0]/math.Sqrt2), zs[0])
			far.normal()
			far.q = good.q
			var s betaSeries
			if !s.setup(ab[0], ab[1], &far) {
				continue
			}
			x, y, ok := s.solve(&far)
			if !ok {
				refusals++
				continue
			}
			wx, wy := betaQuantileByFraction(ab[0], ab[1], &good)
			if betaRelErr(x, wx) > 2e-15 || betaRelErr(y, wy) > 2e-15 {
				t.Errorf("Beta(%v, %v), start z = %v for the q of z = %v: (%.17g, %.17g), want (%.17g, %.17g)",
					ab[0], ab[1], zs[0], zs[1], x, y, wx, wy)
			}
		}
	}
	if refusals == 0 {
		t.Error("no far start was refused")
	}
}

// The continued-fraction solver must reach the same quantile from any
// starting point, on either side of ½ and in either orientation (the
// bracket and the reflection at ½), to the precision of its evaluation of
// I (about 1e-15 relative; a few times that in far tails, where x^a has the
// rounding of a log near 20 in its exponent).
func TestBetaQuantileFractionAnyStart(t *testing.T) {
	for _, c := range [][3]float64{
		{2, 49, 0.025}, {17, 34, 0.25}, {0.5, 30.5, 5e-7}, {30.5, 0.5, 0.025}, {3, 298, 1e-10},
		{298, 3, 1e-10}, {5, 999996, 0.005}, {999996, 5, 0.005}, {25.5, 25.5, 0.4}, {1.5, 1.5, 1e-10},
	} {
		a, b, q := c[0], c[1], c[2]
		tl := NewBetaTail(q, -NormalQuantile(q))
		wx, wy := betaQuantileByFraction(a, b, &tl)
		for _, t0 := range []float64{1e-300, 1e-30, 1e-6, 0.1, 0.4999, 0.5, 0.7, 1 - 1e-9, wx, wy} {
			for _, upper := range []bool{false, true} {
				x, y := betaSolveByFraction(a, b, q, t0, upper)
				if betaRelErr(x, wx) > 1e-14 || betaRelErr(y, wy) > 1e-14 {
					t.Errorf("Beta(%v, %v) at %v from %v (reflected %v): (%.17g, %.17g), want (%.17g, %.17g)",
						a, b, q, t0, upper, x, y, wx, wy)
				}
			}
		}
	}
}

// The shapes 1 have closed forms (1 − (1−x)^b = q, x^a = q); the
// continued fractions agree with them to the precision of their evaluation
// (see above; q goes down to 1e-15 here).
func TestBetaQuantileExactShapes(t *testing.T) {
	for _, n := range []float64{1, 2, 7, 1000, 1 << 40} {
		for _, q := range []float64{0.25, 0.025, 5e-7, 1e-15} {
			tl := NewBetaTail(q, -NormalQuantile(q))
			for _, ab := range [][2]float64{{1, n}, {n, 1}} {
				x, y := BetaLowerQuantile(ab[0], ab[1], &tl)
				if ab[0] == 1 && ab[1] == 1 && (x != q || y != 1-q) {
					t.Errorf("Beta(1, 1) quantile %v: %v", q, x)
				}
				fx, fy := betaQuantileByFraction(ab[0], ab[1], &tl)
				if betaRelErr(x, fx) > 1e-14 || betaRelErr(y, fy) > 1e-14 {
					t.Errorf("Beta(%v, %v) at %v: closed form (%.17g, %.17g), continued fractions (%.17g, %.17g)",
						ab[0], ab[1], q, x, y, fx, fy)
				}
			}
		}
	}
}

// For huge n (2^40, 2^50) in the middle, where no reference evaluates
// I_x, the quantile's distance from the mean must match the Cornish–Fisher
// expansion μ + σ(−z + γ₁(z² − 1)/6) of the beta distribution (mean μ,
// standard deviation σ, skewness γ₁), whose next terms are of relative
// order 1/N, about 1e-12 here; the tolerance 1e-7 on the distance allows for
// the rounding of x itself (1e-16 of x against σ ≈ 1e-8).
func TestBetaQuantileHugeN(t *testing.T) {
	for _, n := range []float64{1 << 40, 1 << 50} {
		for _, f := range []float64{0.5, 1.0 / 3, 0.01} {
			xc := math.Round(f * n)
			for _, level := range []float64{0.5, 0.95, 0.999999} {
				conf := newTestConf(level)
				tl := NewBetaTail(conf.Alpha()/2, conf.Z)
				for _, ab := range [][2]float64{{xc, n - xc + 1}, {n - xc, xc + 1}, {xc + 0.5, n - xc + 0.5}} {
					a, b := ab[0], ab[1]
					N := a + b
					mu := a / N
					sigma := math.Sqrt(a*b/(N+1)) / N
					g1 := 2 * (b - a) * math.Sqrt(N+1) / ((N + 2) * math.Sqrt(a*b))
					z := -NormalQuantile(tl.q)
					dev := sigma * (-z + g1*(z*z-1)/6)
					x, y := BetaLowerQuantile(a, b, &tl)
					got := x - mu
					if mu > 0.5 {
						got = (1 - mu) - y
					}
					if betaRelErr(got, dev) > 1e-7 {
						t.Errorf("Beta(%v, %v) at %v: x − μ = %.10g, Cornish–Fisher %.10g", a, b, level, got, dev)
					}
				}
			}
		}
	}
}

// testConf is the pair (level, z) the quantile's callers pass: the tail
// q = (1 − level)/2 and its normal deviate, which only chooses a branch.
type testConf struct{ Level, Z float64 }

func newTestConf(level float64) testConf {
	return testConf{Level: level, Z: NormalQuantile((1 + level) / 2)}
}

func (c testConf) Alpha() float64 { return 1 - c.Level }
