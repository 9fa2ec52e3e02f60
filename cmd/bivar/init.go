package main

// This file holds `bivar init`: a starting manifest for a new data file.

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"maps"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"unicode"
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
	if strings.EqualFold(filepath.Ext(csvPath), ".toml") {
		// Read as CSV, a manifest gives a puzzling message, and with
		// --force it would be overwritten by a manifest for itself.
		fmt.Fprintf(stderr, "bivar init: %s is a manifest, not a data file: run its studies with 'bivar run %s', or give bivar init the data file (CSV or .xlsx) to write a manifest for\n", csvPath, csvPath)
		return exitUsage
	}
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
	var profs []*csvProfile
	if dataset.IsWorkbook(csvPath) {
		var skipped []string
		var err error
		profs, skipped, err = profileWorkbook(csvPath)
		if err != nil {
			fmt.Fprintf(stderr, "bivar init: %v\n", err)
			return exitFailed
		}
		for _, s := range skipped {
			fmt.Fprintf(stderr, "bivar init: %s: %s; no dataset for it\n", csvPath, s)
		}
		if len(profs) == 0 {
			fmt.Fprintf(stderr, "bivar init: %s: no sheet has two numeric columns to pair (a header row naming the columns, then numbers below it); no manifest written\n", csvPath)
			return exitFailed
		}
	} else {
		prof, err := profileCSV(csvPath)
		if err != nil {
			fmt.Fprintf(stderr, "bivar init: %v\n", err)
			return exitFailed
		}
		if len(prof.pairs()) == 0 {
			fmt.Fprintf(stderr, "bivar init: %s; no manifest written\n", noPairMessage(prof))
			return exitFailed
		}
		profs = []*csvProfile{prof}
	}
	prof := profs[0]
	rel, err := relPath(filepath.Dir(dest), csvPath)
	if err != nil {
		fmt.Fprintf(stderr, "bivar init: %v\n", err)
		return exitFailed
	}
	text := initManifestAll(profs, rel)
	if err := writeWith(dest, func(w io.Writer) error { _, err := io.WriteString(w, text); return err }); err != nil {
		fmt.Fprintf(stderr, "bivar init: writing %s: %v\n", dest, err)
		return exitFailed
	}
	for _, p := range profs {
		at := csvPath
		if p.sheet != "" {
			at += fmt.Sprintf(": sheet %q", p.sheet)
		}
		for _, c := range p.badCells() {
			fmt.Fprintf(stderr, "bivar init: %s: column %q: %s; the manifest counts such cells as missing (non_numeric = \"missing\"): correct them, or keep that line\n", at, c.name, badText(c))
		}
	}
	if len(profs) > 1 || prof.sheet != "" {
		n := 0
		var names []string
		for _, p := range profs {
			n += len(p.pairs())
			names = append(names, strconv.Quote(p.sheet))
		}
		fmt.Fprintf(stderr, "bivar init: wrote %s: %s (%s), %s\n", dest, plural(len(profs), "dataset, one sheet", "datasets, one per sheet"), strings.Join(names, ", "), plural(n, "candidate study", "candidate studies"))
		fmt.Fprintf(stderr, "bivar init: next: choose your studies in %s, then bivar run %s\n", dest, dest)
		return exitOK
	}
	sep, oneSep := prof.oneSeparator()
	for _, c := range prof.grouped() {
		if oneSep {
			fmt.Fprintf(stderr, "bivar init: %s: column %q: %s; the manifest declares thousands = %s for the dataset, so 'bivar run' reads them as numbers\n", csvPath, c.name, groupedText(c), tomlString(string(sep)))
		} else {
			fmt.Fprintf(stderr, "bivar init: %s: column %q: %s; init read them as numbers, but the columns use more than one separator and a dataset declares one: save the file with one separator, or none\n", csvPath, c.name, groupedText(c))
		}
	}
	pairs := prof.pairs()
	state := "none active: remove the '#' of the lines you want under \"study = [\""
	if a := active(pairs); a >= 0 {
		state = fmt.Sprintf("1 active, %s against setting %s; the others commented out", display(pairs[a].y.name), display(pairs[a].x.name))
		if len(pairs) == 1 {
			state = fmt.Sprintf("active: %s against setting %s", display(pairs[a].y.name), display(pairs[a].x.name))
		}
	}
	fmt.Fprintf(stderr, "bivar init: wrote %s: %s, %s (%s)\n", dest, plural(len(prof.numeric()), "numeric column", "numeric columns"), plural(len(pairs), "candidate study", "candidate studies"), state)
	switch {
	case len(prof.grouped()) > 0 && !oneSep:
		fmt.Fprintf(stderr, "bivar init: next: save %s with one thousands separator or none, choose your studies in %s, then bivar run %s\n", csvPath, dest, dest)
	case active(pairs) >= 0:
		fmt.Fprintf(stderr, "bivar init: next: bivar run %s  (then choose your studies in it)\n", dest)
	default:
		fmt.Fprintf(stderr, "bivar init: next: choose your studies in %s, then bivar run %s\n", dest, dest)
	}
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
	sheet        string // a workbook's sheet, "" for a CSV file
	id           string // the dataset id the manifest gives it; "" means "data"
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
	// thousands is the separator between groups of thousands the column's
	// numbers were written with ("1,120"), 0 for none; firstGrouped says
	// where the first such number is.
	thousands    rune
	firstGrouped string
	distinct     []float64 // the distinct numbers, sorted, when there are at most initMaxSettingLevels
	rising       bool      // numeric and never falling in file order
	dates        bool      // text whose every cell is a calendar date
	role         colRole
}

