package segments

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// The adjusted p-values are checked against the definitions written out
// plainly, O(m²), on a sorted copy (bruteAdjusted), and against the
// papers' own step procedures (bruteRejects): a rule's adjusted p-value is
// at most α exactly when its procedure at level α rejects the hypothesis.

// bruteAdjusted applies each paper's definition literally to sorted
// p-values and returns them in the input's order. Ties share one value,
// which the definitions give whatever the order of the tied entries.
func bruteAdjusted(p []float64, a Adjustment) []float64 {
	m := len(p)
	sorted := slices.Clone(p)
	slices.Sort(sorted)
	adj := make([]float64, m)
	for i := 1; i <= m; i++ {
		switch a {
		case Bonferroni:
			adj[i-1] = math.Min(1, float64(m)*sorted[i-1])
		case Holm: // step-down: the largest over the prefix
			v := 0.0
			for j := 1; j <= i; j++ {
				v = math.Max(v, math.Min(1, float64(m-j+1)*sorted[j-1]))
			}
			adj[i-1] = v
		case Hochberg: // step-up: the smallest over the suffix
			v := 1.0
			for j := i; j <= m; j++ {
				v = math.Min(v, float64(m-j+1)*sorted[j-1])
			}
			adj[i-1] = v
		case BenjaminiHochberg:
			v := 1.0
			for j := i; j <= m; j++ {
				v = math.Min(v, float64(m)*sorted[j-1]/float64(j))
			}
			adj[i-1] = v
		case BenjaminiYekutieli:
			c := 0.0
			for k := 1; k <= m; k++ {
				c += 1 / float64(k)
			}
			v := 1.0
			for j := i; j <= m; j++ {
				v = math.Min(v, c*float64(m)*sorted[j-1]/float64(j))
			}
			adj[i-1] = v
		}
	}
	out := make([]float64, m)
	for k, v := range p {
		i := slices.Index(sorted, v) // the first of any ties: they share one value
		out[k] = adj[i]
	}
	return out
}

// bruteRejects runs the procedure of the paper at level alpha and reports
// which hypotheses it rejects: Holm's step-down (reject while
// p(i) ≤ α/(m − i + 1)), Hochberg's step-up (reject all up to the largest i
// with p(i) ≤ α/(m − i + 1)), Benjamini–Hochberg's step-up (largest i with
// p(i) ≤ iα/m), Benjamini–Yekutieli's (largest i with p(i) ≤ iα/(m·c(m)))
// and Bonferroni's (p ≤ α/m).
func bruteRejects(p []float64, a Adjustment, alpha float64) []bool {
	m := len(p)
	sorted := slices.Clone(p)
	slices.Sort(sorted)
	cut := math.Inf(-1) // reject exactly the p-values ≤ cut
	switch a {
	case Bonferroni:
		cut = alpha / float64(m)
	case Holm:
		for i := 1; i <= m && sorted[i-1] <= alpha/float64(m-i+1); i++ {
			cut = sorted[i-1]
		}
	default:
		c := 1.0
		if a == BenjaminiYekutieli {
			c = 0
			for k := 1; k <= m; k++ {
				c += 1 / float64(k)
			}
		}
		for i := m; i >= 1; i-- {
			limit := alpha / float64(m-i+1)
			if a != Hochberg {
				limit = float64(i) * alpha / (float64(m) * c)
			}
			if sorted[i-1] <= limit {
				cut = sorted[i-1]
				break
			}
		}
	}
	out := make([]bool, m)
	for k, v := range p {
		out[k] = v <= cut
	}
	return out
}

// randomPValues draws m p-values with ties: some rounded to two places,
// some repeated, some exactly 0 or 1, the rest spread over orders of
// magnitude.
func randomPValues(r *rand.Rand, m int) []float64 {
	p := make([]float64, m)
	for i := range p {
		switch k := r.IntN(10); {
		case k == 0 && i > 0:
			p[i] = p[r.IntN(i)]
		case k == 1:
			p[i] = math.Round(r.Float64()*100) / 100
		case k == 2:
			p[i] = float64(r.IntN(2))
		default:
			p[i] = math.Pow(10, -6*r.Float64())
		}
	}
	return p
}

func closeTo(a, b float64) bool { return math.Abs(a-b) <= 1e-12*math.Max(1, math.Abs(b)) }

func TestAdjustMatchesDefinitions(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 1979))
	for trial := range 400 {
		m := 1 + r.IntN(40)
		if trial%50 == 0 {
			m = 300
		}
		p := randomPValues(r, m)
		for _, a := range Adjustments() {
			got, err := Adjust(p, a)
			if err != nil {
				t.Fatal(err)
			}
			want := bruteAdjusted(p, a)
			for i := range p {
				if !closeTo(got[i], want[i]) {
					t.Fatalf("%s, m = %d, p = %v: adjusted[%d] = %v, the definition gives %v", a, m, p, i, got[i], want[i])
				}
			}
			for _, alpha := range []float64{0.0437, 0.1013, 0.2571} {
				rej := bruteRejects(p, a, alpha)
				for i := range p {
					if (got[i] <= alpha) != rej[i] {
						t.Fatalf("%s at α = %v, m = %d, p = %v: adjusted p %v of p %v, but the procedure rejects: %v",
							a, alpha, m, p, got[i], p[i], rej[i])
					}
				}
			}
		}
	}
}

