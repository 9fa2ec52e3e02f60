package main

// This file holds `bivar check`: compute every study, gate on the
// expectations, and write only what a CI job needs.

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"bivar/analysis/report"
	"bivar/internal/publish"
	"bivar/render/gate"
)

func runCheck(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("check")
	junit := fs.String("junit", "", "write JUnit XML to `FILE` (one test case per expectation)")
	summary := fs.String("summary", "", "write a Markdown summary for a CI job page to `FILE`")
	if code, ok := parseFlags(fs, args, stdout, stderr); !ok {
		return code
	}
	if fs.NArg() != 1 {
		fmt.Fprintf(stderr, "bivar check: want one manifest, got %s\nusage: %s\n", nArgs(fs.NArg()), lookup("check").Usage)
		return exitUsage
	}
	for _, f := range []struct{ flag, path, example string }{{"--junit", *junit, "junit.xml"}, {"--summary", *summary, "summary.md"}} {
		if info, err := os.Stat(f.path); f.path != "" && err == nil && info.IsDir() {
			fmt.Fprintf(stderr, "bivar check: %s %s is a folder: give a file name, such as %s\n", f.flag, f.path, filepath.Join(f.path, f.example))
			return exitUsage
		}
	}
	if *junit != "" && *summary != "" && samePath(*junit, *summary) {
		fmt.Fprintf(stderr, "bivar check: --junit and --summary both name %s: give each its own file\n", *junit)
		return exitUsage
	}
	for _, f := range []struct{ flag, path string }{{"--junit", *junit}, {"--summary", *summary}} {
		if f.path != "" && samePath(f.path, fs.Arg(0)) {
			fmt.Fprintf(stderr, "bivar check: %s %s is the manifest: give the CI file a name of its own\n", f.flag, f.path)
			return exitUsage
		}
	}
	// The CI files are taken before the studies run, so a second check
	// writing them is refused at once.
	var files []ciFile
	for _, f := range []struct{ flag, path string }{{"--junit", *junit}, {"--summary", *summary}} {
		if f.path == "" {
			files = append(files, ciFile{})
			continue
		}
		t, err := publish.OpenFile(f.path, publish.Options{Command: "bivar check"})
		if err != nil {
			return outputError(stderr, "bivar check", f.flag, f.flag+" FILE", err)
		}
		defer t.Close()
		files = append(files, ciFile{flag: f.flag, target: t})
	}
	jf, sf := files[0], files[1]
	kept := ""
	if jf.target != nil || sf.target != nil {
		kept = "the earlier --junit and --summary files are as they were"
	}
	// compute tells the user on stderr why it failed; keep a copy for the
	// CI files, so a failed run replaces them instead of leaving stale ones.
	var msg bytes.Buffer
	rep, m, code := compute(ctx, fs.Arg(0), io.MultiWriter(stderr, &msg))
	if sig := stopped(ctx); sig != nil {
		return interrupted(stderr, "bivar check", sig, kept)
	}
	for _, f := range files {
		for i := 0; m != nil && f.target != nil && i < len(m.Datasets); i++ {
			if samePath(f.target.Path(), m.Datasets[i].File) {
				fmt.Fprintf(stderr, "bivar check: %s %s is the data file of dataset %q: give the CI file a name of its own\n", f.flag, f.target.Path(), m.Datasets[i].ID)
				return exitUsage
			}
		}
	}
	// Both files are written beside their places, then renamed one right
	// after the other (publish.WriteFiles): a signal before the renames
	// keeps both old ones, and once they start both go ahead.
	var ci []ciFile
	if rep == nil {
		ci = []ciFile{
			{jf.flag, jf.target, func(w io.Writer) error { return gate.JUnitFailedRun(w, fs.Arg(0), msg.String()) }},
			{sf.flag, sf.target, func(w io.Writer) error { return gate.SummaryFailedRun(w, fs.Arg(0), msg.String()) }},
		}
	} else {
		ci = []ciFile{
			{jf.flag, jf.target, func(w io.Writer) error { return gate.JUnit(w, rep) }},
			{sf.flag, sf.target, func(w io.Writer) error { return gate.Summary(w, rep) }},
		}
	}
	if err := writeCI(ctx, ci); err != nil {
		if sig := stopped(ctx); sig != nil {
			return interrupted(stderr, "bivar check", sig, kept)
		}
		fmt.Fprintf(stderr, "bivar check: %v\n", err)
		return exitFailed
	}
	if rep == nil {
		return code
	}
	checkSummary(stderr, rep)
	return status(rep, stderr)
}

