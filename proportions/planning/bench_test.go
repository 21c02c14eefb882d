package planning

import (
	"context"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// Speed target (issue 6): the smallest n with exact power ≥ 0.8 for
// π1 = 0.60 against π2 = 0.75, two-sided score test at α = 0.05, under 1 s.
// The whole search runs: from n1 = 1 to the default horizon.
func BenchmarkExactSampleSizeScore(b *testing.B) {
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		res, err := ExactSampleSize(context.Background(), d, scoreTest, Search{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.First.N1), "n1")
	}
}

// BenchmarkExactPowerScore is one exact power at n = 150 per group.
func BenchmarkExactPowerScore(b *testing.B) {
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		if _, err := ExactPower(context.Background(), d, scoreTest, 150, 150); err != nil {
			b.Fatal(err)
		}
	}
}

// Speed targets (issue 15): the same exact sample size with Barnard's and
// with Boschloo's test under 3 s each on the shared 2-core machine (4 min
// 37 s for Barnard's when the engine ran the test on every outcome), the
// whole scan from n1 = 1 to the horizon; the exact power curve over
// n1 = 20…200 under 10 s. `make bench-exact` prints the same figures as
// CPU time beside the targets.
func BenchmarkExactSampleSizeBarnard(b *testing.B) {
	benchExactSampleSize(b, proportions.BarnardTest)
}

func BenchmarkExactSampleSizeBoschloo(b *testing.B) {
	benchExactSampleSize(b, proportions.BoschlooTest)
}

func BenchmarkExactPowerCurveBarnard(b *testing.B) {
	benchExactPowerCurve(b, proportions.BarnardTest)
}

func BenchmarkExactPowerCurveBoschloo(b *testing.B) {
	benchExactPowerCurve(b, proportions.BoschlooTest)
}

func benchExactSampleSize(b *testing.B, m proportions.TestMethod) {
	b.Log("target: under 3 s per search (0.60 vs 0.75, two-sided 5%, 80% power)")
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		res, err := ExactSampleSize(context.Background(), d, m, Search{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.First.N1), "n1")
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)/3, "share_of_target")
}

func benchExactPowerCurve(b *testing.B, m proportions.TestMethod) {
	b.Log("target: under 10 s per curve (n1 = 20…200)")
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		if _, err := ExactPowerByTrials(context.Background(), d, m, 20, 200); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(b.Elapsed().Seconds()/float64(b.N)/10, "share_of_target")
}
