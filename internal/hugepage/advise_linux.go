package hugepage

import "syscall"

// madvHugepage is MADV_HUGEPAGE of <asm-generic/mman-common.h>.
const madvHugepage = 14

// advise marks [p, p+size) MADV_HUGEPAGE (p and size multiples of the
// page size). Parts of the range that are not mapped are skipped (the
// call then answers ENOMEM); an error (a kernel without transparent huge
// pages answers EINVAL) leaves the memory as it was, which is all the
// advice could change.
func advise(p, size uintptr) {
	syscall.Syscall(syscall.SYS_MADVISE, p, size, madvHugepage)
}
