package main

// This file holds `bivar diff`: compare two runs' results.json.

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"bivar/analysis/compare"
	"bivar/analysis/report"
	"bivar/render/changes"
	"bivar/themes"
)

// failOnChoices are the values of diff --fail-on.
var failOnChoices = []string{"verdict", "significant"}

func runDiff(_ context.Context, args []string, stdout, stderr io.Writer) int {
	flags := newFlagSet("diff", stderr)
	out := flags.String("o", "diff", "output `DIR` for diff.html, diff.md and diff.json")
	failOn := flags.String("fail-on", "", "comma-separated `LIST` of changes that give exit status 3: verdict, significant")
	theme := flags.String("theme", themes.Default, "HTML theme `NAME`: "+strings.Join(themes.Names(), ", "))
	if code, ok := parseFlags(flags, args); !ok {
		return code
	}
	if flags.NArg() != 2 {
		fmt.Fprintf(stderr, "bivar diff: want OLD and NEW, got %d arguments\nusage: %s\n", flags.NArg(), lookup("diff").Usage)
		return exitUsage
	}
	gates, err := parseFailOn(*failOn)
	if err != nil {
		fmt.Fprintf(stderr, "bivar diff: --fail-on: %v\n", err)
		return exitUsage
	}
	if _, err := themes.CSS(*theme); err != nil {
		fmt.Fprintf(stderr, "bivar diff: --theme: %v\n", err)
		return exitUsage
	}
	oldRep, oldFile, err := readResults(flags.Arg(0))
	if err != nil {
		fmt.Fprintf(stderr, "bivar diff: OLD: %v\n", err)
		return exitFailed
	}
	newRep, newFile, err := readResults(flags.Arg(1))
	if err != nil {
		fmt.Fprintf(stderr, "bivar diff: NEW: %v\n", err)
		return exitFailed
	}
	res := compare.Diff(oldRep, newRep, compare.Options{Tool: report.Tool{Name: "bivar", Version: version()}})
	res.Old.File, res.New.File = filepath.ToSlash(oldFile), filepath.ToSlash(newFile)
	if err := changes.Write(*out, res, changes.WithTheme(*theme)); err != nil {
		fmt.Fprintf(stderr, "bivar diff: writing to %s: %v\n", *out, err)
		return exitFailed
	}
	s := res.Summary
	fmt.Fprintf(stderr, "bivar diff: %d studies compared: %d with a significant change (%s, alpha %g), %d with a changed verdict; %d added, %d removed; written to %s\n",
		s.Compared, s.Significant, res.Adjust, res.Alpha, s.VerdictChanged, s.Added, s.Removed, *out)
	for _, sc := range res.Studies {
		var what []string
		if sc.Significant {
			what = append(what, "significant change")
		}
		for _, v := range sc.Verdicts {
			what = append(what, fmt.Sprintf("%s %s → %s", v.Name, v.Old, v.New))
		}
		if len(what) > 0 {
			fmt.Fprintf(stderr, "bivar diff: study %q: %s\n", sc.ID, strings.Join(what, "; "))
		}
	}
	for _, n := range res.Notes {
		fmt.Fprintf(stderr, "bivar diff: note: %s\n", n)
	}
	code := exitOK
	if gates["significant"] && res.AnySignificant() {
		fmt.Fprintf(stderr, "bivar diff: failing: a significant change was found (--fail-on significant)\n")
		code = exitExpectation
	}
	if gates["verdict"] && res.AnyVerdictChanged() {
		fmt.Fprintf(stderr, "bivar diff: failing: a verdict changed (--fail-on verdict)\n")
		code = exitExpectation
	}
	return code
}

// parseFailOn reads the --fail-on list.
func parseFailOn(v string) (map[string]bool, error) {
	gates := map[string]bool{}
	if strings.TrimSpace(v) == "" {
		return gates, nil
	}
	for _, g := range strings.Split(v, ",") {
		g = strings.TrimSpace(g)
		if !slices.Contains(failOnChoices, g) {
			return nil, fmt.Errorf("%q: want a comma-separated list of %s", g, strings.Join(failOnChoices, ", "))
		}
		gates[g] = true
	}
	return gates, nil
}

// readResults reads a results.json, or the results.json inside a folder.
// It returns the file actually read.
func readResults(path string) (*report.Report, string, error) {
	info, err := os.Stat(path)
	if err != nil {
		return nil, path, fmt.Errorf("%w (give a results.json or the folder holding one)", err)
	}
	file := path
	if info.IsDir() {
		file = filepath.Join(path, "results.json")
		if _, err := os.Stat(file); errors.Is(err, fs.ErrNotExist) {
			return nil, file, fmt.Errorf("%s holds no results.json: give the report folder written by 'bivar run' or the file itself", path)
		}
	}
	f, err := os.Open(file)
	if err != nil {
		return nil, file, err
	}
	defer f.Close()
	rep, err := report.Read(f)
	if err != nil {
		return nil, file, fmt.Errorf("%s: %w", file, err)
	}
	return rep, file, nil
}
