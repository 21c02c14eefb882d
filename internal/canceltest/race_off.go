//go:build !race

package canceltest

// raceSlowdown scales Bound (1 without the race detector).
const raceSlowdown = 1