// colRole is what init takes a column to be, from its name and values; it
// decides which columns are paired, which way round and whether a pair is
// left active (see initRules).
type colRole int

const (
	roleText     colRole = iota // not numeric
	roleConstant                // numeric, one value
	roleCounter                 // whole numbers rising by one each row: a row or run number
	roleTime                    // a year, quarter, month, date or time of day
	roleSetting                 // few distinct values, evenly spaced (or in equal ratios): set, not measured
	roleMeasure                 // many distinct values: measured
	roleDiscrete                // few distinct values, unevenly spaced
)

// initMaxSettingLevels is the most distinct values a setting may have.
const initMaxSettingLevels = 10

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
		if c.role != roleConstant && c.role != roleCounter && c.nonEmpty >= 3 {
			out = append(out, c)
		}
	}
	return out
}

// pairKind says why a candidate pair is written as it is.
type pairKind int

const (
	pairSettingResponse pairKind = iota // a setting on x, a measured column on y
	pairOther                           // two columns, neither clearly set: the earlier on x
	pairSeries                          // time on x: a series, not a relationship between two measurements
)

// candidate is one candidate study.
type candidate struct {
	x, y colProfile
	kind pairKind
}

// initRules says, in the manifest's words, how init classifies columns and
// pairs them; pairs and roleOf implement it.
const initRules = `# How init chose (from names and values only; check it against what you know):
#   a setting has at most %d distinct values, evenly spaced or in equal ratios,
#     each used twice or more on average; a measurement has more distinct
#     values, or values that mostly differ;
#   a time column is named year, quarter, month, week, day, date, period (or
#     time alone), or holds whole numbers from 1000 to 2200 rising by one;
#   time goes on x only, two time columns are never paired (year with quarter),
#     nor two settings; a setting goes on x, else a column with few values
#     (unevenly spaced) rather than a measurement, else the earlier column;
#   a study is left active only when exactly one pair is a setting with a
#     measurement; otherwise all are commented out for you to choose.
`

// pairs are the candidate studies, settings against measurements first,
// then the other pairs, then the series in time, each group in column
// order.
func (p *csvProfile) pairs() []candidate {
	a := p.analysable()
	var groups [3][]candidate
	for i := range a {
		for j := i + 1; j < len(a); j++ {
			x, y := a[i], a[j]
			switch {
			case x.role == roleTime && y.role == roleTime,
				x.role == roleSetting && y.role == roleSetting:
				continue
			case y.role == roleTime:
				x, y = y, x
				fallthrough
			case x.role == roleTime:
				groups[pairSeries] = append(groups[pairSeries], candidate{x, y, pairSeries})
			case y.role == roleSetting && x.role == roleMeasure:
				x, y = y, x
				fallthrough
			case x.role == roleSetting && y.role == roleMeasure:
				groups[pairSettingResponse] = append(groups[pairSettingResponse], candidate{x, y, pairSettingResponse})
			case y.role == roleSetting, y.role == roleDiscrete && x.role == roleMeasure:
				x, y = y, x // the column with fewer values is likelier set than measured
				fallthrough
			default:
				groups[pairOther] = append(groups[pairOther], candidate{x, y, pairOther})
			}
		}
	}
	return append(append(groups[0], groups[1]...), groups[2]...)
}

// active is the index of the pair left active, or -1: the one pair of a
// setting with a measurement, when there is exactly one.
func active(pairs []candidate) int {
	n, at := 0, -1
	for i, c := range pairs {
		if c.kind == pairSettingResponse {
			n, at = n+1, i
		}
	}
	if n != 1 {
		return -1
	}
	return at
}

