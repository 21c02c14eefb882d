package proportions

import (
	"math"
	"math/rand/v2"
	"strconv"
	"testing"
)

// TestDecimalMatchesStrconv checks the quick decimal formatting against
// Go's strconv (the standard library's correctly rounded conversion) on
// random values across the ranges the texts use, rounding ties and near
// ties, signed zeros and values outside the quick routes.
func TestDecimalMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	values := []float64{0, math.Copysign(0, -1), 0.05, -0.05, 0.15, 0.25, 0.35, 1.25, 2.5, 5, 95, 97.5, 99.9, 99.99,
		99.995, 99.9949999, 9.9995, 9.99949, 999.95, 1000, 0.1, 0.0001, 1e-7, 12.345, -12.345, 1e15, 1e20,
		math.Inf(1), math.Inf(-1), math.NaN(), 1e-4, 0.001, 0.00099999, 0.0009999999999, 0.01, 0.1, 0.99995, 0.99994, 0.5, 0.008045, 1e-5, 100 * (1 - 0.95), 100 * 0.975, 100 * (1 - 0.975), 100 * 0.999}
	for range 200_000 {
		switch rng.IntN(5) {
		case 4: // p-values
			values = append(values, math.Pow(10, -6*rng.Float64()))
		case 0: // percentage points and percentages
			values = append(values, 200*rng.Float64()-100)
		case 1: // near a tie at one decimal
			values = append(values, (float64(rng.IntN(20000)-10000)+0.5)/10*(1+(rng.Float64()-0.5)*1e-12))
		case 2: // levels and α as percentages
			values = append(values, 100*(1-math.Pow(10, -1-4*rng.Float64())))
		default: // four significant digits in 1 … 1000
			values = append(values, math.Pow(10, 3*rng.Float64()))
		}
	}
	for _, v := range values {
		if got, want := string(appendFixed1(nil, v)), strconv.FormatFloat(v, 'f', 1, 64); got != want {
			t.Fatalf("appendFixed1(%v) = %q, strconv gives %q", v, got, want)
		}
		if got, want := string(appendSignificant4(nil, v)), strconv.FormatFloat(v, 'g', 4, 64); got != want {
			t.Fatalf("appendSignificant4(%v) = %q, strconv gives %q", v, got, want)
		}
	}
}
