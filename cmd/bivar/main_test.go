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
	"runtime/debug"
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
		{"unknown-command", []string{"rnu"}, exitUsage, `bivar: unknown command "rnu" (did you mean run?). Run 'bivar help'.`},
		{"unknown-command-doubled", []string{"runn", "m.toml"}, exitUsage, `bivar: unknown command "runn" (did you mean run?). Run 'bivar help'.`},
		{"unknown-command-far", []string{"xyz"}, exitUsage, `bivar: unknown command "xyz". Run 'bivar help'.`},
		{"manifest-without-command", []string{"bivar.toml"}, exitUsage, `bivar: unknown command "bivar.toml": to run the studies of a manifest, give the command first: bivar run bivar.toml. Run 'bivar help'.`},
		{"data-without-command", []string{"data.csv"}, exitUsage, `give the command first: bivar init data.csv.`},
		{"help-unknown", []string{"help", "chek"}, exitUsage, `bivar help: unknown command "chek" (did you mean check?). Run 'bivar help'.`},
		{"run-no-manifest", []string{"run"}, exitUsage, "want one manifest, got 0 arguments"},
		{"run-two-manifests", []string{"run", "a.toml", "b.toml"}, exitUsage, "want one manifest, got 2 arguments"},
		{"run-bad-flag", []string{"run", "-x", "a.toml"}, exitUsage, "bivar run: unknown option -x: the options of 'bivar run' are -o DIR, --replace\nusage: bivar run [-o DIR] [--replace] MANIFEST\nRun 'bivar help run' for details.\n"},
		{"run-theme", []string{"run", "-theme", "night", "a.toml"}, exitUsage, `bivar run: unknown option --theme: the report's theme is set in the manifest, as theme = "paper" in its [output] table (one of paper, night, contrast; see docs/manifest.md)`},
		{"run-misspelt-option", []string{"run", "--replce", "a.toml"}, exitUsage, "bivar run: unknown option --replce (did you mean --replace?)\n"},
		{"run-option-of-check", []string{"run", "--junit", "j.xml", "a.toml"}, exitUsage, "bivar run: unknown option --junit: --junit is an option of 'bivar check', not of 'bivar run'\n"},
		{"run-output-folder", []string{"run", "--output", "out", "a.toml"}, exitUsage, `bivar run: unknown option --output: the output folder is -o DIR, or dir = "…" in the manifest's [output] table`},
		{"run-switch-value", []string{"run", "--replace=maybe", "a.toml"}, exitUsage, "bivar run: --replace=maybe: --replace is a switch, on when given: write --replace alone (or --replace=false to turn it off)\n"},
		{"run-three-dashes", []string{"run", "---replace", "a.toml"}, exitUsage, `bivar run: "---replace" is not an option: write an option with one dash before a letter or two before a word, such as -o`},
		{"run-o-last", []string{"run", "a.toml", "-o"}, exitUsage, "bivar run: -o needs a DIR after it: output DIR (default: [output] dir of the manifest, relative to its folder)\nusage: bivar run [-o DIR] [--replace] MANIFEST\n"},
		{"check-junit-last", []string{"check", "a.toml", "-junit"}, exitUsage, "bivar check: --junit needs a FILE after it: write JUnit XML to FILE (one test case per expectation)\nusage: bivar check [--junit FILE] [--summary FILE] MANIFEST\nRun 'bivar help check' for details.\n"},
		{"check-junit-then-option", []string{"check", "--junit", "--summary", "s.md", "a.toml"}, exitUsage, "bivar check: --junit needs a FILE after it, not the option --summary: write JUnit XML to FILE (one test case per expectation)\n"},
		{"diff-misspelt-theme", []string{"diff", "--them", "night", "a", "b"}, exitUsage, "bivar diff: unknown option --them (did you mean --theme?)\n"},
		{"init-manifest", []string{"init", "--force", "bivar.toml"}, exitUsage, "bivar init: bivar.toml is a manifest, not a data file: run its studies with 'bivar run bivar.toml', or give bivar init the data file (CSV or .xlsx) to write a manifest for\n"},
		{"version-option", []string{"version", "--x"}, exitUsage, "bivar version: unknown option -x: 'bivar version' takes no options\n"},
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

// TestNotAManifest: a data file, a results.json or a manifest given where
// another kind of file belongs is named for what it looks like, with the
// file to give instead, rather than answered by the TOML or JSON parser.
func TestNotAManifest(t *testing.T) {
	dir := t.TempDir()
	csv := filepath.Join(dir, "data.csv")
	writeFile(t, csv, "a,b\n1,2\n")
	header := filepath.Join(dir, "export") // a CSV header, no extension
	writeFile(t, header, "\ufeffLot;Hardness (HRC)\n1;40\n")
	results := filepath.Join(dir, "old.json")
	writeFile(t, results, "{\"schema\": \"bivar.results/1\"}\n")
	manifest := filepath.Join(dir, "plant.toml")
	writeFile(t, manifest, "[[dataset]]\n")
	withBeside := filepath.Join(dir, "sub", "data.csv")
	writeFile(t, withBeside, "a,b\n")
	writeFile(t, filepath.Join(dir, "sub", "bivar.toml"), "")
	cases := []struct {
		name   string
		args   []string
		stderr string
	}{
		{"check-csv", []string{"check", csv}, "bivar: " + csv + " looks like a data file, not a manifest: give the manifest (bivar.toml) that names it; 'bivar init " + csv + "' writes one\n"},
		{"run-csv-header", []string{"run", header}, "bivar: " + header + " looks like a data file, not a manifest: give the manifest (bivar.toml) that names it"},
		{"run-csv-beside-manifest", []string{"run", withBeside}, "not a manifest: give the manifest that names it, such as " + filepath.Join(dir, "sub", "bivar.toml") + "; 'bivar init " + withBeside + "' writes a new one\n"},
		{"run-json", []string{"run", results}, "bivar: " + results + " looks like JSON (a results.json?), not a manifest: give the manifest (a TOML file such as bivar.toml); 'bivar diff OLD NEW' compares two results.json\n"},
		{"diff-csv", []string{"diff", "-o", filepath.Join(dir, "d1"), csv, results}, "bivar diff: OLD: " + csv + " looks like a data file, not a results.json: give the results.json that 'bivar run' wrote for the manifest naming it (in the report folder), or the folder itself\n"},
		{"diff-manifest", []string{"diff", "-o", filepath.Join(dir, "d2"), manifest, results}, "bivar diff: OLD: " + manifest + " looks like a manifest, not a results.json: run 'bivar run " + manifest + "' and give the report folder it writes (or its results.json)\n"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			code, _, stderr := call(t, tc.args...)
			if code != exitFailed || !strings.Contains(stderr, tc.stderr) {
				t.Errorf("bivar %s: exit %d, stderr:\n%s\nwant exit 1 and %q", strings.Join(tc.args, " "), code, stderr, tc.stderr)
			}
		})
	}
}

