package operating

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
	"gonum.org/v1/gonum/stat/distuv"
)

// waldZ is a test-only unpooled z test of π1 − π2 = δ (reject when
// |d̂ − δ| ≥ z·se, se > 0), a simple asymptotic test whose size is known
// to exceed α at small n (common practice).
var waldZ = proportions.TestMethod{
	Key: "wald-z", Name: "Wald z (test only)", Scale: proportions.Difference, Margins: true,
	Run: func(c proportions.Counts, h proportions.Hypothesis) proportions.TestResult {
		p1, p2 := c.P1(), c.P2()
		se := math.Sqrt(p1*(1-p1)/float64(c.N1) + p2*(1-p2)/float64(c.N2))
		d := p1 - p2 - h.Null
		reject := false
		switch z1 := special.NormalQuantile(1 - h.Alpha()); h.Alternative {
		case proportions.Greater:
			reject = se > 0 && d >= z1*se
		case proportions.Less:
			reject = se > 0 && -d >= z1*se
		default:
			reject = se > 0 && math.Abs(d) >= h.Conf.Z*se
		}
		return proportions.TestResult{Reject: reject}
	},
}

// firstOnly rejects when x1 ≥ 7, whatever x2: its power is the upper tail
// of the first binomial, known in closed form from gonum's CDF.
var firstOnly = proportions.TestMethod{
	Key: "first-only", Name: "x1 ≥ 7 (test only)", Scale: proportions.Difference,
	Run: func(c proportions.Counts, h proportions.Hypothesis) proportions.TestResult {
		return proportions.TestResult{Reject: c.X1 >= 7}
	},
}

