package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/internal/publish"
	"bivar/render"
	"bivar/render/gate"
)

func runRun(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("run")
	out := fs.String("o", "", "output `DIR` (default: [output] dir of the manifest, relative to its folder)")
	replace := fs.Bool("replace", false, "replace a report folder that another manifest wrote (refused without it)")
	if code, ok := parseFlags(fs, args, stdout, stderr); !ok {
		return code
	}
	if fs.NArg() != 1 {
		fmt.Fprintf(stderr, "bivar run: want one manifest, got %d arguments\nusage: %s\n", fs.NArg(), lookup("run").Usage)
		return exitUsage
	}
	m, code := load(fs.Arg(0), stderr)
	if m == nil {
		return code
	}
	dir, from := m.Output.Dir, "[output] dir of "+fs.Arg(0)
	if *out != "" {
		dir, from = *out, "-o"
		if problem := m.OutputDirProblem(dir); problem != "" {
			fmt.Fprintf(stderr, "bivar run: -o %s %s\n", dir, problem)
			return exitUsage
		}
	}
	// The folder is taken before the studies run, so a second run into it
	// is refused at once rather than after its work.
	// The folder records which manifest wrote it: a run of another
	// manifest into it stops (two manifests in one folder would overwrite
	// each other's report without a word) unless --replace says so.
	opts := publish.Options{Command: runCommand(m, dir), Legacy: render.EarlierFile, Replace: *replace}
	target, err := publish.OpenDir(dir, opts)
	var foreign *publish.ForeignError
	if errors.As(err, &foreign) && foreign.Writer == legacyRunCommand(m) {
		// Written by this manifest before runs recorded it relative to
		// the folder: the same manifest, so the folder is taken.
		opts.Replace = true
		target, err = publish.OpenDir(dir, opts)
	}
	if err != nil {
		if errors.As(err, &foreign) && strings.HasPrefix(foreign.Writer, "bivar run \"") {
			other, _ := strconv.Unquote(strings.TrimPrefix(foreign.Writer, "bivar run "))
			if abs, err := filepath.Abs(dir); err == nil && !filepath.IsAbs(other) {
				other = filepath.Join(abs, other)
			}
			fmt.Fprintf(stderr, "bivar: %s holds the report of the manifest %s, and this run is of %s: give each manifest its own [output] dir (or -o DIR), or run with --replace to overwrite that report on purpose\n",
				dir, other, manifestFile(m))
			return exitFailed
		}
		return outputError(stderr, "bivar", from, "-o DIR", err)
	}
	defer target.Close()
	kept := fmt.Sprintf("any earlier report in %s is as it was", dir)
	rep, code := analyze(ctx, m, stderr)
	if rep == nil {
		if sig := stopped(ctx); sig != nil {
			return interrupted(stderr, "bivar", sig, kept)
		}
		return code
	}
	code = status(rep, stderr)
	if ran := studiesRan(rep); ran == 0 {
		// A report of nothing but errors would replace a good earlier one.
		fmt.Fprintf(stderr, "bivar: no study ran; nothing written, and %s\n", kept)
		return exitFailed
	}
	files, err := render.ReportFiles(rep, m.Output.Formats, render.WithTheme(m.Output.Theme))
	if err != nil {
		fmt.Fprintf(stderr, "bivar: writing the report: %v; %s\n", err, kept)
		return exitFailed
	}
	if err := target.Publish(ctx, files); err != nil {
		if sig := stopped(ctx); sig != nil {
			return interrupted(stderr, "bivar", sig, kept)
		}
		fmt.Fprintf(stderr, "bivar: writing the report to %s (from %s): %v; %s\n", dir, from, err, kept)
		return exitFailed
	}
	fmt.Fprintf(stderr, "bivar: %s; report written to %s\n", plural(len(rep.Studies), "study", "studies"), dir)
	return code
}

// outputError explains why an output folder or file could not be taken:
// another process writes it, it holds what is not bivar's, or it cannot
// be created. from says where its name came from (a flag, the manifest),
// choose how to give another (such as "-o DIR").
// runCommand names a run of manifest m into the folder dir for the
// folder's list of contents: "bivar run" and the manifest's path relative
// to that folder, quoted ("bivar run \"../bivar.toml\""). Relative, so that
// a project copied or moved whole, manifest and report folder together,
// still finds its own report there (an absolute path would name the old
// place and make the first run of the copy refuse the folder); where no
// relative path exists, the absolute one.
func runCommand(m *manifest.Manifest, dir string) string {
	file := manifestFile(m)
	if abs, err := filepath.Abs(dir); err == nil {
		if rel, err := filepath.Rel(abs, file); err == nil {
			file = filepath.ToSlash(rel)
		}
	}
	return "bivar run " + strconv.Quote(file)
}

