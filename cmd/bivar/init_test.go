package main

import (
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"bivar/analysis/manifest"
)

// uncommentStudies removes one leading "# " from every line of each
// commented-out [[study]] block (from "# [[study]]" to the blank line), as
// a user choosing them would.
func uncommentStudies(text string) string {
	var out []string
	in := false
	for _, l := range strings.Split(text, "\n") {
		if l == "# [[study]]" {
			in = true
		}
		if l == "" {
			in = false
		}
		if in {
			l = strings.TrimPrefix(l, "# ")
		}
		out = append(out, l)
	}
	return strings.Join(out, "\n")
}

func writeFile(t *testing.T, path, text string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
}

// A small CSV of our own making: only its structure is tested here.
const initCSV = `shot,lot,melt temp,pressure,shrinkage,note,line
1,A,230.5,80,1.52,ok,4
2,A,231.0,82,1.49,,4
3,B,229.8,79,NA,check gauge,4
4,B,233.1,85,1.41,ok,4
5,C,232.4,84,1.44,ok,4
6,C,228.9,78,1.58,ok,4
`

func TestInit(t *testing.T) {
	dir := t.TempDir()
	csvPath := filepath.Join(dir, "data", "cell4.csv")
	writeFile(t, csvPath, initCSV)
	dest := filepath.Join(dir, "bivar.toml")

	code, _, stderr := call(t, "init", "-o", dest, csvPath)
	if code != exitOK {
		t.Fatalf("bivar init: exit %d\n%s", code, stderr)
	}
	b, err := os.ReadFile(dest)
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	for _, want := range []string{
		`file    = "data/cell4.csv"`,
		"[[study]]\nid      = \"pressure-vs-melt-temp\"",
		`# x       = "melt temp"`,
		`# id      = "shrinkage-vs-pressure"`,
		`# # group = "lot"`,
		`# # order = "shot"`,
		`# group = "lot"`,
		`#   shot                 numeric, rises by 1 each row`,
		`#   line                 numeric, constant (4)`,
		`# "melt temp" = ""`,
		`design = "observational"`,
	} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	// The counter and the constant column are not paired.
	for _, bad := range []string{`x       = "shot"`, `y       = "line"`, `x       = "line"`} {
		if strings.Contains(text, bad) {
			t.Errorf("manifest pairs a counter or constant column: %q", bad)
		}
	}
	if n := strings.Count(text, "# [[study]]"); n != 2 {
		t.Errorf("%d commented-out studies, want 2 (three pairs of melt temp, pressure, shrinkage; the first active)", n)
	}
	if !strings.Contains(stderr, "bivar run") {
		t.Errorf("init does not say what to run next: %q", stderr)
	}

	// As written it loads with the first study active; with the others
	// uncommented it loads with all three.
	m, err := manifest.Load(dest)
	if err != nil {
		t.Fatalf("the manifest as written does not load: %v\n%s", err, text)
	}
	if len(m.Studies) != 1 || m.Studies[0].ID != "pressure-vs-melt-temp" {
		t.Errorf("as written: studies %+v, want the first pair only", m.Studies)
	}
	chosen := filepath.Join(dir, "chosen.toml")
	writeFile(t, chosen, uncommentStudies(text))
	m, err = manifest.Load(chosen)
	if err != nil {
		t.Fatalf("the manifest with its studies uncommented does not load: %v\n%s", err, uncommentStudies(text))
	}
	if len(m.Studies) != 3 || m.Studies[0].X != "melt temp" || m.Studies[0].Y != "pressure" || m.Studies[2].ID != "shrinkage-vs-pressure" {
		t.Errorf("studies = %+v", m.Studies)
	}

	// Never overwrite without --force.
	code, _, stderr = call(t, "init", "-o", dest, csvPath)
	if code != exitFailed || !strings.Contains(stderr, "--force") {
		t.Errorf("second init: exit %d, stderr %q; want 1 and a hint about --force", code, stderr)
	}
	if code, _, stderr = call(t, "init", "--force", "-o", dest, csvPath); code != exitOK {
		t.Errorf("init --force: exit %d\n%s", code, stderr)
	}
}

