//go:build unix

package publish

import (
	"errors"
	"fmt"
	"os"
	"syscall"
	"time"
)

// lock takes an exclusive flock on the file path, creating it, and writes
// the holder's process id, start time and command into it. A lock held
// by another process gives a *BusyError that names it. The kernel
// releases the lock when its holder dies, however it dies.
func lock(path, command string) (*os.File, error) {
	for try := range 100 {
		f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE, 0o644)
		if err != nil {
			return nil, err
		}
		if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
			if errors.Is(err, syscall.EWOULDBLOCK) {
				h := holder(f)
				f.Close()
				// A holder writes who it is just after it takes the lock:
				// read too soon, the file is empty or half written. Look
				// again shortly (within this loop's bound) so the message
				// can name it.
				if (h.PID == 0 || h.Since.IsZero() || h.Command == "") && try < 99 {
					time.Sleep(2 * time.Millisecond)
					continue
				}
				return nil, h
			}
			f.Close()
			return nil, err
		}
		// The previous holder removes the file as it lets go: a lock taken
		// on a file no longer at path locks nothing, so try again.
		fi, ferr := f.Stat()
		pi, perr := os.Stat(path)
		if ferr != nil || perr != nil || !os.SameFile(fi, pi) {
			f.Close()
			continue
		}
		info := holderInfo(command)
		if err := f.Truncate(0); err == nil {
			f.WriteAt([]byte(info), 0)
		}
		return f, nil
	}
	return nil, fmt.Errorf("%s keeps changing: another process is taking and releasing it", path)
}

// holder reads who holds the lock in f.
func holder(f *os.File) *BusyError {
	b := make([]byte, 512)
	n, _ := f.ReadAt(b, 0)
	return parseHolder(b[:n])
}

// unlock removes the lock file, while still holding the lock, and lets go.
func unlock(f *os.File) error {
	rerr := os.Remove(f.Name())
	return errors.Join(rerr, f.Close())
}
