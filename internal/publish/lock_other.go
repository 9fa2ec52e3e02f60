//go:build !unix

package publish

import (
	"errors"
	"io/fs"
	"os"
)

// lock creates the file path exclusively and writes the holder's process
// id, start time and command into it; an existing file means another
// holder. Without flock a holder that died leaves its file, so the
// message says to remove it when no bivar is running.
func lock(path, command string) (*os.File, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if errors.Is(err, fs.ErrExist) {
		b, _ := os.ReadFile(path)
		e := parseHolder(b)
		if e.Command != "" {
			e.Command += " (if none is running, remove " + path + ")"
		}
		return nil, e
	}
	if err != nil {
		return nil, err
	}
	f.WriteString(holderInfo(command))
	return f, nil
}

func unlock(f *os.File) error {
	cerr := f.Close()
	return errors.Join(os.Remove(f.Name()), cerr)
}
