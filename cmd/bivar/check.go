package main

// This file holds `bivar check`: compute every study, gate on the
// expectations, and write only what a CI job needs.

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"bivar/analysis/report"
	"bivar/render/gate"
)

func runCheck(_ context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("check", stderr)
	junit := fs.String("junit", "", "write JUnit XML to `FILE` (one test case per expectation)")
	summary := fs.String("summary", "", "write a Markdown summary for a CI job page to `FILE`")
	if code, ok := parseFlags(fs, args); !ok {
		return code
	}
	if fs.NArg() != 1 {
		fmt.Fprintf(stderr, "bivar check: want one manifest, got %d arguments\nusage: %s\n", fs.NArg(), lookup("check").Usage)
		return exitUsage
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

// checkSummary writes the one-line outcome of a check on stderr.
func checkSummary(stderr io.Writer, rep *report.Report) {
	c := gate.Count(rep)
	switch {
	case c.Expectations == 0:
		fmt.Fprintf(stderr, "bivar check: %d studies ran, %d did not; no expectations declared, nothing gated (add [study.expect] to a study)\n",
			c.Studies-c.StudyErrors, c.StudyErrors)
	default:
		fmt.Fprintf(stderr, "bivar check: %d of %d expectations held (%d failed) in %d studies",
			c.Expectations-c.Failed-c.Errored, c.Expectations, c.Failed, c.Studies)
		if c.StudyErrors > 0 {
			fmt.Fprintf(stderr, "; %d studies did not run, their %d expectations were not evaluated", c.StudyErrors, c.Errored)
		}
		fmt.Fprintln(stderr)
	}
}

// writeWith writes a file atomically: the content goes to a temporary file
// in the same folder, which is renamed over path only when complete, so a
// failure never leaves a half-written file for CI to read.
func writeWith(path string, write func(io.Writer) error) error {
	var buf bytes.Buffer
	if err := write(&buf); err != nil {
		return err
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return err
	}
	_, werr := tmp.Write(buf.Bytes())
	cerr := tmp.Close()
	if werr == nil {
		werr = cerr
	}
	if werr == nil {
		werr = os.Chmod(tmp.Name(), 0o644)
	}
	if werr == nil {
		werr = os.Rename(tmp.Name(), path)
	}
	if werr != nil {
		os.Remove(tmp.Name())
	}
	return werr
}
