package operating

import (
	"context"
	"fmt"
	"math"

	"github.com/propscope/propscope/proportions"
)

// TypeIErrorPoint is the probability of rejecting at one pair of rates on the
// null line.
type TypeIErrorPoint struct {
	Pi1        float64 `json:"pi1"`
	Pi2        float64 `json:"pi2"`
	TypeIError float64 `json:"type_i_error"`
}

// TypeIErrorCurve is the actual type I error of a decision along its null line
// (π1 = π2 for a null of no effect; π1 − π2 = δ, π1/π2 = ρ or the odds
// ratio = ψ for a margin), compared with the nominal α.
type TypeIErrorCurve struct {
	Method     string                  `json:"method"`
	MethodName string                  `json:"method_name"`
	N1         int                     `json:"n1"`
	N2         int                     `json:"n2"`
	Null       float64                 `json:"null"`
	Scale      proportions.Scale       `json:"scale"`
	Alt        proportions.Alternative `json:"alternative"`
	// Alpha is the nominal level 1 − Conf.Level of the (first) hypothesis.
	Alpha float64 `json:"alpha"`
	// Max is the largest size on the line, at (MaxPi1, MaxPi2); Mean is
	// the average over the points.
	Max    float64           `json:"max"`
	MaxPi1 float64           `json:"max_pi1"`
	MaxPi2 float64           `json:"max_pi2"`
	Mean   float64           `json:"mean"`
	Points []TypeIErrorPoint `json:"points"`
}

// Exceeds reports whether the size somewhere on the line exceeds α by
// more than tol (a liberal test).
func (s *TypeIErrorCurve) Exceeds(tol float64) bool { return s.Max > s.Alpha+tol }

// String prints "Score at n1 = 30, n2 = 30: actual size up to 6.12% at π = (0.5, 0.5), mean 4.87%, nominal 5%".
func (s *TypeIErrorCurve) String() string {
	return fmt.Sprintf("%s at n1 = %d, n2 = %d (null %v, %s): actual size up to %s at (%g, %g), mean %s, nominal %s",
		s.MethodName, s.N1, s.N2, s.Null, s.Alt, percent(s.Max), s.MaxPi1, s.MaxPi2, percent(s.Mean), percent(s.Alpha))
}

// TypeIError computes the actual size of test t with hypothesis h for a study of
// n1 and n2 trials: the exact probability of rejecting at WithSteps points
// (default 1001) of the null line (see [EffectLine] with θ = h.Null). For a
// one-sided alternative the null is composite; its boundary is the line
// computed here, where the usual tests, whose power grows with the
// effect, reach their largest size. It reads WithSteps, WithProgress (rows
// of the rejection region done) and WithWorkers.
func TypeIError(ctx context.Context, t proportions.TestMethod, n1, n2 int, h proportions.Hypothesis, opts ...RunOption) (*TypeIErrorCurve, error) {
	return Decision{Test: t, Hypotheses: []proportions.Hypothesis{h}}.Size(ctx, n1, n2, opts...)
}

// Size is the actual size of the decision along the null line of its
// first hypothesis (see the function [TypeIError]). For an equivalence decision
// (two one-sided hypotheses) the null has two boundary lines; list the
// hypothesis whose line you want first, or call Size once per order.
func (d Decision) Size(ctx context.Context, n1, n2 int, opts ...RunOption) (*TypeIErrorCurve, error) {
	if err := d.Validate(); err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	k, err := cfg.stepsOr(1001)
	if err != nil {
		return nil, err
	}
	h := d.Hypotheses[0]
	line, err := EffectLine(d.Test.Scale, h.Null, k)
	if err != nil {
		return nil, err
	}
	r, err := NewRejectionRegion(ctx, d, n1, n2, opts...)
	if err != nil {
		return nil, err
	}
	s := &TypeIErrorCurve{Method: d.Test.Key, MethodName: d.Test.Name, N1: n1, N2: n2, Null: h.Null, Scale: d.Test.Scale,
		Alt: h.Alternative, Alpha: h.Alpha(), Max: math.Inf(-1), Points: make([]TypeIErrorPoint, k)}
	var total float64
	for i, p := range line {
		size, err := r.Power(p[0], p[1])
		if err != nil {
			return nil, err
		}
		s.Points[i] = TypeIErrorPoint{Pi1: p[0], Pi2: p[1], TypeIError: size}
		total += size
		if size > s.Max {
			s.Max, s.MaxPi1, s.MaxPi2 = size, p[0], p[1]
		}
	}
	s.Mean = total / float64(k)
	return s, nil
}
