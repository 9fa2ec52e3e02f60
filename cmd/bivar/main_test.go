package main

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite testdata/usage.golden")

// call runs the command line and returns its exit status and streams.
func call(t *testing.T, args ...string) (code int, stdout, stderr string) {
	t.Helper()
	var out, errb bytes.Buffer
	code = run(context.Background(), args, &out, &errb)
	return code, out.String(), errb.String()
}

// TestUsage keeps `bivar help` and testdata/usage.golden in step: the
// golden file is the reviewed text of the help.
func TestUsage(t *testing.T) {
	code, out, _ := call(t, "help")
	if code != exitOK {
		t.Fatalf("bivar help: exit %d, want 0", code)
	}
	golden := filepath.Join("testdata", "usage.golden")
	if *update {
		if err := os.WriteFile(golden, []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(golden)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if out != string(want) {
		t.Errorf("bivar help differs from %s (go test -update rewrites it):\n%s", golden, out)
	}
	if !strings.Contains(out, "bivar diff old/results.json new/results.json") {
		t.Error("help lacks the diff example")
	}
}

func TestUsageErrors(t *testing.T) {
	cases := []struct {
		name   string
		args   []string
		code   int
		stderr string // a fragment the message must contain
	}{
		{"no-arguments", nil, exitUsage, "Usage:"},
		{"unknown-command", []string{"rnu"}, exitUsage, `bivar: unknown command "rnu". Run 'bivar help'.`},
		{"help-unknown", []string{"help", "rnu"}, exitUsage, `unknown command "rnu"`},
		{"run-no-manifest", []string{"run"}, exitUsage, "want one manifest, got 0 arguments"},
		{"run-two-manifests", []string{"run", "a.toml", "b.toml"}, exitUsage, "want one manifest, got 2 arguments"},
		{"run-bad-flag", []string{"run", "-x", "a.toml"}, exitUsage, "bivar run: flag provided but not defined: -x\nusage: bivar run [-o DIR] [--replace] MANIFEST\nRun 'bivar help run' for details.\n"},
		{"run-folder", []string{"run", t.TempDir()}, exitFailed, "is a folder: give the manifest file itself"},
		{"run-missing-file", []string{"run", filepath.Join(t.TempDir(), "absent.toml")}, exitFailed, "absent.toml"},
		{"version-argument", []string{"version", "x"}, exitUsage, "takes no arguments"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := call(t, tc.args...)
			if code != tc.code {
				t.Errorf("bivar %s: exit %d, want %d; stderr:\n%s", strings.Join(tc.args, " "), code, tc.code, stderr)
			}
			if !strings.Contains(stderr, tc.stderr) {
				t.Errorf("bivar %s: stderr lacks %q:\n%s", strings.Join(tc.args, " "), tc.stderr, stderr)
			}
		})
	}
}

func TestHelpFlag(t *testing.T) {
	for _, c := range commands() {
		if c.Run == nil {
			continue
		}
		code, stdout, stderr := call(t, c.Name, "-h")
		if code != exitOK {
			t.Errorf("bivar %s -h: exit %d, want 0", c.Name, code)
		}
		if !strings.HasPrefix(stdout, "usage: "+c.Usage) || stderr != "" {
			t.Errorf("bivar %s -h: want the help on stdout and nothing on stderr; stdout:\n%s\nstderr:\n%s", c.Name, stdout, stderr)
		}
	}
}

func TestVersion(t *testing.T) {
	code, out, _ := call(t, "version")
	if code != exitOK || !strings.HasPrefix(out, "bivar ") {
		t.Errorf("bivar version: exit %d, output %q", code, out)
	}
}

func TestParseFlagsInterleaved(t *testing.T) {
	fs := newFlagSet("run")
	o := fs.String("o", "", "")
	if _, ok := parseFlags(fs, []string{"m.toml", "-o", "out"}, io.Discard, io.Discard); !ok {
		t.Fatal("parse failed")
	}
	if *o != "out" || fs.NArg() != 1 || fs.Arg(0) != "m.toml" {
		t.Errorf("-o=%q args=%q, want out [m.toml]", *o, fs.Args())
	}
}

// TestRunKeepsEarlierReport: a run in which no study can run (here the
// data file has a header and no rows) writes nothing, so the report of an
// earlier good run stays as it was.
func TestRunKeepsEarlierReport(t *testing.T) {
	dir := t.TempDir()
	manifest := filepath.Join(dir, "m.toml")
	data := filepath.Join(dir, "d.csv")
	write := func(name, text string) {
		t.Helper()
		if err := os.WriteFile(name, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write(manifest, "title = \"keep (invented data)\"\n[[dataset]]\nid = \"d\"\nfile = \"d.csv\"\n[[study]]\nid = \"s\"\ndataset = \"d\"\nx = \"a\"\ny = \"b\"\n")
	write(data, "a,b\n1,2\n2,3\n3,5\n4,4\n")
	if code, _, stderr := call(t, "run", manifest); code != exitOK {
		t.Fatalf("first run: exit %d\n%s", code, stderr)
	}
	results := filepath.Join(dir, "report", "results.json")
	before, err := os.ReadFile(results)
	if err != nil {
		t.Fatal(err)
	}
	write(data, "a,b\n")
	code, _, stderr := call(t, "run", manifest)
	if code != exitFailed || !strings.Contains(stderr, "no study ran; nothing written") {
		t.Errorf("second run: exit %d, want %d and a message saying nothing was written; stderr:\n%s", code, exitFailed, stderr)
	}
	after, err := os.ReadFile(results)
	if err != nil || !bytes.Equal(before, after) {
		t.Errorf("the earlier results.json was changed or removed (err %v)", err)
	}
}

// TestExitStatusDocumented keeps the README and the commands' help true
// to the exit statuses a signal gives.
func TestExitStatusDocumented(t *testing.T) {
	readme, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"130 stopped by SIGINT", "143 stopped by SIGTERM"} {
		if !strings.Contains(string(readme), want) {
			t.Errorf("README.md lacks %q", want)
		}
	}
	for _, name := range []string{"run", "check", "diff"} {
		_, out, _ := call(t, "help", name)
		out = strings.Join(strings.Fields(out), " ")
		for _, want := range []string{fmt.Sprintf("%d after SIGINT", exitInterrupted), fmt.Sprintf("%d after SIGTERM", exitTerminated)} {
			if !strings.Contains(out, want) {
				t.Errorf("bivar help %s lacks %q", name, want)
			}
		}
	}
}

// TestHelpMatchesDashH checks that 'bivar help COMMAND' shows what
// 'bivar COMMAND -h' shows, options included, and that run's and check's
// help point to docs/manifest.md and name every expectation key the
// manifest documents.
func TestHelpMatchesDashH(t *testing.T) {
	for _, c := range commands() {
		if c.Run == nil {
			continue
		}
		_, help, _ := call(t, "help", c.Name)
		_, dashH, _ := call(t, c.Name, "-h")
		if help != dashH {
			t.Errorf("bivar help %s:\n%s\ndiffers from bivar %s -h:\n%s", c.Name, help, c.Name, dashH)
		}
	}
	_, runHelp, _ := call(t, "help", "run")
	if !strings.Contains(runHelp, "Options:\n  -o DIR") {
		t.Errorf("bivar help run lists no options:\n%s", runHelp)
	}
	doc, err := os.ReadFile(filepath.Join("..", "..", "docs", "manifest.md"))
	if err != nil {
		t.Fatal(err)
	}
	keys := regexp.MustCompile("`study\\.expect\\.([a-z_]+)`").FindAllStringSubmatch(string(doc), -1)
	if len(keys) < 8 {
		t.Fatalf("docs/manifest.md names %d expectation keys", len(keys))
	}
	for _, name := range []string{"run", "check"} {
		_, out, _ := call(t, "help", name)
		out = strings.Join(strings.Fields(out), " ")
		if !strings.Contains(out, "docs/manifest.md") {
			t.Errorf("bivar help %s does not point to docs/manifest.md", name)
		}
		for _, k := range keys {
			if !strings.Contains(out, k[1]) {
				t.Errorf("bivar help %s does not list the expectation key %s", name, k[1])
			}
		}
	}
}

// TestHelpOptionSpelling checks that each command's usage line and its
// list of options name the same options, spelled alike ("-o", "--replace"),
// so that what the help shows can be typed as shown.
func TestHelpOptionSpelling(t *testing.T) {
	inUsage := regexp.MustCompile(`\[(-{1,2}[a-z][a-z-]*)`)
	inList := regexp.MustCompile(`(?m)^  (-{1,2}[a-z][a-z-]*)`)
	for _, c := range commands() {
		if c.Run == nil {
			continue
		}
		_, help, _ := call(t, "help", c.Name)
		var usage, listed []string
		for _, m := range inUsage.FindAllStringSubmatch(c.Usage, -1) {
			usage = append(usage, m[1])
		}
		if _, opts, ok := strings.Cut(help, "\nOptions:\n"); ok {
			for _, m := range inList.FindAllStringSubmatch(opts, -1) {
				listed = append(listed, m[1])
			}
		}
		slices.Sort(usage)
		slices.Sort(listed)
		if !slices.Equal(usage, listed) {
			t.Errorf("bivar %s: the usage line names %v, the options list %v", c.Name, usage, listed)
		}
	}
}
