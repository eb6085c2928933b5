package ppp_test

import (
	"syscall"
	"time"
	"unsafe"
)

// threadCPU returns the CPU time of the calling OS thread (clock_gettime with
// CLOCK_THREAD_CPUTIME_ID, 3 on Linux): time the thread ran, not time it waited for a core
// the other users of a shared machine held. The caller locks its goroutine to the thread.
func threadCPU() time.Duration {
	var ts syscall.Timespec
	if _, _, e := syscall.Syscall(syscall.SYS_CLOCK_GETTIME, 3, uintptr(unsafe.Pointer(&ts)), 0); e != 0 {
		return 0
	}
	return time.Duration(ts.Nano())
}

const threadCPUClock = true