// timeWords are the words of a column name that make it a time column;
// "time" counts only as the whole name ("cycle time" is measured).
var timeWords = map[string]bool{"year": true, "years": true, "yr": true, "quarter": true, "qtr": true,
	"month": true, "week": true, "day": true, "date": true, "period": true, "jahr": true, "datum": true}

var nameWords = regexp.MustCompile(`[a-z]+`)

func timeName(name string) bool {
	l := strings.ToLower(strings.TrimSpace(name))
	if l == "time" || l == "t" {
		return true
	}
	for _, w := range nameWords.FindAllString(l, -1) {
		if timeWords[w] {
			return true
		}
	}
	return false
}

// dateCell matches the calendar dates init recognises: 2024-03-01,
// 2024-03, 2024-03-01 14:05(:09), 2024-03-01T14:05, 01/03/2024, 1.3.2024.
var dateCell = regexp.MustCompile(`^(\d{4}-\d{1,2}(-\d{1,2}([ T]\d{1,2}:\d{2}(:\d{2}(\.\d+)?)?)?)?|\d{1,2}[./]\d{1,2}[./]\d{2,4})$`)

// roleOf classifies a profiled column (see initRules).
func roleOf(c colProfile) colRole {
	switch {
	case !c.isNumeric:
		return roleText
	case c.constant:
		return roleConstant
	case timeName(c.name):
		return roleTime
	case c.counter && c.min >= 1000 && c.max <= 2200:
		return roleTime // whole numbers rising by one in the range of years
	case c.counter:
		return roleCounter
	case c.distinct == nil || 2*len(c.distinct) > c.nonEmpty:
		return roleMeasure // many values, or mostly different ones
	case evenlySpaced(c.distinct):
		return roleSetting
	}
	return roleDiscrete
}

// evenlySpaced reports whether the sorted distinct values have equal gaps,
// or (all positive) equal ratios, to 1%.
func evenlySpaced(v []float64) bool {
	if len(v) < 2 {
		return false
	}
	equal := func(f func(i int) float64) bool {
		g := f(1)
		for i := 2; i < len(v); i++ {
			if math.Abs(f(i)-g) > 0.01*math.Abs(g) {
				return false
			}
		}
		return true
	}
	if equal(func(i int) float64 { return v[i] - v[i-1] }) {
		return true
	}
	return v[0] > 0 && equal(func(i int) float64 { return math.Log(v[i] / v[i-1]) })
}

// groupSeps are the separators between thousands init recognises: comma,
// point, apostrophe, space, no-break space and narrow no-break space.
const groupSeps = ",.' \u00a0\u202f"