func TestInitDefaultPathAndDecimalComma(t *testing.T) {
	dir := t.TempDir()
	csvPath := filepath.Join(dir, "m.csv")
	writeFile(t, csvPath, "a;b;c\n1,5;2,25;x\n2,5;3,5;y\n3,0;4,75;x\n4,5;5,0;y\n")
	if code, _, stderr := call(t, "init", csvPath); code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(dir, "bivar.toml"))
	if err != nil {
		t.Fatalf("no bivar.toml beside the CSV: %v", err)
	}
	text := string(b)
	for _, want := range []string{`delimiter = ";"`, `decimal = ","`, `id      = "b-vs-a"`, `# group = "c"`} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	writeFile(t, filepath.Join(dir, "chosen.toml"), uncommentStudies(text))
	if _, err := manifest.Load(filepath.Join(dir, "chosen.toml")); err != nil {
		t.Errorf("does not load: %v", err)
	}
}

func TestInitErrors(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, csv, want string
		code            int
	}{
		{"missing file", "", "no such file", exitFailed},
		{"empty", "\n", "the file is empty", exitFailed},
		{"header only", "a,b\n", "no data rows", exitFailed},
		{"duplicate column", "a,a\n1,2\n", `"a" is named twice`, exitFailed},
		{"unnamed column", "a,,c\n1,2,3\n", "column 2 has no name", exitFailed},
	}
	for i, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, tc.name+".csv")
			if tc.csv != "" {
				writeFile(t, p, tc.csv)
			}
			code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "out", string(rune('a'+i))+".toml"), p)
			if code != tc.code || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want %d and %q", code, stderr, tc.code, tc.want)
			}
		})
	}
	if code, _, _ := call(t, "init"); code != exitUsage {
		t.Errorf("no argument: exit %d, want 2", code)
	}
}

// TestInitBadInput: every file init cannot start from is refused with exit
// status 1, a message that names the file (and the line, where there is
// one), says what is wrong and what to do, and no manifest written.
func TestInitBadInput(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, csv string
		want      []string
	}{
		{"one numeric column", "name,score\nann,1.5\nbob,2.25\ncid,0.5\n", []string{"no pair of columns to relate", "name (text), score (numeric)", "add a numeric column"}},
		{"counter and constant", "n,k,v\n1,5,a\n2,5,b\n3,5,c\n", []string{"n (a row counter), k (constant), v (text)"}},
		{"all text", "a,b\nx,y\nz,w\n", []string{"a (text), b (text)"}},
		{"ragged row", "a,b\n1,2\n3\n4,5\n", []string{":3: this row has 1 field but the header has 2"}},
		{"open quote", "a,b\n1,\"2\n3,4\n", []string{"not closed"}},
		{"not utf-8", "a,b\n1,2\n2,\xe93\n3,4\n", []string{":3: not UTF-8 text", "save it as UTF-8"}},
		{"latin-1 header", "temp\xe9rature,b\n1,2\n", []string{":1: not UTF-8 text"}},
		{"blank lines, then a header", "\n\na,b\n", []string{"a header but no data rows"}},
		{"header only crlf", "a;b\r\n", []string{"a header but no data rows"}},
		{"mixed decimal marks", "a;b\n1,5;2\n2.5;3\n3,5;4\n", []string{"decimal"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "-")+".csv")
			writeFile(t, p, tc.csv)
			dest := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "-")+".toml")
			code, stdout, stderr := call(t, "init", "-o", dest, p)
			if code != exitFailed {
				t.Errorf("exit %d, want 1; stderr %q", code, stderr)
			}
			for _, w := range append([]string{"bivar init: " + p}, tc.want...) {
				if !strings.Contains(stderr, w) {
					t.Errorf("stderr lacks %q:\n%s", w, stderr)
				}
			}
			if stdout != "" || strings.Contains(stderr, "panic") {
				t.Errorf("stdout %q, stderr %q", stdout, stderr)
			}
			if _, err := os.Stat(dest); err == nil {
				t.Errorf("a manifest was written for a file init refused")
			}
			if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp")); len(left) > 0 {
				t.Errorf("temporary files left: %v", left)
			}
		})
	}
	if code, _, stderr := call(t, "init", dir); code != exitFailed || !strings.Contains(stderr, "is a folder: give one CSV data file") {
		t.Errorf("folder: exit %d, %q", code, stderr)
	}
	if code, _, stderr := call(t, "init", "a.csv", "b.csv"); code != exitUsage || !strings.Contains(stderr, "got 2 arguments") {
		t.Errorf("two arguments: exit %d, %q", code, stderr)
	}
	// -o a folder that does not exist yet: created; -o an existing folder:
	// bivar.toml in it.
	good := filepath.Join(dir, "good.csv")
	writeFile(t, good, "a,b\n1.5,2\n2.5,3.5\n3.5,3\n")
	if code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "new", "sub", "m.toml"), good); code != exitOK {
		t.Errorf("-o in a new folder: exit %d, %q", code, stderr)
	}
	if code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "new"), good); code != exitOK || !strings.Contains(stderr, filepath.Join(dir, "new", "bivar.toml")) {
		t.Errorf("-o an existing folder: exit %d, %q", code, stderr)
	}
	if code, _, _ := call(t, "init", "--colour", "a.csv"); code != exitUsage {
		t.Errorf("unknown flag: exit %d, want 2", code)
	}
}

