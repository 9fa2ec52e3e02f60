package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"bivar/analysis"
	"bivar/analysis/manifest"
	"bivar/analysis/report"
	"bivar/render"
	"bivar/themes"
)

func runRun(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("run")
	out := fs.String("o", "", "output `DIR` (default: [output] dir of the manifest, relative to its folder)")
	if code, ok := parseFlags(fs, args, stdout, stderr); !ok {
		return code
	}
	if fs.NArg() != 1 {
		fmt.Fprintf(stderr, "bivar run: want one manifest, got %d arguments\nusage: %s\n", fs.NArg(), lookup("run").Usage)
		return exitUsage
	}
	rep, m, code := compute(fs.Arg(0), stderr)
	if rep == nil {
		return code
	}
	dir := *out
	if dir == "" {
		dir = m.Output.Dir
		if !filepath.IsAbs(dir) {
			dir = filepath.Join(m.Dir, dir)
		}
	}
	code = status(rep, stderr)
	if ran := studiesRan(rep); ran == 0 {
		// A report of nothing but errors would replace a good earlier one.
		fmt.Fprintf(stderr, "bivar: no study ran; nothing written, and any earlier report in %s is left as it was\n", dir)
		return exitFailed
	}
	if err := render.WriteReport(dir, rep, m.Output.Formats, render.WithTheme(m.Output.Theme)); err != nil {
		fmt.Fprintf(stderr, "bivar: writing the report to %s (from [output] dir or -o): %v\n", dir, err)
		return exitFailed
	}
	fmt.Fprintf(stderr, "bivar: %s; report written to %s\n", plural(len(rep.Studies), "study", "studies"), dir)
	return code
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
// already told the user why and returns a nil report with the exit status.
func compute(path string, stderr io.Writer) (*report.Report, *manifest.Manifest, int) {
	if err := manifestArg(path); err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, nil, exitFailed
	}
	m, err := manifest.Load(path)
	if err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, nil, exitFailed
	}
	if _, err := themes.CSS(m.Output.Theme); err != nil {
		fmt.Fprintf(stderr, "bivar: %s: [output] theme: %v\n", path, err)
		return nil, nil, exitFailed
	}
	generated, err := sourceDateEpoch()
	if err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, nil, exitFailed
	}
	rep, err := analysis.Run(m, analysis.Options{Version: version(), Generated: generated})
	if err != nil {
		fmt.Fprintf(stderr, "bivar: %v\n", err)
		return nil, nil, exitFailed
	}
	return rep, m, exitOK
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
				fmt.Fprintf(stderr, "bivar: study %q: expectation %s failed: %s\n", s.ID, e.Name, e.Detail)
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

// sourceDateEpoch returns the report time from SOURCE_DATE_EPOCH
// (reproducible-builds.org), or "" when it is not set: reports carry no
// time otherwise, so two runs on the same input give the same bytes.
func sourceDateEpoch() (string, error) {
	v, ok := os.LookupEnv("SOURCE_DATE_EPOCH")
	if !ok || v == "" {
		return "", nil
	}
	sec, err := strconv.ParseInt(v, 10, 64)
	if err != nil {
		return "", fmt.Errorf("SOURCE_DATE_EPOCH=%q: want whole seconds since 1970-01-01 UTC", v)
	}
	return time.Unix(sec, 0).UTC().Format(time.RFC3339), nil
}
