//go:build !race

package planning

// raceSlowdown scales the bound of the cancellation tests (1 without the
// race detector).
const raceSlowdown = 1