// legacyRunCommand is how runs recorded manifest m before runCommand made
// the path relative: its absolute path.
func legacyRunCommand(m *manifest.Manifest) string {
	return "bivar run " + strconv.Quote(manifestFile(m))
}

// manifestFile is the manifest's absolute path: its folder (Manifest.Dir,
// made absolute by manifest.Load) and its file name.
func manifestFile(m *manifest.Manifest) string { return filepath.Join(m.Dir, filepath.Base(m.Path)) }

func outputError(stderr io.Writer, who, from, choose string, err error) int {
	var busy *publish.BusyError
	var foreign *publish.ForeignError
	switch {
	case errors.As(err, &busy):
		fmt.Fprintf(stderr, "%s: %v: wait for it to finish, or choose another with %s\n", who, err, choose)
	case errors.As(err, &foreign):
		fmt.Fprintf(stderr, "%s: %v (the folder comes from %s)\n", who, err, from)
	default:
		fmt.Fprintf(stderr, "%s: %v (from %s)\n", who, err, from)
	}
	return exitFailed
}

// studiesRan counts the studies that ran (have no error).
func studiesRan(rep *report.Report) int {
	n := 0
	for _, s := range rep.Studies {
		if s.Error == nil {
			n++
		}
	}
	return n
}

// compute loads the manifest and runs every study. On failure it has
// already told the user why and returns a nil report with the exit status
// (for a stop by a signal: nil and exitFailed, and stopped(ctx) says which).
func compute(ctx context.Context, path string, stderr io.Writer) (*report.Report, *manifest.Manifest, int) {
	m, code := load(path, stderr)
	if m == nil {
		return nil, nil, code
	}
	rep, code := analyze(ctx, m, stderr)
	return rep, m, code
}

// load reads and validates the manifest, telling the user on stderr what
// is wrong if anything is.
func load(path string, stderr io.Writer) (*manifest.Manifest, int) {
	if err := manifestArg(path); err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, exitFailed
	}
	m, err := manifest.Load(path)
	if err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, exitFailed
	}
	return m, exitOK
}

// analyze runs every study of m. A signal (ctx cancelled) ends the wait:
// the studies write nothing, so nothing is left to undo.
func analyze(ctx context.Context, m *manifest.Manifest, stderr io.Writer) (*report.Report, int) {
	generated, err := sourceDateEpoch()
	if err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, exitFailed
	}
	if ctx.Err() != nil {
		return nil, exitFailed
	}
	type result struct {
		rep *report.Report
		err error
	}
	done := make(chan result, 1)
	go func() {
		rep, err := analysis.Run(m, analysis.Options{Version: version(), Generated: generated})
		done <- result{rep, err}
	}()
	select {
	case <-ctx.Done():
		return nil, exitFailed
	case r := <-done:
		if r.err != nil {
			fmt.Fprintf(stderr, "bivar: %v\n", r.err)
			return nil, exitFailed
		}
		return r.rep, exitOK
	}
}

// status reports failed studies and expectations on stderr and returns
// the exit status: 1 when a study failed, else 3 when an expectation
// failed, else 0.
func status(rep *report.Report, stderr io.Writer) int {
	failedStudy, failedExpect := false, false
	for _, s := range rep.Studies {
		if s.Error != nil {
			failedStudy = true
			fmt.Fprintf(stderr, "bivar: study %q did not run: %s\n", s.ID, *s.Error)
			if len(s.Expectations) > 0 {
				fmt.Fprintf(stderr, "bivar: study %q: %s not evaluated\n", s.ID, plural(len(s.Expectations), "expectation", "expectations"))
			}
			continue
		}
		for _, e := range s.Expectations {
			if !e.OK {
				failedExpect = true
				fmt.Fprintf(stderr, "bivar: study %q: expectation %s failed: %s\n", s.ID, gate.Label(e), e.Detail)
			}
		}
	}
	switch {
	case failedStudy:
		return exitFailed
	case failedExpect:
		return exitExpectation
	}
	return exitOK
}

// sourceDateEpoch returns the run's date and time in UTC (RFC 3339): from
// SOURCE_DATE_EPOCH when it is set (reproducible-builds.org), so that two
// runs on the same input give the same bytes, else the time of the run.
func sourceDateEpoch() (string, error) {
	v, ok := os.LookupEnv("SOURCE_DATE_EPOCH")
	if !ok || v == "" {
		return time.Now().UTC().Truncate(time.Second).Format(time.RFC3339), nil
	}
	sec, err := strconv.ParseInt(v, 10, 64)
	if err != nil {
		return "", fmt.Errorf("SOURCE_DATE_EPOCH=%q: want whole seconds since 1970-01-01 UTC", v)
	}
	return time.Unix(sec, 0).UTC().Format(time.RFC3339), nil
}