// TestInitBadCell: a numeric column with a cell that is not a number stays
// numeric; the manifest counts such cells as missing, says where the first
// one is, and 'bivar run' on it gives a report.
func TestInitBadCell(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "d.csv")
	writeFile(t, p, "temp,gloss\n180.5,71\n182.0,n/a?\n185.5,74\n188.0,77\n190.5,78\n")
	dest := filepath.Join(dir, "bivar.toml")
	code, _, stderr := call(t, "init", "-o", dest, p)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(stderr, `column "gloss": 1 not a number (first: line 3: "n/a?")`) {
		t.Errorf("stderr does not point at the cell:\n%s", stderr)
	}
	b, _ := os.ReadFile(dest)
	text := string(b)
	for _, want := range []string{"\nnon_numeric = \"missing\"", `gloss: 1 not a number (first: line 3: "n/a?")`, "[[study]]\nid      = \"gloss-vs-temp\""} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	if code, _, stderr := call(t, "run", dest); code != exitOK {
		t.Errorf("bivar run on the manifest: exit %d\n%s", code, stderr)
	}
}

// tomlKeys collects every key the manifest schema knows, from the toml
// tags of manifest.Manifest and the types below it.
func tomlKeys(t reflect.Type, into map[string]bool) {
	for t.Kind() == reflect.Pointer || t.Kind() == reflect.Slice || t.Kind() == reflect.Map {
		t = t.Elem()
	}
	if t.Kind() != reflect.Struct {
		return
	}
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		tag := strings.Split(f.Tag.Get("toml"), ",")[0]
		if tag == "" || tag == "-" {
			continue
		}
		into[tag] = true
		tomlKeys(f.Type, into)
	}
}

