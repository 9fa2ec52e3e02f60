package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf8"
)

// hostileCSV has a group column whose values hold invalid UTF-8 and a
// terminal escape sequence, read as text as they stand.
const hostileCSV = "temp,hard,line\n" +
	"1,2.1,g\xff\n2,2.9,g\xff\n3,4.2,g\xff\n4,4.8,g\xff\n5,6.1,g\xff\n6,6.8,g\xff\n" +
	"1,1.2,h\x1b[2J\n2,2.2,h\x1b[2J\n3,2.8,h\x1b[2J\n4,4.1,h\x1b[2J\n5,5.2,h\x1b[2J\n6,5.9,h\x1b[2J\n"

// hostileManifest gives labels and a title holding an OSC-8 hyperlink, a
// carriage return, DEL and a C1 control, all legal in TOML strings.
const hostileManifest = `title = "T\u001b]8;;http://evil.example/\u001b\\click\u001b]8;;\u001b\\"
[[dataset]]
id = "d"
file = "d.csv"
labels = { temp = "Temp\r\u001b[2K", hard = "Hard\u007f\u0085" }
[[study]]
id = "s"
dataset = "d"
x = "temp"
y = "hard"
group = "line"
notes = "see \u001b[31mred\u001b[0m"
[study.expect]
direction = "negative"
`

// TestHostileTextInEveryOutput runs, checks and diffs a project whose
// names hold control characters and invalid UTF-8: no file written and
// nothing printed may carry them raw (cleantext is applied on the way out
// of every writer and of the terminal streams).
func TestHostileTextInEveryOutput(t *testing.T) {
	dir := t.TempDir()
	writeFile(t, filepath.Join(dir, "d.csv"), hostileCSV)
	m := filepath.Join(dir, "m.toml")
	writeFile(t, m, hostileManifest)
	out := filepath.Join(dir, "report")
	var printed []string
	code, so, se := call(t, "run", "-o", out, m)
	if code != exitExpectation {
		t.Fatalf("bivar run: exit %d, want 3 (the expectation fails)\n%s", code, se)
	}
	printed = append(printed, so, se)
	_, so, se = call(t, "check", "--junit", filepath.Join(dir, "ci", "junit.xml"), "--summary", filepath.Join(dir, "ci", "summary.md"), m)
	printed = append(printed, so, se)
	again := filepath.Join(dir, "again", "results.json")
	if b, err := os.ReadFile(filepath.Join(out, "results.json")); err != nil || os.MkdirAll(filepath.Dir(again), 0o755) != nil || os.WriteFile(again, b, 0o644) != nil {
		t.Fatal("copying results.json:", err)
	}
	_, so, se = call(t, "diff", "-o", filepath.Join(dir, "diff"), out, again)
	printed = append(printed, so, se)
	if !strings.Contains(se+printed[1], "␛") {
		t.Errorf("stderr shows no ␛ for the escape character:\n%s", printed[1])
	}
	for i, p := range printed {
		if bad := raw(p); bad != "" {
			t.Errorf("printed text %d holds %s:\n%q", i, bad, p)
		}
	}
	var files int
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() || strings.HasSuffix(p, ".csv") || strings.HasSuffix(p, ".toml") {
			return err
		}
		files++
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		if bad := raw(string(b)); bad != "" {
			t.Errorf("%s holds %s", p, bad)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	// report.html, report.md, results.json, 2 figures, junit.xml,
	// summary.md, diff.html, diff.md, diff.json
	if files < 10 {
		t.Errorf("%d files written, want at least 10", files)
	}
}

// raw names the first byte a reader or terminal would act on: invalid
// UTF-8, a control character other than tab and line feed, DEL or a C1
// control; "" when there is none.
func raw(s string) string {
	if !utf8.ValidString(s) {
		return "invalid UTF-8"
	}
	for _, r := range s {
		if r < 0x20 && r != '\t' && r != '\n' || r >= 0x7f && r <= 0x9f {
			return fmt.Sprintf("control character %U", r)
		}
	}
	return ""
}
