//go:build unix

package dataset

import (
	"path/filepath"
	"syscall"
	"testing"
)

// TestReadFIFO: a named pipe is refused before it is opened (opening it
// would wait for a writer).
func TestReadFIFO(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "pipe.csv")
	if err := syscall.Mkfifo(path, 0o600); err != nil {
		t.Skipf("cannot make a named pipe here: %v", err)
	}
	want := path + ": cannot read the data file: it is a named pipe (FIFO), not a regular file; bivar reads CSV data only from regular files, so save the data to a file and name that"
	if _, err := Read(path, Options{}, []string{"x"}, nil); err == nil || err.Error() != want {
		t.Errorf("Read(FIFO) error = %v\nwant %s", err, want)
	}
	if _, err := Header(path, 0); err == nil || err.Error() != want {
		t.Errorf("Header(FIFO) error = %v\nwant %s", err, want)
	}
}
