package bayes

import (
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
)

// Altham PME (1969), "Exact Bayesian analysis of a 2×2 contingency table,
// and Fisher's 'exact' significance test", Journal of the Royal
// Statistical Society B 31:261–269. The form checked here: with the
// improper priors Beta(0, 1) on π1 and Beta(1, 0) on π2 (shape for events
// first), the posteriors are Beta(x1, n1−x1+1) and Beta(x2+1, n2−x2), and
// P(π1 < π2 | data) equals Fisher's one-sided p-value P(X1 ≥ x1) given the
// margins. Why: Beta(x1, n1−x1+1) is the x1-th smallest of n1 uniforms U
// and Beta(x2+1, n2−x2) the (x2+1)-th smallest of n2 uniforms V; π1 < π2
// exactly when at least x1 of the m = x1+x2 smallest of all n1+n2 values
// are U's, and that count is hypergeometric (n1+n2, n1, m). Posteriors are
// proper for x1 ≥ 1 and x2 ≤ n2 − 1, the tables checked. Reference: the
// library's FisherTest (Greater), computed by hypergeometric sums.
func TestAltham(t *testing.T) {
	checked := 0
	for n1 := int64(1); n1 <= 14; n1++ {
		for n2 := int64(1); n2 <= 14; n2 += 3 {
			for x1 := int64(1); x1 <= n1; x1++ {
				for x2 := int64(0); x2 < n2; x2++ {
					p1 := NewPosterior(float64(x1), float64(n1-x1+1))
					p2 := NewPosterior(float64(x2+1), float64(n2-x2))
					_, lower, _, exact := ProbabilityFirstHigher(p1, p2)
					fisher := proportions.FisherTest.Run(proportions.Counts{X1: x1, N1: n1, X2: x2, N2: n2},
						proportions.Hypothesis{Alternative: proportions.Greater, Conf: proportions.Confidence{Level: 0.95}})
					if !exact || math.Abs(lower-fisher.PValue) > 1e-12*math.Max(fisher.PValue, 1e-3) {
						t.Errorf("%d/%d vs %d/%d: P(π1 < π2) = %.15g (exact sum %v), Fisher p = %.15g", x1, n1, x2, n2, lower, exact, fisher.PValue)
					}
					checked++
				}
			}
		}
	}
	// The bounded integral path agrees too (shapes shifted off whole
	// numbers by swapping which group holds them is not possible here, so
	// call the integral directly).
	for _, c := range [][4]int64{{3, 10, 7, 12}, {9, 14, 2, 13}, {1, 5, 0, 9}} {
		p1 := NewPosterior(float64(c[0]), float64(c[1]-c[0]+1))
		p2 := NewPosterior(float64(c[2]+1), float64(c[3]-c[2]))
		e, _ := NewEffect(proportions.Difference, p1, p2)
		below, _, er := e.Tails(0)
		fisher := proportions.FisherTest.Run(proportions.Counts{X1: c[0], N1: c[1], X2: c[2], N2: c[3]},
			proportions.Hypothesis{Alternative: proportions.Greater, Conf: proportions.Confidence{Level: 0.95}})
		if math.Abs(below-fisher.PValue) > math.Max(er, 1e-9) {
			t.Errorf("integral %v: %.15g vs Fisher %.15g (estimate %.2g)", c, below, fisher.PValue, er)
		}
	}
	t.Logf("%d tables", checked)
}

// Symmetric case: identical posteriors give exactly ½, and the finite sum
// on its own gives ½ to rounding (symmetry of the two groups).
func TestSymmetric(t *testing.T) {
	c, _ := proportions.NewComparison(7, 20, 7, 20, proportions.Labels{})
	if a, err := Analyze(c, WithPrior(Jeffreys())); err != nil || a.ProbabilityFirstHigher != 0.5 {
		t.Errorf("7/20 vs 7/20: P = %v (%v), want exactly 0.5", a.ProbabilityFirstHigher, err)
	}
	for _, n := range []int64{1, 10, 1000, 1_000_000} {
		p := Uniform().Update(n/3, n)
		if h, l, _, _ := ProbabilityFirstHigher(p, p); h != 0.5 || l != 0.5 {
			t.Errorf("n = %d: P = %v / %v, want exactly 0.5", n, h, l)
		}
		le, gt, _ := wholeShapeSum(p, p)
		if math.Abs(le-0.5) > 1e-9 || math.Abs(gt-0.5) > 1e-9 {
			t.Errorf("n = %d: sum gives %.15g / %.15g", n, le, gt)
		}
	}
}

