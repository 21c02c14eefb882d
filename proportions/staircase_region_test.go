package proportions

import (
	"context"
	"slices"
	"testing"
)

// TestStaircaseRegion: the staircase walk of the interval search gives the
// same regions, run for run, as the table-by-table scan (buildRegion with
// zInRegion at every table), on many designs, nulls, thresholds and sides.
func TestStaircaseRegion(t *testing.T) {
	designs := [][2]int{{1, 1}, {1, 6}, {5, 3}, {10, 10}, {12, 29}, {40, 17}, {60, 60}}
	deltas := []float64{-0.9, -0.5, -0.2, -1e-17, 0.05, 0.3, 0.75}
	checked := 0
	for _, d := range designs {
		n1, n2 := d[0], d[1]
		for _, delta := range deltas {
			z := func(x1, x2 int) float64 {
				return exactScoreZ(float64(x1), float64(n1), float64(x2), float64(n2), delta)
			}
			// Thresholds: the statistics of a spread of tables (ties with
			// other tables included) and 0.
			var obs []float64
			for x1 := 0; x1 <= n1; x1 += max(1, n1/6) {
				for x2 := 0; x2 <= n2; x2 += max(1, n2/5) {
					obs = append(obs, z(x1, x2))
				}
			}
			obs = append(obs, 0)
			for _, zobs := range obs {
				for _, side := range []regionSide{sideGreater, sideLess, sideBoth} {
					got := staircaseRegion(context.Background(), n1, n2, z, zobs, side)
					want := buildRegion(context.Background(), n1, n2, func(x1, from int, part []bool) {
						for j := range part {
							part[j] = zInRegion(z(x1, from+j), zobs, side)
						}
					})
					if got.tables != want.tables || !slices.Equal(got.rowStart, want.rowStart) || !slices.Equal(got.runs, want.runs) {
						t.Fatalf("%d vs %d, δ = %v, z_obs = %v, side %d: staircase %v (%d tables), scan %v (%d tables)",
							n1, n2, delta, zobs, side, got.runs, got.tables, want.runs, want.tables)
					}
					checked++
				}
			}
		}
	}
	t.Logf("%d regions compared", checked)
}
