package schema_test

import (
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters/simulate"
	"github.com/propscope/propscope/proportions/schema"
)

// checkSimulations validates simulations with every method, with a few
// methods on unequal clusters at equal rates, with hostile labels, and a
// sweep over the intracluster correlation.
func checkSimulations(t *testing.T, c *corpus) {
	c.check(schema.Simulation, mustSimulation(t))
	p := simulate.NewPlan(4, 0, 0.3, 0.3, 0.2)
	p.Design.Sizes = []int{3, 9, 1}
	p.Studies = 300
	p.Methods = []string{"wald", "zou-donner", "pearson-chi-square-test", "rao-scott-test"}
	p.By = `<b>"tray"</b>`
	p.Labels = proportions.Labels{First: "</script>", Second: "a\nb", Event: "`x`"}
	r, err := simulate.Run(t.Context(), p)
	if err != nil {
		t.Fatal(err)
	}
	c.check(schema.Simulation, r)
	c.check(schema.SimulationCurve, mustCurve(t))
}

func mustSimulation(t *testing.T) *simulate.Result {
	p := simulate.NewPlan(5, 8, 0.7, 0.5, 0.05)
	p.Studies = 200
	r, err := simulate.Run(t.Context(), p)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func mustCurve(t *testing.T) *simulate.Curve {
	p := simulate.NewPlan(3, 6, 0.9, 0.8, 0)
	p.Studies = 100
	c, err := simulate.Sweep(t.Context(), p, []float64{0, 0.1, 0.3})
	if err != nil {
		t.Fatal(err)
	}
	return c
}
