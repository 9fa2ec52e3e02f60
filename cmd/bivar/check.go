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

	"bivar/analysis/report"
	"bivar/internal/atomicfile"
	"bivar/render/gate"
)

func runCheck(_ context.Context, args []string, stdout, stderr io.Writer) int {
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
	// compute tells the user on stderr why it failed; keep a copy for the
	// CI files, so a failed run replaces them instead of leaving stale ones.
	var msg bytes.Buffer
	rep, _, code := compute(fs.Arg(0), io.MultiWriter(stderr, &msg))
	if rep == nil {
		if *junit != "" {
			if err := writeWith(*junit, func(w io.Writer) error { return gate.JUnitFailedRun(w, fs.Arg(0), msg.String()) }); err != nil {
				fmt.Fprintf(stderr, "bivar check: --junit: %v\n", err)
			}
		}
		if *summary != "" {
			if err := writeWith(*summary, func(w io.Writer) error { return gate.SummaryFailedRun(w, fs.Arg(0), msg.String()) }); err != nil {
				fmt.Fprintf(stderr, "bivar check: --summary: %v\n", err)
			}
		}
		return code
	}
	if *junit != "" {
		if err := writeWith(*junit, func(w io.Writer) error { return gate.JUnit(w, rep) }); err != nil {
			fmt.Fprintf(stderr, "bivar check: --junit: %v\n", err)
			return exitFailed
		}
	}
	if *summary != "" {
		if err := writeWith(*summary, func(w io.Writer) error { return gate.Summary(w, rep) }); err != nil {
			fmt.Fprintf(stderr, "bivar check: --summary: %v\n", err)
			return exitFailed
		}
	}
	checkSummary(stderr, rep)
	return status(rep, stderr)
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
		}
		return fmt.Errorf("%s is a folder: give the manifest file itself%s", path, hint)
	}
	return nil
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

// writeWith writes a file atomically: the content goes to a temporary file
// in the same folder, which is renamed over path only when complete, so a
// failure never leaves a half-written file for CI to read. Missing folders
// on the way to path are created.
func writeWith(path string, write func(io.Writer) error) error {
	var buf bytes.Buffer
	if err := write(&buf); err != nil {
		return err
	}
	if info, err := os.Stat(path); err == nil && info.IsDir() {
		return fmt.Errorf("%s is a folder: give a file name", path)
	}
	return atomicfile.Write(filepath.Dir(path), []atomicfile.File{{Name: filepath.Base(path), Data: buf.Bytes()}})
}
