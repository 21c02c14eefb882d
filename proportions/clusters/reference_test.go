package clusters

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/propscope/propscope/proportions"
)

type scipyCase struct {
	Name             string     `json:"name"`
	Group1, Group2   [][2]int64 `json:"-"`
	RawGroup1        [][]int64  `json:"group1"`
	RawGroup2        [][]int64  `json:"group2"`
	Level            float64    `json:"level"`
	Ratio            float64    `json:"msc_over_msw"`
	N0               float64    `json:"n0"`
	ICC              float64    `json:"anova_icc"`
	SearleLower      float64    `json:"searle_lower"`
	SearleUpper      float64    `json:"searle_upper"`
	ClusterT         float64    `json:"cluster_t"`
	ClusterTP        float64    `json:"cluster_t_p"`
	ClusterTQuantile float64    `json:"cluster_t_quantile"`
}

func (c scipyCase) data(t *testing.T) Data {
	mk := func(prefix string, raw [][]int64) []Cluster {
		out := make([]Cluster, len(raw))
		for i, r := range raw {
			out[i] = Cluster{Value: fmt.Sprintf("%s%d", prefix, i+1), Events: r[0], Trials: r[1]}
		}
		return out
	}
	return mustData(t, mk("a", c.RawGroup1), mk("b", c.RawGroup2))
}

