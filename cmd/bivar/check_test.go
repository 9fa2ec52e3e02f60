package main

import (
	"encoding/xml"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"bivar/internal/reference"
)

// anscombeI writes set I of Anscombe (1973), read from
// shared/reference/anscombe.csv, as a CSV of its own in dir (a temporary
// folder; the reference file itself is never copied into the project).
func anscombeI(t *testing.T, dir string) string {
	t.Helper()
	recs := reference.ReadCSV(t, reference.File(t, "anscombe.csv"))
	var b strings.Builder
	b.WriteString("x,y\n")
	for _, r := range recs[1:] {
		if r[0] == "I" {
			b.WriteString(r[1] + "," + r[2] + "\n")
		}
	}
	p := filepath.Join(dir, "anscombe-i.csv")
	writeFile(t, p, b.String())
	return p
}

// checkManifest writes a manifest with one study of Anscombe's set I and
// the given [study.expect] body.
func checkManifest(t *testing.T, expect string) string {
	t.Helper()
	dir := t.TempDir()
	anscombeI(t, dir)
	p := filepath.Join(dir, "bivar.toml")
	writeFile(t, p, `title = "Anscombe (1973) set I"

[[dataset]]
id   = "a1"
file = "anscombe-i.csv"

[[study]]
id      = "y-vs-x"
dataset = "a1"
x       = "x"
y       = "y"

[study.expect]
`+expect)
	return p
}

type junitDoc struct {
	Tests    int `xml:"tests,attr"`
	Failures int `xml:"failures,attr"`
	Suites   []struct {
		Cases []struct {
			Name    string    `xml:"name,attr"`
			Failure *struct{} `xml:"failure"`
		} `xml:"testcase"`
	} `xml:"testsuite"`
}

