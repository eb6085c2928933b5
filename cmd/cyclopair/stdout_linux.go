package main

import "syscall"

// stdoutClosed reports whether the process was started with standard output closed
// (`cyclopair ... >&-`). The Go runtime reopens a closed descriptor 0–2 as /dev/null in
// read-write mode before main runs (runtime.checkfds), which hides the closed stdout; a
// shell's `> /dev/null` opens it write-only. So fd 1 being /dev/null opened read-write is
// taken as "closed". A caller that deliberately connects stdout to a read-write /dev/null
// (Python's subprocess.DEVNULL does) gets the same error: such a caller discards the
// output anyway and should pass a write-only /dev/null or a file.
func stdoutClosed() bool {
	var st syscall.Stat_t
	if err := syscall.Fstat(1, &st); err != nil {
		return true
	}
	if st.Mode&syscall.S_IFMT != syscall.S_IFCHR || st.Rdev != devNullRdev {
		return false
	}
	fl, _, errno := syscall.Syscall(syscall.SYS_FCNTL, 1, syscall.F_GETFL, 0)
	return errno == 0 && fl&syscall.O_ACCMODE == syscall.O_RDWR
}

// devNullRdev is the device number of /dev/null on Linux (major 1, minor 3).
const devNullRdev = 1<<8 | 3
