package main

// This file holds `bivar init`: a starting manifest for a new data file.

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf8"

	"bivar/analysis/dataset"
	"bivar/analysis/findings"
	"bivar/analysis/manifest"
	"bivar/themes"
)

// initMaxPairs bounds the commented-out studies init writes; the rest are
// named in a comment so the manifest stays readable.
const initMaxPairs = 30

// initMaxGroupLevels is the most levels a text column may have to be
// suggested as a group.
const initMaxGroupLevels = 12

func runInit(_ context.Context, args []string, stdout, stderr io.Writer) int {
	flags := newFlagSet("init")
	out := flags.String("o", "", "write the manifest to `MANIFEST`, or to bivar.toml in it when it is a folder (default: bivar.toml beside the CSV)")
	force := flags.Bool("force", false, "overwrite an existing manifest")
	if code, ok := parseFlags(flags, args, stdout, stderr); !ok {
		return code
	}
	if flags.NArg() != 1 {
		fmt.Fprintf(stderr, "bivar init: want one CSV file, got %s\nusage: %s\n", nArgs(flags.NArg()), lookup("init").Usage)
		return exitUsage
	}
	csvPath := flags.Arg(0)
	dest := *out
	if dest == "" {
		dest = filepath.Join(filepath.Dir(csvPath), "bivar.toml")
	} else if info, err := os.Stat(dest); err == nil && info.IsDir() {
		dest = filepath.Join(dest, "bivar.toml") // -o FOLDER: the manifest goes in it
	}
	if _, err := os.Stat(dest); err == nil && !*force {
		fmt.Fprintf(stderr, "bivar init: %s exists; not overwritten (use --force to replace it, or -o to write elsewhere)\n", dest)
		return exitFailed
	} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
		fmt.Fprintf(stderr, "bivar init: %v\n", err)
		return exitFailed
	}
	prof, err := profileCSV(csvPath)
	if err != nil {
		fmt.Fprintf(stderr, "bivar init: %v\n", err)
		return exitFailed
	}
	if len(prof.pairs()) == 0 {
		fmt.Fprintf(stderr, "bivar init: %s; no manifest written\n", noPairMessage(prof))
		return exitFailed
	}
	rel, err := relPath(filepath.Dir(dest), csvPath)
	if err != nil {
		fmt.Fprintf(stderr, "bivar init: %v\n", err)
		return exitFailed
	}
	text := initManifest(prof, rel)
	if err := writeWith(dest, func(w io.Writer) error { _, err := io.WriteString(w, text); return err }); err != nil {
		fmt.Fprintf(stderr, "bivar init: writing %s: %v\n", dest, err)
		return exitFailed
	}
	for _, c := range prof.badCells() {
		fmt.Fprintf(stderr, "bivar init: %s: column %q: %s; the manifest counts such cells as missing (non_numeric = \"missing\"): correct them, or keep that line\n", csvPath, c.name, badText(c))
	}
	nPairs := len(prof.pairs())
	more := " (the first active, the others commented out)"
	if nPairs == 1 {
		more = " (active)"
	}
	fmt.Fprintf(stderr, "bivar init: wrote %s: %s, %s%s\n", dest, plural(len(prof.numeric()), "numeric column", "numeric columns"), plural(nPairs, "candidate study", "candidate studies"), more)
	fmt.Fprintf(stderr, "bivar init: next: bivar run %s  (then choose your studies in it)\n", dest)
	return exitOK
}

// relPath returns target relative to dir, slash-separated, as the manifest
// wants it.
func relPath(dir, target string) (string, error) {
	absDir, err := filepath.Abs(dir)
	if err != nil {
		return "", err
	}
	absT, err := filepath.Abs(target)
	if err != nil {
		return "", err
	}
	rel, err := filepath.Rel(absDir, absT)
	if err != nil {
		return filepath.ToSlash(absT), nil
	}
	return filepath.ToSlash(rel), nil
}

// csvProfile is what init learned about a data file.
type csvProfile struct {
	file         string
	delimiter    rune
	decimalComma bool
	rows         int
	cols         []colProfile
}

type colProfile struct {
	name      string
	isNumeric bool // every non-missing cell parses as a number
	missing   int
	nonEmpty  int
	min, max  float64
	constant  bool
	counter   bool // whole numbers rising by one each row: a row or run number
	// nonNumeric counts the cells of a numeric column that are not numbers
	// (nor missing); firstBad says where the first is ("line 7: \"x3\"").
	nonNumeric int
	firstBad   string
	levels     int  // distinct values (text columns; counted up to a bound)
	unique     bool // every value differs (text columns)
}

