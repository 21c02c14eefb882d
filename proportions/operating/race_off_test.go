//go:build !race

package operating_test

// raceSlowdown scales the bound of the cancellation tests (1 without the
// race detector).
const raceSlowdown = 1