// Anscombe (1973), Am. Stat. 27(1):17-21, prints for set I n = 11,
// r = 0.82 and the line y = 3 + 0.5x; shared/reference/SOURCES.md gives
// r = 0.8164 and slope 0.500 computed from the published values. The
// passing expectations are set at half a unit of the last printed digit
// around those; the failing ones exclude them.
func TestCheck(t *testing.T) {
	passing := `direction    = "positive"
min_abs_r    = 0.8
r_within     = [0.815, 0.825]
slope_within = [0.4995, 0.5005]
max_p        = 0.01
min_n        = 11
`
	failing := `direction = "positive"
min_abs_r = 0.9
min_n     = 12
`
	t.Run("passes", func(t *testing.T) {
		m := checkManifest(t, passing)
		junit := filepath.Join(filepath.Dir(m), "junit.xml")
		summary := filepath.Join(filepath.Dir(m), "summary.md")
		code, stdout, stderr := call(t, "check", "--junit", junit, "--summary", summary, m)
		if code != exitOK {
			t.Fatalf("exit %d, want 0\n%s", code, stderr)
		}
		if stdout != "" {
			t.Errorf("check wrote to stdout: %q", stdout)
		}
		if !strings.Contains(stderr, "6 of 6 expectations held") {
			t.Errorf("stderr: %q", stderr)
		}
		doc := parseJUnit(t, junit)
		if doc.Tests != 6 || doc.Failures != 0 || len(doc.Suites) != 1 || len(doc.Suites[0].Cases) != 6 {
			t.Errorf("JUnit: %+v, want 6 cases, no failure", doc)
		}
		b, _ := os.ReadFile(summary)
		if !strings.Contains(string(b), "**Passed**: all 6 expectations held") {
			t.Errorf("summary:\n%s", b)
		}
		// check writes no report.
		if _, err := os.Stat(filepath.Join(filepath.Dir(m), "report")); err == nil {
			t.Error("check wrote a report folder")
		}
	})
	t.Run("fails", func(t *testing.T) {
		m := checkManifest(t, failing)
		junit := filepath.Join(filepath.Dir(m), "junit.xml")
		code, _, stderr := call(t, "check", m, "--junit", junit)
		if code != exitExpectation {
			t.Fatalf("exit %d, want 3\n%s", code, stderr)
		}
		// The key, which CI logs are searched for, and the gate in words.
		if !strings.Contains(stderr, "1 of 3 expectations held (2 failed)") ||
			!strings.Contains(stderr, `study "y-vs-x": expectation min_abs_r (correlation at least as strong as required) failed: `) {
			t.Errorf("stderr: %q", stderr)
		}
		doc := parseJUnit(t, junit)
		var failed []string
		for _, c := range doc.Suites[0].Cases {
			if c.Failure != nil {
				failed = append(failed, c.Name)
			}
		}
		if want := "min_abs_r (correlation at least as strong as required),min_n (enough complete rows)"; doc.Tests != 3 || strings.Join(failed, ",") != want {
			t.Errorf("JUnit: %d cases, failed %q; want 3 cases, failed %s", doc.Tests, failed, want)
		}
	})
	t.Run("bad input", func(t *testing.T) {
		m := checkManifest(t, "min_abs_rr = 0.5\n")
		junit := filepath.Join(filepath.Dir(m), "junit.xml")
		writeFile(t, junit, "stale")
		if code, _, stderr := call(t, "check", "--junit", junit, m); code != exitFailed || !strings.Contains(stderr, "min_abs_rr") {
			t.Errorf("unknown key: exit %d, stderr %q; want 1 naming the key", code, stderr)
		}
		// The stale JUnit file is replaced by one that reports the error.
		if doc := parseJUnit(t, junit); doc.Tests != 1 || doc.Failures != 0 {
			t.Errorf("JUnit after a failed run: %+v", doc)
		}
		if code, _, _ := call(t, "check", filepath.Join(t.TempDir(), "none.toml")); code != exitFailed {
			t.Errorf("missing manifest: exit %d, want 1", code)
		}
	})
	t.Run("wrong manifest argument", func(t *testing.T) {
		m := checkManifest(t, passing)
		dir := filepath.Dir(m)
		junit := filepath.Join(dir, "ci", "out", "junit.xml") // folders created
		cases := []struct {
			name, arg string
			want      []string
		}{
			{"folder", dir, []string{"is a folder: give the manifest file itself, such as " + m}},
			{"absent", filepath.Join(dir, "nope.toml"), []string{"nope.toml: no such file", "'bivar init DATA.csv' writes one"}},
		}
		for _, tc := range cases {
			code, _, stderr := call(t, "check", "--junit", junit, tc.arg)
			if code != exitFailed {
				t.Errorf("%s: exit %d, want 1", tc.name, code)
			}
			for _, w := range tc.want {
				if !strings.Contains(stderr, w) {
					t.Errorf("%s: stderr lacks %q:\n%s", tc.name, w, stderr)
				}
			}
			if doc := parseJUnit(t, junit); doc.Tests != 1 || len(doc.Suites) != 1 || len(doc.Suites[0].Cases) != 1 {
				t.Errorf("%s: JUnit %+v, want one error case", tc.name, doc)
			}
		}
		if code, _, stderr := call(t, "check", "--junit", dir, m); code != exitUsage || !strings.Contains(stderr, "is a folder: give a file name, such as "+filepath.Join(dir, "junit.xml")) {
			t.Errorf("--junit a folder: exit %d, %q", code, stderr)
		}
	})
	t.Run("study that did not run", func(t *testing.T) {
		// No expectations, but a study whose column is constant: exit 1
		// and an error case in the JUnit file.
		dir := t.TempDir()
		writeFile(t, filepath.Join(dir, "c.csv"), "x,y\n1,5\n2,5\n3,5\n4,5\n")
		m := filepath.Join(dir, "bivar.toml")
		writeFile(t, m, "[[dataset]]\nid = \"c\"\nfile = \"c.csv\"\n\n[[study]]\nid = \"flat\"\ndataset = \"c\"\nx = \"x\"\ny = \"y\"\n")
		junit := filepath.Join(dir, "junit.xml")
		code, _, stderr := call(t, "check", "--junit", junit, m)
		if code != exitFailed || !strings.Contains(stderr, "1 did not") {
			t.Errorf("exit %d, want 1; stderr %q", code, stderr)
		}
		doc := parseJUnit(t, junit)
		if doc.Tests != 1 || len(doc.Suites) != 1 || doc.Suites[0].Cases[0].Name != "run" {
			t.Errorf("JUnit %+v, want one case \"run\"", doc)
		}
	})
	t.Run("usage", func(t *testing.T) {
		if code, _, _ := call(t, "check"); code != exitUsage {
			t.Errorf("no manifest: exit %d, want 2", code)
		}
		if code, _, _ := call(t, "check", "--junit"); code != exitUsage {
			t.Errorf("--junit without a file: exit %d, want 2", code)
		}
	})
}

func parseJUnit(t *testing.T, path string) junitDoc {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var doc junitDoc
	if err := xml.Unmarshal(b, &doc); err != nil {
		t.Fatalf("JUnit XML does not parse: %v\n%s", err, b)
	}
	return doc
}

// TestCheckReportFolder: 'bivar check' given a report folder (its
// results.json written from the manifest m.toml) names that manifest; it
// said only "is a folder: give the manifest file itself".
func TestCheckReportFolder(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "report")
	r := runOf(1, 0.8, "strong")
	r.Manifest.File = "m.toml"
	writeResults(t, dir, r)
	code, _, stderr := call(t, "check", dir)
	want := dir + ` is a report folder, written from the manifest "m.toml": give that manifest`
	if code != exitFailed || !strings.Contains(stderr, want) {
		t.Errorf("bivar check %s: exit %d, stderr:\n%s\nwant exit 1 and %q", dir, code, stderr, want)
	}
}
