// Command bivar runs the two-variable studies declared in a TOML manifest
// and writes a self-contained HTML report, a Markdown report and
// results.json; it gates CI on declared expectations and compares two runs.
//
// main only translates: run takes the arguments and the streams, so tests
// call it directly.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"runtime/metrics"
	"strings"

	"bivar/analysis/manifest"
	"bivar/internal/cleantext"
)

// Exit statuses, as in DESIGN.md.
const (
	exitOK          = 0 // every study ran and every expectation held
	exitFailed      = 1 // bad input, or a study failed
	exitUsage       = 2 // the command line was wrong
	exitExpectation = 3 // an expectation failed (run, check) or a gated change was found (diff)
)

// command is one subcommand. Help is generated from this table.
type command struct {
	Name  string
	Usage string // one line: bivar NAME ARGS
	Short string // a line for the command list
	Long  string // paragraphs shown by `bivar help NAME` and `-h`
	Run   func(ctx context.Context, args []string, stdout, stderr io.Writer) int
}

// manifestHelp points to the manifest's documentation and lists the
// expectation keys, for run and check.
const manifestHelp = `The manifest's keys are documented in docs/manifest.md. The CI gates go
in a study's [study.expect] table: direction, form, min_abs_r, r_within,
slope_within (two numbers, in y units per x unit), max_p, min_n,
not_outlier_driven and, for an agreement study, agree (the limits of
agreement inside the acceptable difference).`

// commands returns the table. It is a function, not a package variable,
// so the table holds no state between calls.
func commands() []command {
	return []command{
		{
			Name:  "run",
			Usage: "bivar run [-o DIR] [--replace] MANIFEST",
			Short: "run every study and write the report",
			Long: `Reads MANIFEST (TOML), loads its datasets, runs every study and writes
the formats chosen in [output] (report.html, report.md with its figures, and
results.json) to the output folder: -o DIR, or [output] dir, relative to the
manifest's folder.

The new report is written whole into a fresh folder beside the output
folder and swapped in with one atomic rename (on Linux), so the folder holds
the previous report or the new one, complete, whatever stops the run; a
run that fails, is stopped, or in which no study ran leaves the previous
report as it was. A run replaces the whole folder, so the folder must be
bivar's own: one holding files bivar did not write is refused, and so is
one another bivar is writing (the message names its process id). The
next run removes what a run that was killed left behind.

Exit status: 0 when every study ran and every expectation held, 1 on bad
input, a failed study or an output that cannot be written, 2 on a usage
error, 3 when an expectation failed, 130 after SIGINT (Ctrl-C) and 143
after SIGTERM.

` + manifestHelp,
			Run: runRun,
		},
		{
			Name:  "check",
			Usage: "bivar check [--junit FILE] [--summary FILE] MANIFEST",
			Short: "compute every study and gate on its expectations (for CI)",
			Long: `Computes everything 'bivar run' computes but writes only what a CI job
needs: a short summary on stderr, and optionally JUnit XML (--junit, one
test case per expectation) and a Markdown summary (--summary). Both are
written beside their places first and then each renamed over the old
file, one right after the other, so CI never reads a half-written file; a
check that fails or is stopped before the renames leaves both old files.

Exit status: 0 when every study ran and every expectation held, 1 on bad
input or when a study did not run, 2 on a usage error, 3 when an
expectation failed, 130 after SIGINT (Ctrl-C) and 143 after SIGTERM.

` + manifestHelp,
			Run: runCheck,
		},
		{
			Name:  "diff",
			Usage: "bivar diff [-o DIR] [--fail-on LIST] [--theme NAME] OLD NEW",
			Short: "compare two runs' results.json and say what changed",
			Long: `OLD and NEW are results.json files, or folders holding one. For every
study in both, tests the change in r (Fisher z) and in slope (t test for
equal slopes), lists changed verdicts and data hashes, and studies added or
removed. Writes diff.html, diff.md and diff.json to -o DIR (default: diff),
a folder of its own replaced whole in one step, as 'bivar run' replaces
its report.

The CI gates whose outcome changed come first, then each change in slope
set against the declared slope gate and shown in y units at the x values
the study predicts at, with a chart of the old line against the new one.

--fail-on chooses which changes give exit status 3 (comma-separated;
default none): expectation (a CI gate that held in OLD fails in NEW, or a
new gate fails), verdict (a verdict changed: form, direction, strength,
outlier-driven, reversal, drift, changing spread, explained by, groups'
lines or agreement; or a study that ran in OLD did not run in NEW),
significant (r or the slope changed beyond chance).
Exit status: 0, or 3 for a gated change; 1 on bad input, 2 on a usage
error (OLD and NEW the same file among them), 130 after SIGINT and 143
after SIGTERM.`,
			Run: runDiff,
		},
		{
			Name:  "init",
			Usage: "bivar init [-o MANIFEST] [--force] CSV",
			Short: "write a starting manifest for a data file",
			Long: `Reads the header and the numeric columns of CSV and writes a starting
manifest (default bivar.toml beside the CSV) with each key documented and
one line per candidate pair of columns. The pairs are left commented out
for you to choose, unless exactly one pair is a setting (few evenly spaced
values) with a measurement: that one is active, so "bivar run" gives a
first report at once. Time columns (year, quarter, date, ...) go on x only
and are offered as order; the manifest says how each choice was made.
Numbers with thousands separators are read as numbers, and the dataset
declares the separator (thousands = ","); a spreadsheet or other binary file is named, with what to do.
An existing manifest is never overwritten without --force. A file without
at least two numeric columns that vary is refused: there is nothing to pair.`,
			Run: runInit,
		},
		{
			Name:  "version",
			Usage: "bivar version",
			Short: "print the version",
			Long: `Prints bivar's version: the module version stamped by the build, or "dev"
with the commit it was built from when the build recorded one
("dev (commit abc123def456, modified)": modified when the tree had changes
not yet committed). Reports name the same version in their footer.`,
			Run: runVersion,
		},
		{
			Name:  "help",
			Usage: "bivar help [COMMAND]",
			Short: "show help for bivar or one command",
			Long:  `Shows the command list, or a command's full help.`,
			Run:   nil, // set in run: help needs the table itself
		},
	}
}

