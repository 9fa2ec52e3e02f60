package hugepage

import (
	"syscall"
	"unsafe"
)

// madvHugepage is MADV_HUGEPAGE of <asm-generic/mman-common.h>.
const madvHugepage = 14

// advise marks the whole huge pages of [p, p+size) MADV_HUGEPAGE. An
// error (a kernel without transparent huge pages answers EINVAL) leaves
// the memory as it was, which is all the advice could change.
func advise(p unsafe.Pointer, size uintptr) {
	lo, hi := alignedRange(uintptr(p), size)
	if hi > lo {
		syscall.Syscall(syscall.SYS_MADVISE, lo, hi-lo, madvHugepage)
	}
}
