package planning

import (
	"context"
	"github.com/propscope/propscope/proportions"
	"testing"
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

func BenchmarkProbeSampleSizeBarnard(b *testing.B) {
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		res, err := ExactSampleSize(context.Background(), d, proportions.BarnardTest, Search{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.First.N1), "n1")
		b.ReportMetric(float64(res.Stable.N1), "stable")
	}
}
func BenchmarkProbeSampleSizeBoschloo(b *testing.B) {
	d := NewPlan(Equality, 0.60, 0.75)
	for range b.N {
		res, err := ExactSampleSize(context.Background(), d, proportions.BoschlooTest, Search{})
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(res.First.N1), "n1")
		b.ReportMetric(float64(res.Stable.N1), "stable")
	}
}
