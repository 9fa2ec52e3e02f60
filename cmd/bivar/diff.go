package main

// This file holds `bivar diff`: compare two runs' results.json.

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"unicode/utf8"

	"bivar/analysis/compare"
	"bivar/analysis/report"
	"bivar/internal/publish"
	"bivar/render/changes"
	"bivar/themes"
)

// failOnChoices are the values of diff --fail-on.
var failOnChoices = []string{"expectation", "verdict", "significant"}

func runDiff(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	flags := newFlagSet("diff")
	out := flags.String("o", "diff", "output `DIR` for diff.html, diff.md and diff.json")
	failOn := flags.String("fail-on", "", "comma-separated `LIST` of changes that give exit status 3: expectation (a CI gate that held now fails), verdict, significant")
	theme := flags.String("theme", themes.Default, "HTML theme `NAME`: "+strings.Join(themes.Names(), ", "))
	if code, ok := parseFlags(flags, args, stdout, stderr); !ok {
		return code
	}
	if flags.NArg() != 2 {
		fmt.Fprintf(stderr, "bivar diff: want OLD and NEW (two results.json files or report folders), got %s\nusage: %s\n", nArgs(flags.NArg()), lookup("diff").Usage)
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
	if info, err := os.Stat(*out); err == nil && !info.IsDir() {
		fmt.Fprintf(stderr, "bivar diff: -o %s is a file: give a folder for diff.html, diff.md and diff.json (created if needed)\n", *out)
		return exitUsage
	}
	if rf := insideReport(*out); rf != "" {
		fmt.Fprintf(stderr, "bivar diff: -o %s is inside the report folder %s, which 'bivar run' replaces whole (and refuses to while it holds files of others): give the diff a folder of its own, such as %s\n", *out, rf, filepath.Join(filepath.Dir(rf), "diff"))
		return exitUsage
	}
	// The folder is taken first, so a second diff into it is refused at once.
	target, err := publish.OpenDir(*out, publish.Options{Command: "bivar diff", Legacy: changes.EarlierFile})
	if err != nil {
		return outputError(stderr, "bivar diff", "-o", "-o DIR", err)
	}
	defer target.Close()
	kept := fmt.Sprintf("any earlier diff in %s is as it was", *out)
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
	if samePath(oldFile, newFile) {
		fmt.Fprintf(stderr, "bivar diff: OLD and NEW are the same file, %s: a run compared with itself shows no change; give the previous run's results.json (or its report folder) as OLD\n", newFile)
		return exitUsage
	}
	res := compare.Diff(oldRep, newRep, compare.Options{Tool: report.Tool{Name: "bivar", Version: version()}})
	res.Old.File, res.New.File = filepath.ToSlash(oldFile), filepath.ToSlash(newFile)
	files, err := changes.DiffFiles(res, changes.WithTheme(*theme))
	if err == nil {
		err = target.Publish(ctx, files)
	}
	if err != nil {
		if sig := stopped(ctx); sig != nil {
			return interrupted(stderr, "bivar diff", sig, kept)
		}
		fmt.Fprintf(stderr, "bivar diff: writing to %s: %v; %s\n", *out, err, kept)
		return exitFailed
	}
	s := res.Summary
	fmt.Fprintf(stderr, "bivar diff: %s compared: %s changed outcome (%d now failing that did not fail before), %d changed beyond chance (adjusted p below %g, %s), %d with a changed verdict; %d added, %d removed, %d stopped running; written to %s\n",
		plural(s.Compared, "study", "studies"), plural(s.ExpectationChanged, "CI gate", "CI gates"), s.ExpectationBroken, s.Significant, res.Alpha, compare.AdjustName(res.Adjust), s.VerdictChanged, s.Added, s.Removed, s.StoppedRunning, *out)
	if res.Identical() {
		fmt.Fprintf(stderr, "bivar diff: %s\n", res.Statements[0])
	}
	for _, sc := range res.Studies {
		if sc.Statement != "" {
			fmt.Fprintf(stderr, "bivar diff: study %q: %s\n", sc.ID, sc.Statement)
		}
	}
	if len(res.Statements) > 1 {
		for _, st := range res.Statements[1:] {
			fmt.Fprintf(stderr, "bivar diff: %s\n", st)
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
	if gates["expectation"] && res.AnyExpectationBroken() {
		fmt.Fprintf(stderr, "bivar diff: failing: a CI gate fails in the new run that did not fail in the old (it held there, or was not declared) (--fail-on expectation)\n")
		code = exitExpectation
	}
	if gates["verdict"] && res.AnyVerdictChanged() {
		if s.VerdictChanged > 0 {
			fmt.Fprintf(stderr, "bivar diff: failing: a verdict changed (--fail-on verdict)\n")
		}
		if s.StoppedRunning > 0 {
			fmt.Fprintf(stderr, "bivar diff: failing: a study that ran in the old run did not run in the new one, so its verdicts are lost (--fail-on verdict)\n")
		}
		code = exitExpectation
	}
	return code
}

// insideReport returns the report folder (one holding a results.json of
// bivar's) that out lies inside, or "". out itself is not looked at:
// publish refuses a folder of another command's files.
func insideReport(out string) string {
	abs, err := filepath.Abs(out)
	if err != nil {
		return ""
	}
	for dir := filepath.Dir(abs); ; dir = filepath.Dir(dir) {
		if data, err := os.ReadFile(filepath.Join(dir, "results.json")); err == nil && resultsShape(data) == nil {
			return dir
		}
		if filepath.Dir(dir) == dir {
			return ""
		}
	}
}

// parseFailOn reads the --fail-on list.
func parseFailOn(v string) (map[string]bool, error) {
	gates := map[string]bool{}
	if strings.TrimSpace(v) == "" {
		return gates, nil
	}
	for _, g := range strings.Split(v, ",") {
		g = strings.TrimSpace(g)
		if g == "" {
			continue // "verdict," or "verdict,,significant"
		}
		if !slices.Contains(failOnChoices, g) {
			return nil, fmt.Errorf("%q: want a comma-separated list of %s", g, strings.Join(failOnChoices, ", "))
		}
		gates[g] = true
	}
	return gates, nil
}

// readResults reads a results.json, or the results.json inside a folder.
// It returns the file actually read. Its errors name the file, say what is
// wrong with it (where, for a broken file: line and column) and what to do.
func readResults(path string) (*report.Report, string, error) {
	info, err := os.Stat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, path, fmt.Errorf("%s: no such file or folder; give a results.json written by 'bivar run', or the report folder holding one", path)
	}
	if err != nil {
		return nil, path, fmt.Errorf("%s: %w", path, err)
	}
	file := path
	if info.IsDir() {
		file = filepath.Join(path, "results.json")
		fi, err := os.Stat(file)
		switch {
		case errors.Is(err, fs.ErrNotExist):
			if _, err := os.Stat(filepath.Join(path, changes.Files["json"])); err == nil {
				return nil, file, fmt.Errorf("%s is the folder of a diff (it holds %s), not a report: give the report folder written by 'bivar run', or its results.json", path, changes.Files["json"])
			}
			return nil, file, fmt.Errorf("%s holds no results.json: give the report folder written by 'bivar run' (with \"json\" in [output] formats) or the file itself", path)
		case err == nil && fi.IsDir():
			return nil, file, fmt.Errorf("%s is a folder, not a file: give a report folder written by 'bivar run', or the results.json it holds", file)
		}
	}
	switch looksLike(file) {
	case dataFile:
		return nil, file, fmt.Errorf("%s looks like a data file, not a results.json: give the results.json that 'bivar run' wrote for the manifest naming it (in the report folder), or the folder itself", file)
	case tomlFile:
		return nil, file, fmt.Errorf("%s looks like a manifest, not a results.json: run 'bivar run %s' and give the report folder it writes (or its results.json)", file, file)
	}
	data, err := os.ReadFile(file)
	if err != nil {
		return nil, file, fmt.Errorf("%s: %w", file, err)
	}
	rep, err := parseResults(file, data)
	return rep, file, err
}

// parseResults reads the results.json held in data; file names it in
// errors.
func parseResults(file string, data []byte) (*report.Report, error) {
	// A byte-order mark (an editor on Windows saves one) is not part of
	// the JSON; the decoder would stop at it ("invalid character 'ï'").
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if err := resultsShape(data); err != nil {
		return nil, fmt.Errorf("%s: %w", file, err)
	}
	rep, err := report.Read(bytes.NewReader(data))
	if err != nil {
		return nil, fmt.Errorf("%s: %s", file, explainJSON(data, err))
	}
	if err := resultsWhole(data, rep); err != nil {
		return nil, fmt.Errorf("%s: %w: the file was edited or written by another program; run 'bivar run' again to write it whole", file, err)
	}
	return rep, nil
}

// resultsWhole checks what the strict decoding cannot: that the keys
// bivar always writes are there and not null, and that studies and
// datasets have the ids the comparison matches them by, once each. A
// file without them would be compared as if its studies were added,
// removed or alike.
func resultsWhole(data []byte, rep *report.Report) error {
	var top map[string]json.RawMessage
	if err := json.Unmarshal(data, &top); err != nil {
		return err
	}
	for _, key := range []string{"manifest", "datasets", "studies"} {
		if v, ok := top[key]; !ok || string(bytes.TrimSpace(v)) == "null" {
			return fmt.Errorf("key %q is missing or null", key)
		}
	}
	at := elementOffsets(data, "studies")
	where := func(i int) string {
		if i < len(at) {
			lc := lineCol(data, at[i]+1) // lineCol takes the offset after the byte
			return fmt.Sprintf("line %d, column %d: study %d", lc[0], lc[1], i+1)
		}
		return fmt.Sprintf("study %d", i+1)
	}
	seen := map[string]int{}
	for i, s := range rep.Studies {
		switch {
		case s.ID == "":
			return fmt.Errorf("%s has no id", where(i))
		case s.X.Column == "" || s.Y.Column == "":
			return fmt.Errorf("%s (%q) names no x or y column", where(i), s.ID)
		}
		if j, dup := seen[s.ID]; dup {
			return fmt.Errorf("%s has the id %q of study %d too", where(i), s.ID, j+1)
		}
		seen[s.ID] = i
		for _, e := range s.Expectations {
			if e.Name == "" {
				return fmt.Errorf("%s (%q) has an expectation without a name", where(i), s.ID)
			}
		}
	}
	ds := map[string]bool{}
	for i, d := range rep.Datasets {
		if d.ID == "" || ds[d.ID] {
			return fmt.Errorf("dataset %d has no id, or one another dataset has too (%q)", i+1, d.ID)
		}
		ds[d.ID] = true
	}
	return nil
}

// elementOffsets returns the byte offset at which each element of the
// top-level array key begins in data, or nil when it cannot be found.
func elementOffsets(data []byte, key string) []int64 {
	dec := json.NewDecoder(bytes.NewReader(data))
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return nil
	}
	for dec.More() {
		k, err := dec.Token()
		if err != nil {
			return nil
		}
		if k != key {
			var skip json.RawMessage
			if dec.Decode(&skip) != nil {
				return nil
			}
			continue
		}
		if t, err := dec.Token(); err != nil || t != json.Delim('[') {
			return nil
		}
		var out []int64
		for dec.More() {
			off := dec.InputOffset()
			// InputOffset is the end of the last token: skip the comma
			// and spaces to the element itself.
			for off < int64(len(data)) && (data[off] == ',' || data[off] == ' ' || data[off] == '\n' || data[off] == '\t' || data[off] == '\r') {
				off++
			}
			out = append(out, off)
			var skip json.RawMessage
			if dec.Decode(&skip) != nil {
				return nil
			}
		}
		return out
	}
	return nil
}

// resultsShape checks, before the strict decoding, that data is a
// complete JSON object of the results schema, so that a truncated file, a
// file of another kind and one of another schema version each get their
// own message instead of the decoder's first complaint.
func resultsShape(data []byte) error {
	trimmed := bytes.TrimSpace(bytes.TrimPrefix(data, []byte("\xef\xbb\xbf")))
	switch {
	case len(trimmed) == 0:
		return errors.New("the file is empty: run 'bivar run' again to write it")
	case !utf8.Valid(data):
		return errors.New("not UTF-8 text, so not a results.json written by bivar: give the results.json of a report folder")
	case trimmed[0] != '{':
		return errors.New("not a JSON object, so not a results.json written by bivar: give the results.json of a report folder")
	}
	var head struct {
		Schema *string `json:"schema"`
	}
	if err := json.Unmarshal(trimmed, &head); err != nil {
		return errors.New(explainJSON(data, err))
	}
	switch {
	case head.Schema == nil:
		return fmt.Errorf("no \"schema\" key, so not a results.json written by bivar (want schema %q): give the results.json of a report folder", report.Schema)
	case !report.ReadsSchema(*head.Schema):
		if strings.HasPrefix(*head.Schema, "bivar.results/") {
			return fmt.Errorf("schema %q, but this bivar reads %q: rerun 'bivar run' with this version of bivar to write both sides in the same schema", *head.Schema, report.Schema)
		}
		return fmt.Errorf("schema %q is not bivar's results schema %q: give the results.json of a report folder (a diff.json cannot be compared)", *head.Schema, report.Schema)
	}
	return nil
}

// explainJSON turns a decoding error into a sentence with the line and
// column it happened at, when the decoder gives an offset.
func explainJSON(data []byte, err error) string {
	var syn *json.SyntaxError
	var typ *json.UnmarshalTypeError
	switch {
	case errors.Is(err, io.ErrUnexpectedEOF), errors.As(err, &syn) && strings.Contains(syn.Error(), "unexpected end of JSON input"):
		end := lineCol(data, int64(len(bytes.TrimRight(data, " \t\r\n"))))
		return fmt.Sprintf("the file ends early, at line %d, column %d (cut off while being written or copied?): run 'bivar run' again to write it whole", end[0], end[1])
	case errors.As(err, &syn):
		lc := lineCol(data, syn.Offset)
		return fmt.Sprintf("line %d, column %d: not valid JSON (%v): the file was changed or damaged after 'bivar run' wrote it; run it again", lc[0], lc[1], syn)
	case errors.As(err, &typ):
		lc := lineCol(data, typ.Offset)
		want := jsonKind(typ.Type)
		if typ.Type == reflect.TypeFor[report.Float]() {
			want = "a number, or null where the value is undefined (bivar writes NaN and infinities as null)"
		}
		return fmt.Sprintf("line %d, column %d: key %q holds a JSON %s where bivar writes %s: the file was edited or written by another program; run 'bivar run' again", lc[0], lc[1], typ.Field, typ.Value, want)
	}
	msg := err.Error()
	if strings.Contains(msg, "unknown field") {
		return msg + ": the file holds a key bivar does not write (edited, or written by a newer bivar); run 'bivar run' again with this version"
	}
	return msg
}

// jsonKind says in words what JSON value a Go type is written as: "a
// whole number" for an int, "text" for a string, not Go's type names.
func jsonKind(t reflect.Type) string {
	switch t.Kind() {
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return "a whole number"
	case reflect.Float32, reflect.Float64:
		return "a number"
	case reflect.String:
		return "text in quotes"
	case reflect.Bool:
		return "true or false"
	case reflect.Slice, reflect.Array:
		return "a list [...]"
	case reflect.Map, reflect.Struct:
		return "an object {...}"
	case reflect.Pointer:
		return jsonKind(t.Elem()) + " or null"
	}
	return "a " + t.String()
}

// lineCol returns the 1-based line and column of byte offset off.
func lineCol(data []byte, off int64) [2]int {
	off = max(0, min(off, int64(len(data))))
	before := data[:off]
	line := bytes.Count(before, []byte("\n")) + 1
	col := int(off) - (bytes.LastIndexByte(before, '\n') + 1)
	if col == 0 {
		col = 1
	}
	return [2]int{line, col}
}