// ciFile is one of check's output files, taken for writing, and what to
// write in it; a nil target (the flag was not given) writes nothing.
type ciFile struct {
	flag   string
	target *publish.Target
	render func(io.Writer) error
}

// writeCI renders the files in memory and replaces the previous ones
// (publish.WriteFiles), so CI never reads a half-written file.
func writeCI(ctx context.Context, files []ciFile) error {
	var targets []*publish.Target
	var data [][]byte
	for _, f := range files {
		if f.target == nil {
			continue
		}
		var buf bytes.Buffer
		if err := f.render(&buf); err != nil {
			return fmt.Errorf("%s: %w", f.flag, err)
		}
		targets = append(targets, f.target)
		data = append(data, buf.Bytes())
	}
	if len(targets) == 0 {
		return nil
	}
	return publish.WriteFiles(ctx, targets, data)
}

// samePath says whether a and b name one file, existing or not.
func samePath(a, b string) bool {
	if sa, err := os.Stat(a); err == nil {
		sb, err := os.Stat(b)
		return err == nil && os.SameFile(sa, sb)
	}
	aa, err1 := filepath.Abs(a)
	ab, err2 := filepath.Abs(b)
	return err1 == nil && err2 == nil && aa == ab
}

// nArgs says how many arguments were given, in words for a message.
func nArgs(n int) string {
	switch n {
	case 0:
		return "none"
	case 1:
		return "1 argument"
	}
	return fmt.Sprintf("%d arguments", n)
}

// manifestArg checks the manifest argument before it is loaded, for the
// mistakes whose low-level error would not say what to do: a folder, a
// file that does not exist.
func manifestArg(path string) error {
	info, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return fmt.Errorf("%s: no such file; give the path of a manifest (a TOML file such as bivar.toml; 'bivar init DATA.csv' writes one)", path)
	case err != nil:
		return fmt.Errorf("%s: %w", path, err)
	case info.IsDir():
		hint := ""
		if _, err := os.Stat(filepath.Join(path, "bivar.toml")); err == nil {
			hint = fmt.Sprintf(", such as %s", filepath.Join(path, "bivar.toml"))
		} else if m := reportOf(path); m != "" {
			return fmt.Errorf("%s is a report folder, written from the manifest %s: give that manifest (the studies are computed again from it); 'bivar diff OLD NEW' compares two report folders", path, m)
		}
		return fmt.Errorf("%s is a folder: give the manifest file itself%s", path, hint)
	}
	switch looksLike(path) {
	case dataFile:
		beside := filepath.Join(filepath.Dir(path), "bivar.toml")
		if _, err := os.Stat(beside); err == nil {
			return fmt.Errorf("%s looks like a data file, not a manifest: give the manifest that names it, such as %s; 'bivar init %s' writes a new one", path, beside, path)
		}
		return fmt.Errorf("%s looks like a data file, not a manifest: give the manifest (bivar.toml) that names it; 'bivar init %s' writes one", path, path)
	case jsonFile:
		return fmt.Errorf("%s looks like JSON (a results.json?), not a manifest: give the manifest (a TOML file such as bivar.toml); 'bivar diff OLD NEW' compares two results.json", path)
	}
	return nil
}

// reportOf returns the manifest named in dir/results.json when dir is a
// report folder, or "".
func reportOf(dir string) string {
	data, err := os.ReadFile(filepath.Join(dir, "results.json"))
	if err != nil {
		return ""
	}
	rep, err := parseResults(filepath.Join(dir, "results.json"), data)
	if err != nil || rep.Manifest.File == "" {
		return ""
	}
	return strconv.Quote(rep.Manifest.File)
}

