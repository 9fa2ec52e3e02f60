package main

// This file holds `bivar init`: a starting manifest for a new data file.

import (
	"bytes"
	"context"
	"encoding/csv"
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
	flags := newFlagSet("init", stderr)
	out := flags.String("o", "", "write the manifest to `MANIFEST` (default: bivar.toml beside the CSV)")
	force := flags.Bool("force", false, "overwrite an existing manifest")
	if code, ok := parseFlags(flags, args); !ok {
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
	nPairs := len(prof.pairs())
	fmt.Fprintf(stderr, "bivar init: wrote %s: %d numeric columns, %d candidate studies (the first active, the others commented out)\n", dest, len(prof.numeric()), nPairs)
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
	levels    int  // distinct values (text columns; counted up to a bound)
	unique    bool // every value differs (text columns)
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

// profileCSV reads a CSV file: its delimiter (comma, semicolon or tab,
// whichever splits the header and the first rows into the same, largest
// number of fields), the decimal mark, and for every column whether it is
// numeric. Missing cells are "" and "NA", as the manifest's default.
func profileCSV(path string) (*csvProfile, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	if !utf8.Valid(data) {
		return nil, fmt.Errorf("%s: not UTF-8 text; save the file as UTF-8 CSV", path)
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	delim := detectDelimiter(data)
	r := csv.NewReader(bytes.NewReader(data))
	r.Comma = delim
	r.FieldsPerRecord = 0
	recs, err := r.ReadAll()
	if err != nil {
		return nil, fmt.Errorf("%s: %v", path, err)
	}
	if len(recs) == 0 {
		return nil, fmt.Errorf("%s: empty file; want a header line naming the columns, then data rows", path)
	}
	header := recs[0]
	for i, h := range header {
		header[i] = strings.TrimSpace(h)
		if header[i] == "" {
			return nil, fmt.Errorf("%s: line 1, column %d has no name; give every column a name in the header", path, i+1)
		}
	}
	if dup := firstDuplicate(header); dup != "" {
		return nil, fmt.Errorf("%s: line 1: column %q is named twice; give each column its own name", path, dup)
	}
	rows := recs[1:]
	if len(rows) == 0 {
		return nil, fmt.Errorf("%s: a header but no data rows", path)
	}
	prof := &csvProfile{file: path, delimiter: delim, rows: len(rows)}
	// The decimal comma: only with a semicolon or tab delimiter, when some
	// cell reads as a number with ',' for '.' and none has a '.' mark.
	if delim != ',' {
		comma, dot := false, false
		for _, rec := range rows {
			for _, cell := range rec {
				cell = strings.TrimSpace(cell)
				if strings.Contains(cell, ",") {
					if _, err := strconv.ParseFloat(strings.Replace(cell, ",", ".", 1), 64); err == nil {
						comma = true
					}
				} else if strings.Contains(cell, ".") {
					if _, err := strconv.ParseFloat(cell, 64); err == nil {
						dot = true
					}
				}
			}
		}
		prof.decimalComma = comma && !dot
	}
	for j, name := range header {
		c := colProfile{name: name, isNumeric: true, min: math.Inf(1), max: math.Inf(-1), counter: true}
		seen := map[string]bool{}
		prev := math.NaN()
		for _, rec := range rows {
			cell := ""
			if j < len(rec) {
				cell = strings.TrimSpace(rec[j])
			}
			if cell == "" || cell == "NA" {
				c.missing++
				c.counter = false
				continue
			}
			c.nonEmpty++
			if len(seen) <= len(rows) {
				seen[cell] = true
			}
			if prof.decimalComma {
				cell = strings.Replace(cell, ",", ".", 1)
			}
			v, err := strconv.ParseFloat(cell, 64)
			if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
				c.isNumeric = false
				continue
			}
			c.min, c.max = math.Min(c.min, v), math.Max(c.max, v)
			if v != math.Trunc(v) || (!math.IsNaN(prev) && v != prev+1) {
				c.counter = false
			}
			prev = v
		}
		c.levels = len(seen)
		c.unique = c.nonEmpty > 0 && len(seen) == c.nonEmpty
		c.constant = c.isNumeric && c.min == c.max
		if !c.isNumeric || c.nonEmpty < 2 {
			c.counter = false
		}
		if c.nonEmpty == 0 {
			c.isNumeric = false
		}
		prof.cols = append(prof.cols, c)
	}
	return prof, nil
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

// detectDelimiter picks the delimiter that gives the header and the next
// rows the same number of fields, preferring more fields; comma on a tie.
func detectDelimiter(data []byte) rune {
	best, bestFields := ',', 0
	for _, d := range []rune{',', ';', '\t'} {
		r := csv.NewReader(bytes.NewReader(data))
		r.Comma = d
		r.FieldsPerRecord = 0
		n, ok := 0, true
		for i := 0; i < 20; i++ {
			rec, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				ok = false
				break
			}
			n = len(rec)
		}
		if ok && n > bestFields {
			best, bestFields = d, n
		}
	}
	return best
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
	kv("# [thresholds]", "the verdicts' cut points; the defaults are common practice, not a standard")
	kv("# strong   = 0.7", "|r| at or above: strong")
	kv("# moderate = 0.4", "|r| at or above: moderate")
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
	kv("# non_numeric = "+tomlString(manifest.DefaultNonNumeric), strings.Join(manifest.NonNumericPolicies(), " | ")+": what a non-numeric cell in a studied column is")
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
	w("\n[dataset.units]   # UCUM unit code per column, e.g. \"Cel\", \"[degF]\", \"mm\", \"[in_i]\", \"%%\", \"kg\"\n")
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
		w("\n# No pair of numeric, non-constant columns was found, so no study is suggested.\n")
		w("# A study needs two numeric columns; add one like this:\n")
		w("# [[study]]\n# id      = \"y-vs-x\"\n# dataset = \"data\"\n# x       = \"...\"\n# y       = \"...\"\n")
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

func quoteJoin(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = tomlString(s)
	}
	return strings.Join(q, ", ")
}
