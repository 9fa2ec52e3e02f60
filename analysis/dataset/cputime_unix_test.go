//go:build unix

package dataset

import "syscall"

// cpuTime returns the CPU time (user + system) the process has used, in
// nanoseconds, or -1 when it cannot be read.
func cpuTime() int64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return -1
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}