func (p *csvProfile) numeric() []colProfile {
	var out []colProfile
	for _, c := range p.cols {
		if c.isNumeric {
			out = append(out, c)
		}
	}
	return out
}

// analysable are the numeric columns worth pairing: not constant, not a
// row counter, with at least three values.
func (p *csvProfile) analysable() []colProfile {
	var out []colProfile
	for _, c := range p.numeric() {
		if !c.constant && !c.counter && c.nonEmpty >= 3 {
			out = append(out, c)
		}
	}
	return out
}

// pairs are the candidate studies: every pair of analysable columns, the
// earlier column as x.
func (p *csvProfile) pairs() [][2]colProfile {
	a := p.analysable()
	var out [][2]colProfile
	for i := range a {
		for j := i + 1; j < len(a); j++ {
			out = append(out, [2]colProfile{a[i], a[j]})
		}
	}
	return out
}

// profileCSV reads a CSV file as 'bivar run' will read it (dataset.Read:
// the same delimiter and decimal-mark detection, quoting rules and
// missing-value tokens "" and "NA") and learns for every column whether it
// is numeric. A column whose cells are numbers but for a few (at most one
// in ten, or a single one) is numeric with those cells noted, so a typo in
// a data cell is reported where it is rather than turning the column into
// text.
func profileCSV(path string) (*csvProfile, error) {
	info, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil, fmt.Errorf("%s: no such file; give the path of a CSV data file with a header row", path)
	case err != nil:
		return nil, err
	case info.IsDir():
		return nil, fmt.Errorf("%s is a folder: give one CSV data file in it", path)
	}
	if err := utf8File(path); err != nil {
		return nil, err
	}
	header, err := dataset.Header(path, 0)
	if err != nil {
		return nil, err
	}
	if len(header) == 0 || len(header) == 1 && header[0] == "" {
		return nil, fmt.Errorf("%s: the first line is blank; want a header line naming the columns, then data rows", path)
	}
	for i, h := range header {
		if h == "" {
			return nil, fmt.Errorf("%s: line 1, column %d has no name; give every column a name in the header", path, i+1)
		}
	}
	if dup := firstDuplicate(header); dup != "" {
		return nil, fmt.Errorf("%s: line 1: column %q is named twice; give each column its own name", path, dup)
	}
	tab, err := dataset.Read(path, dataset.Options{NonNumericAsMissing: true}, header, header)
	if err != nil {
		return nil, err
	}
	if tab.Rows == 0 {
		return nil, fmt.Errorf("%s: a header but no data rows; add the measurements below the header line", path)
	}
	prof := &csvProfile{file: path, delimiter: tab.Delimiter, decimalComma: tab.DecimalComma, rows: tab.Rows}
	for _, name := range header {
		texts, nums := tab.Text[name], tab.Numeric[name]
		c := colProfile{name: name, min: math.Inf(1), max: math.Inf(-1), counter: true,
			missing: tab.Missing[name], nonNumeric: tab.NonNumeric[name]}
		seen := map[string]bool{}
		prev := math.NaN()
		for i, cell := range texts {
			if cell == "" || cell == "NA" {
				c.counter = false
				continue
			}
			c.nonEmpty++
			seen[cell] = true
			v := nums[i]
			if math.IsNaN(v) {
				c.counter = false
				continue
			}
			c.min, c.max = math.Min(c.min, v), math.Max(c.max, v)
			if v != math.Trunc(v) || (!math.IsNaN(prev) && v != prev+1) {
				c.counter = false
			}
			prev = v
		}
		good := c.nonEmpty - c.nonNumeric
		c.isNumeric = good > 0 && (c.nonNumeric == 0 || good >= 2 && (c.nonNumeric == 1 || 10*c.nonNumeric <= c.nonEmpty))
		if c.isNumeric && c.nonNumeric > 0 {
			// Read the column strictly for the first bad cell's line and text.
			if _, err := dataset.Read(path, dataset.Options{}, []string{name}, nil); err != nil {
				var de *dataset.Error
				if errors.As(err, &de) && de.Line > 0 {
					c.firstBad = fmt.Sprintf("line %d: %q", de.Line, de.Text)
				}
			}
		}
		c.levels = len(seen)
		c.unique = c.nonEmpty > 0 && len(seen) == c.nonEmpty
		c.constant = c.isNumeric && c.min == c.max
		if !c.isNumeric || c.nonEmpty < 2 || c.nonNumeric > 0 {
			c.counter = false
		}
		prof.cols = append(prof.cols, c)
	}
	return prof, nil
}

