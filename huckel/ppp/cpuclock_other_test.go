//go:build !linux

package ppp_test

import "time"

// threadCPU falls back to the wall clock where no thread CPU clock is wired up.
func threadCPU() time.Duration { return time.Duration(time.Now().UnixNano()) }

const threadCPUClock = false
