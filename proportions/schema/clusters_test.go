package schema_test

import (
	"fmt"
	"testing"

	"github.com/propscope/propscope/proportions"
	"github.com/propscope/propscope/proportions/clusters"
	"github.com/propscope/propscope/proportions/planning"
	"github.com/propscope/propscope/proportions/schema"
)

// clustersOf makes a group of clusters from (events, trials) pairs.
func clustersOf(prefix string, counts ...[2]int64) []clusters.Cluster {
	out := make([]clusters.Cluster, len(counts))
	for i, c := range counts {
		out[i] = clusters.Cluster{Value: fmt.Sprintf("%s%d", prefix, i+1), Events: c[0], Trials: c[1]}
	}
	return out
}

// checkClusters validates clustered analyses that reach every warning: a
// strongly clustered trial with few trays, trays more alike than chance
// (a negative estimate), trays of one seed (ρ not estimable), many
// clusters, hostile labels and a one-sided test.
func checkClusters(t *testing.T, c *corpus) {
	labels := proportions.Labels{First: "coated", Second: "plain", Event: "germinated"}
	var many1, many2 [][2]int64
	for i := 0; i < 12; i++ {
		many1 = append(many1, [2]int64{int64(10 + i%3), 15})
		many2 = append(many2, [2]int64{int64(8 + i%4), 12 + int64(i%2)})
	}
	for _, k := range []struct {
		by     string
		labels proportions.Labels
		g1, g2 []clusters.Cluster
		opts   []proportions.Option
	}{
		{"tray", labels, clustersOf("c", [2]int64{19, 20}, [2]int64{12, 20}, [2]int64{18, 20}), clustersOf("p", [2]int64{10, 20}, [2]int64{16, 20}, [2]int64{8, 20}), nil},
		{"tray", labels, clustersOf("c", [2]int64{5, 10}, [2]int64{5, 10}, [2]int64{5, 10}), clustersOf("p", [2]int64{3, 10}, [2]int64{3, 10}), nil},
		{"pot", labels, clustersOf("c", [2]int64{1, 1}, [2]int64{1, 1}, [2]int64{0, 1}), clustersOf("p", [2]int64{0, 1}, [2]int64{1, 1}), nil},
		{"batch", labels, clustersOf("c", many1...), clustersOf("p", many2...), []proportions.Option{proportions.WithAlternative(proportions.Greater)}},
		{`<b>tray</b>`, proportions.Labels{First: `"a"`, Second: "</script>", Event: "*x*"}, clustersOf("<i>", [2]int64{3, 4}, [2]int64{0, 5}), clustersOf("&", [2]int64{2, 2}, [2]int64{1, 3}), nil},
	} {
		d, err := clusters.New(k.by, k.labels, k.g1, k.g2)
		if err != nil {
			t.Fatal(err)
		}
		a, err := clusters.Analyze(d, k.opts...)
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.Clusters, a)
		c.check(schema.Analysis, a.Naive)
	}
	checkClusteredPlanning(t, c)
}

func mustClustered(t *testing.T) clusters.Analysis {
	d, err := clusters.New("tray", proportions.Labels{}, clustersOf("a", [2]int64{3, 9}, [2]int64{7, 9}), clustersOf("b", [2]int64{2, 8}, [2]int64{1, 8}))
	if err != nil {
		t.Fatal(err)
	}
	a, err := clusters.Analyze(d)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// checkClusteredPlanning validates clustered plans with equal and unequal
// cluster sizes, drop-out and an allocation ratio, and their power grids.
func checkClusteredPlanning(t *testing.T, c *corpus) {
	p := planning.NewPlan(planning.Equality, 0.6, 0.4)
	q := planning.NewPlan(planning.NonInferiority, 0.8, 0.8)
	q.Margin, q.Dropout, q.Allocation = -0.1, 0.1, 2
	for _, plan := range []planning.Plan{p, q} {
		for _, cl := range []planning.Clustering{{Size: 20, Correlation: 0.05}, {Size: 8.5, Correlation: 0, SizeVariation: 0.4}} {
			res, err := planning.ClusteredSampleSize(plan, cl)
			if err != nil {
				t.Fatal(err)
			}
			c.check(schema.ClusteredSampleSize, res)
		}
		g, err := planning.ClusteredPowerByClusters(plan, 0.05, 0.2, []float64{5, 20, 50}, []int64{2, 5, 10, 40})
		if err != nil {
			t.Fatal(err)
		}
		c.check(schema.ClusteredPower, g)
	}
}

func mustClusteredPlan(t *testing.T) planning.ClusteredSizeResult {
	r, err := planning.ClusteredSampleSize(planning.NewPlan(planning.Equality, 0.6, 0.4), planning.Clustering{Size: 10, Correlation: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func mustClusteredGrid(t *testing.T) planning.ClusteredPowerGrid {
	g, err := planning.ClusteredPowerByClusters(planning.NewPlan(planning.Equality, 0.6, 0.4), 0.1, 0, []float64{10}, []int64{4})
	if err != nil {
		t.Fatal(err)
	}
	return g
}