func readSciPy(t *testing.T) []scipyCase {
	b, err := os.ReadFile("../../testdata/reference/clusters-scipy.json")
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Checks []scipyCase `json:"checks"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Checks) == 0 {
		t.Fatal("no checks")
	}
	return doc.Checks
}

func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol*max(1, math.Abs(want)) }

// The ANOVA estimate and its Searle interval against SciPy 1.10.1's
// f_oneway (on group-centred outcomes) and F quantiles; the cluster-level
// t test against SciPy's ttest_ind (testdata/reference/clusters_scipy.py).
func TestAgainstSciPy(t *testing.T) {
	for _, c := range readSciPy(t) {
		d := c.data(t)
		s := Summarize(d)
		a := anova(s)
		if !near(a.between/a.within, c.Ratio, 1e-10) || !near(a.n0, c.N0, 1e-12) {
			t.Errorf("%s: MSC/MSW = %.12g, n0 = %.12g; SciPy %.12g, %.12g", c.Name, a.between/a.within, a.n0, c.Ratio, c.N0)
		}
		r := ANOVACorrelation(s, c.Level)
		if !r.Defined || !near(r.Estimate, c.ICC, 1e-10) || !near(r.Lower, c.SearleLower, 1e-8) || !near(r.Upper, c.SearleUpper, 1e-8) {
			t.Errorf("%s: ρ = %.12g (%.10g, %.10g); SciPy %.12g (%.10g, %.10g)", c.Name, r.Estimate, r.Lower, r.Upper, c.ICC, c.SearleLower, c.SearleUpper)
		}
		res, err := ClusterLevelTTest.Test(d, proportions.WithLevel(c.Level))
		if err != nil {
			t.Fatal(err)
		}
		if !near(res.Statistic, c.ClusterT, 1e-10) || !near(res.PValue, c.ClusterTP, 1e-8) {
			t.Errorf("%s: cluster-level t = %.12g, p = %.10g; SciPy %.12g, %.10g", c.Name, res.Statistic, res.PValue, c.ClusterT, c.ClusterTP)
		}
		iv, _ := ClusterLevelT.Interval(d, c.Level)
		if half := (iv.RawUpper - iv.RawLower) / 2; !near(half*c.ClusterT, c.ClusterTQuantile*iv.Estimate, 1e-9) {
			t.Errorf("%s: half-width %.12g is not t(1−α/2)·se with SciPy's quantile %.12g", c.Name, half, c.ClusterTQuantile)
		}
	}
}

// bruteClusters holds one group's clusters as plain numbers for the
// brute-force checks below, computed from the clusters, not the sums.
func bruteDesignEffect(cl []Cluster, rho float64) float64 {
	var num, n float64
	for _, k := range cl {
		num += float64(k.Trials) * (1 + float64(k.Trials-1)*rho)
		n += float64(k.Trials)
	}
	return num / n
}

// bruteRaoScott is Rao & Scott's (1992) design effect from its definition,
// cluster by cluster.
func bruteRaoScott(cl []Cluster) float64 {
	var x, n float64
	for _, k := range cl {
		x += float64(k.Events)
		n += float64(k.Trials)
	}
	p := x / n
	var ss float64
	for _, k := range cl {
		r := float64(k.Events) - p*float64(k.Trials)
		ss += r * r
	}
	m := float64(len(cl))
	return m / (m - 1) * ss / (n * n) * n / (p * (1 - p))
}

// bruteFleissCuzick is the pooled Fleiss–Cuzick kappa from its definition.
func bruteFleissCuzick(groups ...[]Cluster) float64 {
	var within, expected float64
	for _, cl := range groups {
		var x, n float64
		for _, k := range cl {
			x += float64(k.Events)
			n += float64(k.Trials)
			within += float64(k.Events) * float64(k.Trials-k.Events) / float64(k.Trials)
		}
		p := x / n
		expected += (n - float64(len(cl))) * p * (1 - p)
	}
	return 1 - within/expected
}

// The sums-based design effects, Rao–Scott test and Fleiss–Cuzick kappa
// against their definitions computed cluster by cluster.
func TestSumsAgainstDefinitions(t *testing.T) {
	for _, c := range readSciPy(t) {
		d := c.data(t)
		s := Summarize(d)
		rho := usableRho(ANOVACorrelation(s, 0.95).Estimate)
		for i, cl := range [][]Cluster{d.Group1, d.Group2} {
			g := []GroupSummary{s.Group1, s.Group2}[i]
			de := GroupDesignEffect(g, rho)
			if got, want := de.Value, bruteDesignEffect(cl, rho); !near(got, want, 1e-12) {
				t.Errorf("%s group %d: design effect %.15g, from its definition %.15g", c.Name, i+1, got, want)
			}
			// The coefficient-of-variation form (Eldridge, Ashby & Kerry
			// 2006) with the sizes' population standard deviation.
			var sum, sq float64
			for _, k := range cl {
				sum += float64(k.Trials)
			}
			mean := sum / float64(len(cl))
			for _, k := range cl {
				sq += (float64(k.Trials) - mean) * (float64(k.Trials) - mean)
			}
			cv := math.Sqrt(sq/float64(len(cl))) / mean
			if want := 1 + ((cv*cv+1)*mean-1)*rho; !near(de.Value, want, 1e-12) || !near(de.SizeVariation, cv, 1e-12) {
				t.Errorf("%s group %d: design effect %.15g (CV %.15g), CV form %.15g (CV %.15g)", c.Name, i+1, de.Value, de.SizeVariation, want, cv)
			}
			if got, want := raoScottDesignEffect(g), bruteRaoScott(cl); !near(got, want, 1e-10) {
				t.Errorf("%s group %d: Rao–Scott d = %.15g, from its definition %.15g", c.Name, i+1, got, want)
			}
		}
		d1, d2 := bruteRaoScott(d.Group1), bruteRaoScott(d.Group2)
		tot := d.Totals()
		want := pearsonX2(float64(tot.X1)/d1, float64(tot.N1)/d1, float64(tot.X2)/d2, float64(tot.N2)/d2)
		if res, _ := RaoScottTest.Test(d); !near(res.Statistic, want, 1e-10) {
			t.Errorf("%s: Rao–Scott X² = %.15g, Pearson on effective counts %.15g", c.Name, res.Statistic, want)
		}
		// Donner's X² from its definition with the design effects computed
		// cluster by cluster.
		c1, c2 := bruteDesignEffect(d.Group1, rho), bruteDesignEffect(d.Group2, rho)
		p1, p2 := float64(tot.X1)/float64(tot.N1), float64(tot.X2)/float64(tot.N2)
		p := float64(tot.X1+tot.X2) / float64(tot.N1+tot.N2)
		wantD := (float64(tot.N1)*(p1-p)*(p1-p)/c1 + float64(tot.N2)*(p2-p)*(p2-p)/c2) / (p * (1 - p))
		if res, _ := DonnerTest.Test(d); !near(res.Statistic, wantD, 1e-10) {
			t.Errorf("%s: Donner X² = %.15g, from its definition %.15g", c.Name, res.Statistic, wantD)
		}
		if got, want := FleissCuzickCorrelation(s).Estimate, bruteFleissCuzick(d.Group1, d.Group2); !near(got, want, 1e-12) {
			t.Errorf("%s: Fleiss–Cuzick %.15g, from its definition %.15g", c.Name, got, want)
		}
	}
}

// The fast t quantile against gonum's StudentsT.Quantile, at the degrees
// of freedom and levels a cluster-level analysis meets.
func TestTQuantileAgainstGonum(t *testing.T) {
	for _, df := range []float64{1, 2, 3, 5, 8, 14, 30, 98, 500, 10000} {
		for _, alpha := range []float64{0.5, 0.2, 0.1, 0.05, 0.01, 1e-4} {
			got := tQuantile(df, alpha)
			want := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(1 - alpha/2)
			if !near(got, want, 1e-9) {
				t.Errorf("df %v, α %v: %.15g, gonum %.15g", df, alpha, got, want)
			}
		}
	}
}

// The F quantiles from the beta solver against gonum's F.Quantile.
func TestFQuantilesAgainstGonum(t *testing.T) {
	for _, d := range [][2]float64{{1, 1}, {2, 30}, {6, 304}, {14, 1000}, {40, 12}, {200, 5000}} {
		for _, alpha := range []float64{0.5, 0.1, 0.05, 0.001} {
			lo, hi := fQuantiles(d[0], d[1], alpha)
			dist := distuv.F{D1: d[0], D2: d[1]}
			if wl, wh := dist.Quantile(alpha/2), dist.Quantile(1-alpha/2); !near(lo, wl, 1e-8) || !near(hi, wh, 1e-8) {
				t.Errorf("F(%v, %v), α %v: (%.12g, %.12g), gonum (%.12g, %.12g)", d[0], d[1], alpha, lo, hi, wl, wh)
			}
		}
	}
}
