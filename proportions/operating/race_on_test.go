//go:build race

package operating_test

// raceSlowdown scales the bound of the cancellation tests: the race
// detector makes the code several times slower.
const raceSlowdown = 5
