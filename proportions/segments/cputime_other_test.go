//go:build !unix

package segments

import "math"

// cpuSeconds is not measured off Unix.
func cpuSeconds() float64 { return math.NaN() }