func main() {
	// A soft limit on the heap (Go's GOMEMLIMIT, which overrides it): the
	// garbage collector works harder as the heap nears it instead of
	// letting it grow to twice what is live, so a file of 10⁷ rows stays
	// near the memory it needs. Soft: a run that needs more still gets it.
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(defaultMemoryLimit)
		followLiveHeap()
	}
	// A collection when the heap has grown by half (Go's GOGC, which
	// overrides it), not by its default of all that is live. The heap is
	// mostly columns of numbers, which the collector need not scan, so a
	// cycle costs little, and a freed column's memory is reused sooner
	// instead of new memory being taken from the system: every fresh page
	// costs a fault and the kernel's zeroing, a sixth of the CPU time of a
	// 10⁶-row study on a virtual machine. Measured with bench-pair.sh's
	// study, alternating runs, CPU (user + system) medians: when a 10⁶-row
	// study took 1.4 s, a quarter against all (100) went 1.44 → 1.36 s and
	// 194 → 146 MB peak, and 10⁷ rows 13.2 → 12.3 s. Now that the study
	// takes a tenth of that, collecting that often costs more than the
	// memory it saves: half against a quarter, the median of paired runs'
	// ratios was 0.89 at 10⁵ rows (15 pairs; 35 → 38 MB peak), 0.92 and
	// 0.95 at 10⁶ (15 and 20 pairs; 108 → 121 MB) and 0.95 at 10⁷ (4
	// pairs; 740 → 737 MB, where the soft limit governs), and all (100)
	// was between them at 10⁶ (0.97, 146 MB), on 2026-12-05.
	if os.Getenv("GOGC") == "" {
		debug.SetGCPercent(defaultGCPercent)
	}
	ctx, stop := withSignals(context.Background())
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// defaultMemoryLimit is the soft heap limit main sets unless GOMEMLIMIT is
// set: 768 MiB, so that with the runtime's own overhead a run stays near
// 1 GB of memory where the data allow it.
const defaultMemoryLimit = 768 << 20