func hypothesis(t *testing.T, m proportions.TestMethod, opts ...proportions.Option) proportions.Hypothesis {
	t.Helper()
	s, err := proportions.NewSettings(opts...)
	if err != nil {
		t.Fatal(err)
	}
	h, err := m.Hypothesis(s)
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// rejections runs the decision on every outcome.
func rejections(d Decision, n1, n2 int) [][]bool {
	r := make([][]bool, n1+1)
	for x1 := range r {
		r[x1] = make([]bool, n2+1)
		for x2 := range r[x1] {
			r[x1][x2] = d.Rejects(proportions.Counts{X1: int64(x1), N1: int64(n1), X2: int64(x2), N2: int64(n2)})
		}
	}
	return r
}

// brutePower is the plain double sum with gonum's binomial probabilities.
func brutePower(reject [][]bool, pi1, pi2 float64) float64 {
	n1, n2 := len(reject)-1, len(reject[0])-1
	b1 := distuv.Binomial{N: float64(n1), P: pi1}
	b2 := distuv.Binomial{N: float64(n2), P: pi2}
	var p float64
	for x1 := 0; x1 <= n1; x1++ {
		for x2 := 0; x2 <= n2; x2++ {
			if reject[x1][x2] {
				p += binomProb(b1, x1) * binomProb(b2, x2)
			}
		}
	}
	return p
}

// TestPowerAgainstBruteForce compares Power, Decision.Power and the
// rejection region with the plain double sum, for registered tests and
// test-only ones, including an equivalence decision with two hypotheses.
func TestPowerAgainstBruteForce(t *testing.T) {
	n1, n2 := 12, 17
	var decisions []Decision
	for _, m := range append(proportions.Tests(), waldZ) {
		if m.TrialLimit > 0 && int64(n1+n2) > m.TrialLimit {
			continue
		}
		decisions = append(decisions, Decision{Test: m, Hypotheses: []proportions.Hypothesis{hypothesis(t, m)}})
		if m.Margins && m.Scale == proportions.Difference {
			decisions = append(decisions, Decision{Test: m, Hypotheses: []proportions.Hypothesis{
				hypothesis(t, m, proportions.WithNull(-0.2), proportions.WithAlternative(proportions.Greater), proportions.WithLevel(0.9)),
				hypothesis(t, m, proportions.WithNull(0.2), proportions.WithAlternative(proportions.Less), proportions.WithLevel(0.9)),
			}})
		}
	}
	// Power computes only the outcomes that matter at each pair of
	// rates, so few pairs keep the slow exact tests quick.
	rates := [][2]float64{{0.1, 0.6}, {0, 0.3}, {0.33, 0.41}}
	for _, d := range decisions {
		region, err := NewRejectionRegion(context.Background(), d, n1, n2)
		if err != nil {
			t.Fatal(err)
		}
		reject := rejections(d, n1, n2)
		for _, r := range rates {
			want := brutePower(reject, r[0], r[1])
			got, err := d.Power(n1, n2, r[0], r[1])
			if err != nil {
				t.Fatal(err)
			}
			fromRegion, _ := region.Power(r[0], r[1])
			if math.Abs(got-want) > 1e-13 || math.Abs(fromRegion-want) > 1e-13 {
				t.Errorf("%s (%d hypotheses) at %v: Power %.15g, region %.15g, brute force %.15g", d.Test.Key, len(d.Hypotheses), r, got, fromRegion, want)
			}
		}
		for x1 := 0; x1 <= n1; x1++ {
			for x2 := 0; x2 <= n2; x2++ {
				if region.Contains(x1, x2) != reject[x1][x2] {
					t.Fatalf("%s: region and test disagree at (%d, %d)", d.Test.Key, x1, x2)
				}
			}
		}
	}
}

// TestPowerClosedForm: a rule that depends on x1 only has the binomial
// upper tail as its power (gonum's distuv.Binomial CDF).
func TestPowerClosedForm(t *testing.T) {
	h := hypothesis(t, firstOnly)
	for _, pi1 := range []float64{0.2, 0.5, 0.77} {
		got, err := Power(firstOnly, 15, 40, h, pi1, 0.5)
		if err != nil {
			t.Fatal(err)
		}
		want := 1 - distuv.Binomial{N: 15, P: pi1}.CDF(6)
		if math.Abs(got-want) > 1e-13 {
			t.Errorf("π1 = %g: power %.15g, binomial tail %.15g", pi1, got, want)
		}
	}
}

// TestSizeOfExactTests: a test marked Exact keeps its size at or below α
// at every point of the null line (its defining property; Fisher 1935 for
// the conditional test, Barnard 1947 and Boschloo 1970 for the
// unconditional ones), while the Wald z test is liberal at small n
// (common practice).
func TestSizeOfExactTests(t *testing.T) {
	n1, n2 := 15, 12
	for _, m := range proportions.Tests() {
		if !m.Exact || (m.TrialLimit > 0 && int64(n1+n2) > m.TrialLimit) {
			continue
		}
		s, err := TypeIError(context.Background(), m, n1, n2, hypothesis(t, m), WithSteps(201))
		if err != nil {
			t.Fatal(err)
		}
		if s.Exceeds(1e-12) {
			t.Errorf("%s", s)
		}
	}
	s, err := TypeIError(context.Background(), waldZ, n1, n2, hypothesis(t, waldZ))
	if err != nil {
		t.Fatal(err)
	}
	if !s.Exceeds(0.01) {
		t.Errorf("the Wald z test should be liberal at this design: %s", s)
	}
	if len(s.Points) != 1001 || s.Points[0].Pi1 != 0 || s.Points[1000].Pi2 != 1 {
		t.Errorf("size curve runs from %v to %v over %d points", s.Points[0], s.Points[len(s.Points)-1], len(s.Points))
	}
}

// TestPowerBadInput: errors wrap the sentinels.
func TestPowerBadInput(t *testing.T) {
	h := hypothesis(t, waldZ)
	if _, err := Power(waldZ, 0, 5, h, 0.5, 0.5); !errors.Is(err, proportions.ErrNoTrials) {
		t.Errorf("n1 = 0: %v", err)
	}
	if _, err := Power(waldZ, 5, 5, h, 0.5, 2); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("π2 = 2: %v", err)
	}
	bad := h
	bad.Null = 0.3
	if _, err := Power(firstOnly, 5, 5, bad, 0.5, 0.5); !errors.Is(err, proportions.ErrUnsupported) {
		t.Errorf("margin on a no-margin test: %v", err)
	}
	if _, err := (Decision{Test: waldZ}).Power(5, 5, 0.5, 0.5); !errors.Is(err, proportions.ErrEmptyInput) {
		t.Errorf("no hypothesis: %v", err)
	}
}

// TestFisherPowerSciPy checks exact power and the largest actual size of
// Fisher's exact test at 60 per group against a SciPy 1.10.1 enumeration
// (scipy.stats.fisher_exact at every outcome; source and status in
// testdata/reference/coverage.json).
func TestFisherPowerSciPy(t *testing.T) {
	fisher, err := proportions.LookupTest("fisher-test")
	if err != nil {
		t.Skip("Fisher's test not registered")
	}
	h := hypothesis(t, fisher)
	for _, c := range loadReference(t) {
		if c.Method != "fisher-test" {
			continue
		}
		var got float64
		if c.Pi1 != nil {
			got, err = Power(fisher, c.N1, c.N2, h, *c.Pi1, *c.Pi2)
		} else {
			var s *TypeIErrorCurve
			s, err = TypeIError(context.Background(), fisher, c.N1, c.N2, h)
			if s != nil {
				got = s.Max
			}
		}
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-c.Value) > 1e-12 {
			t.Errorf("%s: %.15g, SciPy %.15g", c.ID, got, c.Value)
		}
	}
}
