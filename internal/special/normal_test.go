package special

import (
	"math"
	"math/big"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// epsilon is the float64 machine epsilon, 2⁻⁵².
const epsilon = 0x1p-52

// ulp returns the spacing of float64 values at x.
func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}

// halfUnit returns half a unit in the last printed digit of the decimal s
// ("1.959963984540054" → 5e−16): how far a correctly rounded printed value
// may be from the true one.
func halfUnit(s string) float64 {
	mant, exp, _ := strings.Cut(strings.ToLower(s), "e")
	e, _ := strconv.Atoi(exp) // 0 when there is no exponent
	decimals := 0
	if _, frac, ok := strings.Cut(mant, "."); ok {
		decimals = len(frac)
	}
	return 0.5 * math.Pow(10, float64(e-decimals))
}

// bigDecimal parses a decimal string exactly enough (256 bits).
func bigDecimal(t *testing.T, s string) *big.Float {
	t.Helper()
	f, ok := new(big.Float).SetPrec(256).SetString(s)
	if !ok {
		t.Fatalf("bad decimal %q", s)
	}
	return f
}

// bigSubFloat64 returns x − y as a float64, the difference formed exactly.
func bigSubFloat64(x, y *big.Float) float64 {
	d, _ := new(big.Float).SetPrec(max(x.Prec(), y.Prec())+64).Sub(x, y).Float64()
	return d
}

// normalTailTolerance is the relative error allowed in P(Z ≥ z) by the
// erfc route: the argument z/√2 carries up to about 0.6ε of relative
// rounding (the division and the constant √2), which the tail magnifies by
// its condition number |z·φ(z)/Q(z)| ≈ z², and erfc itself adds a few ulps.
// Measured errors stay below 0.6·z²·ε.
func normalTailTolerance(z float64) float64 { return (z*z + 8) * epsilon }

// TestNormalReferences checks the two references of bigref_normal_test.go
// before the kernels are checked against them: π against math.Pi; the
// series against math.Erfc where erfc is well conditioned (|z| ≤ 1); the
// series against Laplace's continued fraction from z = 5 to 40 (two
// unrelated expansions, past where float64 underflows); and both against
// tail values recalled from memory (of the kind tabulated in Abramowitz &
// Stegun 1964, ch. 26, table 26.1), each to half a unit in its last printed
// digit.
func TestNormalReferences(t *testing.T) {
	if pi, _ := bigPi(200).Float64(); pi != math.Pi {
		t.Fatalf("bigPi = %v, want %v", pi, math.Pi)
	}
	for _, z := range []float64{-1, -0.5, -1e-3, 0, 1e-3, 0.25, 0.5, 1} {
		want := 0.5 * math.Erfc(z/math.Sqrt2)
		got, _ := bigUpperTailAt(z).Float64()
		if math.Abs(got-want) > 4*epsilon*want {
			t.Errorf("series Q(%v) = %.17g, erfc gives %.17g", z, got, want)
		}
	}
	for _, z := range []float64{5, 6, 8, 10, 15, 20, 25, 30, 35, 37, 38, 40} {
		series, cf := logOfBig(bigUpperTailAt(z)), cfLogUpperTail(z)
		if d := math.Abs(series - cf); d > 4*ulp(series) {
			t.Errorf("log Q(%v): series %.17g, continued fraction %.17g (differ by %.3g)", z, series, cf, d)
		}
	}
	// Recalled from memory, 15 significant digits (and confirmed with mpmath
	// 1.3.0 while writing): Q(z) = 1 − Φ(z).
	for _, c := range []struct {
		z float64
		q string
	}{
		{1, "0.158655253931457"},
		{1.96, "0.0249978951482204"},
		{2, "0.0227501319481792"},
		{3, "0.00134989803163009"},
		{5, "2.86651571879194e-7"},
		{10, "7.61985302416053e-24"},
	} {
		ref := bigUpperTailAt(c.z)
		if d := bigSubFloat64(ref, bigDecimal(t, c.q)); math.Abs(d) > halfUnit(c.q) {
			f, _ := ref.Float64()
			t.Errorf("series Q(%v) = %.17g, remembered %s", c.z, f, c.q)
		}
	}
}