// followLiveHeap raises the soft memory limit when the live heap stays
// near it: after thrashCycles collections in a row that each leave the
// live heap above fifteen sixteenths of the limit, to the live heap and
// an eighth more. A limit below what a run must hold has the collector
// run without pause and the runtime hand memory back to the system only
// to take it again: a 10⁷-row dataset of eight columns (650 MB of
// columns) with four studies ran 1573 collections and 72 s of CPU (20 s
// of it the system's), and with this 186 and 49 s, at 1.69 GB peak
// instead of 1.64. One study of 10⁷ rows keeps its peak near 800 MB either
// way. It runs after each collection from a finalizer that re-arms itself
// (the runtime calls finalizers on one goroutine of their own).
func followLiveHeap() {
	near := 0 // collections in a row with the live heap near the limit
	var arm func()
	arm = func() {
		type sentinel struct{ _ [16]byte } // not zero-size: those may share an address
		runtime.SetFinalizer(&sentinel{}, func(*sentinel) {
			sample := []metrics.Sample{{Name: "/gc/heap/live:bytes"}}
			metrics.Read(sample)
			if sample[0].Value.Kind() == metrics.KindUint64 {
				live := int64(sample[0].Value.Uint64())
				limit := debug.SetMemoryLimit(-1)
				if live > limit-limit/16 {
					near++
				} else {
					near = 0
				}
				if near >= thrashCycles {
					debug.SetMemoryLimit(live + live/8)
					near = 0
				}
			}
			arm()
		})
	}
	arm()
}

// thrashCycles is how many collections in a row near the soft limit make
// followLiveHeap raise it.
const thrashCycles = 8

// defaultGCPercent is the heap growth, in percent of the live heap, that
// starts a collection unless GOGC is set (see main).
const defaultGCPercent = 50

// run dispatches to a subcommand and returns the exit status. Everything
// it prints passes through cleantext.Writer: names and values from the
// user's files are quoted in messages, and a terminal must show their
// escape sequences, carriage returns and invalid bytes, not obey them.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	stdout, stderr = cleantext.Writer(stdout), cleantext.Writer(stderr)
	if len(args) == 0 {
		usage(stderr)
		return exitUsage
	}
	name := args[0]
	switch name {
	case "-h", "-help", "--help":
		usage(stdout)
		return exitOK
	case "help":
		return runHelp(args[1:], stdout, stderr)
	case "-version", "--version":
		name = "version"
	}
	for _, c := range commands() {
		if c.Name == name && c.Run != nil {
			return c.Run(ctx, args[1:], stdout, stderr)
		}
	}
	fmt.Fprintf(stderr, "bivar: unknown command %q%s. Run 'bivar help'.\n", name, commandHint(name, args[1:]))
	return exitUsage
}

// commandHint says what an unknown command name may have meant: the
// nearest command (" (did you mean run?)"), or for a file given without a
// command, the command that reads it. "" when nothing fits.
func commandHint(name string, rest []string) string {
	var names []string
	for _, c := range commands() {
		names = append(names, c.Name)
	}
	if near := manifest.Nearest(name, names); near != "" {
		return fmt.Sprintf(" (did you mean %s?)", near)
	}
	quoted := strings.Join(append([]string{name}, rest...), " ")
	switch strings.ToLower(filepath.Ext(name)) {
	case ".toml":
		return fmt.Sprintf(": to run the studies of a manifest, give the command first: bivar run %s", quoted)
	case ".json":
		return fmt.Sprintf(": to compare two runs' results, give the command first: bivar diff %s", quoted)
	}
	if dataExtension(name) {
		return fmt.Sprintf(": to write a starting manifest for a data file, give the command first: bivar init %s", quoted)
	}
	return ""
}

