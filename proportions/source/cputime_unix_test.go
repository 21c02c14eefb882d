//go:build unix

package source

import (
	"syscall"
	"time"
)

// cpuTime is the process's user and system CPU time so far: on a shared
// machine the wall time of a benchmark includes waiting for a core, and the
// CPU time says what the work itself costs.
func cpuTime() time.Duration {
	var u syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &u) != nil {
		return 0
	}
	return time.Duration(u.Utime.Nano() + u.Stime.Nano())
}
