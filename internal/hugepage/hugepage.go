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
// whole heap arenas that hold it (the 64 MiB units in which the runtime
// maps its heap), not only the buffer (a buffer of 16 MiB or more: its own
// whole huge pages, see ownPagesBytes). The runtime clears a reused
// buffer before make returns, so advice given then comes too late for
// that buffer's pages if they were never touched before (a freed buffer's
// memory counts as used whether or not it was written); advice on the
// arena is there before any later buffer in it is cleared or written.
// Measured on a 10⁶-row run (one study, medians of 13 runs alternated
// with the former advice of each buffer's own pages): about 11 000 page
// faults before, 3 500 after, 0.21 s of system CPU time before, 0.11 s
// after, and a peak of 115 MB instead of 130 (a buffer no longer comes
// with 4 MiB of slack for its alignment). At 10⁷ rows, where buffers
// fill arenas, the arenas' advice raised the peak (ownPagesBytes).
//
// The advice is a hint: where the mode is "never", or the kernel has no
// free huge page, the memory is the same ordinary memory, so nothing
// depends on it. Other systems than Linux get make's buffer unchanged.
package hugepage

import "unsafe"

// minBytes is the smallest buffer whose arenas Make advises: a buffer of
// 256 KiB or more is worth the system call (a microsecond or two against
// the 64 faults of its own pages alone).
const minBytes = 256 << 10

// arenaSize is the unit in which the Go runtime maps its heap on 64-bit
// Linux (heapArenaBytes in runtime/malloc.go); an arena holds nothing but
// the heap. (On 32-bit systems the arenas are smaller, and Make gives no
// advice there.)
const arenaSize = 64 << 20

// ownPagesBytes is the smallest buffer advised on its own whole huge
// pages only (pageSize each), not on its arenas: a quarter of an arena.
// Such a buffer fills most of the arenas it spans, and advice on the rest
// of them backs the small objects the heap keeps there with huge pages
// too: at 10⁷ rows (one study, columns of 80 MB) the peak passed 1 GB in
// 2 of 8 runs with the arenas advised (1 078 and 1 088 MiB), and stayed
// at 732 to 814 MiB in 16 runs so (with one task slot fewer, see
// analysis.taskSlots).
const ownPagesBytes = arenaSize / 4

// pageSize is the huge page size on amd64 and arm64 with 4 KiB base pages.
const pageSize = 2 << 20

// Make returns make([]T, n), its arenas advised for huge pages when it
// takes at least minBytes. T should hold no pointers: the advice does not
// care, but the buffers it is meant for are numbers.
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
	s := make([]T, n, c)
	if size := uintptr(c) * unsafe.Sizeof(zero); size >= minBytes && unsafe.Sizeof(uintptr(0)) == 8 {
		p := uintptr(unsafe.Pointer(unsafe.SliceData(s)))
		lo, hi := p&^(arenaSize-1), (p+size+arenaSize-1)&^(arenaSize-1)
		if size >= ownPagesBytes {
			lo, hi = (p+pageSize-1)&^(pageSize-1), (p+size)&^(pageSize-1)
		}
		advise(lo, hi-lo)
	}
	return s
}
