//go:build !linux

package hugepage

import "unsafe"

// advise does nothing outside Linux.
func advise(unsafe.Pointer, uintptr) {}
