package exact

import (
	"context"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// BenchmarkWaldSurface500 is the speed target of the engine: the exact
// coverage surface of the 95% Wald interval for n1 = n2 = 500 on the
// default 101×101 grid, including the 251,001 interval computations
// (target < 10 ms on 2 cores; scripts/bench-coverage.sh runs the
// vectorised NumPy enumeration beside it and prints the ratio).
func BenchmarkWaldSurface500(b *testing.B) {
	benchSurface(b, proportions.Wald, 500)
}

func benchSurface(b *testing.B, m proportions.IntervalMethod, n int) {
	d := Design{N1: n, N2: n, Level: 0.95}
	b.ReportAllocs()
	for b.Loop() {
		t, err := NewTable(context.Background(), m, d)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := t.Surface(context.Background()); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkWaldTable500 times the interval computations alone.
func BenchmarkWaldTable500(b *testing.B) {
	d := Design{N1: 500, N2: 500, Level: 0.95}
	for b.Loop() {
		if _, err := NewTable(context.Background(), proportions.Wald, d); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkMiettinenNurminenSurface500 is the second speed target: the
// Miettinen–Nurminen coverage surface at n1 = n2 = 500 including all
// 251,001 interval computations (target < 0.25 s on 2 cores).
func BenchmarkMiettinenNurminenSurface500(b *testing.B) {
	m, err := proportions.LookupInterval("miettinen-nurminen")
	if err != nil {
		b.Skip("Miettinen–Nurminen interval not registered")
	}
	benchSurface(b, m, 500)
}