// TestNormalUpperTail checks p and log p of NormalUpperTail against the
// math/big series from z = −38 to 40, across the switch from erfc to the
// asymptotic series at 37 and the underflow of p near 38.5: p to
// normalTailTolerance (absolute 2⁻¹⁰⁷⁴ once subnormal), log p to the same
// relative error of p plus 4 ulps of log p itself.
func TestNormalUpperTail(t *testing.T) {
	zs := []float64{-38, -20, -8.5, -1.96, -1e-300, 0, 5e-324, 1e-8, 36.9, 37 - 1e-9, 37, 37 + 1e-9, 37.25, 37.5, 38, 38.4, 38.6, 39, 40}
	for z := -10.0; z <= 36.5; z += 0.37 {
		zs = append(zs, z)
	}
	for _, z := range zs {
		ref := bigUpperTailAt(z)
		want, _ := ref.Float64()
		wantLog := logOfBig(ref)
		p, logp := NormalUpperTail(z)
		tol := normalTailTolerance(z)
		if d := math.Abs(p - want); !(d <= tol*want+0x1p-1074) {
			t.Errorf("Q(%v) = %.17g, want %.17g (relative error %.3g, tolerance %.3g)", z, p, want, d/want, tol)
		}
		if d := math.Abs(logp - wantLog); !(d <= tol+4*ulp(wantLog)) {
			t.Errorf("log Q(%v) = %.17g, want %.17g (off by %.3g)", z, logp, wantLog, d)
		}
	}
}

// TestNormalUpperTailFarTail checks log p beyond z = 37, where p
// underflows, against Laplace's continued fraction (validated against the
// series up to 40 in TestNormalReferences). The asymptotic series of
// NormalUpperTail stops at 105/z⁸; the first term left out, 945/z¹⁰, is
// 2e−13 at z = 37 and falls fast, and −z²/2 is rounded once (relative ε/2),
// hence the tolerance 3e−13 + 2ε·|log p|. Dropping the last kept term would
// cost 3e−11 at z = 37.
func TestNormalUpperTailFarTail(t *testing.T) {
	for _, z := range []float64{37, 37.1, 37.5, 38, 39, 40, 45, 50, 75, 100, 300, 1e3, 1e4, 1e6, 1e8, 1e12, 1e100} {
		want := cfLogUpperTail(z)
		p, logp := NormalUpperTail(z)
		if d := math.Abs(logp - want); !(d <= 3e-13+2*epsilon*math.Abs(want)) {
			t.Errorf("log Q(%v) = %.17g, continued fraction %.17g (off by %.3g)", z, logp, want, d)
		}
		if wp := math.Exp(want); math.Abs(p-wp) > 1e-12*wp+0x1p-1074 {
			t.Errorf("Q(%v) = %v, want %v", z, p, wp)
		}
	}
}

// TestNormalUpperTailGonum compares p with gonum's distuv.UnitNormal
// (gonum v0.17.0), whose Survival is ½·(1 − erf(z/√2)): the same special
// function family but the complement taken by subtraction, so it agrees to
// about 1e−16 absolute only (and is useless as a relative check beyond
// z ≈ 5). It guards the wiring of the erfc route.
func TestNormalUpperTailGonum(t *testing.T) {
	for z := -8.0; z <= 8; z += 0.125 {
		want := distuv.UnitNormal.Survival(z)
		p, _ := NormalUpperTail(z)
		if d := math.Abs(p - want); d > 1.2e-16+normalTailTolerance(z)*p {
			t.Errorf("Q(%v) = %.17g, gonum %.17g (differ by %.3g)", z, p, want, d)
		}
	}
}

