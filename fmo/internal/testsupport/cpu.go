package testsupport

import (
	"syscall"
	"time"
)

// CPUTime is the process's user+system CPU time. On this shared 2-core machine wall-clock
// ns/op swings with other jobs' load; CPU time consumed per operation does much less, so the
// benchmarks report both (pairs/s from wall clock, pairs/cpu-s from CPU time).
func CPUTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
