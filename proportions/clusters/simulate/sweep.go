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

// MaxSweepPoints is the largest number of ICC values of one sweep.
const MaxSweepPoints = 101

// Curve is a simulation repeated at several ICC values, everything else
// held: how coverage and rejection rates change as the clusters grow more
// alike. Results[i] is the simulation at ICC[i].
type Curve struct {
	ICC     []float64 `json:"icc"`
	Results []*Result `json:"results"`
}

// Sweep runs the plan at each ICC value in iccs (the plan's own ICC is
// replaced). Each value draws from its own streams derived from the plan's
// seed, so the points are independent and each is reproducible. It reads
// operating.WithWorkers and operating.WithProgress (in studies over the
// whole sweep) and returns ctx's error within milliseconds of a cancel.
func Sweep(ctx context.Context, p Plan, iccs []float64, opts ...operating.RunOption) (*Curve, error) {
	if len(iccs) == 0 || len(iccs) > MaxSweepPoints {
		return nil, fmt.Errorf("%d ICC values: %w; a sweep takes 1 to %d", len(iccs), proportions.ErrSimulation, MaxSweepPoints)
	}
	runners := make([]*runner, len(iccs))
	for i, icc := range iccs {
		q := p
		q.Design.ICC = icc
		r, err := newRunner(q)
		if err != nil {
			return nil, fmt.Errorf("ICC value %d: %w", i+1, err)
		}
		runners[i] = r
	}
	prog := newProgress(operating.ProgressOf(opts...), p.Studies*len(iccs))
	c := &Curve{ICC: append([]float64(nil), iccs...)}
	for i, icc := range iccs {
		q := p
		q.Design.ICC = icc
		res, err := runners[i].run(ctx, uint64(i+1), q, operating.WorkersOf(opts...), prog)
		if err != nil {
			return nil, err
		}
		c.Results = append(c.Results, res)
	}
	return c, nil
}

// String prints one line per ICC value with every interval's coverage.
func (c *Curve) String() string {
	if len(c.Results) == 0 {
		return "no simulation"
	}
	var b strings.Builder
	p := c.Results[0].Plan
	fmt.Fprintf(&b, "Simulated coverage by ICC, %d studies per point: %s\n", p.Studies, strings.SplitN(p.Design.String(), ", ICC", 2)[0])
	for i, r := range c.Results {
		fmt.Fprintf(&b, "  ICC %s:", strconv.FormatFloat(c.ICC[i], 'g', 4, 64))
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
	p.ICC, p.Results = jsonlist.NonNil(c.ICC), jsonlist.NonNil(c.Results)
	return json.Marshal(p)
}