// utf8File checks that the file is UTF-8 text (a BOM allowed), reading it
// in blocks, and names the line of the first byte that is not.
func utf8File(path string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	br := bufio.NewReaderSize(f, 1<<16)
	line := 1
	for {
		l, err := br.ReadBytes('\n')
		if !utf8.Valid(l) {
			return fmt.Errorf("%s:%d: not UTF-8 text (a byte that is not UTF-8: the file is in another encoding, such as Windows-1252); save it as UTF-8 CSV", path, line)
		}
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		line++
	}
}

func firstDuplicate(names []string) string {
	seen := map[string]bool{}
	for _, n := range names {
		if seen[n] {
			return n
		}
		seen[n] = true
	}
	return ""
}

var bareKey = regexp.MustCompile(`^[A-Za-z0-9_-]+$`)

// tomlKey writes a key bare when TOML allows it, else quoted.
func tomlKey(k string) string {
	if bareKey.MatchString(k) {
		return k
	}
	return tomlString(k)
}

// tomlString writes s as a TOML basic string.
func tomlString(s string) string {
	var b strings.Builder
	b.WriteByte('"')
	for _, r := range s {
		switch {
		case r == '"':
			b.WriteString(`\"`)
		case r == '\\':
			b.WriteString(`\\`)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04X`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte('"')
	return b.String()
}

var nonID = regexp.MustCompile(`[^a-z0-9]+`)

// studyID makes a study id "y-vs-x" from column names: lower case letters,
// digits and hyphens.
func studyID(x, y string, used map[string]bool) string {
	clean := func(s string) string {
		s = strings.Trim(nonID.ReplaceAllString(strings.ToLower(s), "-"), "-")
		if s == "" {
			s = "col"
		}
		return s
	}
	base := clean(y) + "-vs-" + clean(x)
	id := base
	for i := 2; used[id]; i++ {
		id = fmt.Sprintf("%s-%d", base, i)
	}
	used[id] = true
	return id
}

// display is a column name for a comment line: bare when it is plain,
// quoted (newlines and control characters escaped) otherwise.
func display(name string) string {
	if bareKey.MatchString(name) || (!strings.ContainsAny(name, "\"\\") && !strings.ContainsFunc(name, func(r rune) bool { return r < 0x20 || r == 0x7f })) {
		return name
	}
	return tomlString(name)
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

// initManifest writes the starting manifest for prof, whose CSV is at
// rel from the manifest's folder. Every key is explained where it
// stands; the studies are left commented out for the user to choose.
func initManifest(prof *csvProfile, rel string) string {
	var b strings.Builder
	base := strings.TrimSuffix(filepath.Base(prof.file), filepath.Ext(prof.file))
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }

	w("# bivar manifest for %s, written by 'bivar init'.\n", rel)
	w("#\n# Next: run  bivar run <this file>  for a first report, then choose your\n")
	w("# studies: remove the leading '# ' from the [[study]] blocks you want (each\n")
	w("# block down to the blank line).\n")
	w("# Keys left out take their default; every key is explained where it stands.\n\n")

	// kv writes one key line with its comment in a column.
	kv := func(line, comment string) { w("%-40s # %s\n", line, comment) }
	kv("title  = "+tomlString(base), "shown at the top of the report")
	kv("design = "+tomlString(manifest.DefaultDesign), strings.Join(manifest.Designs(), " | ")+":")
	w("%-40s # what the report may say about cause (observational: no claim of cause)\n", "")
	kv(fmt.Sprintf("alpha  = %g", manifest.DefaultAlpha), "significance level of every verdict; intervals at 1 - alpha")
	kv("adjust = "+tomlString(manifest.DefaultAdjust), strings.Join(manifest.Adjustments(), " | ")+": p-values adjusted across all studies")
	kv(fmt.Sprintf("# seed = %d", manifest.DefaultSeed), "seed of every random source (permutation tests, samples)")
	w("\n[output]\n")
	kv("dir     = "+tomlString(manifest.DefaultOutputDir), "folder for the report, relative to this file")
	kv("formats = ["+quoteJoin(manifest.DefaultFormats())+"]", "any of "+strings.Join(manifest.Formats(), ", "))
	kv("theme   = "+tomlString(themes.Default), strings.Join(themes.Names(), " | "))
	w("\n")
	th := findings.DefaultThresholds()
	kv("# [thresholds]", "the strength cut points (common practice, not a standard); docs/manifest.md lists every cut point")
	kv(fmt.Sprintf("# strong   = %g", th.Strong), "|r| at or above: strong")
	kv(fmt.Sprintf("# moderate = %g", th.Moderate), "|r| at or above: moderate")
	kv(fmt.Sprintf("# weak     = %g", th.Weak), "|r| at or above: weak; below: none")
	w("\n[[dataset]]\n")
	kv(`id      = "data"`, "studies name their dataset by this id")
	kv("file    = "+tomlString(rel), "relative to this file")
	if prof.delimiter != ',' {
		kv("delimiter = "+tomlString(string(prof.delimiter)), `detected; "," ";" "\t", or leave out to detect`)
	} else {
		kv(`# delimiter = ","`, `"," ";" "\t"; left out: detected`)
	}
	if prof.decimalComma {
		kv(`decimal = ","`, "detected: decimal comma")
	} else {
		kv(`# decimal = "."`, `"." or ","; left out: detected`)
	}
	kv("missing = ["+quoteJoin(manifest.DefaultMissing())+"]", "cells read as missing")
	if bad := prof.badCells(); len(bad) > 0 {
		kv(`non_numeric = "missing"`, strings.Join(manifest.NonNumericPolicies(), " | ")+": what a non-numeric cell in a studied column is;")
		w("%-40s # set here because some cells of numeric columns are not numbers:\n", "")
		for _, c := range bad {
			w("%-40s #   %s: %s\n", "", display(c.name), badText(c))
		}
		w("%-40s # correct them and remove this line (default %q: stop at such a cell)\n", "", manifest.DefaultNonNumeric)
	} else {
		kv("# non_numeric = "+tomlString(manifest.DefaultNonNumeric), strings.Join(manifest.NonNumericPolicies(), " | ")+": what a non-numeric cell in a studied column is")
	}
	var idCol string
	for _, c := range prof.cols {
		if !c.isNumeric && c.unique && c.missing == 0 {
			idCol = c.name
			break
		}
	}
	if idCol == "" {
		for _, c := range prof.cols {
			if c.counter {
				idCol = c.name
				break
			}
		}
	}
	if idCol != "" {
		kv("# id_column = "+tomlString(idCol), "names rows in the report (default: data row number)")
	} else {
		kv(`# id_column = "..."`, "a column that names rows in the report (default: data row number)")
	}

	num := prof.numeric()
	w("\n[dataset.units]   # UCUM unit code per column, e.g. \"Cel\", \"[degF]\", \"mm\", \"[in_i]\", \"%%\", \"kg\":\n")
	w("                  # remove the '# ' and write the code between the quotes (an empty one is refused)\n")
	for _, c := range num {
		w("# %s = \"\"\n", tomlKey(c.name))
	}
	w("\n[dataset.labels]  # names for people, shown on axes and in the text\n")
	for _, c := range num {
		w("# %s = %s\n", tomlKey(c.name), tomlString(c.name))
	}

	w("\n# Columns found in %s (%d data rows):\n", rel, prof.rows)
	for _, c := range prof.cols {
		switch {
		case c.isNumeric && c.counter:
			w("#   %-20s numeric, rises by 1 each row: a row or run number (try it as order)\n", display(c.name))
		case c.isNumeric && c.constant:
			w("#   %-20s numeric, constant (%s): nothing to relate\n", display(c.name), fmtNum(c.min))
		case c.isNumeric && c.nonNumeric > 0:
			w("#   %-20s numeric, %s to %s, %d missing, %s\n", display(c.name), fmtNum(c.min), fmtNum(c.max), c.missing, badText(c))
		case c.isNumeric:
			w("#   %-20s numeric, %s to %s, %d missing\n", display(c.name), fmtNum(c.min), fmtNum(c.max), c.missing)
		case c.unique && c.missing == 0:
			w("#   %-20s text, every value differs: a row name (try it as id_column)\n", display(c.name))
		case c.levels <= initMaxGroupLevels && c.levels > 0:
			w("#   %-20s text, %d levels (try it as group)\n", display(c.name), c.levels)
		default:
			w("#   %-20s text\n", display(c.name))
		}
	}

	var group, order string
	for _, c := range prof.cols {
		if group == "" && !c.isNumeric && !c.unique && c.levels >= 2 && c.levels <= initMaxGroupLevels {
			group = c.name
		}
		if order == "" && c.counter {
			order = c.name
		}
	}

	pairs := prof.pairs()
	if len(pairs) == 0 {
		// runInit refuses such a file; this keeps the text honest if called.
		w("\n# No pair of numeric, non-constant columns was found, so no study is suggested.\n")
		return b.String()
	}
	w("\n# Candidate studies, one per pair of numeric columns (x is the earlier column;\n")
	w("# swap x and y so that x is the setting or the cheaper measurement). Keys:\n")
	w("#   id, dataset, x, y   required; the id names the study in reports and in 'bivar diff'\n")
	w("#   title               a heading for people\n")
	w("#   group               a text column: per-group fits and a check for a reversal across groups\n")
	w("#   order               run order: drift and autocorrelation of the residuals\n")
	w("#   covariates          columns that may lurk behind the relationship (partial correlations)\n")
	w("#   also_in             other units for x and y: the unit-invariance table, e.g. { x = \"[degF]\" }\n")
	w("#   predict_at          x values to predict y at, with confidence and prediction intervals\n")
	w("#   notes               Markdown shown with the study\n")
	w("#   [study.expect]      CI gates checked by 'bivar check': direction (%s), form (%s),\n", strings.Join(manifest.Directions(), "|"), strings.Join(manifest.Forms(), "|"))
	w("#                       min_abs_r, r_within = [lo, hi], slope_within = [lo, hi] (recorded units),\n")
	w("#                       max_p (adjusted), min_n, not_outlier_driven = true\n")
	used := map[string]bool{}
	var rest []string
	for i, p := range pairs {
		x, y := p[0], p[1]
		id := studyID(x.name, y.name, used)
		if i >= initMaxPairs {
			rest = append(rest, id)
			continue
		}
		// The first study is left active so that 'bivar run' works at
		// once; the others are commented out for the user to choose.
		c := "# "
		if i == 0 {
			c = ""
			w("\n# A first study, left active so that 'bivar run' gives a report at once;\n")
			w("# keep it, change it or comment it out once you have chosen your own.\n")
			w("[[study]]\n")
		} else {
			w("\n# [[study]]\n")
		}
		w("%sid      = %s\n", c, tomlString(id))
		w("%stitle   = %s\n", c, tomlString(y.name+" against "+x.name))
		w("%sdataset = \"data\"\n", c)
		w("%sx       = %s\n", c, tomlString(x.name))
		w("%sy       = %s\n", c, tomlString(y.name))
		if group != "" {
			w("%s# group = %s\n", c, tomlString(group))
		}
		if order != "" {
			w("%s# order = %s\n", c, tomlString(order))
		}
		w("%s# predict_at = [%s]\n", c, fmtNum((x.min+x.max)/2))
		w("%s# [study.expect]\n", c)
		w("%s# min_abs_r = 0.5\n", c)
		w("%s# not_outlier_driven = true\n", c)
	}
	if len(rest) > 0 {
		w("\n# %d more pairs, not written out:\n", len(rest))
		for k := 0; k < len(rest); k += 3 {
			w("#   %s\n", strings.Join(rest[k:min(k+3, len(rest))], "  "))
		}
	}
	return b.String()
}

// badCells are the numeric columns that hold cells that are not numbers.
func (p *csvProfile) badCells() []colProfile {
	var out []colProfile
	for _, c := range p.numeric() {
		if c.nonNumeric > 0 {
			out = append(out, c)
		}
	}
	return out
}

// badText says how many cells of c are not numbers, and where the first is.
func badText(c colProfile) string {
	s := fmt.Sprintf("%d not a number", c.nonNumeric)
	if c.nonNumeric > 1 {
		s = fmt.Sprintf("%d not numbers", c.nonNumeric)
	}
	if c.firstBad != "" {
		s += " (first: " + c.firstBad + ")"
	}
	return s
}

// noPairMessage explains why a file gives no study: which columns are
// numeric, and why each of the others cannot be used.
func noPairMessage(p *csvProfile) string {
	var parts []string
	for _, c := range p.cols {
		why := "text"
		switch {
		case c.isNumeric && c.counter:
			why = "a row counter"
		case c.isNumeric && c.constant:
			why = "constant"
		case c.isNumeric && c.nonEmpty < 3:
			why = "fewer than 3 values"
		case c.isNumeric:
			why = "numeric"
		case c.nonEmpty == 0:
			why = "empty"
		}
		parts = append(parts, fmt.Sprintf("%s (%s)", display(c.name), why))
	}
	return fmt.Sprintf("%s: no pair of columns to relate: a study needs two numeric columns that vary, and the columns are %s; add a numeric column, or check that numbers are written with one decimal mark throughout",
		p.file, strings.Join(parts, ", "))
}

func quoteJoin(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = tomlString(s)
	}
	return strings.Join(q, ", ")
}