func posteriors() [][2]Posterior {
	return [][2]Posterior{
		{NewPosterior(42, 10), NewPosterior(34, 18)},
		{NewPosterior(3.5, 10), NewPosterior(4, 9.5)},
		{NewPosterior(1, 21), NewPosterior(4, 18)},
		{NewPosterior(12.5, 400.5), NewPosterior(30.5, 380.5)},
	}
}

// Independent numerical integration: gonum's fixed Gauss–Legendre rule in
// the rate itself (not in the log-odds), over group 2's rate with group
// 1's incomplete beta or density inside, on 4000 nodes across (0, 1). The
// two computations share only gonum's incomplete beta function.
func TestAgainstGonumQuadrature(t *testing.T) {
	for _, pp := range posteriors() {
		p1, p2 := pp[0], pp[1]
		b1 := distuv.Beta{Alpha: p1.EventShape, Beta: p1.NonEventShape}
		b2 := distuv.Beta{Alpha: p2.EventShape, Beta: p2.NonEventShape}
		ref := func(f func(y float64) float64) float64 {
			return quad.Fixed(func(y float64) float64 { return b2.Prob(y) * f(y) }, 0, 1, 4000, quad.Legendre{}, 0)
		}
		higher, _, _, _ := ProbabilityFirstHigher(p1, p2)
		if want := ref(func(y float64) float64 { return 1 - b1.CDF(y) }); math.Abs(higher-want) > 1e-8 {
			t.Errorf("%v: P(π1 > π2) %.12g, gonum %.12g", pp, higher, want)
		}
		type scaleCase struct {
			sc    proportions.Scale
			v     float64
			event func(y float64) float64 // P(effect ≤ v | π2 = y)
			dens  func(y float64) float64 // density contribution at v
		}
		for _, c := range []scaleCase{
			{proportions.Difference, 0.1, func(y float64) float64 { return b1.CDF(math.Min(1, y+0.1)) },
				func(y float64) float64 { return b1.Prob(y + 0.1) }},
			{proportions.Ratio, 1.3, func(y float64) float64 { return b1.CDF(math.Min(1, 1.3*y)) },
				func(y float64) float64 { return y * b1.Prob(1.3*y) }},
			{proportions.OddsRatio, 2, func(y float64) float64 { return b1.CDF(2 * y / (1 - y + 2*y)) },
				func(y float64) float64 { d := 1 - y + 2*y; return b1.Prob(2*y/d) * y * (1 - y) / (d * d) }},
		} {
			e, _ := NewEffect(c.sc, p1, p2)
			below, above, er := e.Tails(c.v)
			want := ref(c.event)
			if math.Abs(below-want) > 1e-8+er || math.Abs(above-(1-want)) > 1e-8+er {
				t.Errorf("%v %v: P(E ≤ %v) %.12g / above %.12g, gonum %.12g", pp, c.sc, c.v, below, above, want)
			}
			f, _ := e.Density(c.v)
			if wantF := ref(c.dens); math.Abs(f-wantF) > 1e-7*math.Max(1, wantF) {
				t.Errorf("%v %v: density at %v %.12g, gonum %.12g", pp, c.sc, c.v, f, wantF)
			}
		}
	}
}

