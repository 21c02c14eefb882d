package operating

import (
	"context"
	"math"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// TestWaldCoverageSciPy checks the exact coverage of the 95% Wald interval
// against SciPy 1.10.1 / NumPy full enumeration (values printed to 12
// significant digits; source and status in testdata/reference/coverage.json),
// through all three routes: the single-point enumeration, a Table point and
// the default 101×101 surface with its grid mean.
func TestWaldCoverageSciPy(t *testing.T) {
	tables := map[[2]int]*OutcomeLimits{}
	surfaces := map[[2]int]*Surface{}
	for _, c := range loadReference(t) {
		if c.Method != "wald" || c.Status != "reference-library" {
			continue
		}
		d := Design{N1: c.N1, N2: c.N2, Level: c.Level}
		key := [2]int{c.N1, c.N2}
		if tables[key] == nil {
			tab, err := NewOutcomeLimits(context.Background(), proportions.Wald, d)
			if err != nil {
				t.Fatal(err)
			}
			tables[key] = tab
			if surfaces[key], err = tab.Surface(context.Background()); err != nil {
				t.Fatal(err)
			}
		}
		const tol = 1e-11 // 12 significant digits
		if c.Pi1 == nil {
			if got := surfaces[key].Summary().Mean; math.Abs(got-c.Value) > tol {
				t.Errorf("%s: grid mean %.12g, SciPy %.12g", c.ID, got, c.Value)
			}
			continue
		}
		p, err := Coverage(proportions.Wald, d, *c.Pi1, *c.Pi2)
		if err != nil {
			t.Fatal(err)
		}
		q, err := tables[key].At(*c.Pi1, *c.Pi2)
		if err != nil {
			t.Fatal(err)
		}
		i, j := int(math.Round(*c.Pi1*100)), int(math.Round(*c.Pi2*100))
		s := surfaces[key].At(i, j)
		for name, got := range map[string]float64{"Coverage": p.Coverage, "Table.At": q.Coverage, "Surface": s.Coverage} {
			if math.Abs(got-c.Value) > tol {
				t.Errorf("%s via %s: %.12g, SciPy %.12g", c.ID, name, got, c.Value)
			}
		}
	}
}

// TestCoverageRecomputedValues checks the COV2 entries, independent
// recomputations (status "recomputed": a cross-implementation check, not a
// published number) printed to 6 significant digits.
func TestCoverageRecomputedValues(t *testing.T) {
	keys := map[string]string{"wald": "wald", "newcombe-hybrid-score": "newcombe"}
	for _, c := range loadReference(t) {
		if c.Status != "recomputed" {
			continue
		}
		m, err := proportions.LookupInterval(keys[c.Method])
		if err != nil {
			t.Logf("%s: method %q not registered yet; skipped", c.ID, keys[c.Method])
			continue
		}
		p, err := Coverage(m, Design{N1: c.N1, N2: c.N2, Level: c.Level}, *c.Pi1, *c.Pi2)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(p.Coverage-c.Value) > 5e-6 {
			t.Errorf("%s: %.7g, recomputed value %.7g", c.ID, p.Coverage, c.Value)
		}
	}
}