// usage writes the command list generated from the table.
func usage(w io.Writer) {
	fmt.Fprint(w, `bivar runs two-variable studies declared in a TOML manifest and writes a
report (HTML, Markdown, results.json) that says what shape a relationship
has, which way it goes, how strong it is, whether a few units make it, and
what may not be claimed.

Usage:

`)
	width := 0
	for _, c := range commands() {
		width = max(width, len(c.Usage))
	}
	for _, c := range commands() {
		fmt.Fprintf(w, "  %-*s  %s\n", width, c.Usage, c.Short)
	}
	fmt.Fprint(w, `
Examples:

  bivar init data/furnace.csv            # a starting manifest for a data file
  bivar run bivar.toml                   # the report, in the manifest's output folder
  bivar check --junit junit.xml bivar.toml
  bivar diff old/results.json new/results.json

Run 'bivar help COMMAND' for a command's options.
`)
}

func runHelp(args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		usage(stdout)
		return exitOK
	}
	for _, c := range commands() {
		if c.Name == args[0] {
			if c.Run != nil {
				// The command's own -h: the same text and options, spelled
				// the same, as 'bivar COMMAND -h'.
				return c.Run(context.Background(), []string{"-h"}, stdout, stderr)
			}
			commandHelp(stdout, c)
			return exitOK
		}
	}
	fmt.Fprintf(stderr, "bivar help: unknown command %q%s. Run 'bivar help'.\n", args[0], commandHint(args[0], nil))
	return exitUsage
}

// commandHelp writes one command's usage and long help.
func commandHelp(w io.Writer, c command) {
	fmt.Fprintf(w, "usage: %s\n\n%s\n", c.Usage, strings.TrimSpace(c.Long))
}

// lookup returns the table entry for name; it panics on a name not in the
// table, which is a programmer error.
func lookup(name string) command {
	for _, c := range commands() {
		if c.Name == name {
			return c
		}
	}
	panic("bivar: no command " + name)
}

func runVersion(_ context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("version")
	if code, ok := parseFlags(fs, args, stdout, stderr); !ok {
		return code
	}
	if fs.NArg() != 0 {
		fmt.Fprintf(stderr, "bivar version: takes no arguments\n")
		return exitUsage
	}
	fmt.Fprintf(stdout, "bivar %s\n", version())
	return exitOK
}

// version is bivar's version as the build stamped it in the binary
// (versionOf the build information), so that a report attached to a
// change request names the code that wrote it. It is the same in every
// run of one binary, so SOURCE_DATE_EPOCH runs stay byte for byte alike.
func version() string {
	bi, _ := debug.ReadBuildInfo()
	return versionOf(bi)
}

// versionOf reads a version from build information: the main module's
// version when the build has one of its own (a tag: go install
// bivar@v1.2.0, or a build at a tagged commit), else "dev" with the commit
// the go command stamped (vcs.revision, its first 12 hex digits, and
// "modified" when vcs.modified says the tree had uncommitted changes):
// "dev (commit abc123def456, modified)". Since Go 1.24 a build in a
// checkout also gets a pseudo-version made from that commit
// ("v0.0.0-20261205073807-abc123def456+dirty"); it is shown in the dev form
// too, which says the same more plainly. Plain "dev" without either (a
// build with -buildvcs=false or outside a checkout, or a test binary).
func versionOf(bi *debug.BuildInfo) string {
	if bi == nil {
		return "dev"
	}
	var rev string
	var modified bool
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			modified = s.Value == "true"
		}
	}
	if len(rev) > 12 {
		rev = rev[:12]
	}
	if v := bi.Main.Version; v != "" && v != "(devel)" && (rev == "" || !strings.Contains(v, rev)) {
		return v
	}
	if rev == "" {
		return "dev"
	}
	if modified {
		return "dev (commit " + rev + ", modified)"
	}
	return "dev (commit " + rev + ")"
}
