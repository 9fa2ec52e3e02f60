//go:build !unix

package publish

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strconv"
	"strings"
	"time"
)

// lock creates the file path exclusively and writes the holder's process
// id, start time and command into it; an existing file means another
// holder. Without flock a holder that died leaves its file, so the
// message says to remove it when no bivar is running.
func lock(path, command string) (*os.File, error) {
	f, err := os.OpenFile(path, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if errors.Is(err, fs.ErrExist) {
		e := &BusyError{}
		b, _ := os.ReadFile(path)
		for _, line := range strings.Split(string(b), "\n") {
			k, v, _ := strings.Cut(line, "=")
			switch k {
			case "pid":
				e.PID, _ = strconv.Atoi(v)
			case "since":
				e.Since, _ = time.Parse(time.RFC3339, v)
			case "command":
				e.Command = v + " (if none is running, remove " + path + ")"
			}
		}
		return nil, e
	}
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(f, "pid=%d\nsince=%s\ncommand=%s\n", os.Getpid(), time.Now().UTC().Format(time.RFC3339), command)
	return f, nil
}

func unlock(f *os.File) error {
	cerr := f.Close()
	return errors.Join(os.Remove(f.Name()), cerr)
}
