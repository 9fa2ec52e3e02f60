package publish

import (
	"errors"

	"golang.org/x/sys/unix"
)

// exchange swaps the folders a and b in one renameat2(RENAME_EXCHANGE)
// call (Linux 3.15 and later). It returns errNoExchange where the kernel
// or the file system lacks the call.
func exchange(a, b string) error {
	err := unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
	if errors.Is(err, unix.ENOSYS) || errors.Is(err, unix.EINVAL) || errors.Is(err, unix.EOPNOTSUPP) {
		return errNoExchange
	}
	return err
}