// Monte Carlo with a fixed seed (PCG 18, case): 200 000 draws of each
// posterior; every posterior quantity within 4 standard errors.
func TestMonteCarlo(t *testing.T) {
	const draws = 200_000
	for ci, pp := range posteriors()[:3] {
		p1, p2 := pp[0], pp[1]
		src := rand.New(rand.NewPCG(18, uint64(ci)))
		b1 := distuv.Beta{Alpha: p1.EventShape, Beta: p1.NonEventShape, Src: src}
		b2 := distuv.Beta{Alpha: p2.EventShape, Beta: p2.NonEventShape, Src: src}
		x, y := make([]float64, draws), make([]float64, draws)
		for i := range x {
			x[i], y[i] = b1.Rand(), b2.Rand()
		}
		share := func(ok func(i int) bool) float64 {
			n := 0
			for i := range x {
				if ok(i) {
					n++
				}
			}
			return float64(n) / draws
		}
		near := func(what string, got, mc float64) {
			se := math.Sqrt(math.Max(got*(1-got), 1e-6) / draws)
			if math.Abs(got-mc) > 4*se {
				t.Errorf("case %d %s: %.6g, Monte Carlo %.6g (4 SE = %.2g)", ci, what, got, mc, 4*se)
			}
		}
		higher, _, _, _ := ProbabilityFirstHigher(p1, p2)
		near("P(π1 > π2)", higher, share(func(i int) bool { return x[i] > y[i] }))
		value := map[proportions.Scale]func(i int) float64{
			proportions.Difference: func(i int) float64 { return x[i] - y[i] },
			proportions.Ratio:      func(i int) float64 { return x[i] / y[i] },
			proportions.OddsRatio:  func(i int) float64 { return x[i] * (1 - y[i]) / (y[i] * (1 - x[i])) },
		}
		for sc, val := range value {
			e, _ := NewEffect(sc, p1, p2)
			for _, q := range []float64{0.025, 0.5, 0.975} {
				v, _, _ := e.Quantile(q)
				near(sc.String()+" quantile mass", q, share(func(i int) bool { return val(i) <= v }))
			}
			lo, hi, _, _ := e.HighestDensity(0.9)
			near(sc.String()+" highest-density mass", 0.9, share(func(i int) bool { return val(i) >= lo && val(i) <= hi }))
		}
		// P(π1 − π2 > δ) and the equivalence region
		d, _ := NewEffect(proportions.Difference, p1, p2)
		_, above, _ := d.Tails(0.05)
		near("P(π1 − π2 > 0.05)", above, share(func(i int) bool { return x[i]-y[i] > 0.05 }))
		in, _ := inside(d, Region{-0.03, 0.03})
		near("P(equivalent)", in, share(func(i int) bool { return math.Abs(x[i]-y[i]) < 0.03 }))
		// expected loss: a mean, checked against its own standard error
		loss, _ := expectedLoss(p1, p2, proportions.HigherIsBetter)
		var s, s2 float64
		for i := range x {
			l := math.Max(y[i]-x[i], 0)
			s += l
			s2 += l * l
		}
		m := s / draws
		se := math.Sqrt((s2/draws - m*m) / draws)
		if math.Abs(loss.First-m) > 4*se {
			t.Errorf("case %d expected loss %.6g, Monte Carlo %.6g (4 SE %.2g)", ci, loss.First, m, 4*se)
		}
		// next batch: binomial draws at the drawn rates
		d1, _ := p1.Predict(30)
		d2, _ := p2.Predict(30)
		beats, _ := compareBatches(d1, d2)
		bin := func(p float64) int {
			k := 0
			for j := 0; j < 30; j++ {
				if src.Float64() < p {
					k++
				}
			}
			return k
		}
		const batchDraws = 100_000
		n := 0
		for i := 0; i < batchDraws; i++ {
			if bin(x[i]) > bin(y[i]) {
				n++
			}
		}
		mc := float64(n) / batchDraws
		if se := math.Sqrt(beats * (1 - beats) / batchDraws); math.Abs(beats-mc) > 4*se {
			t.Errorf("case %d P(next batch beats) %.6g, Monte Carlo %.6g", ci, beats, mc)
		}
	}
}

// The beta-binomial sums to one and matches its mean and variance
// formulas (Skellam JG (1948), Journal of the Royal Statistical Society B
// 10:257–261: mean mα/(α+β), variance mαβ(α+β+m)/((α+β)²(α+β+1))); at small
// m each probability matches C(m,k)B(α+k, β+m−k)/B(α,β) by log-gamma.
func TestPredictive(t *testing.T) {
	for _, p := range []Posterior{NewPosterior(3, 9), NewPosterior(0.5, 20.5), NewPosterior(4000, 9000), NewPosterior(1, 1)} {
		for _, m := range []int64{1, 7, 100, 100_000} {
			d, err := p.Predict(m)
			if err != nil {
				t.Fatal(err)
			}
			var s, mean, sq float64
			for i, v := range d.Probabilities {
				k := float64(d.From + int64(i))
				s += v
				mean += k * v
				sq += k * k * v
			}
			a, b, mm := p.EventShape, p.NonEventShape, float64(m)
			wantMean := mm * a / (a + b)
			wantVar := mm * a * b * (a + b + mm) / ((a + b) * (a + b) * (a + b + 1))
			if math.Abs(s-1) > 1e-12+4e-16*float64(len(d.Probabilities)) || math.Abs(mean-wantMean) > 1e-9*math.Max(1, wantMean) ||
				math.Abs(sq-mean*mean-wantVar) > 1e-7*math.Max(1, wantVar) {
				t.Errorf("%v m=%d: sum %.15g mean %.12g (want %.12g) variance %.12g (want %.12g)", p, m, s, mean, wantMean, sq-mean*mean, wantVar)
			}
			if m <= 100 {
				for k := int64(0); k <= m; k++ {
					kk := float64(k)
					lc, _ := math.Lgamma(mm + 1)
					l1, _ := math.Lgamma(kk + 1)
					l2, _ := math.Lgamma(mm - kk + 1)
					want := math.Exp(lc - l1 - l2 + lbeta(a+kk, b+mm-kk) - lbeta(a, b))
					if math.Abs(d.At(k)-want) > 1e-12+1e-10*want {
						t.Errorf("%v m=%d k=%d: %.15g want %.15g", p, m, k, d.At(k), want)
					}
				}
			}
		}
	}
}

