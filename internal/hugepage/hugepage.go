// Package hugepage makes the large, short-lived buffers of a run (columns
// of 10⁶–10⁷ values) cheaper to touch. A fresh buffer costs one page
// fault per 4 KiB page on first write: about 40 000 faults for a 10⁶-row
// study, which measured a quarter of its CPU time on a virtual machine
// (each fault leaves the guest). Linux backs a region with 2 MiB pages,
// one fault each, where the region is advised MADV_HUGEPAGE and the
// system's transparent huge page mode is "madvise" or "always"
// (Documentation/admin-guide/mm/transhuge.rst in the Linux sources); the
// Go runtime advises only its own metadata so, and leaves the heap to the
// system's default, which on many distributions is "madvise".
//
// Make allocates a buffer on the Go heap as make does and advises the
// whole 2 MiB pages inside it, before anything writes to it. The advice is
// a hint: where the mode is "never", or the kernel has no free huge page,
// the memory is the same ordinary memory, so nothing depends on it. Other
// systems than Linux get make's buffer unchanged.
package hugepage

import "unsafe"

// minBytes is the smallest buffer advised: 2 MiB, so that the huge pages
// advised (the buffer rounded up to whole pages) are at most twice the
// buffer. A column of 10⁶ 32-bit indices (4 MB) took a thousand 4 KiB
// faults below the former 4 MiB bound; the kernel's zeroing of the
// rounded-up part of its last page costs less than those faults.
const minBytes = 2 << 20

// pageSize is the huge page size on amd64 and arm64 with 4 KiB base pages.
const pageSize = 2 << 20

// Make returns make([]T, n), advised for huge pages when it is at least
// 2 MiB: then its buffer is cut from one 4 MiB longer, so that it starts
// on a 2 MiB boundary and its last page is whole too, and every page of it
// is advised (the slack beyond is never written, so it costs address space
// only). T should hold no pointers: the advice does not care, but the
// buffers it is meant for are numbers.
func Make[T any](n int) []T {
	return makeCap[T](n, n)
}

// Empty returns make([]T, 0, c), advised as Make's.
func Empty[T any](c int) []T {
	return makeCap[T](0, c)
}

// Grow returns s with room for at least extra more elements, as
// slices.Grow does, a new buffer (of at least twice the old capacity)
// coming from Empty.
func Grow[T any](s []T, extra int) []T {
	if cap(s)-len(s) >= extra {
		return s
	}
	return append(Empty[T](max(len(s)+extra, 2*cap(s))), s...)
}

// makeCap is make([]T, n, c) (n ≤ c) advised as Make says.
func makeCap[T any](n, c int) []T {
	var zero T
	el := unsafe.Sizeof(zero)
	size := uintptr(c) * el
	if size < minBytes || el == 0 || pageSize%el != 0 {
		return make([]T, n, c)
	}
	// A large object starts on a page of the Go heap (8 KiB), so the
	// distance to the next 2 MiB boundary is a whole number of elements.
	s := make([]T, c+int(2*pageSize/el))
	p := uintptr(unsafe.Pointer(unsafe.SliceData(s)))
	lo, _ := alignedRange(p, pageSize)
	if (lo-p)%el != 0 {
		return s[:n:c]
	}
	off := int((lo - p) / el)
	advise(unsafe.Pointer(&s[off]), (size+pageSize-1)&^(pageSize-1))
	return s[off : off+n : off+c]
}

// alignedRange is the part of [p, p+size) made of whole pages of pageSize.
func alignedRange(p, size uintptr) (lo, hi uintptr) {
	lo = (p + pageSize - 1) &^ (pageSize - 1)
	hi = (p + size) &^ (pageSize - 1)
	if hi < lo {
		hi = lo
	}
	return lo, hi
}