// fileKind is what a file given in place of another looks like.
type fileKind int

const (
	unknownKind fileKind = iota // nothing plain: let the reader say what is wrong
	dataFile                    // a CSV or spreadsheet
	tomlFile                    // a TOML manifest
	jsonFile                    // a JSON document, such as a results.json
)

// dataExtensions are the file name endings of data files bivar reads or
// that a user might give for one.
var dataExtensions = []string{".csv", ".tsv", ".tab", ".xlsx", ".xlsm", ".xls", ".ods", ".parquet"}

// dataExtension says whether path ends like a data file.
func dataExtension(path string) bool {
	return slices.Contains(dataExtensions, strings.ToLower(filepath.Ext(path)))
}

// looksLike says what path plainly is, from its name and its first bytes:
// a data file (a data file's ending, a spreadsheet's ZIP or OLE signature,
// or a first line that is a CSV header: fields between commas, semicolons
// or tabs, and no "=", which every TOML line that is not blank, a comment
// or a [table] header holds), a manifest (.toml, or a first line that is a
// TOML key or table), JSON (.json, or a first byte "{"). unknownKind when
// it is none of these plainly, or cannot be read.
func looksLike(path string) fileKind {
	switch ext := strings.ToLower(filepath.Ext(path)); {
	case dataExtension(path):
		return dataFile
	case ext == ".json":
		return jsonFile
	case ext == ".toml":
		return tomlFile
	}
	f, err := os.Open(path)
	if err != nil {
		return unknownKind
	}
	defer f.Close()
	head := make([]byte, 1<<12)
	n, _ := io.ReadFull(f, head)
	head = head[:n]
	if bytes.HasPrefix(head, []byte("PK\x03\x04")) || bytes.HasPrefix(head, []byte("\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1")) {
		return dataFile
	}
	for _, line := range strings.Split(string(bytes.TrimPrefix(head, []byte("\xef\xbb\xbf"))), "\n") {
		line = strings.TrimSpace(line)
		switch {
		case line == "":
			continue
		case line[0] == '{':
			return jsonFile
		case line[0] == '#' || line[0] == '[' || strings.Contains(line, "="):
			return tomlFile
		case strings.ContainsAny(line, ",;\t"):
			return dataFile
		}
		return unknownKind
	}
	return unknownKind
}

func plural(n int, one, many string) string {
	if n == 1 {
		return fmt.Sprintf("%d %s", n, one)
	}
	return fmt.Sprintf("%d %s", n, many)
}

// checkSummary writes the one-line outcome of a check on stderr.
func checkSummary(stderr io.Writer, rep *report.Report) {
	c := gate.Count(rep)
	switch {
	case c.Expectations == 0:
		fmt.Fprintf(stderr, "bivar check: %s ran, %d did not; no expectations declared, nothing gated (add [study.expect] to a study)\n",
			plural(c.Studies-c.StudyErrors, "study", "studies"), c.StudyErrors)
	default:
		fmt.Fprintf(stderr, "bivar check: %d of %s held (%d failed) in %s",
			c.Expectations-c.Failed-c.Errored, plural(c.Expectations, "expectation", "expectations"), c.Failed, plural(c.Studies, "study", "studies"))
		if c.StudyErrors > 0 {
			fmt.Fprintf(stderr, "; %s did not run, so %s not evaluated", plural(c.StudyErrors, "study", "studies"), plural(c.Errored, "expectation was", "expectations were"))
		}
		fmt.Fprintln(stderr)
	}
}

// writeWith writes one file in one step (for bivar init): the content is
// rendered in memory, written to a temporary file beside path and renamed
// over it, so a failure never leaves a half-written file. Missing folders
// on the way to path are created.
func writeWith(path string, write func(io.Writer) error) error {
	var buf bytes.Buffer
	if err := write(&buf); err != nil {
		return err
	}
	t, err := publish.OpenFile(path, publish.Options{Command: "bivar init"})
	if err != nil {
		return err
	}
	defer t.Close()
	return t.WriteFile(context.Background(), buf.Bytes())
}
