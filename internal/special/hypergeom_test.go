package special

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"

	"github.com/propscope/propscope/internal/bigref"
)

// TestLogHypergeomPMF compares the saddle-point log pmf with exact rational
// arithmetic, C(n1,k)C(n2,m−k)/C(n1+n2,m), over whole supports.
func TestLogHypergeomPMF(t *testing.T) {
	for _, d := range [][3]int64{{5, 7, 6}, {40, 60, 30}, {300, 200, 251}, {1, 1, 1}} {
		n1, n2, m := d[0], d[1], d[2]
		lo, hi := HypergeomSupport(n1, n2, m)
		total := new(big.Int).Binomial(n1+n2, m)
		sum := 0.0
		for k := lo; k <= hi; k++ {
			num := new(big.Int).Mul(new(big.Int).Binomial(n1, k), new(big.Int).Binomial(n2, m-k))
			want, _ := new(big.Rat).SetFrac(num, total).Float64()
			got := LogHypergeomPMF(k, n1, n2, m)
			if math.Abs(got-math.Log(want)) > 1e-12*math.Max(1, math.Abs(math.Log(want))) {
				t.Errorf("n1=%d n2=%d m=%d k=%d: log pmf %.15g, want %.15g", n1, n2, m, k, got, math.Log(want))
			}
			sum += math.Exp(got)
		}
		if math.Abs(sum-1) > 1e-12 {
			t.Errorf("n1=%d n2=%d m=%d: pmf sums to %v", n1, n2, m, sum)
		}
		if !math.IsInf(LogHypergeomPMF(lo-1, n1, n2, m), -1) || !math.IsInf(LogHypergeomPMF(hi+1, n1, n2, m), -1) {
			t.Errorf("outside the support the log pmf must be -Inf")
		}
	}
}

// TestLogBinomPMF compares the saddle-point binomial log pmf with exact
// rational arithmetic C(n,k) pᵏ (1−p)ⁿ⁻ᵏ for a dyadic p.
func TestLogBinomPMF(t *testing.T) {
	for _, n := range []int64{1, 2, 15, 16, 17, 60, 121} {
		for _, pr := range []*big.Rat{big.NewRat(1, 1024), big.NewRat(3, 8), big.NewRat(1, 2), big.NewRat(1023, 1024)} {
			p, _ := pr.Float64()
			q := 1 - p
			for k := int64(0); k <= n; k++ {
				exact := new(big.Rat).SetInt(new(big.Int).Binomial(n, k))
				for range k {
					exact.Mul(exact, pr)
				}
				qr := new(big.Rat).Sub(big.NewRat(1, 1), pr)
				for range n - k {
					exact.Mul(exact, qr)
				}
				// log of a Rat via its float mantissa/exponent.
				f := new(big.Float).SetPrec(200).SetRat(exact)
				mant := new(big.Float)
				e := f.MantExp(mant)
				mf, _ := mant.Float64()
				want := math.Log(mf) + float64(e)*math.Ln2
				got := LogBinomPMF(float64(k), float64(n), p, q)
				if math.Abs(got-want) > 1e-12*math.Max(1, math.Abs(want)) {
					t.Errorf("n=%d k=%d p=%v: %.15g, want %.15g", n, k, p, got, want)
				}
			}
		}
	}
}

// TestLogHypergeomPMFRandom compares the log pmf with exact rational
// arithmetic on random designs (groups of 1 to 30 and of 1 to 2000, every
// margin, the ends of the support included, where cells are zero): the
// combined saddle-point form must be within 2·10⁻¹⁵·max(1, |log P|), a
// few ulps (the previous three-binomial form reached 1.5·10⁻¹⁴ here).
func TestLogHypergeomPMFRandom(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 4))
	worst := 0.0
	for it := range 400 {
		n1, n2 := 1+r.Int64N(2000), 1+r.Int64N(2000)
		if it%3 == 0 {
			n1, n2 = 1+r.Int64N(30), 1+r.Int64N(30)
		}
		m := r.Int64N(n1 + n2 + 1)
		lo, w := bigref.HypergeomWeights(n1, n2, m)
		if len(w) == 1 {
			continue
		}
		den := new(big.Int).Binomial(n1+n2, m)
		for _, i := range []int{0, len(w) - 1, len(w) / 2, r.IntN(len(w)), r.IntN(len(w))} {
			k := lo + int64(i)
			want := bigref.RatLog(new(big.Rat).SetFrac(w[i], den))
			got := LogHypergeomPMF(k, n1, n2, m)
			e := math.Abs(got-want) / math.Max(1, math.Abs(want))
			worst = max(worst, e)
			if e > 2e-15 {
				t.Errorf("n1=%d n2=%d m=%d k=%d: log pmf %.17g, want %.17g", n1, n2, m, k, got, want)
			}
		}
	}
	t.Logf("worst error %.2g", worst)
}

