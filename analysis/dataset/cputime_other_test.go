//go:build !unix

package dataset

// cpuTime is not measured on this system.
func cpuTime() int64 { return -1 }
