//go:build unix

package segments

import "syscall"

// cpuSeconds is the process's user and system CPU time: on a shared
// machine the wall time of a benchmark says more about the neighbours
// than about the code, so the benchmarks report both.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return float64(ru.Utime.Nano()+ru.Stime.Nano()) / 1e9
}
