package root

import (
	"math"
	"testing"
)

// The fuzz targets build cubics from their roots and evaluate them in
// product form, k·(x − r1)(x − r2)(x − r3). Each factor x − rᵢ is a single
// rounded subtraction, which keeps its sign exactly (and is 0 only at
// x = rᵢ), and k is a power of two, so the computed sign of the cubic is
// its true sign at every float x. The checks are therefore exact: the roots
// are known by construction, and a sign change between two points proves a
// root between them.

// fuzzValue accepts a fuzzed float64 as a root or bracket end: finite and
// at most 1e9 in size, so products of three factors stay far from overflow
// and underflow.
func fuzzValue(vs ...float64) bool {
	for _, v := range vs {
		if !(math.Abs(v) <= 1e9) {
			return false
		}
	}
	return true
}

// sameSign reports whether u and v are both positive or both negative
// (a product could underflow to 0 and hide that).
func sameSign(u, v float64) bool { return (u > 0 && v > 0) || (u < 0 && v < 0) }

// fuzzScale turns a fuzzed exponent into the power of two k = ±2^(e mod 61).
func fuzzScale(e int8, neg bool) float64 {
	k := math.Ldexp(1, int(e)%61)
	if neg {
		k = -k
	}
	return k
}

// FuzzBrent: for a cubic with a sign change on [a, b] (a zero at an end
// counts), Brent's result must lie in the bracket, within brentTolerance of
// one of the cubic's roots that lies in the bracket, and, when the roots
// within that tolerance are odd in number (with multiplicity), show a sign
// change between x − tol and x + tol.
func FuzzBrent(f *testing.F) {
	for _, s := range []struct {
		r1, r2, r3, a, b float64
		e                int8
		neg              bool
	}{
		{1, 2, 3, 0, 1.5, 0, false},                // one simple root in the bracket
		{1, 2, 3, 0, 10, 0, true},                  // three simple roots in the bracket
		{0.5, 0.5, 2, 0.4, 2.5, 3, false},          // a double root just inside a, the simple root at 2
		{0.5, 0.5, 2, 0, 3, 3, false},              // the double root inside, the simple root found
		{0.7, 0.7, 0.7, 0, 2, -20, false},          // a triple root: flat, but a sign change
		{1, 5, 9, 1, 4, 0, false},                  // a root at bracket end a
		{1e-13, 5, 9, -1, 1, 0, false},             // a root near 0
		{1e8, 2e8, -3e8, 0, 1.5e8, 40, true},       // large roots: the relative tolerance
		{299.99999, 1000, -1000, 0, 300, 0, false}, // near MaxLogScale
		{3, 2, 1, 10, 0, 5, false},                 // a reversed bracket
	} {
		f.Add(s.r1, s.r2, s.r3, s.a, s.b, s.e, s.neg)
	}
	f.Fuzz(func(t *testing.T, r1, r2, r3, a, b float64, e int8, neg bool) {
		if !fuzzValue(r1, r2, r3, a, b) || a == b {
			return
		}
		k := fuzzScale(e, neg)
		roots := [3]float64{r1, r2, r3}
		p := func(x float64) float64 { return k * (x - r1) * (x - r2) * (x - r3) }
		fa, fb := p(a), p(b)
		if sameSign(fa, fb) {
			return // no sign change: outside Brent's contract
		}
		lo, hi := math.Min(a, b), math.Max(a, b)
		x := Brent(p, a, b, fa, fb)
		if math.IsNaN(x) || x < lo || x > hi {
			t.Fatalf("Brent on roots %v, bracket [%v, %v]: got %v, outside the bracket", roots, a, b, x)
		}
		tol := brentTolerance(x)
		near, inside := 0, false
		for _, r := range roots {
			if math.Abs(x-r) <= tol && r >= lo && r <= hi {
				inside = true
			}
			if x-tol < r && r < x+tol {
				near++
			}
		}
		if !inside {
			t.Fatalf("Brent on roots %v, bracket [%v, %v]: got %.17g, no root of the bracket within %.3g", roots, a, b, x, tol)
		}
		if near%2 == 1 {
			if l, r := p(x-tol), p(x+tol); sameSign(l, r) {
				t.Fatalf("Brent on roots %v: got %.17g, no sign change at ±%.3g (%v, %v)", roots, x, tol, l, r)
			}
		}
	})
}

