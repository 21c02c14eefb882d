package operating

import (
	"context"
	"fmt"
	"strings"

	"github.com/propscope/propscope/proportions"
)

// Slice is the exact behaviour of a method along a line of success rates:
// either at a fixed true effect (Along = "effect", Fixed = θ, varying π2)
// or at a fixed second rate (Along = "first", Fixed = π2, varying π1).
type Slice struct {
	Method     string            `json:"method"`
	MethodName string            `json:"method_name"`
	Scale      proportions.Scale `json:"scale"`
	Design     Design            `json:"design"`
	Along      string            `json:"along"`
	Fixed      float64           `json:"fixed"`
	Points     []Point           `json:"points"`
}

// String prints one line per point.
func (s *Slice) String() string {
	var b strings.Builder
	what := fmt.Sprintf("%s fixed at %g", s.Scale, s.Fixed)
	if s.Along == "first" {
		what = fmt.Sprintf("π2 fixed at %g", s.Fixed)
	}
	fmt.Fprintf(&b, "%s, %s, %s:\n", s.MethodName, s.Design, what)
	for _, p := range s.Points {
		fmt.Fprintf(&b, "  %s\n", p)
	}
	return b.String()
}

// AlongEffect evaluates the table along the line where the scale's true
// parameter equals θ (see [EffectLine]), at WithSteps points (default 101).
// It reads WithSteps, WithProgress and WithWorkers.
func (t *OutcomeLimits) AlongEffect(ctx context.Context, theta float64, opts ...RunOption) (*Slice, error) {
	cfg := newConfig(opts)
	k, err := cfg.stepsOr(101)
	if err != nil {
		return nil, err
	}
	pts, err := EffectLine(t.scale(), theta, k)
	if err != nil {
		return nil, err
	}
	return t.slice(ctx, "effect", theta, pts, cfg)
}

// AlongFirst evaluates the table at a fixed π2 with π1 running from 0 to 1
// at WithSteps points (default 101). It reads WithSteps, WithProgress and
// WithWorkers.
func (t *OutcomeLimits) AlongFirst(ctx context.Context, pi2 float64, opts ...RunOption) (*Slice, error) {
	if err := validateRate("π2", pi2); err != nil {
		return nil, err
	}
	cfg := newConfig(opts)
	k, err := cfg.stepsOr(101)
	if err != nil {
		return nil, err
	}
	pts := make([][2]float64, k)
	for i, p := range evenly(0, 1, k) {
		pts[i] = [2]float64{p, pi2}
	}
	return t.slice(ctx, "first", pi2, pts, cfg)
}

func (t *OutcomeLimits) slice(ctx context.Context, along string, fixed float64, pts [][2]float64, cfg config) (*Slice, error) {
	pi1, pi2 := make([]float64, len(pts)), make([]float64, len(pts))
	pairs := make([]pair, len(pts))
	for k, p := range pts {
		pi1[k], pi2[k] = p[0], p[1]
		pairs[k] = pair{int32(k), int32(k)}
	}
	points, err := t.evaluate(ctx, pi1, pi2, pairs, cfg)
	if err != nil {
		return nil, err
	}
	return &Slice{Method: t.method.Key, MethodName: t.method.Name, Scale: t.scale(), Design: t.design,
		Along: along, Fixed: fixed, Points: points}, nil
}