func TestAdjustProperties(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 1988))
	for range 300 {
		m := 1 + r.IntN(60)
		p := randomPValues(r, m)
		adj := map[Adjustment][]float64{}
		for _, a := range Adjustments() {
			got, err := Adjust(p, a)
			if err != nil {
				t.Fatal(err)
			}
			adj[a] = got
			for i := range p {
				if got[i] < p[i] || got[i] > 1 {
					t.Fatalf("%s: adjusted %v of p %v: want p ≤ adjusted ≤ 1", a, got[i], p[i])
				}
				for j := range p {
					if p[i] <= p[j] && got[i] > got[j] {
						t.Fatalf("%s: p %v ≤ %v but adjusted %v > %v", a, p[i], p[j], got[i], got[j])
					}
				}
			}
		}
		for i := range p {
			chain := []Adjustment{BenjaminiHochberg, Hochberg, Holm, Bonferroni}
			for k := 1; k < len(chain); k++ {
				if adj[chain[k-1]][i] > adj[chain[k]][i] {
					t.Fatalf("p = %v: %s gives %v above %s's %v; want BH ≤ Hochberg ≤ Holm ≤ Bonferroni",
						p, chain[k-1], adj[chain[k-1]][i], chain[k], adj[chain[k]][i])
				}
			}
			if adj[BenjaminiHochberg][i] > adj[BenjaminiYekutieli][i] {
				t.Fatalf("BH %v above BY %v", adj[BenjaminiHochberg][i], adj[BenjaminiYekutieli][i])
			}
		}
	}
	for _, v := range []float64{0, 1e-300, 0.1, 0.3, 0.7, 1} {
		for _, a := range Adjustments() {
			got, _ := Adjust([]float64{v}, a)
			if got[0] != v {
				t.Errorf("%s with m = 1: adjusted %v of p %v; want p itself", a, got[0], v)
			}
		}
	}
}

// The example of Benjamini and Hochberg (1995, section 4.2; the fifteen
// p-values of a study of myocardial infarction as we recall them: memory):
// at 0.05 their procedure rejects four hypotheses where Bonferroni's (and
// Holm's and Hochberg's) reject three. The counts are checked against the
// step procedures computed here, so a wrong recollection fails the test
// only if it breaks the arithmetic.
func TestBenjaminiHochbergExample(t *testing.T) {
	p := []float64{0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459,
		0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.0000}
	for _, k := range []struct {
		a    Adjustment
		want int // memory for BH and Bonferroni; worked by hand for Holm and Hochberg
	}{{BenjaminiHochberg, 4}, {Bonferroni, 3}, {Holm, 3}, {Hochberg, 3}} {
		adj, err := Adjust(p, k.a)
		if err != nil {
			t.Fatal(err)
		}
		got, proc := 0, 0
		rej := bruteRejects(p, k.a, 0.05)
		for i := range adj {
			if adj[i] <= 0.05 {
				got++
			}
			if rej[i] {
				proc++
			}
		}
		if got != proc || got != k.want {
			t.Errorf("%s: %d adjusted p-values ≤ 0.05, the procedure rejects %d; the paper's example: %d", k.a, got, proc, k.want)
		}
	}
}

// Step-up against step-down, worked by hand: p = 0.01, 0.02, 0.03, 0.04,
// 0.05 at α = 0.05. Holm rejects only the first (0.02 > 0.05/4); Hochberg
// rejects all five (the largest, 0.05, is at most 0.05/1), every adjusted
// p-value being 0.05.
func TestHochbergStepsUp(t *testing.T) {
	p := []float64{0.03, 0.01, 0.05, 0.02, 0.04}
	holm, _ := Adjust(p, Holm)
	hoch, _ := Adjust(p, Hochberg)
	// Sorted: 5·0.01, 4·0.02, 3·0.03, 2·0.04, 1·0.05 = 0.05, 0.08, 0.09,
	// 0.08, 0.05; the running maximum: 0.05, 0.08, 0.09, 0.09, 0.09.
	wantHolm := []float64{0.09, 0.05, 0.09, 0.08, 0.09}
	for i := range p {
		if !closeTo(holm[i], wantHolm[i]) {
			t.Errorf("Holm at p = %v: %v, by hand %v", p[i], holm[i], wantHolm[i])
		}
		if !closeTo(hoch[i], 0.05) {
			t.Errorf("Hochberg at p = %v: %v, by hand 0.05", p[i], hoch[i])
		}
	}
}

func TestAdjustRejectsBadInput(t *testing.T) {
	for _, p := range [][]float64{{0.1, math.NaN()}, {-0.01}, {1.5}, {math.Inf(1)}} {
		if _, err := Adjust(p, Holm); !errors.Is(err, proportions.ErrAdjustment) {
			t.Errorf("Adjust(%v): %v, want ErrAdjustment", p, err)
		}
	}
	if _, err := Adjust([]float64{0.1}, Adjustment(9)); !errors.Is(err, proportions.ErrAdjustment) {
		t.Errorf("unknown adjustment: %v", err)
	}
	if got, err := Adjust(nil, Holm); err != nil || len(got) != 0 {
		t.Errorf("no p-values: %v, %v; want none and no error", got, err)
	}
}