// TestLogHypergeomPMFLarge checks the log pmf at 10⁶ and 2⁴⁰ per group
// near the mode, where rounding the expected cells would show (about
// 10⁻¹³ in the log at 10⁶), against the log of a product of exact ratios
// from a neighbouring table in 128-bit arithmetic: log P(k+j) − log P(k).
func TestLogHypergeomPMFLarge(t *testing.T) {
	for _, d := range [][3]int64{{1000000, 800000, 900800}, {1000000, 1000000, 1001000}, {1 << 40, 1<<40 + 12345, 1 << 40}} {
		n1, n2, m := d[0], d[1], d[2]
		k0 := HypergeomMode(n1, n2, m)
		prod := new(big.Float).SetPrec(128).SetInt64(1)
		for k := k0; k < k0+3000; k++ {
			num := new(big.Float).SetPrec(128).SetInt64(n1 - k)
			prod.Mul(prod, num.Mul(num, new(big.Float).SetInt64(m-k)))
			den := new(big.Float).SetPrec(128).SetInt64(k + 1)
			prod.Quo(prod, den.Mul(den, new(big.Float).SetInt64(n2-m+k+1)))
			if (k-k0)%500 != 499 {
				continue
			}
			r, _ := prod.Rat(nil)
			want := bigref.RatLog(r)
			got := LogHypergeomPMF(k+1, n1, n2, m) - LogHypergeomPMF(k0, n1, n2, m)
			if math.Abs(got-want) > 1e-14 {
				t.Errorf("n1=%d n2=%d m=%d: log P(%d) − log P(%d) = %.17g, want %.17g", n1, n2, m, k+1, k0, got, want)
			}
		}
	}
}

// TestStirlerrTable compares stirlerrInt (a table built by an exact
// recurrence up to 15, the asymptotic series above) with stirlerr(n) =
// log n! − (n+½)·log n + n − ½·log 2π evaluated in 256-bit arithmetic
// (bigLog, and π to 80 digits), to 3·10⁻¹⁷ absolute. (stirlerr's own
// lgamma route is good to a few 10⁻¹⁵ only.)
func TestStirlerrTable(t *testing.T) {
	pi, _ := new(big.Float).SetPrec(256).SetString("3.1415926535897932384626433832795028841971693993751058209749445923078164062862089986")
	halfLog2Pi := bigLog(new(big.Float).SetPrec(256).Mul(pi, big.NewFloat(2)))
	halfLog2Pi.Quo(halfLog2Pi, big.NewFloat(2))
	for n := int64(1); n < 60; n++ {
		fact := new(big.Float).SetPrec(256).SetInt(new(big.Int).MulRange(1, n))
		ln := bigLog(new(big.Float).SetPrec(256).SetInt64(n))
		want := bigLog(fact)
		want.Sub(want, ln.Mul(ln, big.NewFloat(float64(n)+0.5)))
		want.Add(want, new(big.Float).SetInt64(n))
		want.Sub(want, halfLog2Pi)
		wf, _ := want.Float64()
		if got := stirlerrInt(n); math.Abs(got-wf) > 3e-17 {
			t.Errorf("stirlerr(%d) = %.17g, want %.17g", n, got, wf)
		}
	}
}

// TestBd0Dev compares bd0Dev(x, d, e) with x·log(x/e) + e − x evaluated in
// 256-bit arithmetic (bigLog) for d and e exactly x − e and e (so the
// inputs agree), over deviations from 10⁻⁹ to 10 times the expected
// value, to 2·10⁻¹⁵ relative.
func TestBd0Dev(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	for range 1000 {
		e0 := math.Exp(r.Float64() * 30)
		x := math.Round(e0 * math.Exp((r.Float64()*2-1)*math.Pow(10, -9+r.Float64()*10)))
		bx := new(big.Float).SetPrec(256).SetFloat64(x)
		d, _ := new(big.Float).SetPrec(256).Sub(bx, new(big.Float).SetFloat64(e0)).Float64()
		if d == 0 {
			continue
		}
		be := new(big.Float).SetPrec(256).Sub(bx, new(big.Float).SetFloat64(d)) // e = x − d exactly
		e, _ := be.Float64()
		want := new(big.Float).SetPrec(256).Sub(be, bx)
		if x > 0 {
			l := bigLog(new(big.Float).SetPrec(256).Quo(bx, be))
			want.Add(want, l.Mul(l, bx))
		}
		wf, _ := want.Float64()
		if got := bd0Dev(x, d, e); math.Abs(got-wf) > 2e-15*wf {
			t.Errorf("bd0(%v, %v) = %.17g, want %.17g", x, e, got, wf)
		}
	}
}

