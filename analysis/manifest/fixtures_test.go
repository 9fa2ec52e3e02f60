package manifest

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestFixtures(t *testing.T) {
	t.Parallel()
	// Guard the table: every fixture must exist, or nothing gets tested.
	cases := []struct {
		file   string
		detail string // whole Detail() output; "" means Load must succeed
	}{
		{"good.toml", ""},
		{"also-in-forms.toml", ""},
		{"unknown-key.toml", "testdata/unknown-key.toml:6:1: study \"shrinkage-vs-melt\" has no y: add y = \"…\" (the column of the response)\n" +
			"    6 | [[study]]\n" +
			"      | ^\n" +
			"testdata/unknown-key.toml:10:2: unknown key \"study.yy\" — did you mean \"study.y\"?\n" +
			"   10 |  yy      = \"shrinkage\"\n" +
			"      |  ^\n"},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			t.Parallel()
			path := filepath.Join("testdata", c.file)
			if _, err := os.Stat(path); err != nil {
				t.Fatal(err)
			}
			_, err := Load(path)
			if c.detail == "" {
				if err != nil {
					t.Fatalf("Load(%s): %v", c.file, err)
				}
				return
			}
			var es Errors
			if !errors.As(err, &es) {
				t.Fatalf("Load(%s) error = %v, want Errors", c.file, err)
			}
			if got := es.Detail(); got != c.detail {
				t.Errorf("Detail:\ngot\n%s\nwant\n%s", got, c.detail)
			}
		})
	}
}

func TestAlsoInForms(t *testing.T) {
	t.Parallel()
	m, err := Load("testdata/also-in-forms.toml")
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ x, y string }{{"[degF]", ""}, {"[degF],K", ""}, {"", "1"}}
	for i, w := range want {
		a := m.Studies[i].AlsoIn
		if strings.Join(a.X, ",") != w.x || strings.Join(a.Y, ",") != w.y {
			t.Errorf("study %d AlsoIn = %+v, want x %q y %q", i, a, w.x, w.y)
		}
	}
}

func TestLoadMissingFile(t *testing.T) {
	t.Parallel()
	_, err := Load("testdata/no-such.toml")
	if err == nil || !errors.Is(err, os.ErrNotExist) {
		t.Errorf("Load(no-such.toml) error = %v, want one wrapping os.ErrNotExist", err)
	}
}

// FuzzManifest: decoding never panics, every failure is an Errors value of
// *Error whose Detail renders, and line numbers lie inside the source.
func FuzzManifest(f *testing.F) {
	seeds, _ := filepath.Glob("testdata/*.toml")
	for _, s := range seeds {
		b, err := os.ReadFile(s)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Add([]byte(head + study + "also_in = { x = 3 }\n"))
	f.Add([]byte("a.b.c = 1\n[x.\"y z\"]\n'q' = '''\nmulti\n'''\n[[study]]\n[study.expect]\n"))
	f.Add([]byte("notes = \"\"\"\nx = 1\n\"\"\"\"\"\n[[dataset]]\nunits = { a = \"m\" }\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		m, err := Parse("fuzz.toml", data, "testdata")
		if err == nil {
			if m == nil {
				t.Fatal("nil manifest without error")
			}
			return
		}
		var es Errors
		if !errors.As(err, &es) || len(es) == 0 {
			t.Fatalf("error %v (%T) is not a non-empty Errors", err, err)
		}
		lines := strings.Count(string(data), "\n") + 1
		for _, e := range es {
			if e.File != "fuzz.toml" || e.Line < 0 || e.Line > lines || e.Msg == "" {
				t.Errorf("bad error %+v (source has %d lines)", e, lines)
			}
			_ = e.Detail()
		}
	})
}
