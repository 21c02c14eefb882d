package planning

import (
	"errors"
	"math"
	"testing"

	"github.com/propscope/propscope/internal/special"
	"github.com/propscope/propscope/proportions"
)

// fleissEquality is the pooled equal-allocation sample size of Fleiss,
// Levin & Paik (2003, ch. 4), written out here from the textbook formula.
func fleissEquality(p1, p2, alpha, power float64) float64 {
	za, zb := special.NormalQuantile(1-alpha/2), special.NormalQuantile(power)
	pbar := (p1 + p2) / 2
	num := za*math.Sqrt(2*pbar*(1-pbar)) + zb*math.Sqrt(p1*(1-p1)+p2*(1-p2))
	return num * num / ((p1 - p2) * (p1 - p2))
}

// Clusters per group are ⌈n·(1 + (m − 1)ρ)/m⌉ (Donner, Birkett & Buck
// 1981) with n the independent-units size, computed here from the
// textbook formula; the result reaches the target power.
func TestClusteredSampleSizeInflatesByDesignEffect(t *testing.T) {
	for _, tc := range []struct {
		p1, p2, size, rho, cv float64
	}{{0.6, 0.4, 20, 0.05, 0}, {0.85, 0.7, 12, 0.1, 0}, {0.3, 0.15, 30, 0.02, 0.4}, {0.5, 0.3, 1, 0.3, 0}} {
		p := NewPlan(Equality, tc.p1, tc.p2)
		c := Clustering{Size: tc.size, Correlation: tc.rho, SizeVariation: tc.cv}
		res, err := ClusteredSampleSize(p, c)
		if err != nil {
			t.Fatal(err)
		}
		de := 1 + ((tc.cv*tc.cv+1)*tc.size-1)*tc.rho
		n := fleissEquality(tc.p1, tc.p2, p.Alpha, p.Power)
		want := max(int64(math.Ceil(n*de/tc.size-1e-9)), 2)
		if math.Abs(res.DesignEffect-de) > 1e-12 || res.Clusters1 != want || res.Clusters2 != want {
			t.Errorf("%+v: D = %v, clusters %d and %d; want D = %v and %d clusters (n = %.4f)", tc, res.DesignEffect, res.Clusters1, res.Clusters2, de, want, n)
		}
		if res.Power < p.Power-1e-9 {
			t.Errorf("%+v: power %v below the target %v", tc, res.Power, p.Power)
		}
		if tc.size == 1 && res.N1 != res.Independent.N1 {
			t.Errorf("clusters of one unit: %d units, independent units need %d", res.N1, res.Independent.N1)
		}
	}
}

// With ρ = 0 clustering costs nothing: the grid's power equals the power
// of independent units at clusters·m̄.
func TestClusteredPowerWithoutCorrelationIsIndependent(t *testing.T) {
	p := NewPlan(Equality, 0.6, 0.45)
	g, err := ClusteredPowerByClusters(p, 0, 0, []float64{5, 20}, []int64{4, 10, 30})
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range g.Lines {
		for _, pt := range l.Points {
			n := int64(l.ClusterSize) * pt.Clusters
			want, err := Power(p, n, n)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(pt.Power-want.Power) > 1e-12 {
				t.Errorf("%v clusters of %v: power %v, independent %v", pt.Clusters, l.ClusterSize, pt.Power, want.Power)
			}
		}
	}
	// With ρ > 0 power grows with clusters, and at a fixed total of units
	// smaller clusters give more power.
	g, _ = ClusteredPowerByClusters(p, 0.1, 0, []float64{5, 20}, []int64{4, 8, 16})
	for _, l := range g.Lines {
		for i := 1; i < len(l.Points); i++ {
			if l.Points[i].Power <= l.Points[i-1].Power {
				t.Errorf("size %v: power falls from %v to %v clusters", l.ClusterSize, l.Points[i-1].Clusters, l.Points[i].Clusters)
			}
		}
	}
	if g.Lines[0].Points[2].Power <= g.Lines[1].Points[0].Power { // 16×5 = 80 units vs 4×20 = 80 units
		t.Errorf("80 units in clusters of 5 (%v) not more powerful than in clusters of 20 (%v)", g.Lines[0].Points[2].Power, g.Lines[1].Points[0].Power)
	}
}

func TestClusteredPlanRefusesBadInput(t *testing.T) {
	p := NewPlan(Equality, 0.6, 0.4)
	for _, c := range []Clustering{{Size: 0.5}, {Size: 10, Correlation: -0.1}, {Size: 10, Correlation: 1}, {Size: 10, SizeVariation: -1},
		{Size: 1, SizeVariation: 0.5}, {Size: math.NaN()}} {
		if _, err := ClusteredSampleSize(p, c); !errors.Is(err, proportions.ErrPlan) {
			t.Errorf("%+v: %v", c, err)
		}
	}
	for _, k := range [][]int64{nil, {1}, {0}} {
		if _, err := ClusteredPowerByClusters(p, 0.05, 0, []float64{10}, k); !errors.Is(err, proportions.ErrPlan) {
			t.Errorf("clusters %v: %v", k, err)
		}
	}
	if _, err := ClusteredPowerByClusters(p, 0.05, 0, []float64{0}, []int64{5}); !errors.Is(err, proportions.ErrPlan) {
		t.Errorf("size 0: %v", err)
	}
	if _, err := ClusteredSampleSize(NewPlan(Equality, 0.4, 0.4), Clustering{Size: 10, Correlation: 0.05}); !errors.Is(err, proportions.ErrUnreachable) {
		t.Errorf("equal rates: %v", err)
	}
}

// TestClusteredSampleSizeBeyondAnyStudy: clusters of 10¹⁵ units (a size
// the clustering accepts) with a strong correlation need more units than
// an int64 holds; that is an error wrapping ErrTooLarge, not a study of
// 1 unit per group (the product wrapped around and was clamped to 1).
func TestClusteredSampleSizeBeyondAnyStudy(t *testing.T) {
	d := NewPlan(Equality, 0.5, 0.45)
	for _, c := range []Clustering{{Size: 1e15, Correlation: 0.99, SizeVariation: 5}, {Size: 1e14, Correlation: 0.99, SizeVariation: 5}} {
		res, err := ClusteredSampleSize(d, c)
		if !errors.Is(err, proportions.ErrTooLarge) {
			t.Errorf("%v: got %v (%d and %d units), want an error wrapping ErrTooLarge", c, err, res.N1, res.N2)
		}
	}
}
