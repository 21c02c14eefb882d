package segments

import (
	"cmp"
	"encoding/json"
	"fmt"
	"math"
	"slices"

	"github.com/propscope/propscope/proportions"
)

// Adjustment is a published rule that adjusts the p-values of m tests for
// multiplicity. With the p-values sorted, p(1) ≤ … ≤ p(m), each rule gives
// the adjusted value p̃(i) of the i-th smallest; a segment rejects at level
// α after adjustment when p̃ ≤ α. Every rule is computed with one sort,
// O(m log m), and one pass.
type Adjustment int

const (
	// Holm: Holm S (1979). A simple sequentially rejective multiple test
	// procedure. Scandinavian Journal of Statistics 6:65–70. Step-down,
	// controls the family-wise error rate under any dependence:
	// p̃(i) = max over j ≤ i of min(1, (m − j + 1)·p(j)).
	Holm Adjustment = iota
	// Hochberg: Hochberg Y (1988). A sharper Bonferroni procedure for
	// multiple tests of significance. Biometrika 75:800–802. Step-up,
	// controls the family-wise error rate for independent (or positively
	// dependent) tests: p̃(i) = min over j ≥ i of min(1, (m − j + 1)·p(j)).
	Hochberg
	// BenjaminiHochberg: Benjamini Y, Hochberg Y (1995). Controlling the
	// false discovery rate: a practical and powerful approach to multiple
	// testing. Journal of the Royal Statistical Society B 57:289–300.
	// Step-up, controls the false discovery rate for independent tests:
	// p̃(i) = min over j ≥ i of min(1, m·p(j)/j).
	BenjaminiHochberg
	// BenjaminiYekutieli: Benjamini Y, Yekutieli D (2001). The control of
	// the false discovery rate in multiple testing under dependency. Annals
	// of Statistics 29:1165–1188. Benjamini–Hochberg with the harmonic sum
	// c(m) = 1 + 1/2 + … + 1/m, controlling the false discovery rate under
	// any dependence: p̃(i) = min over j ≥ i of min(1, c(m)·m·p(j)/j).
	BenjaminiYekutieli
	// Bonferroni: Dunn OJ (1961). Multiple comparisons among means. Journal
	// of the American Statistical Association 56:52–64, after Bonferroni's
	// inequality. Single-step, controls the family-wise error rate under any
	// dependence: p̃(i) = min(1, m·p(i)). The simultaneous intervals use its
	// level 1 − (1 − level)/m whatever the adjustment of the p-values.
	Bonferroni
)

// DefaultAdjustment is Holm's: it controls the family-wise error rate
// under any dependence between segments and is never less powerful than
// Bonferroni's.
const DefaultAdjustment = Holm

var adjustmentKeys = [...]string{"holm", "hochberg", "benjamini-hochberg", "benjamini-yekutieli", "bonferroni"}
var adjustmentNames = [...]string{"Holm", "Hochberg", "Benjamini–Hochberg", "Benjamini–Yekutieli", "Bonferroni"}
var adjustmentControls = [...]string{"family-wise error rate", "family-wise error rate", "false discovery rate", "false discovery rate",
	"family-wise error rate"}

// Adjustments lists every adjustment, Holm first.
func Adjustments() []Adjustment {
	return []Adjustment{Holm, Hochberg, BenjaminiHochberg, BenjaminiYekutieli, Bonferroni}
}

// Validate returns an error wrapping proportions.ErrAdjustment for an
// unknown value.
func (a Adjustment) Validate() error {
	if a < 0 || int(a) >= len(adjustmentKeys) {
		return fmt.Errorf("adjustment %d: %w; use Holm, Hochberg, BenjaminiHochberg, BenjaminiYekutieli or Bonferroni",
			int(a), proportions.ErrAdjustment)
	}
	return nil
}

// String returns the key: "holm", "hochberg", "benjamini-hochberg",
// "benjamini-yekutieli" or "bonferroni".
func (a Adjustment) String() string {
	if a.Validate() != nil {
		return fmt.Sprintf("adjustment(%d)", int(a))
	}
	return adjustmentKeys[a]
}

