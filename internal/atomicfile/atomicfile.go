// Package atomicfile writes a set of files so that a failure never leaves
// a half-written one and never destroys the previous version: every file is
// written and synced under a temporary name beside its final place, and
// only when all are complete are they renamed into place.
package atomicfile

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
)

// File is one file to write: a slash-separated name relative to the
// folder it is written into, and its bytes.
type File struct {
	Name string
	Data []byte
}

// Write writes files under dir, creating dir and any folder a name needs.
// A name given twice is an error, found before anything is written. On
// any error the temporary files are removed; files already renamed when
// a rename fails are whole (each rename is atomic), the rest keep their
// previous content.
func Write(dir string, files []File) (err error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("creating the folder %s: %w", dir, err)
	}
	type pending struct{ tmp, final string }
	var done []pending
	defer func() {
		if err != nil {
			for _, p := range done {
				os.Remove(p.tmp)
			}
		}
	}()
	names := make([]string, 0, len(files))
	for _, f := range files {
		if slices.Contains(names, f.Name) {
			return fmt.Errorf("file %s would be written twice", f.Name)
		}
		names = append(names, f.Name)
	}
	for _, f := range files {
		final := filepath.Join(dir, filepath.FromSlash(f.Name))
		sub := filepath.Dir(final)
		if err := os.MkdirAll(sub, 0o755); err != nil {
			return fmt.Errorf("creating %s: %w", sub, err)
		}
		tmp, err := os.CreateTemp(sub, "."+filepath.Base(final)+".*.tmp")
		if err != nil {
			return fmt.Errorf("writing %s: %w", final, err)
		}
		done = append(done, pending{tmp.Name(), final})
		_, werr := tmp.Write(f.Data)
		if werr == nil {
			werr = tmp.Sync()
		}
		cerr := tmp.Close()
		if werr = errors.Join(werr, cerr); werr != nil {
			return fmt.Errorf("writing %s: %w", final, werr)
		}
		if err := os.Chmod(tmp.Name(), 0o644); err != nil {
			return fmt.Errorf("writing %s: %w", final, err)
		}
	}
	for i, p := range done {
		if err := os.Rename(p.tmp, p.final); err != nil {
			// Files renamed so far are whole; remove the temporaries left.
			for _, q := range done[i:] {
				os.Remove(q.tmp)
			}
			done = nil
			return fmt.Errorf("putting %s in place: %w", p.final, err)
		}
	}
	return nil
}