// TestNormalUpperTailEdges: NaN in gives NaN out; the infinities give the
// limits; arguments beyond the float64 range of z² give p = 0 and a log
// that is −Inf or finite, never NaN; everywhere 0 ≤ p ≤ 1 and log p ≤ 0;
// and the two branches meet at z = 37 without a jump (the last float below
// 37 and 37 itself differ in log p by about 37·ulp(37), 2.6e−13, in truth).
func TestNormalUpperTailEdges(t *testing.T) {
	if p, logp := NormalUpperTail(math.NaN()); !math.IsNaN(p) || !math.IsNaN(logp) {
		t.Errorf("NaN: got (%v, %v), want NaNs", p, logp)
	}
	if p, logp := NormalUpperTail(math.Inf(-1)); p != 1 || logp != 0 {
		t.Errorf("−Inf: got (%v, %v), want (1, 0)", p, logp)
	}
	if p, logp := NormalUpperTail(math.Inf(1)); p != 0 || !math.IsInf(logp, -1) {
		t.Errorf("+Inf: got (%v, %v), want (0, −Inf)", p, logp)
	}
	for _, z := range []float64{-math.MaxFloat64, -1e300, -40, -37.5, -1, 0, 1, 37.5, 1e154, 1.5e154, 1e300, math.MaxFloat64} {
		p, logp := NormalUpperTail(z)
		if math.IsNaN(p) || math.IsNaN(logp) || p < 0 || p > 1 || logp > 0 {
			t.Errorf("z = %v: got (%v, %v)", z, p, logp)
		}
	}
	below := math.Nextafter(37, 0)
	_, l1 := NormalUpperTail(below)
	_, l2 := NormalUpperTail(37)
	if d := l1 - l2; !(d > 0 && d < 1e-12) {
		t.Errorf("log Q jumps at the switch: log Q(%v) − log Q(37) = %.3g", below, d)
	}
}

// TestChiSquare1UpperTail checks P(X ≥ x) for one degree of freedom
// against the math/big series at z² = x exactly (so the reference carries
// no rounding of √x), against gonum's distuv.ChiSquared{K: 1} (gonum
// v0.17.0; its Survival is the regularized upper incomplete gamma function
// Q(½, x/2), an independent algorithm; the two differ by up to 1.8e−13
// relative near x = 1369, where ours carries the 2e−13 of the asymptotic
// series at z = 37, so 5e−13 is allowed),
// and beyond x ≈ 1369 (z = 37), where p underflows, log p against the
// continued fraction. The erfc route's tolerance in x is that of the normal
// tail at z = √x, plus the rounding of √x (relative ε/2, magnified by
// z² = x), hence (2x + 8)·ε.
func TestChiSquare1UpperTail(t *testing.T) {
	xs := []float64{1e-300, 1e-20, 1e-10, 1e-4, 0.01, 0.5, 1, 2, 3.84, 5, 10, 20, 50, 100, 300, 700, 1000, 1368, 1369, 1369.5, 1400, 1405}
	for x := 0.05; x < 1400; x *= 1.37 {
		xs = append(xs, x)
	}
	for _, x := range xs {
		ref := bigUpperTail(new(big.Float).SetFloat64(x), false)
		ref.Mul(ref, big.NewFloat(2))
		want, _ := ref.Float64()
		wantLog := logOfBig(ref)
		p, logp := ChiSquare1UpperTail(x)
		tol := (2*x + 8) * epsilon
		if d := math.Abs(p - want); !(d <= tol*want+0x1p-1074) {
			t.Errorf("χ²₁ tail at %v = %.17g, want %.17g (relative error %.3g)", x, p, want, d/want)
		}
		if d := math.Abs(logp - wantLog); !(d <= tol+4*ulp(wantLog)) {
			t.Errorf("log χ²₁ tail at %v = %.17g, want %.17g (off by %.3g)", x, logp, wantLog, d)
		}
		if g := (distuv.ChiSquared{K: 1}).Survival(x); g > 1e-300 {
			if d := math.Abs(p - g); d > 5e-13*g {
				t.Errorf("χ²₁ tail at %v = %.17g, gonum %.17g (relative difference %.3g)", x, p, g, d/g)
			}
		}
	}
	for _, x := range []float64{1369, 1500, 2000, 1e4, 1e6, 1e10} {
		want := math.Ln2 + cfLogUpperTail(math.Sqrt(x))
		if _, logp := ChiSquare1UpperTail(x); math.Abs(logp-want) > 3e-13+4*epsilon*math.Abs(want) {
			t.Errorf("log χ²₁ tail at %v = %.17g, continued fraction %.17g", x, logp, want)
		}
	}
}

