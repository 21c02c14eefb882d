package operating

import (
	"context"
	"encoding/json"
	"fmt"
	"slices"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// Surface is the exact coverage of one method over a grid of success
// rates: Pi1 × Pi2. The maps are stored row by row: the value at
// (Pi1[i], Pi2[j]) is at index i·len(Pi2) + j (use [Surface.At]). The
// fields have the meaning documented on [Point]; where the truth is not
// defined, Defined is false and the other maps hold NaN (null in JSON).
type Surface struct {
	Method     string            `json:"method"`
	MethodName string            `json:"method_name"`
	Scale      proportions.Scale `json:"scale"`
	Design     Design            `json:"design"`
	Pi1        []float64         `json:"pi1"`
	Pi2        []float64         `json:"pi2"`
	Coverage   []float64         `json:"coverage"`
	Below      []float64         `json:"below"`
	Above      []float64         `json:"above"`
	Width      []float64         `json:"width"`
	Unbounded  []float64         `json:"unbounded"`
	Defined    []bool            `json:"defined"`
}

// At returns the point at (Pi1[i], Pi2[j]).
func (s *Surface) At(i, j int) Point {
	k := i*len(s.Pi2) + j
	theta, _ := Truth(s.Scale, s.Pi1[i], s.Pi2[j])
	return Point{Pi1: s.Pi1[i], Pi2: s.Pi2[j], Truth: theta, Defined: s.Defined[k],
		Coverage: s.Coverage[k], Below: s.Below[k], Above: s.Above[k], Width: s.Width[k], Unbounded: s.Unbounded[k]}
}

// String prints the method, the design and the grid summary.
func (s *Surface) String() string {
	return fmt.Sprintf("%s, %s, %d×%d grid: %s", s.MethodName, s.Design, len(s.Pi1), len(s.Pi2), s.Summary())
}

// MarshalJSON writes the maps as arrays of rows (one row per π1), with
// NaN as null and infinities as "Infinity"; every list is an array, [] when
// empty, even in a surface built by hand.
func (s *Surface) MarshalJSON() ([]byte, error) {
	rows := func(v []float64) [][]proportions.JSONFloat {
		out := make([][]proportions.JSONFloat, len(s.Pi1))
		for i := range out {
			out[i] = make([]proportions.JSONFloat, len(s.Pi2))
			for j := range out[i] {
				out[i][j] = jf(v[i*len(s.Pi2)+j])
			}
		}
		return out
	}
	defined := make([][]bool, len(s.Pi1))
	for i := range defined {
		defined[i] = jsonlist.NonNil(s.Defined[i*len(s.Pi2) : (i+1)*len(s.Pi2)])
	}
	return json.Marshal(struct {
		Method     string                    `json:"method"`
		MethodName string                    `json:"method_name"`
		Scale      proportions.Scale         `json:"scale"`
		Design     Design                    `json:"design"`
		Pi1        []float64                 `json:"pi1"`
		Pi2        []float64                 `json:"pi2"`
		Coverage   [][]proportions.JSONFloat `json:"coverage"`
		Below      [][]proportions.JSONFloat `json:"below"`
		Above      [][]proportions.JSONFloat `json:"above"`
		Width      [][]proportions.JSONFloat `json:"width"`
		Unbounded  [][]proportions.JSONFloat `json:"unbounded"`
		Defined    [][]bool                  `json:"defined"`
		Summary    Summary                   `json:"summary"`
	}{s.Method, s.MethodName, s.Scale, s.Design, jsonlist.NonNil(s.Pi1), jsonlist.NonNil(s.Pi2), rows(s.Coverage), rows(s.Below), rows(s.Above),
		rows(s.Width), rows(s.Unbounded), defined, s.Summary()})
}

// Surface computes the exact coverage over a grid of success rates, by
// default π1, π2 ∈ {0, 0.01, …, 1} (101 × 101). It reads WithGrid,
// WithProgress (columns of π2 done out of len(Pi2)) and WithWorkers, and
// stops with ctx's error when ctx is cancelled.
//
// The work is shared by all points: each interval was computed once by
// NewTable, and the points are visited in order of their truth so that each
// row's run of covered outcomes moves a few steps between points (see the
// package documentation). Progress counts the points computed (about half
// the grid when mirror images are copied, see below).
func (t *OutcomeLimits) Surface(ctx context.Context, opts ...RunOption) (*Surface, error) {
	cfg := newConfig(opts)
	pi1, pi2 := cfg.pi1, cfg.pi2
	if pi1 == nil && pi2 == nil {
		pi1, pi2 = DefaultGrid(), DefaultGrid()
	}
	if err := validateGrid("π1", pi1); err != nil {
		return nil, err
	}
	if err := validateGrid("π2", pi2); err != nil {
		return nil, err
	}
	g1, g2 := len(pi1), len(pi2)
	s := &Surface{
		Method: t.method.Key, MethodName: t.method.Name, Scale: t.method.Scale, Design: t.design,
		Pi1: slices.Clone(pi1), Pi2: slices.Clone(pi2),
		Coverage: make([]float64, g1*g2), Below: make([]float64, g1*g2), Above: make([]float64, g1*g2),
		Width: make([]float64, g1*g2), Unbounded: make([]float64, g1*g2), Defined: make([]bool, g1*g2),
	}
	// A Symmetric difference method with n1 = n2 has the same coverage at
	// (π2, π1) as at (π1, π2), with the two sides exchanged (exchange the
	// groups: the truth and every interval change sign, exactly). On a
	// square grid only the points with i ≤ j are computed.
	mirrored := t.method.Symmetric && t.scale() == proportions.Difference && t.n1 == t.n2 && slices.Equal(pi1, pi2)
	pairs := make([]pair, 0, g1*g2)
	for i := range pi1 {
		for j := range pi2 {
			if !mirrored || i <= j {
				pairs = append(pairs, pair{int32(i), int32(j)})
			}
		}
	}
	points, err := t.evaluate(ctx, s.Pi1, s.Pi2, pairs, cfg)
	if err != nil {
		return nil, err
	}
	for k, p := range points {
		i, j := int(pairs[k].i), int(pairs[k].j)
		s.set(i*g2+j, p.Defined, p.Coverage, p.Below, p.Above, p.Width, p.Unbounded)
		if mirrored {
			s.set(j*g2+i, p.Defined, p.Coverage, p.Above, p.Below, p.Width, p.Unbounded)
		}
	}
	return s, nil
}

func (s *Surface) set(k int, defined bool, cov, below, above, width, unbounded float64) {
	s.Defined[k] = defined
	s.Coverage[k], s.Below[k], s.Above[k], s.Width[k], s.Unbounded[k] = cov, below, above, width, unbounded
}

func validateGrid(name string, v []float64) error {
	if len(v) == 0 {
		return fmt.Errorf("grid of %s: %w; give at least one success rate", name, proportions.ErrEmptyInput)
	}
	for _, p := range v {
		if err := validateRate(name, p); err != nil {
			return fmt.Errorf("grid of %s: %w", name, err)
		}
	}
	return nil
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