// As counts grow the posterior interval of the difference approaches the
// Wald interval p1 − p2 ± z·√(p1q1/n1 + p2q2/n2) (Bernstein–von Mises;
// common practice): at 10⁶ per group the ends agree to 0.5% of the width.
func TestWaldLimit(t *testing.T) {
	c, _ := proportions.NewComparison(300_000, 1_000_000, 298_000, 1_000_000, proportions.Labels{})
	a, err := Analyze(c)
	if err != nil {
		t.Fatal(err)
	}
	p1, p2 := 0.3, 0.298
	se := math.Sqrt(p1*(1-p1)/1e6 + p2*(1-p2)/1e6)
	z := 1.959963984540054 // Φ⁻¹(0.975), standard tables
	lo, hi := p1-p2-z*se, p1-p2+z*se
	d := a.Effects[0]
	if math.Abs(d.Lower-lo) > 0.005*(hi-lo) || math.Abs(d.Upper-hi) > 0.005*(hi-lo) {
		t.Errorf("posterior %.8g to %.8g, Wald %.8g to %.8g", d.Lower, d.Upper, lo, hi)
	}
}

// Extreme rates and 10⁶ per group: probabilities stay in [0, 1], finite,
// and the exact sum and the integral agree within their estimates plus
// 10⁻⁸ (the incomplete beta's own error, see the package doc).
func TestExtremes(t *testing.T) {
	for _, c := range [][4]float64{{0, 1e6, 3, 1e6}, {1e6, 1e6, 999_990, 1e6}, {500_000, 1e6, 500_100, 1e6}, {0, 1e6, 0, 10}} {
		for _, pr := range []Prior{Uniform(), Jeffreys()} {
			p1 := pr.Update(int64(c[0]), int64(c[1]))
			p2 := pr.Update(int64(c[2]), int64(c[3]))
			h, l, er, _ := ProbabilityFirstHigher(p1, p2)
			e, _ := NewEffect(proportions.Difference, p1, p2)
			below, above, er2 := e.Tails(0)
			if math.IsNaN(h+l+below+above) || math.Abs(h-above) > er+er2+1e-8 || math.Abs(l-below) > er+er2+1e-8 {
				t.Errorf("%v %v: sum %.12g/%.12g, integral %.12g/%.12g", c, pr, h, l, above, below)
			}
		}
	}
}

func TestBadInput(t *testing.T) {
	c, _ := proportions.NewComparison(4, 10, 6, 10, proportions.Labels{})
	bad := []struct {
		opt  Option
		want error
	}{
		{WithPrior(Prior{Name: "informative", EventShape: 0, NonEventShape: 1}), ErrPrior},
		{WithPrior(Prior{Name: "informative", EventShape: math.NaN(), NonEventShape: 1}), ErrPrior},
		{WithLevel(1), proportions.ErrLevel},
		{WithMargin(-1), proportions.ErrMargin},
		{WithEquivalence(0.1, -0.1), ErrRegion},
		{WithBatch(0), ErrBatch},
		{WithBetter(proportions.Better(7)), proportions.ErrBetter},
	}
	for _, b := range bad {
		if _, err := Analyze(c, b.opt); !errors.Is(err, b.want) {
			t.Errorf("got %v, want an error wrapping %v", err, b.want)
		}
	}
	if _, err := PriorFromMean(1, 10); !errors.Is(err, ErrPrior) {
		t.Errorf("mean 1: %v", err)
	}
	if _, err := PriorFromMean(0.3, -2); !errors.Is(err, ErrPrior) {
		t.Errorf("strength −2: %v", err)
	}
	if p, err := PriorFromMean(0.25, 20); err != nil || p.EventShape != 5 || p.NonEventShape != 15 {
		t.Errorf("mean 0.25 strength 20: %v %v", p, err)
	}
	if _, err := Analyze(proportions.Comparison{First: proportions.Group{Events: 3, Trials: 2}, Second: proportions.Group{Trials: 1}}); !errors.Is(err, proportions.ErrEventsExceedTrials) {
		t.Errorf("bad counts: %v", err)
	}
}