// FuzzBracketedHalley: a cubic k·(x − r)·g(x) on the bracket
// (a, b) = (r − |da|, r + |db|), with r its only root there, where g is
// (x − p)(x − q) with p and q outside the bracket, or (x − u)² + v² (a
// complex pair u ± iv); k's sign is set so that F(a) < 0 < F(b). The result
// must lie in [a, b], within tol = 1e−11·S of r (S = max(|a|, |b|)), with
// F(x − tol) < 0 < F(x + tol).
//
// Where that tolerance comes from: the search stops after a step below
// 1e−6·|x| ≤ 1e−6·S, and the error left is about K·s³ with Halley's
// constant |K| ≤ 5/d², d the distance from r to the other roots. The other
// roots are kept at least 1e−3·S away from the bracket (and, for a complex
// pair, from the real axis), so the error is at most about 5e−12·S. That gap
// also keeps the fuzz clear of the known defect of
// TestBracketedHalleyRootBesideBracket (a root just outside the bracket
// stops the search early); once that is fixed, the gap for real roots need
// only hold from r.
func FuzzBracketedHalley(f *testing.F) {
	for _, s := range []struct {
		r, da, db, p, q, x0 float64
		pair                bool
		e                   int8
		neg                 bool
	}{
		{2, 1, 1, -1, 5, 2.5, false, 0, false},
		{2, 1, 1, -1, 5, 1.0001, false, 0, true},        // start near an end
		{0.3, 0.3, 0.7, 0.3, 0.01, 0.9, true, 0, false}, // complex pair close by
		{0.3, 0.3, 0.7, 0.1, 100, 0.5, true, 10, false}, // complex pair far off
		{1e6, 5e5, 1e6, 0, 3e6, 1.9e6, false, -30, false},
		{0, 1, 1, -5, 5, 0.7, false, 0, false}, // root at 0
		{1e-9, 1, 1, -5, 5, -0.9, false, 0, false},
		{0.999, 0.099, 0.101, 0.5, 1.5, math.NaN(), false, 0, false},                      // x0 outside: midpoint
		{2.0945514815423265, 1e-12, 1e-12, 100, -100, 2.0945514815423265, true, 0, false}, // a tiny bracket
	} {
		f.Add(s.r, s.da, s.db, s.p, s.q, s.x0, s.pair, s.e, s.neg)
	}
	f.Fuzz(func(t *testing.T, r, da, db, p, q, x0 float64, pair bool, e int8, neg bool) {
		if !fuzzValue(r, da, db, p, q) {
			return
		}
		a, b := r-math.Abs(da), r+math.Abs(db)
		if !(a < r && r < b) {
			return
		}
		S := math.Max(math.Abs(a), math.Abs(b))
		if S < 1e-100 {
			return // g(x) ≈ S² would underflow and lose the sign of F
		}
		gap := 1e-3 * S
		var g func(x float64) (g, d1 float64) // g″ = 2 in both forms
		if pair {
			u, v := p, q
			if !(math.Abs(v) >= gap) {
				return
			}
			g = func(x float64) (float64, float64) { return (x-u)*(x-u) + v*v, 2 * (x - u) }
		} else {
			for _, s := range []float64{p, q} {
				if s > a-gap && s < b+gap {
					return
				}
			}
			g = func(x float64) (float64, float64) { return (x - p) * (x - q), (x - p) + (x - q) }
		}
		k := fuzzScale(e, neg)
		F := func(x float64) (float64, float64, float64) {
			gx, g1 := g(x)
			d := x - r
			return k * d * gx, k * (gx + d*g1), k * (2*g1 + 2*d)
		}
		if fa, _, _ := F(a); fa > 0 {
			k = -k
		}
		if fa, _, _ := F(a); !(fa < 0) {
			return
		}
		if fb, _, _ := F(b); !(fb > 0) {
			return
		}
		x := BracketedHalley(F, x0, a, b)
		if math.IsNaN(x) || x < a || x > b {
			t.Fatalf("BracketedHalley, root %v in [%v, %v] (p %v, q %v, pair %v) from %v: got %v outside", r, a, b, p, q, pair, x0, x)
		}
		tol := 1e-11 * S
		if math.Abs(x-r) > tol {
			t.Fatalf("BracketedHalley, root %v in [%v, %v] (p %v, q %v, pair %v) from %v: got %.17g, off by %.3g > %.3g",
				r, a, b, p, q, pair, x0, x, math.Abs(x-r), tol)
		}
		if l, _, _ := F(x - tol); !(l < 0) {
			t.Fatalf("root %v: got %.17g, F(x − tol) = %v not < 0", r, x, l)
		}
		if h, _, _ := F(x + tol); !(h > 0) {
			t.Fatalf("root %v: got %.17g, F(x + tol) = %v not > 0", r, x, h)
		}
	})
}

// FuzzDecreasingCrossing: for g(t) = k·(r − t)ⁿ with n = 1 or 3 (so g is
// decreasing with its sign exact), the crossing search from any t0 in
// [−MaxLogScale, MaxLogScale] and any step returns r within tolerance when
// |r| ≤ MaxLogScale, and ±Inf when r lies beyond ±MaxLogScale.
func FuzzDecreasingCrossing(f *testing.F) {
	f.Add(2.5, 0.0, 1.0, false, int8(0))
	f.Add(-299.99, 10.0, 0.5, true, int8(-40))
	f.Add(300.0, 0.0, 1.0, false, int8(3))
	f.Add(300.5, -300.0, 1e-9, true, int8(0))
	f.Add(-1e6, 0.0, math.Inf(1), false, int8(0))
	f.Add(0.0, 1e-300, 0.0, true, int8(60))
	f.Fuzz(func(t *testing.T, r, t0, step float64, cubic bool, e int8) {
		if !fuzzValue(r) || !(math.Abs(t0) <= MaxLogScale) {
			return
		}
		k := fuzzScale(e, false)
		g := func(x float64) float64 { return k * (r - x) }
		if cubic {
			g = func(x float64) float64 { d := r - x; return k * d * d * d }
		}
		var beyond bool
		got := DecreasingCrossing(func(x float64) float64 {
			if math.Abs(x) > MaxLogScale {
				beyond = true
			}
			return g(x)
		}, t0, step)
		if beyond {
			t.Fatalf("r %v, t0 %v, step %v: g evaluated beyond ±MaxLogScale", r, t0, step)
		}
		switch {
		case r > MaxLogScale:
			if got != math.Inf(1) {
				t.Fatalf("r %v beyond MaxLogScale, t0 %v, step %v: got %v, want +Inf", r, t0, step, got)
			}
		case r < -MaxLogScale:
			if got != math.Inf(-1) {
				t.Fatalf("r %v beyond −MaxLogScale, t0 %v, step %v: got %v, want −Inf", r, t0, step, got)
			}
		default:
			if tol := brentTolerance(got); !(math.Abs(got-r) <= tol) {
				t.Fatalf("r %v, t0 %v, step %v: got %.17g, off by %.3g > %.3g", r, t0, step, got, math.Abs(got-r), tol)
			}
		}
	})
}
