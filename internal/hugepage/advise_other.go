//go:build !linux

package hugepage

// advise does nothing outside Linux.
func advise(p, size uintptr) {}