// TestInitDocumentsRealKeys: every key the generated manifest names — in
// a key line, commented or not, and in the key list of the study comment —
// exists in analysis/manifest, so no comment sends the user to a key the
// loader rejects.
func TestInitDocumentsRealKeys(t *testing.T) {
	known := map[string]bool{}
	tomlKeys(reflect.TypeOf(manifest.Manifest{}), known)
	dir := t.TempDir()
	// Column names with spaces and capitals, so that no column is taken
	// for a key below.
	p := filepath.Join(dir, "d.csv")
	writeFile(t, p, "Shot,Lot,Melt Temp,Pressure,Shrinkage\n1,A,230.5,80,1.52\n2,A,231.0,82,1.49\n3,B,229.8,79,NA\n4,B,233.1,85,1.41\n5,C,232.4,84,1.44\n")
	prof, err := profileCSV(p)
	if err != nil {
		t.Fatal(err)
	}
	text := initManifest(prof, "d.csv")
	keyLine := regexp.MustCompile(`^([a-z][a-z_]*)\s*=`)
	snake := regexp.MustCompile(`\b[a-z]+(?:_[a-z]+)+\b`)
	quoted := regexp.MustCompile(`"[^"]*"`) // values and unit codes, not keys
	table := regexp.MustCompile(`\[\[?([a-z.]+)\]\]?`)
	checked := map[string]bool{}
	check := func(k, line string) {
		checked[k] = true
		if !known[k] {
			t.Errorf("the manifest documents key %q, which analysis/manifest does not know:\n  %s", k, line)
		}
	}
	inColumns, inKeyList := false, false
	for _, line := range strings.Split(text, "\n") {
		bare := line
		for strings.HasPrefix(bare, "# ") {
			bare = strings.TrimPrefix(bare, "# ")
		}
		switch {
		case strings.HasPrefix(bare, "[dataset.units]"), strings.HasPrefix(bare, "[dataset.labels]"):
			inColumns = true
		case line == "":
			inColumns, inKeyList = false, false
		case strings.Contains(line, "Keys:"):
			inKeyList = true
			continue
		}
		for _, m := range table.FindAllStringSubmatch(bare, -1) {
			for _, part := range strings.Split(m[1], ".") {
				check(part, line)
			}
		}
		if m := keyLine.FindStringSubmatch(bare); m != nil && !inColumns {
			check(m[1], line)
		}
		if inKeyList {
			// "#   id, dataset, x, y   required; ...": the words before the gap.
			body := strings.TrimPrefix(line, "#")
			if gap := strings.Index(strings.TrimLeft(body, " "), "  "); gap > 0 && !strings.HasPrefix(body, "                    ") {
				for _, k := range strings.Split(strings.TrimLeft(body, " ")[:gap], ",") {
					if k = strings.TrimSpace(k); k != "" && !strings.HasPrefix(k, "[") {
						check(k, line)
					}
				}
			}
		}
		for _, k := range snake.FindAllString(quoted.ReplaceAllString(line, `""`), -1) {
			check(k, line)
		}
	}
	// The test must have seen the keys it is about.
	for _, k := range []string{"title", "design", "alpha", "adjust", "seed", "dir", "formats", "theme", "strong", "weak",
		"delimiter", "missing", "non_numeric", "id_column", "units", "labels", "id", "dataset", "x", "y",
		"group", "order", "covariates", "also_in", "predict_at", "notes", "expect", "min_abs_r", "r_within",
		"slope_within", "max_p", "min_n", "not_outlier_driven"} {
		if !checked[k] {
			t.Errorf("key %q not found in the generated manifest (the test's parsing is off, or init stopped documenting it):\n%s", k, text)
		}
	}
}

// FuzzInit: any CSV either gives an error or a manifest that, with every
// study uncommented, the loaderifest.Load accepts (so column names are quoted
// correctly whatever they hold).
func FuzzInit(f *testing.F) {
	f.Add(initCSV)
	f.Add("a;b\n1,5;2\n2,5;3\n3,5;1\n")
	f.Add("\"we\"\"ird\",\"new\nline\",#x\n1,2,3\n2,3,1\n3,1,2\n")
	f.Add("a\tb\tc\n1\t2\t3\n4\t5\t7\n7\t8\t8\n")
	f.Add("ü ñ,=,[x]\n1,2,3\n2,3,4\n3,5,4\n")
	f.Fuzz(func(t *testing.T, data string) {
		dir := t.TempDir()
		p := filepath.Join(dir, "d.csv")
		writeFile(t, p, data)
		prof, err := profileCSV(p)
		if err != nil {
			return
		}
		text := initManifest(prof, "d.csv")
		if len(prof.pairs()) == 0 {
			return
		}
		m := filepath.Join(dir, "m.toml")
		writeFile(t, m, uncommentStudies(text))
		got, err := manifest.Load(m)
		if err != nil {
			t.Fatalf("generated manifest does not load: %v\n%s", err, uncommentStudies(text))
		}
		if want := min(len(prof.pairs()), initMaxPairs); len(got.Studies) != want {
			t.Fatalf("%d studies loaded, want %d", len(got.Studies), want)
		}
	})
}