// TestChiSquare1UpperTailEdges: x ≤ 0 (including −Inf) has p = 1 and
// log p = 0; +Inf has p = 0 and log p = −Inf; NaN stays NaN rather than
// turning into p = 1; for tiny x, p is 1 and log p ≤ 0, never slightly
// above.
func TestChiSquare1UpperTailEdges(t *testing.T) {
	for _, x := range []float64{0, math.Copysign(0, -1), -1, math.Inf(-1)} {
		if p, logp := ChiSquare1UpperTail(x); p != 1 || logp != 0 {
			t.Errorf("x = %v: got (%v, %v), want (1, 0)", x, p, logp)
		}
	}
	if p, logp := ChiSquare1UpperTail(math.Inf(1)); p != 0 || !math.IsInf(logp, -1) {
		t.Errorf("+Inf: got (%v, %v), want (0, −Inf)", p, logp)
	}
	if p, logp := ChiSquare1UpperTail(math.NaN()); !math.IsNaN(p) || !math.IsNaN(logp) {
		t.Errorf("NaN: got (%v, %v), want NaNs", p, logp)
	}
	for _, x := range []float64{5e-324, 1e-300, 1e-30, 1e-16, 1e-8} {
		if p, logp := ChiSquare1UpperTail(x); p > 1 || logp > 0 || math.IsNaN(logp) {
			t.Errorf("x = %v: got (%v, %v), want p ≤ 1, log p ≤ 0", x, p, logp)
		}
	}
}

// TestNormalQuantile checks Φ⁻¹ by the defining equation: at q =
// NormalQuantile(p), the math/big series gives Φ(q) exactly enough, and
// (Φ(q) − p)/φ(q) is q's own error, which must stay within 4 ulps of
// max(|q|, 1) (gonum's AS 241 claims about 1e−16 relative). The
// difference is formed in big arithmetic, so p near 1 is tested as sharply
// as p near 0.
func TestNormalQuantile(t *testing.T) {
	ps := []float64{1e-300, 1e-200, 1e-100, 1e-50, 1e-20, 1e-10, 1e-5, 1e-3, 0.01, 0.025, 0.05, 0.075, 0.1, 0.2, 0.3, 0.4,
		0.45, 0.5 - 1e-9, 0.5, 0.5 + 1e-9, 0.55, 0.6, 0.7, 0.8, 0.9, 0.95, 0.975, 0.99, 0.999, 1 - 1e-6, 1 - 1e-10, 1 - 0x1p-53}
	for _, p := range ps {
		q := NormalQuantile(p)
		if math.IsNaN(q) || math.IsInf(q, 0) {
			t.Errorf("Φ⁻¹(%v) = %v", p, q)
			continue
		}
		phi := math.Exp(-q*q/2) / math.Sqrt(2*math.Pi)
		dz := bigSubFloat64(bigUpperTailAt(-q), new(big.Float).SetFloat64(p)) / phi
		if tol := 4 * epsilon * math.Max(math.Abs(q), 1); math.Abs(dz) > tol {
			t.Errorf("Φ⁻¹(%v) = %.17g is off by %.3g (tolerance %.3g)", p, q, dz, tol)
		}
	}
	if q := NormalQuantile(0); !math.IsInf(q, -1) {
		t.Errorf("Φ⁻¹(0) = %v, want −Inf", q)
	}
	if q := NormalQuantile(1); !math.IsInf(q, 1) {
		t.Errorf("Φ⁻¹(1) = %v, want +Inf", q)
	}
}