// Name returns the published name ("Benjamini–Hochberg").
func (a Adjustment) Name() string {
	if a.Validate() != nil {
		return a.String()
	}
	return adjustmentNames[a]
}

// Controls names the error rate the adjustment controls: "family-wise
// error rate" or "false discovery rate".
func (a Adjustment) Controls() string {
	if a.Validate() != nil {
		return ""
	}
	return adjustmentControls[a]
}

// MarshalJSON writes the key.
func (a Adjustment) MarshalJSON() ([]byte, error) {
	if err := a.Validate(); err != nil {
		return nil, err
	}
	return json.Marshal(a.String())
}

// UnmarshalJSON reads the key.
func (a *Adjustment) UnmarshalJSON(b []byte) error {
	var s string
	if err := json.Unmarshal(b, &s); err != nil {
		return err
	}
	for i, k := range adjustmentKeys {
		if k == s {
			*a = Adjustment(i)
			return nil
		}
	}
	return fmt.Errorf("adjustment %q: %w; use one of %v", s, proportions.ErrAdjustment, adjustmentKeys)
}

// pValue is what the adjustment keeps of a segment: its p-value and its
// position, 16 bytes.
type pValue struct {
	p     float64
	index int
}

// Adjust returns the adjusted p-values of p (in the order given) under the
// adjustment, with m = len(p). Every p-value must lie in [0, 1]; an error
// wrapping proportions.ErrAdjustment names the first that does not.
func Adjust(p []float64, a Adjustment) ([]float64, error) {
	if err := a.Validate(); err != nil {
		return nil, err
	}
	pairs := make([]pValue, len(p))
	for i, v := range p {
		if !(v >= 0 && v <= 1) {
			return nil, fmt.Errorf("p-value %d is %v: %w; p-values lie from 0 to 1", i+1, v, proportions.ErrAdjustment)
		}
		pairs[i] = pValue{v, i}
	}
	adjustPairs(pairs, a)
	out := make([]float64, len(p))
	for _, q := range pairs {
		out[q.index] = q.p
	}
	return out, nil
}

// adjustPairs sorts the pairs by p-value (ties by position, so the order
// is reproducible) and replaces each p-value with its adjusted value. Ties
// get equal adjusted values whatever their order: each rule's running max
// or min absorbs the differing factors of tied p-values.
func adjustPairs(pairs []pValue, a Adjustment) {
	slices.SortFunc(pairs, func(x, y pValue) int {
		if c := cmp.Compare(x.p, y.p); c != 0 {
			return c
		}
		return cmp.Compare(x.index, y.index)
	})
	m := len(pairs)
	fm := float64(m)
	switch a {
	case Bonferroni:
		for i := range pairs {
			pairs[i].p = math.Min(1, fm*pairs[i].p)
		}
	case Holm:
		run := 0.0
		for i := range pairs {
			run = math.Max(run, math.Min(1, float64(m-i)*pairs[i].p))
			pairs[i].p = run
		}
	case Hochberg:
		stepUp(pairs, func(j int) float64 { return float64(m - j + 1) })
	case BenjaminiHochberg:
		// m/j rounded is at most the whole number m − j + 1, so a product
		// with it never exceeds Hochberg's, and is exactly p at j = m.
		stepUp(pairs, func(j int) float64 { return fm / float64(j) })
	case BenjaminiYekutieli:
		cm := fm * harmonic(m)
		stepUp(pairs, func(j int) float64 { return cm / float64(j) })
	}
}

// stepUp sets p̃(i) = min over j ≥ i of min(1, factor(j)·p(j)) for sorted
// pairs, j counted from 1.
func stepUp(pairs []pValue, factor func(j int) float64) {
	run := 1.0
	for i := len(pairs) - 1; i >= 0; i-- {
		run = math.Min(run, factor(i+1)*pairs[i].p)
		pairs[i].p = run
	}
}

// harmonic returns 1 + 1/2 + … + 1/m, summed from the smallest term up so
// that the small terms are not lost.
func harmonic(m int) float64 {
	s := 0.0
	for k := m; k >= 1; k-- {
		s += 1 / float64(k)
	}
	return s
}