// TestLooksLike: what a file plainly is, from its name and first line. A
// manifest under another name is left to the manifest's reader.
func TestLooksLike(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		name, text string
		want       fileKind
	}{
		{"m.cfg", "# plant manifest\ntitle = \"a, b\"\n", tomlFile},
		{"m.conf", "\n\n[[dataset]]\n", tomlFile},
		{"m.txt", "title = \"x\"\n", tomlFile},
		{"d.txt", "lot,hardness\n", dataFile},
		{"d.dat", "lot\thardness\n", dataFile},
		{"w.bin", "PK\x03\x04rest", dataFile},
		{"r.out", "  {\"schema\": 1}", jsonFile},
		{"one-word", "hardness\n", unknownKind},
		{"empty", "", unknownKind},
		{"D.CSV", "", dataFile},
		{"x.xlsx", "", dataFile},
	} {
		path := filepath.Join(dir, tc.name)
		writeFile(t, path, tc.text)
		if got := looksLike(path); got != tc.want {
			t.Errorf("%s holding %q: kind %d, want %d", tc.name, tc.text, got, tc.want)
		}
	}
	if got := looksLike(filepath.Join(dir, "absent")); got != unknownKind {
		t.Errorf("a file that does not exist: kind %d, want unknownKind", got)
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

// TestVersionOf: the version comes from the build information alone, so
// every run of one binary names the same version.
func TestVersionOf(t *testing.T) {
	rev := "abc123def4567890abc123def4567890abc123de"
	for _, tc := range []struct {
		name string
		bi   *debug.BuildInfo
		want string
	}{
		{"no build information", nil, "dev"},
		{"module version", &debug.BuildInfo{Main: debug.Module{Version: "v1.4.0"}, Settings: []debug.BuildSetting{{Key: "vcs.revision", Value: rev}}}, "v1.4.0"},
		{"pseudo-version without vcs settings", &debug.BuildInfo{Main: debug.Module{Version: "v0.0.0-20261205072815-abc123def456+dirty"}}, "v0.0.0-20261205072815-abc123def456+dirty"},
		{"pseudo-version of the stamped commit", &debug.BuildInfo{Main: debug.Module{Version: "v0.0.0-20261205072815-abc123def456+dirty"}, Settings: []debug.BuildSetting{{Key: "vcs.revision", Value: rev}, {Key: "vcs.modified", Value: "true"}}}, "dev (commit abc123def456, modified)"},
		{"commit, clean", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{{Key: "vcs.revision", Value: rev}, {Key: "vcs.modified", Value: "false"}}}, "dev (commit abc123def456)"},
		{"commit, modified", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{{Key: "vcs", Value: "git"}, {Key: "vcs.revision", Value: rev}, {Key: "vcs.modified", Value: "true"}}}, "dev (commit abc123def456, modified)"},
		{"short revision", &debug.BuildInfo{Settings: []debug.BuildSetting{{Key: "vcs.revision", Value: "abc1"}}}, "dev (commit abc1)"},
		{"no commit", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{{Key: "vcs.modified", Value: "true"}}}, "dev"},
	} {
		if got := versionOf(tc.bi); got != tc.want {
			t.Errorf("%s: version %q, want %q", tc.name, got, tc.want)
		}
	}
	// The test binary's own: the same on every call.
	if a, b := version(), version(); a != b || !strings.HasPrefix(a, "dev") && !strings.HasPrefix(a, "v") {
		t.Errorf("version() = %q then %q", a, b)
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

// TestManifestWithoutDataset: a manifest whose study names no declared
// dataset says, at the study's line, that the manifest has none and what
// to add, not "naming one of: " followed by nothing.
func TestManifestWithoutDataset(t *testing.T) {
	m := filepath.Join(t.TempDir(), "bivar.toml")
	writeFile(t, m, "title = \"no data yet\"\n\n[[study]]\nid = \"s\"\nx = \"a\"\ny = \"b\"\n")
	code, _, stderr := call(t, "check", m)
	want := "bivar: " + m + ":3:1: the manifest has no dataset: add a [[dataset]] table above this [[study]] with id = \"…\" and file = \"…\""
	if code != exitFailed || !strings.HasPrefix(stderr, want) || strings.Contains(stderr, "naming one of") {
		t.Errorf("exit %d, stderr:\n%s\nwant exit 1 and a first line starting %q", code, stderr, want)
	}
}