// bigLog returns log x for x > 0 in 256-bit arithmetic: x = f·2ᵉ with
// f in [½, 1), log f = 2·atanh((f−1)/(f+1)) and log 2 = 2·atanh(⅓) by
// their series (|atanh argument| ≤ ⅓, so 170 terms reach 10⁻⁸¹).
func bigLog(x *big.Float) *big.Float {
	const prec = 256
	atanh2 := func(y *big.Float) *big.Float { // 2·atanh(y)
		y2 := new(big.Float).SetPrec(prec).Mul(y, y)
		sum, term := new(big.Float).SetPrec(prec), new(big.Float).SetPrec(prec).Set(y)
		q := new(big.Float).SetPrec(prec)
		for j := int64(1); j < 340; j += 2 {
			sum.Add(sum, q.Quo(term, q.SetInt64(j)))
			term.Mul(term, y2)
		}
		return sum.Add(sum, sum)
	}
	f := new(big.Float).SetPrec(prec)
	e := x.MantExp(f)
	one := new(big.Float).SetPrec(prec).SetInt64(1)
	y := new(big.Float).SetPrec(prec).Quo(new(big.Float).SetPrec(prec).Sub(f, one), new(big.Float).SetPrec(prec).Add(f, one))
	ln2 := atanh2(new(big.Float).SetPrec(prec).Quo(one, new(big.Float).SetInt64(3)))
	r := atanh2(y)
	return r.Add(r, ln2.Mul(ln2, new(big.Float).SetInt64(int64(e))))
}

// TestRatioLoops compares RatioSeries and RatioWalk, in both their exact
// difference form (values below 2⁵³) and their product form (above), with
// a plain loop over the same ratios.
func TestRatioLoops(t *testing.T) {
	// Series from the upper end of a table's support and walks down from
	// above the mode through it (n1 = n2 = 10⁶ and 2⁴⁰, m = n1, k = mode
	// + 300 and + 3·10⁶; the ratios rise above 1, then fall).
	for _, p := range [][5]float64{
		{40, 30, 20, 25, 30}, {1e6, 1e6, 1e6 + 1, 1e6 + 1, 5000}, {9, 9, 1, 1, 9},
		{500300, 500300, 499701, 499701, 3000},
		{1<<39 + 3e6, 1<<39 + 3e6, 1<<39 - 3e6 + 1, 1<<39 - 3e6 + 1, 8e6},
		{1<<39 - 3e6, 1<<39 - 3e6, 1<<39 + 3e6 + 1, 1<<39 + 3e6 + 1, 3e6},
	} {
		a, b, c, d, n := p[0], p[1], p[2], p[3], int64(p[4])
		// Plain series: every term up to n, or until the terms vanish.
		want, term := 1.0, 1.0
		for i := range n {
			fi := float64(i)
			term *= (a - fi) * (b - fi) / ((c + fi) * (d + fi))
			want += term
		}
		if r := (a * b) / (c * d); r < 1 {
			if got := RatioSeries(a, b, c, d, n); math.Abs(got-want) > 1e-13*want {
				t.Errorf("RatioSeries%v = %.17g, want %.17g", p, got, want)
			}
		}
		// The walk to the first term below a limit.
		for _, lim := range []float64{0, 0.5, 1e-3} {
			sum, j, tj, ok := RatioWalk(a, b, c, d, 1, lim, n)
			ws, wj, wt := 0.0, n+1, 1.0
			term = 1
			for i := range n {
				fi := float64(i)
				term *= (a - fi) * (b - fi) / ((c + fi) * (d + fi))
				if term <= lim {
					wj, wt = i+1, term
					break
				}
				ws, wt = ws+term, term
			}
			if !ok || j != wj || math.Abs(sum-ws) > 1e-13*ws || math.Abs(tj-wt) > 1e-13*wt {
				t.Errorf("RatioWalk%v lim %v = %v %v %v %v, want %v %v %v", p, lim, sum, j, tj, ok, ws, wj, wt)
			}
		}
	}
}

// TestMulSub compares mulSub with big.Int arithmetic.
func TestMulSub(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	for range 1000 {
		a, b, c, d := r.Int64N(1<<51), r.Int64N(1<<51), r.Int64N(1<<51), r.Int64N(1<<51)
		if r.IntN(2) == 0 {
			c, d = a, b+r.Int64N(9)-4 // nearly equal products
			d = max(d, 0)
		}
		want := new(big.Int).Sub(new(big.Int).Mul(big.NewInt(a), big.NewInt(b)), new(big.Int).Mul(big.NewInt(c), big.NewInt(d)))
		wf, _ := new(big.Float).SetInt(want).Float64()
		if got := mulSub(a, b, c, d); math.Abs(got-wf) > 2.3e-16*math.Abs(wf) {
			t.Errorf("mulSub(%d, %d, %d, %d) = %v, want %v", a, b, c, d, got, wf)
		}
	}
}