// TestExtremePosteriorsAreRefused checks that the posteriors whose integrals
// took minutes (10¹⁰ units per group) or gave infinite densities (a prior
// shape of 10⁻³⁰ with no events), and levels whose intervals came out NaN
// (1 − 10⁻¹⁶), are refused with the sentinel that names the problem, and
// that the edges of the allowed range still give a result that marshals.
func TestExtremePosteriorsAreRefused(t *testing.T) {
	large, _ := proportions.NewComparison(5e9, 1e10, 5.1e9, 1e10, proportions.Labels{})
	small, _ := proportions.NewComparison(0, 3, 1, 3, proportions.Labels{})
	tiny := Prior{Name: "vague", EventShape: 1e-30, NonEventShape: 1e-30}
	strong := Prior{Name: "strong", EventShape: 1e10, NonEventShape: 1e10}
	for _, tc := range []struct {
		name string
		c    proportions.Comparison
		opts []Option
		want error
	}{
		{"10¹⁰ units per group", large, nil, proportions.ErrTooLarge},
		{"prior of strength 2·10¹⁰", small, []Option{WithPrior(strong)}, proportions.ErrTooLarge},
		{"prior shape 10⁻³⁰, no events", small, []Option{WithPrior(tiny)}, ErrPrior},
		{"level 1 − 10⁻¹⁶", small, []Option{WithLevel(1 - 1e-16)}, proportions.ErrLevel},
	} {
		if _, err := Analyze(tc.c, tc.opts...); !errors.Is(err, tc.want) {
			t.Errorf("%s: error %v, want one wrapping %v", tc.name, err, tc.want)
		}
	}
	if _, err := NewEffect(proportions.Difference, NewPosterior(math.NaN(), 1), NewPosterior(1, 1)); !errors.Is(err, ErrPrior) {
		t.Errorf("NewEffect with a NaN shape: error %v, want one wrapping ErrPrior", err)
	}
	e, err := NewEffect(proportions.Difference, NewPosterior(1, 3), NewPosterior(2, 2))
	if err != nil {
		t.Fatal(err)
	}
	if _, _, _, err := e.EqualTailed(1 - 1e-16); !errors.Is(err, proportions.ErrLevel) {
		t.Errorf("EqualTailed(1 − 10⁻¹⁶): error %v, want one wrapping ErrLevel", err)
	}
	edge, _ := proportions.NewComparison(0, 3, 1, 3, proportions.Labels{})
	a, err := Analyze(edge, WithPrior(Prior{Name: "vague", EventShape: 0.05, NonEventShape: 0.05}), WithLevel(proportions.MaxLevel))
	if err != nil {
		t.Fatalf("shape 0.05 at the largest level: %v", err)
	}
	if _, err := json.Marshal(a); err != nil {
		t.Errorf("shape 0.05 at the largest level: %v", err)
	}
}

// TestPosteriorsAtTheLimitRun checks a posterior right at the largest
// strength Analyze accepts (10⁸ units, Jeffreys' prior included): the
// expected loss works on posteriors one shape larger, which the limit
// alone would refuse, and a refused posterior there was a nil effect and
// a crash. It must give a result that marshals.
func TestPosteriorsAtTheLimitRun(t *testing.T) {
	c, err := proportions.NewComparison(49_999_999, 99_999_999, 50_010_000, 99_999_999, proportions.Labels{})
	if err != nil {
		t.Fatal(err)
	}
	a, err := Analyze(c, WithPrior(Jeffreys()))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := json.Marshal(a); err != nil {
		t.Error(err)
	}
	if !(a.ExpectedLoss.First > 0 && a.ExpectedLoss.Second >= 0) {
		t.Errorf("expected loss %+v: the first group, lower by 10⁻⁴, must lose something", a.ExpectedLoss)
	}
}