// TestNormalHandbookQuantiles: the usual two-sided critical values, as
// printed (to fewer digits) in the percentage-point tables of Abramowitz &
// Stegun (1964), ch. 26 (z_0.975 = 1.959963984540054, for one). The
// 16-digit strings were recalled from memory and, where that memory proved
// wrong (z at 99.9% and all five χ²₁ values, off in the 14th to 16th
// digit, which this test caught), recomputed with mpmath 1.3.0 at 30
// digits. Each is first checked here against the math/big series: it must
// lie within half a unit of its last digit of the exact quantile of the
// decimal level. Then NormalQuantile of the float64 tail must agree with it
// to that half unit, plus the tail's own rounding to float64 (over the
// density) and 4 ulps; and ChiSquare1UpperTail at the χ²₁ value must give
// the level back to the same accuracy.
func TestNormalHandbookQuantiles(t *testing.T) {
	for _, c := range []struct{ level, z, x2 string }{
		{"0.90", "1.644853626951473", "2.705543454095415"},
		{"0.95", "1.959963984540054", "3.841458820694126"},
		{"0.98", "2.326347874040841", "5.411894431054341"},
		{"0.99", "2.575829303548901", "6.634896601021215"},
		{"0.999", "3.290526731491895", "10.82756617066273"},
	} {
		tail := new(big.Float).SetPrec(256).Sub(big.NewFloat(1), bigDecimal(t, c.level))
		tail.Quo(tail, big.NewFloat(2)) // α/2, exactly enough
		zm, _ := bigDecimal(t, c.z).Float64()
		phi := math.Exp(-zm*zm/2) / math.Sqrt(2*math.Pi)
		// Q at the printed z, as a float64: zm is within half an ulp of the
		// printed decimal, which halfUnit dwarfs.
		if dz := bigSubFloat64(bigUpperTailAt(zm), tail) / phi; math.Abs(dz) > halfUnit(c.z)+ulp(zm) {
			t.Errorf("remembered z = %s for level %s is off by %.3g", c.z, c.level, -dz)
		}
		a2, _ := tail.Float64()
		levelErr := math.Abs(bigSubFloat64(new(big.Float).SetFloat64(a2), tail)) / phi
		if got := -NormalQuantile(a2); math.Abs(got-zm) > halfUnit(c.z)+levelErr+4*ulp(zm) {
			t.Errorf("−Φ⁻¹(%v) = %.17g, want %s", a2, got, c.z)
		}
		// χ²₁: x = z², density φ(√x)/√x; the tail at x is 2·Q(√x).
		xm, _ := bigDecimal(t, c.x2).Float64()
		bx := new(big.Float).SetFloat64(xm)
		ref := bigUpperTail(bx, false)
		dens := math.Exp(-xm/2) / math.Sqrt(2*math.Pi*xm)
		if dx := bigSubFloat64(ref, tail) * 2 / dens; math.Abs(dx) > halfUnit(c.x2)+ulp(xm) {
			t.Errorf("remembered χ²₁ = %s for level %s is off by %.3g", c.x2, c.level, -dx)
		}
		alpha := 2 * a2
		if p, _ := ChiSquare1UpperTail(xm); math.Abs(p-alpha) > dens*(halfUnit(c.x2)+ulp(xm))+(2*xm+8)*epsilon*alpha {
			t.Errorf("χ²₁ tail at %s = %.17g, want %v", c.x2, p, alpha)
		}
	}
}
