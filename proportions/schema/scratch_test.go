package schema_test

import (
	"context"
	"encoding/json"
	"os"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/operating"
	"github.com/propscope/propscope/proportions/planning"
)

func dump(t *testing.T, name string, v any) {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		t.Fatal(name, err)
	}
	os.WriteFile("/tmp/schemasamples/"+name+".json", b, 0o644)
}

func TestScratch(t *testing.T) {
	os.MkdirAll("/tmp/schemasamples", 0o755)
	ctx := context.Background()
	c, _ := proportions.NewComparison(0, 5, 3, 4, proportions.Labels{})
	a, err := proportions.Analyze(c, proportions.WithScope(proportions.ScopeAll), proportions.WithYatesTest(true))
	if err != nil { t.Fatal(err) }
	dump(t, "analysis", a)
	nn, err := proportions.NumberNeededToTreat(c, proportions.Newcombe, proportions.HigherIsBetter)
	if err != nil { t.Fatal(err) }
	dump(t, "nnt", nn)
	p := planning.NewPlan(planning.NonInferiority, 0.8, 0.8)
	p.Margin = -0.1
	p.Dropout = 0.1
	ss, err := planning.SampleSize(p)
	if err != nil { t.Fatal(err) }
	dump(t, "samplesize", ss)
	pw, _ := planning.Power(p, 100, 100)
	dump(t, "power", pw)
	dt, err := planning.DetectableDifference(p, 100, 100)
	if err != nil { t.Fatal(err) }
	dump(t, "detectable", dt)
	pc, _ := planning.PowerByTrials(p, 10, 13)
	dump(t, "curve", pc)
	ep, err := planning.ExactPower(ctx, p, proportions.FarringtonManningTest, 20, 20)
	if err != nil { t.Fatal(err) }
	dump(t, "exactpower", ep)
	q := planning.NewPlan(planning.Equality, 0.7, 0.2)
	es, err := planning.ExactSampleSize(ctx, q, proportions.FisherTest, planning.Search{})
	if err != nil { t.Fatal(err) }
	dump(t, "exactss", es)
	d, _ := operating.NewDesign(5, 5, 0.95)
	pt, err := operating.Coverage(proportions.Katz, d, 0, 0.3)
	if err != nil { t.Fatal(err) }
	dump(t, "point", pt)
	tab, err := operating.NewOutcomeLimits(ctx, proportions.Katz, d)
	if err != nil { t.Fatal(err) }
	sf, err := tab.Surface(ctx, operating.WithGrid([]float64{0, 0.5}, []float64{0, 0.3, 1}))
	if err != nil { t.Fatal(err) }
	dump(t, "surface", sf)
	sl, err := tab.AlongFirst(ctx, 0.3, operating.WithSteps(3))
	if err != nil { t.Fatal(err) }
	dump(t, "slice", sl)
	h, _ := proportions.FisherTest.Hypothesis(proportions.Settings{Level: 0.95})
	ty, err := operating.TypeIError(ctx, proportions.FisherTest, 5, 5, h, operating.WithSteps(3))
	if err != nil { t.Fatal(err) }
	dump(t, "typei", ty)
	rec, err := operating.Recommend(ctx, proportions.Ratio, d, operating.WithGrid([]float64{0.2, 0.5}, []float64{0.3}))
	if err != nil { t.Fatal(err) }
	dump(t, "rec", rec)
}
