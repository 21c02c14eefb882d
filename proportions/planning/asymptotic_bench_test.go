package planning

import (
	"testing"

	"github.com/propscope/propscope/proportions"
)

// Speed target (issue 6): every asymptotic planning calculation under 10 µs.

func benchDesigns() map[string]Plan {
	ni := NewPlan(NonInferiority, 0.85, 0.85)
	ni.Margin = -0.1
	eq := NewPlan(Equivalence, 0.52, 0.5)
	eq.Margin = 0.1
	ratio := NewPlan(NonInferiority, 0.55, 0.6)
	ratio.Scale, ratio.Margin, ratio.Allocation = proportions.Ratio, 0.8, 0.5
	cc := NewPlan(Equality, 0.6, 0.75)
	cc.ContinuityCorrection = true
	return map[string]Plan{"equality": NewPlan(Equality, 0.6, 0.75), "continuity": cc,
		"noninferiority": ni, "equivalence": eq, "ratio": ratio}
}

func BenchmarkSampleSize(b *testing.B) {
	for name, d := range benchDesigns() {
		b.Run(name, func(b *testing.B) {
			for range b.N {
				if _, err := SampleSize(d); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkPowerAt(b *testing.B) {
	for name, d := range benchDesigns() {
		b.Run(name, func(b *testing.B) {
			for range b.N {
				if _, err := Power(d, 150, 150); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkDetectableDifference(b *testing.B) {
	for name, d := range benchDesigns() {
		b.Run(name, func(b *testing.B) {
			for range b.N {
				if _, err := DetectableDifference(d, 1000, 1000); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
