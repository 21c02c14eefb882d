//go:build !unix

package source

import "time"

// cpuTime is not measured off Unix; the benchmarks then report 0.
func cpuTime() time.Duration { return 0 }
