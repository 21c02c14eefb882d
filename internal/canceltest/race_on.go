//go:build race

package canceltest

// raceSlowdown scales Bound: the race detector makes the code several
// times slower.
const raceSlowdown = 5
