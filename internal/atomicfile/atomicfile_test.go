package atomicfile

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestWrite(t *testing.T) {
	dir := t.TempDir()
	if err := Write(dir, []File{{"a.txt", []byte("one")}, {"sub/b.txt", []byte("two")}}); err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]string{"a.txt": "one", "sub/b.txt": "two"} {
		got, err := os.ReadFile(filepath.Join(dir, filepath.FromSlash(name)))
		if err != nil || string(got) != want {
			t.Errorf("%s = %q, %v; want %q", name, got, err, want)
		}
	}
	// A failure (here a name given twice) changes nothing and leaves no
	// temporary file behind.
	err := Write(dir, []File{{"a.txt", []byte("new")}, {"a.txt", []byte("again")}})
	if err == nil || !strings.Contains(err.Error(), "a.txt would be written twice") {
		t.Errorf("duplicate name: error %v", err)
	}
	// A file standing where a folder must go fails the whole set before
	// anything is renamed.
	if err := os.WriteFile(filepath.Join(dir, "c"), nil, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := Write(dir, []File{{"a.txt", []byte("new")}, {"c/d.txt", []byte("x")}}); err == nil {
		t.Error("a file in the way of a folder: no error")
	}
	if got, _ := os.ReadFile(filepath.Join(dir, "a.txt")); string(got) != "one" {
		t.Errorf("a.txt = %q after failed writes, want the old %q", got, "one")
	}
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		if strings.HasSuffix(e.Name(), ".tmp") {
			t.Errorf("temporary file %s left behind", e.Name())
		}
	}
}
