package simulate

import (
	"context"
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
)

// MaxSweepPoints is the largest number of values of ρ in one sweep.
const MaxSweepPoints = 101

// Curve is a simulation repeated at several values of the intracluster
// correlation ρ, everything else held: how coverage and rejection rates
// change as the clusters grow more alike. Results[i] is the simulation at
// ρ = Correlations[i].
type Curve struct {
	Correlations []float64 `json:"correlations"`
	Results      []*Result `json:"results"`
}

// Sweep runs the plan at each value of the intracluster correlation ρ in
// values (the plan's own ρ is replaced). Each value draws from its own streams derived from the plan's
// seed, so the points are independent and each is reproducible. It reads
// operating.WithWorkers and operating.WithProgress (in studies over the
// whole sweep) and returns ctx's error within milliseconds of a cancel.
func Sweep(ctx context.Context, p Plan, values []float64, opts ...operating.RunOption) (*Curve, error) {
	if len(values) == 0 || len(values) > MaxSweepPoints {
		return nil, fmt.Errorf("%d values of the intracluster correlation: %w; a sweep takes 1 to %d", len(values), proportions.ErrSimulation, MaxSweepPoints)
	}
	runners := make([]*runner, len(values))
	for i, rho := range values {
		q := p
		q.Design.Correlation = rho
		r, err := newRunner(q)
		if err != nil {
			return nil, fmt.Errorf("intracluster correlation %d of the sweep: %w", i+1, err)
		}
		runners[i] = r
	}
	prog := newProgress(operating.ProgressOf(opts...), p.Studies*len(values))
	c := &Curve{Correlations: append([]float64(nil), values...)}
	for i, rho := range values {
		q := p
		q.Design.Correlation = rho
		res, err := runners[i].run(ctx, uint64(i+1), q, operating.WorkersOf(opts...), prog)
		if err != nil {
			return nil, err
		}
		c.Results = append(c.Results, res)
	}
	return c, nil
}

// String prints one line per value of ρ with every interval's coverage.
func (c *Curve) String() string {
	if len(c.Results) == 0 {
		return "no simulation"
	}
	var b strings.Builder
	p := c.Results[0].Plan
	fmt.Fprintf(&b, "Simulated coverage by intracluster correlation ρ, %d studies per point: %s\n", p.Studies, strings.SplitN(p.Design.String(), ", intracluster", 2)[0])
	for i, r := range c.Results {
		fmt.Fprintf(&b, "  ρ = %s:", strconv.FormatFloat(c.Correlations[i], 'g', 4, 64))
		for _, iv := range r.Intervals {
			fmt.Fprintf(&b, " %s %s;", iv.MethodName, pctf(iv.Coverage))
		}
		b.WriteString("\n")
	}
	return strings.TrimSuffix(b.String(), "\n")
}

// MarshalJSON writes the lists as arrays even when empty.
func (c Curve) MarshalJSON() ([]byte, error) {
	type plain Curve
	p := plain(c)
	p.Correlations, p.Results = jsonlist.NonNil(c.Correlations), jsonlist.NonNil(c.Results)
	return json.Marshal(p)
}