// parseGrouped reads a number written with a separator between groups of
// three digits ("1,120", "12 345,5", "1'000'000"), the decimal mark being
// a point or (decimalComma) a comma. It returns the number and the
// separator; ok is false unless s is such a number with at least one
// separator, every group after the first of exactly three digits.
func parseGrouped(s string, decimalComma bool) (v float64, sep rune, ok bool) {
	mark := '.'
	if decimalComma {
		mark = ','
	}
	body := strings.TrimLeft(s, "+-")
	if len(s)-len(body) > 1 {
		return 0, 0, false
	}
	intPart, frac, hasFrac := strings.Cut(body, string(mark))
	if hasFrac && (frac == "" || strings.Trim(frac, "0123456789") != "") {
		return 0, 0, false
	}
	for _, r := range intPart {
		if r < '0' || r > '9' {
			sep = r
			break
		}
	}
	if sep == 0 || sep == mark || !strings.ContainsRune(groupSeps, sep) {
		return 0, 0, false
	}
	groups := strings.Split(intPart, string(sep))
	for i, g := range groups {
		if strings.Trim(g, "0123456789") != "" || g == "" || len(g) > 3 || i > 0 && len(g) != 3 {
			return 0, 0, false
		}
	}
	plain := s[:len(s)-len(body)] + strings.Join(groups, "")
	if hasFrac {
		plain += "." + frac
	}
	v, err := strconv.ParseFloat(plain, 64)
	return v, sep, err == nil
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
	if err := notText(path); err != nil {
		return nil, err
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
	return profileTable(path, header, tab, func(name string) string {
		// Read the column strictly for the first bad cell's line and text.
		if _, err := dataset.Read(path, dataset.Options{}, []string{name}, nil); err != nil {
			var de *dataset.Error
			if errors.As(err, &de) && de.Line > 0 {
				return fmt.Sprintf("line %d: %q", de.Line, de.Text)
			}
		}
		return ""
	}), nil
}

// profileTable profiles the columns read into tab; firstBad says where a
// column's first non-numeric cell is.
func profileTable(path string, header []string, tab *dataset.Table, firstBad func(name string) string) *csvProfile {
	prof := &csvProfile{file: path, delimiter: tab.Delimiter, decimalComma: tab.DecimalComma, rows: tab.Rows}
	for _, name := range header {
		texts, nums := tab.Text[name].Slice(), tab.Numeric[name]
		c := colProfile{name: name, min: math.Inf(1), max: math.Inf(-1), counter: true,
			missing: tab.Missing[name], nonNumeric: tab.NonNumeric[name]}
		if c.nonNumeric > 0 {
			nums = readGrouped(&c, texts, nums, tab.DecimalComma)
		}
		seen := map[string]bool{}
		values := map[float64]bool{}
		prev := math.NaN()
		c.rising, c.dates = true, true
		for i, cell := range texts {
			if cell == "" || cell == "NA" {
				c.counter = false
				continue
			}
			c.nonEmpty++
			seen[cell] = true
			c.dates = c.dates && dateCell.MatchString(cell)
			v := nums[i]
			if math.IsNaN(v) {
				c.counter = false
				continue
			}
			c.min, c.max = math.Min(c.min, v), math.Max(c.max, v)
			if len(values) <= initMaxSettingLevels {
				values[v] = true
			}
			if v != math.Trunc(v) || (!math.IsNaN(prev) && v != prev+1) {
				c.counter = false
			}
			if !math.IsNaN(prev) && v < prev {
				c.rising = false
			}
			prev = v
		}
		if len(values) <= initMaxSettingLevels {
			c.distinct = slices.Sorted(maps.Keys(values))
		}
		good := c.nonEmpty - c.nonNumeric
		c.isNumeric = good > 0 && (c.nonNumeric == 0 || good >= 2 && (c.nonNumeric == 1 || 10*c.nonNumeric <= c.nonEmpty))
		if c.isNumeric && c.nonNumeric > 0 {
			c.firstBad = firstBad(name)
		}
		c.levels = len(seen)
		c.unique = c.nonEmpty > 0 && len(seen) == c.nonEmpty
		c.constant = c.isNumeric && c.min == c.max
		if !c.isNumeric || c.nonEmpty < 2 || c.nonNumeric > 0 {
			c.counter = false
		}
		c.rising = c.rising && c.isNumeric
		c.dates = c.dates && !c.isNumeric && c.nonEmpty > 0
		c.role = roleOf(c)
		prof.cols = append(prof.cols, c)
	}
	return prof
}

// profileWorkbook profiles every sheet of a workbook as 'bivar run' reads
// it (header in the first non-empty row; error cells missing) and keeps
// the sheets with at least one candidate pair, in tab order, each with a
// dataset id made from its name. skipped says why the others were left.
func profileWorkbook(path string) (profs []*csvProfile, skipped []string, err error) {
	w, err := dataset.OpenWorkbook(path, nil)
	if err != nil {
		return nil, nil, err
	}
	used := map[string]bool{}
	for _, sheet := range w.Sheets() {
		ref := dataset.SheetRef{Name: sheet}
		header, err := w.Header(ref, 0)
		if err != nil {
			skipped = append(skipped, fmt.Sprintf("sheet %q: %v", sheet, err))
			continue
		}
		var names []string
		for _, h := range header {
			if h != "" && !slices.Contains(names, h) {
				names = append(names, h)
			}
		}
		tab, err := w.Read(ref, 0, dataset.Options{NonNumericAsMissing: true}, names, names)
		if err != nil || tab.Rows == 0 {
			skipped = append(skipped, fmt.Sprintf("sheet %q: no data rows", sheet))
			continue
		}
		prof := profileTable(path, names, tab, func(name string) string {
			if _, err := w.Read(ref, 0, dataset.Options{}, []string{name}, nil); err != nil {
				var de *dataset.Error
				if errors.As(err, &de) && de.Cell != "" {
					return fmt.Sprintf("cell %s: %q", de.Cell, de.Text)
				}
			}
			return ""
		})
		if len(prof.pairs()) == 0 {
			skipped = append(skipped, fmt.Sprintf("sheet %q: fewer than two numeric columns to pair", sheet))
			continue
		}
		prof.sheet = sheet
		prof.id = sheetID(sheet, used)
		profs = append(profs, prof)
	}
	return profs, skipped, nil
}

// sheetID makes a dataset id from a sheet's name: letters and digits kept,
// other runs turned into '-', lower case, made unique with a number.
func sheetID(sheet string, used map[string]bool) string {
	var b strings.Builder
	dash := false
	for _, r := range strings.ToLower(sheet) {
		if r < 128 && (unicode.IsLetter(r) || unicode.IsDigit(r)) {
			if dash && b.Len() > 0 {
				b.WriteByte('-')
			}
			b.WriteRune(r)
			dash = false
		} else {
			dash = true
		}
	}
	id := b.String()
	if id == "" {
		id = "sheet"
	}
	base := id
	for n := 2; used[id]; n++ {
		id = fmt.Sprintf("%s-%d", base, n)
	}
	used[id] = true
	return id
}

// readGrouped reads the cells of a column that did not parse as numbers
// written with a separator between thousands (parseGrouped). When every
// such cell is one, with the same separator throughout, the column's
// numbers are returned with them filled in, c.thousands names the
// separator and c.firstGrouped the first such cell; otherwise nums comes
// back unchanged.
func readGrouped(c *colProfile, texts []string, nums []float64, decimalComma bool) []float64 {
	out := slices.Clone(nums)
	var sep rune
	first := ""
	for i, cell := range texts {
		if !math.IsNaN(nums[i]) || cell == "" || cell == "NA" {
			continue
		}
		v, s, ok := parseGrouped(cell, decimalComma)
		if !ok || sep != 0 && s != sep {
			return nums
		}
		if sep == 0 {
			first = fmt.Sprintf("data row %d: %q", i+1, cell)
		}
		sep, out[i] = s, v
	}
	c.thousands, c.firstGrouped, c.nonNumeric = sep, first, 0
	return out
}

// fileKinds are the binary files init recognises by their first bytes
// (their "magic numbers", as each format's specification gives them).
var fileKinds = []struct {
	magic string
	what  string
}{
	{"\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1", "an Excel 97-2003 workbook (.xls) or another legacy Office file (OLE compound file)"},
	{"%PDF-", "a PDF document"},
	{"\x1F\x8B", "a gzip-compressed file"},
	{"PAR1", "a Parquet file"},
	{"SQLite format 3\x00", "an SQLite database"},
	{"\x89PNG\r\n\x1A\n", "a PNG image"},
	{"\xFF\xD8\xFF", "a JPEG image"},
	{"\xFF\xFE", "UTF-16 text (little-endian)"},
	{"\xFE\xFF", "UTF-16 text (big-endian)"},
}

// notText recognises a spreadsheet or another binary file by its first
// bytes and says what it is and what to do; it returns nil for anything
// else (utf8File then checks the encoding). A ZIP archive is named by what
// it holds: an Excel workbook (an entry under xl/), an OpenDocument
// spreadsheet (its mimetype entry), or any other ZIP archive.
func notText(path string) error {
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	head := make([]byte, 1<<16)
	n, err := io.ReadFull(f, head)
	if err != nil && err != io.ErrUnexpectedEOF && err != io.EOF {
		return err
	}
	head = head[:n]
	const save = "open it in the program that wrote it and save (or export) the sheet with the data as \"CSV UTF-8\", one sheet per file, then run bivar init on the .csv file"
	if bytes.HasPrefix(head, []byte("PK\x03\x04")) {
		what := "a ZIP archive, not a CSV text file; unpack it and run bivar init on the CSV file in it"
		switch {
		case bytes.Contains(head, []byte("opendocument.spreadsheet")):
			what = "an OpenDocument spreadsheet (.ods), not a CSV text file; " + save
		case bytes.Contains(head, []byte("xl/")):
			what = "an Excel workbook, not a CSV text file; bivar reads workbooks named .xlsx: rename it to end in .xlsx and run bivar init on that"
		}
		return fmt.Errorf("%s is %s", path, what)
	}
	for _, k := range fileKinds {
		if !bytes.HasPrefix(head, []byte(k.magic)) {
			continue
		}
		switch {
		case strings.HasPrefix(k.what, "UTF-16"):
			return fmt.Errorf("%s is %s; bivar reads UTF-8: save it again as \"CSV UTF-8\" (or convert it, e.g. iconv -f UTF-16 -t UTF-8)", path, k.what)
		case strings.Contains(k.what, "Excel"):
			return fmt.Errorf("%s is %s, not a CSV text file; %s", path, k.what, save)
		}
		return fmt.Errorf("%s is %s, not a CSV text file; export the data as CSV (UTF-8, a header line naming the columns) and run bivar init on that", path, k.what)
	}
	if i := bytes.IndexByte(head, 0); i >= 0 {
		return fmt.Errorf("%s is a binary file, not CSV text (a NUL byte at byte %d); export the data as CSV (UTF-8, a header line naming the columns) and run bivar init on that", path, i+1)
	}
	return nil
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
// rel from the manifest's folder. Every key is explained where it stands;
// the candidate studies are one line each in the study array, left
// commented out unless exactly one pair is a setting with a measurement
// (initRules).
func initManifest(prof *csvProfile, rel string) string {
	return initManifestAll([]*csvProfile{prof}, rel)
}

// initManifestAll writes a manifest with one dataset per profile (the
// sheets of a workbook, or one CSV file), their candidate studies in one
// list.
func initManifestAll(profs []*csvProfile, rel string) string {
	var b strings.Builder
	base := strings.TrimSuffix(filepath.Base(profs[0].file), filepath.Ext(profs[0].file))
	w := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	npairs := 0
	for _, prof := range profs {
		npairs += len(prof.pairs())
	}
	where := func(prof *csvProfile) string {
		if prof.sheet == "" {
			return rel
		}
		return fmt.Sprintf("%s, sheet %q", rel, prof.sheet)
	}
	idOf := func(prof *csvProfile) string {
		if prof.id == "" {
			return "data"
		}
		return prof.id
	}

	w("# bivar manifest for %s, written by 'bivar init'.\n", rel)
	w("#\n# Next: choose your studies in the list under \"study = [\" below (remove the\n")
	w("# leading '#' of a line to keep it), then run  bivar run <this file>.\n")
	w("# Keys left out take their default; every key is explained where it stands.\n\n")

	// kv writes one key line with its comment in a column.
	kv := func(line, comment string) { w("%-40s # %s\n", line, comment) }
	kv("title  = "+tomlString(base), "shown at the top of the report")
	kv("design = "+tomlString(manifest.DefaultDesign), strings.Join(manifest.Designs(), " | ")+":")
	w("%-40s # what the report may say about cause (observational: no claim of cause)\n", "")
	kv(fmt.Sprintf("alpha  = %g", manifest.DefaultAlpha), "significance level of every verdict; intervals at 1 - alpha")
	kv("adjust = "+tomlString(manifest.DefaultAdjust), strings.Join(manifest.Adjustments(), " | ")+": p-values adjusted across all studies")
	kv(fmt.Sprintf("# seed = %d", manifest.DefaultSeed), "recorded only: random samples are seeded by the rows")

	for _, prof := range profs {
		w("\n# Columns found in %s (%d data rows):\n", where(prof), prof.rows)
		for _, c := range prof.cols {
			w("#   %-20s %s\n", display(c.name), describe(c))
		}
	}

	w("\n")
	w(initRules, initMaxSettingLevels)
	w("\n# Keys: (of a study; write them inside its braces as key = value, comma-separated;\n")
	w("# a study written as a [[study]] block instead needs all of them out of the list)\n")
	w("#   id, dataset, x, y   required; the id names the study in reports and in 'bivar diff'\n")
	w("#   title               a heading for people\n")
	w("#   group               a text column: per-group fits and a check for a reversal across groups\n")
	w("#   order               run order: drift and autocorrelation of the residuals\n")
	w("#   covariates          columns that may lurk behind the relationship (partial correlations)\n")
	w("#   also_in             other units for x and y: the unit-invariance table, e.g. { x = \"[degF]\" }\n")
	w("#   predict_at          x values to predict y at, with confidence and prediction intervals\n")
	w("#   notes               Markdown shown with the study\n")
	w("#   expect              CI gates checked by 'bivar check', e.g. expect = { min_abs_r = 0.5 }:\n")
	w("#                       direction (%s), form (%s),\n", strings.Join(manifest.Directions(), "|"), strings.Join(manifest.Forms(), "|"))
	w("#                       min_abs_r, r_within = [lo, hi], slope_within = [lo, hi] (recorded units),\n")
	w("#                       max_p (adjusted), min_n, not_outlier_driven = true; agree = true (agreement studies)\n")
	for _, prof := range profs {
		var group, order string
		for _, c := range prof.cols {
			if group == "" && !c.isNumeric && !c.unique && !c.dates && c.levels >= 2 && c.levels <= initMaxGroupLevels {
				group = c.name
			}
		}
		for _, c := range prof.cols { // a run counter first, else a rising time column
			if order == "" && c.role == roleCounter {
				order = c.name
			}
		}
		for _, c := range prof.cols {
			if order == "" && c.role == roleTime && c.rising {
				order = c.name
			}
		}

		if group != "" || order != "" {
			var add []string
			if group != "" {
				add = append(add, "group = "+tomlString(group))
			}
			if order != "" {
				add = append(add, "order = "+tomlString(order))
			}
			if prof.sheet != "" {
				w("\n# To add to a study of sheet %q: %s\n", prof.sheet, strings.Join(add, ", "))
			} else {
				w("\n# To add to a study: %s\n", strings.Join(add, ", "))
			}
		}
	}

	anyActive := false
	for _, prof := range profs {
		anyActive = anyActive || active(prof.pairs()) >= 0
	}
	w("\n# Candidate studies, one line per pair (%d in all", npairs)
	if anyActive && len(profs) > 1 {
		w("; in each sheet, the pair of a setting with a measurement is active")
	} else if anyActive {
		w("; the pair of a setting with a measurement is active")
	} else {
		w("; none active: remove the '#' of those you want")
	}
	w("):\nstudy = [\n")
	used := map[string]bool{}
	var rest, lines, why []string
	width := 0
	for _, prof := range profs {
		pairs := prof.pairs()
		act := active(pairs)
		for i, p := range pairs {
			id := studyID(p.x.name, p.y.name, used)
			if i >= initMaxPairs {
				rest = append(rest, id)
				continue
			}
			lead := "# "
			if i == act {
				lead = "  "
			}
			line := fmt.Sprintf("%s{ id = %s, dataset = %s, x = %s, y = %s },", lead, tomlString(id), tomlString(idOf(prof)), tomlString(p.x.name), tomlString(p.y.name))
			lines, why = append(lines, line), append(why, pairWhy(p))
			width = max(width, utf8.RuneCountInString(line))
		}
	}
	for i, line := range lines { // the comments in one column
		w("%s%s # %s\n", line, strings.Repeat(" ", width-utf8.RuneCountInString(line)), why[i])
	}
	w("]\n")
	if len(rest) > 0 {
		w("# %d more pairs, not written out:\n", len(rest))
		for k := 0; k < len(rest); k += 3 {
			w("#   %s\n", strings.Join(rest[k:min(k+3, len(rest))], "  "))
		}
	}

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
	for _, prof := range profs {
		w("\n[[dataset]]\n")
		kv("id      = "+tomlString(idOf(prof)), "studies name their dataset by this id")
		kv("file    = "+tomlString(rel), "relative to this file")
		if prof.sheet != "" {
			kv("sheet   = "+tomlString(prof.sheet), "the sheet, by name (or number, 1 for the first)")
			kv("# header_row = 1", "the row naming the columns; left out: the first non-empty row")
			w("%-40s # cells with errors (#DIV/0!, #N/A) are missing; dates are Excel serial days\n", "")
		} else if prof.delimiter != ',' {
			kv("delimiter = "+tomlString(string(prof.delimiter)), `detected; "," ";" "\t", or leave out to detect`)
		} else {
			kv(`# delimiter = ","`, `"," ";" "\t"; left out: detected`)
		}
		if prof.sheet != "" {
		} else if prof.decimalComma {
			kv(`decimal = ","`, "detected: decimal comma")
		} else {
			kv(`# decimal = "."`, `"." or ","; left out: detected`)
		}
		if g := prof.grouped(); len(g) > 0 {
			if sep, ok := prof.oneSeparator(); ok && prof.sheet == "" {
				kv("thousands = "+tomlString(string(sep)), "detected: "+sepName(sep)+" between thousands, in:")
				for _, c := range g {
					w("%-40s #   %s: %s\n", "", display(c.name), groupedText(c))
				}
			} else {
				w("# Numbers with a separator between thousands, read as numbers by init:\n")
				for _, c := range g {
					w("#   %s: %s\n", display(c.name), groupedText(c))
				}
				if prof.sheet != "" {
					w("# 'bivar run' reads a workbook's numbers as numbers, not text: format these\n")
					w("# cells as numbers in the spreadsheet.\n")
				} else {
					w("# A dataset declares one separator (thousands = \",\"), and these columns use\n")
					w("# more than one: save the file with one separator, or none, and declare it.\n")
				}
			}
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
				if c.role == roleCounter || c.role == roleTime && c.counter {
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
		w("\n[dataset.units]   # UCUM unit code per column, e.g. \"Cel\", \"[degF]\", \"mm\", \"[in_i]\", \"%%\", \"kg\", \"a\":\n")
		w("                  # remove the '# ' and write the code between the quotes (an empty one is refused)\n")
		for _, c := range num {
			w("# %s = \"\"\n", tomlKey(c.name))
		}
		w("\n[dataset.labels]  # names for people, shown on axes and in the text\n")
		for _, c := range num {
			w("# %s = %s\n", tomlKey(c.name), tomlString(c.name))
		}
	}
	return b.String()
}

// describe is a column's line in the manifest's list of columns.
func describe(c colProfile) string {
	rng := func() string {
		s := fmt.Sprintf("%s to %s, %d missing", fmtNum(c.min), fmtNum(c.max), c.missing)
		if c.nonNumeric > 0 {
			s += ", " + badText(c)
		}
		if c.thousands != 0 {
			s += ", " + groupedText(c)
		}
		return s
	}
	switch c.role {
	case roleConstant:
		return fmt.Sprintf("numeric, constant (%s): nothing to relate", fmtNum(c.min))
	case roleCounter:
		return "numeric, rises by 1 each row: a row or run number (try it as order)"
	case roleTime:
		if c.rising {
			return "numeric, " + rng() + ": time, never falling (try it as order; x only)"
		}
		return "numeric, " + rng() + ": time (x only)"
	case roleSetting:
		return fmt.Sprintf("numeric, %d evenly spaced values (%s): a setting", len(c.distinct), joinNums(c.distinct))
	case roleDiscrete:
		return fmt.Sprintf("numeric, %d distinct values (%s), unevenly spaced", len(c.distinct), joinNums(c.distinct))
	case roleMeasure:
		return "numeric, " + rng() + ": a measurement"
	}
	switch {
	case c.dates:
		return "text, calendar dates: order needs a number (a year or a day count column)"
	case c.unique && c.missing == 0:
		return "text, every value differs: a row name (try it as id_column)"
	case c.levels <= initMaxGroupLevels && c.levels > 0:
		return fmt.Sprintf("text, %d levels (try it as group)", c.levels)
	}
	return "text"
}

func joinNums(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = fmtNum(x)
	}
	return strings.Join(s, ", ")
}

// pairWhy is the comment after a candidate line.
func pairWhy(p candidate) string {
	switch p.kind {
	case pairSettingResponse:
		return "setting on x, measurement on y"
	case pairSeries:
		return "a series in time: time on x"
	}
	return "neither is clearly a setting"
}

// grouped are the numeric columns written with thousands separators.
func (p *csvProfile) grouped() []colProfile {
	var out []colProfile
	for _, c := range p.numeric() {
		if c.thousands != 0 {
			out = append(out, c)
		}
	}
	return out
}

// oneSeparator is the thousands separator of the grouped columns when
// they all use the same one (a dataset declares one: dataset.thousands).
func (p *csvProfile) oneSeparator() (rune, bool) {
	var sep rune
	for _, c := range p.grouped() {
		if sep != 0 && c.thousands != sep {
			return 0, false
		}
		sep = c.thousands
	}
	return sep, sep != 0
}

// groupedText names a column's thousands separator and its first use.
func groupedText(c colProfile) string {
	return fmt.Sprintf("thousands separated by %s (first: %s)", sepName(c.thousands), c.firstGrouped)
}

func sepName(r rune) string {
	switch r {
	case ',':
		return `a comma ","`
	case '.':
		return `a point "."`
	case '\'':
		return `an apostrophe "'"`
	case ' ':
		return "a space"
	case '\u00a0':
		return "a no-break space (U+00A0)"
	case '\u202f':
		return "a narrow no-break space (U+202F)"
	}
	return strconv.QuoteRune(r)
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
		case c.role == roleCounter:
			why = "a row counter"
		case c.role == roleConstant:
			why = "constant"
		case c.isNumeric && c.nonEmpty < 3:
			why = "fewer than 3 values"
		case c.role == roleTime:
			why = "time"
		case c.role == roleSetting:
			why = "a setting"
		case c.isNumeric:
			why = "numeric"
		case c.nonEmpty == 0:
			why = "empty"
		case c.dates:
			why = "dates"
		}
		parts = append(parts, fmt.Sprintf("%s (%s)", display(c.name), why))
	}
	msg := fmt.Sprintf("%s: no pair of columns to relate: a study needs two numeric columns that vary (never two time columns, nor two settings), and the columns are %s; add a numeric column, or check that numbers are written with one decimal mark throughout",
		p.file, strings.Join(parts, ", "))
	for _, c := range p.cols {
		if c.dates {
			msg += fmt.Sprintf("; column %s holds dates, which are text to bivar: to study a measurement against time, add a numeric time column beside it (a decimal year such as 1958.24, or a day count)", display(c.name))
			break
		}
	}
	return msg
}

func quoteJoin(ss []string) string {
	q := make([]string, len(ss))
	for i, s := range ss {
		q[i] = tomlString(s)
	}
	return strings.Join(q, ", ")
}
