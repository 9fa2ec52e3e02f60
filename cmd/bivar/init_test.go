package main

import (
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"bivar/analysis/manifest"
)

// uncommentStudies removes the leading "#" of every commented-out
// candidate line in the study array, as a user choosing them all would.
func uncommentStudies(text string) string {
	var out []string
	for _, l := range strings.Split(text, "\n") {
		if strings.HasPrefix(l, "# { id = ") {
			l = " " + strings.TrimPrefix(l, "#")
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
		"study = [\n" +
			`# { id = "pressure-vs-melt-temp", dataset = "data", x = "melt temp", y = "pressure" },   # neither is clearly a setting` + "\n" +
			`# { id = "shrinkage-vs-melt-temp", dataset = "data", x = "melt temp", y = "shrinkage" }, # neither is clearly a setting` + "\n" +
			`# { id = "shrinkage-vs-pressure", dataset = "data", x = "pressure", y = "shrinkage" },   # neither is clearly a setting` + "\n" +
			"]\n",
		`# To add to a study: group = "lot", order = "shot"`,
		`#   shot                 numeric, rises by 1 each row`,
		`#   line                 numeric, constant (4)`,
		`#   melt temp            numeric, 228.9 to 233.1, 0 missing: a measurement`,
		`# "melt temp" = ""`,
		`design = "observational"`,
		"# How init chose",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	// The counter and the constant column are not paired.
	for _, bad := range []string{`x = "shot"`, `y = "line"`, `x = "line"`} {
		if strings.Contains(text, bad) {
			t.Errorf("manifest pairs a counter or constant column: %q", bad)
		}
	}
	if !strings.Contains(stderr, "3 candidate studies (none active") || !strings.Contains(stderr, "then bivar run") {
		t.Errorf("init does not say that none is active and what to do next: %q", stderr)
	}

	// As written no study is chosen, and the loader says so; with the
	// lines uncommented it loads with all three.
	if _, err := manifest.Load(dest); err == nil || !strings.Contains(err.Error(), "no [[study]] declared") {
		t.Errorf("the manifest as written: %v; want the loader to ask for a study", err)
	}
	chosen := filepath.Join(dir, "chosen.toml")
	writeFile(t, chosen, uncommentStudies(text))
	m, err := manifest.Load(chosen)
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
	for _, want := range []string{`delimiter = ";"`, `decimal = ","`, `# { id = "b-vs-a", dataset = "data", x = "a", y = "b" }`, `# To add to a study: group = "c"`} {
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
	// Invented data: temp is a setting (three evenly spaced values, each
	// twice), gloss a measurement, so the one pair is active.
	writeFile(t, p, "temp,gloss\n180,71\n180,n/a?\n185,74\n185,75.5\n190,77\n190,78\n")
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
	for _, want := range []string{"\nnon_numeric = \"missing\"", `gloss: 1 not a number (first: line 3: "n/a?")`, "study = [\n  { id = \"gloss-vs-temp\", dataset = \"data\", x = \"temp\", y = \"gloss\" }, # setting on x, measurement on y\n]"} {
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

// initManifestFor profiles csv (written to a temporary file) and returns
// init's manifest for it.
func initManifestFor(t *testing.T, csv string) (*csvProfile, string) {
	t.Helper()
	p := filepath.Join(t.TempDir(), "d.csv")
	writeFile(t, p, csv)
	prof, err := profileCSV(p)
	if err != nil {
		t.Fatalf("profileCSV: %v", err)
	}
	return prof, initManifest(prof, "d.csv")
}

// studyLines returns the candidate lines of a manifest, commented or not.
func studyLines(text string) []string {
	var out []string
	for _, l := range strings.Split(text, "\n") {
		if t := strings.TrimLeft(l, "# "); strings.HasPrefix(t, "{ id = ") {
			out = append(out, l)
		}
	}
	return out
}

// TestInitNile: a year column and one measurement (the Nile's annual flow,
// as statsmodels 0.13.5 publishes it; testdata/README.md) is not refused:
// the year is time, offered as order and put on x; the one study is left
// commented out (it is a series, not a setting with a response), and once
// chosen it runs.
func TestInitNile(t *testing.T) {
	dir := t.TempDir()
	data, err := os.ReadFile(filepath.Join("testdata", "nile.csv"))
	if err != nil {
		t.Fatal(err)
	}
	csvPath := filepath.Join(dir, "nile.csv")
	writeFile(t, csvPath, string(data))
	dest := filepath.Join(dir, "bivar.toml")
	code, _, stderr := call(t, "init", csvPath)
	if code != exitOK {
		t.Fatalf("bivar init on the Nile data: exit %d\n%s", code, stderr)
	}
	b, _ := os.ReadFile(dest)
	text := string(b)
	for _, want := range []string{
		"#   year                 numeric, 1871 to 1970, 0 missing: time, never falling (try it as order; x only)",
		"#   volume               numeric, 456 to 1370, 0 missing: a measurement",
		`# To add to a study: order = "year"`,
		"study = [\n" + `# { id = "volume-vs-year", dataset = "data", x = "year", y = "volume" }, # a series in time: time on x` + "\n]",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	if !strings.Contains(stderr, "1 candidate study (none active") {
		t.Errorf("stderr: %q", stderr)
	}
	writeFile(t, dest, uncommentStudies(text))
	if code, _, stderr := call(t, "run", dest); code != exitOK {
		t.Errorf("bivar run with the study chosen: exit %d\n%s", code, stderr)
	}
}

// TestInitRoles: which pairs init writes, which way round, and when one is
// left active (initRules). All data here are invented.
func TestInitRoles(t *testing.T) {
	cases := []struct {
		name, csv string
		lines     []string // the candidate lines, in order, without their comments
	}{
		{
			// One setting (three evenly spaced temperatures, each twice),
			// one measurement, a run counter: the one pair is active, the
			// setting on x although it is the later column.
			"setting and response",
			"run,strength,temp\n1,41.2,160\n2,44.0,170\n3,47.1,180\n4,40.8,160\n5,44.5,170\n6,46.6,180\n",
			[]string{`  { id = "strength-vs-temp", dataset = "data", x = "temp", y = "strength" },`},
		},
		{
			// Settings in equal ratios (1, 10, 100) count too.
			"ratio setting",
			"dose,response\n1,2.1\n10,3.9\n100,6.2\n1,2.3\n10,4.2\n100,5.8\n",
			[]string{`  { id = "response-vs-dose", dataset = "data", x = "dose", y = "response" },`},
		},
		{
			// Two settings of a designed experiment and one response: the
			// settings are not paired with each other, and with two pairs of
			// a setting with a response, none is active.
			"two settings",
			"air,water,loss\n50,18,7.1\n60,18,8.9\n70,18,11.2\n50,22,7.8\n60,22,9.6\n70,22,12.4\n",
			[]string{
				`# { id = "loss-vs-air", dataset = "data", x = "air", y = "loss" },`,
				`# { id = "loss-vs-water", dataset = "data", x = "water", y = "loss" },`,
			},
		},
		{
			// Year and quarter are never paired with each other, time is
			// always on x, never on y; the two measurements pair with
			// each other first.
			"year and quarter",
			"year,quarter,gdp,unemp\n2001,1,100.2,5.1\n2001,2,101.0,5.0\n2001,3,101.9,5.2\n2001,4,102.5,5.4\n2002,1,103.1,5.3\n2002,2,103.0,5.6\n",
			[]string{
				`# { id = "unemp-vs-gdp", dataset = "data", x = "gdp", y = "unemp" },`,
				`# { id = "gdp-vs-year", dataset = "data", x = "year", y = "gdp" },`,
				`# { id = "unemp-vs-year", dataset = "data", x = "year", y = "unemp" },`,
				`# { id = "gdp-vs-quarter", dataset = "data", x = "quarter", y = "gdp" },`,
				`# { id = "unemp-vs-quarter", dataset = "data", x = "quarter", y = "unemp" },`,
			},
		},
		{
			// A decimal date after the measurement still goes on x.
			"decimal date",
			"co2,decimal date\n315.7,1958.2\n317.5,1958.3\n317.5,1958.4\n317.1,1958.5\n315.9,1958.6\n",
			[]string{`# { id = "co2-vs-decimal-date", dataset = "data", x = "decimal date", y = "co2" },`},
		},
		{
			// Whole numbers rising by one in the range of years, without a
			// time word in the name, are time too.
			"unnamed year",
			"yy,level\n1990,3.1\n1991,2.7\n1992,3.6\n1993,3.3\n",
			[]string{`# { id = "level-vs-yy", dataset = "data", x = "yy", y = "level" },`},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, text := initManifestFor(t, tc.csv)
			got := studyLines(text)
			for i := range got {
				got[i] = strings.TrimRight(strings.Split(got[i], " # ")[0], " ")
			}
			if !reflect.DeepEqual(got, tc.lines) {
				t.Errorf("candidate lines\ngot  %q\nwant %q\n%s", got, tc.lines, text)
			}
		})
	}
}

// TestInitStackLoss: Brownlee's stack loss data (as statsmodels 0.13.5
// publishes them; testdata/README.md). The three operating settings were
// not set on evenly spaced levels, so no pair is clearly a setting with a
// response and none is left active (before, the first active study paired
// two settings); the response, stack loss, is on y against the two columns
// with few values (air flow, water temperature).
func TestInitStackLoss(t *testing.T) {
	data, err := os.ReadFile(filepath.Join("testdata", "stackloss.csv"))
	if err != nil {
		t.Fatal(err)
	}
	_, text := initManifestFor(t, string(data))
	var got []string
	for _, l := range studyLines(text) {
		got = append(got, strings.TrimRight(strings.Split(l, " # ")[0], " "))
	}
	want := []string{
		`# { id = "stackloss-vs-airflow", dataset = "data", x = "AIRFLOW", y = "STACKLOSS" },`,
		`# { id = "stackloss-vs-watertemp", dataset = "data", x = "WATERTEMP", y = "STACKLOSS" },`,
		`# { id = "acidconc-vs-stackloss", dataset = "data", x = "STACKLOSS", y = "ACIDCONC" },`,
		`# { id = "watertemp-vs-airflow", dataset = "data", x = "AIRFLOW", y = "WATERTEMP" },`,
		`# { id = "acidconc-vs-airflow", dataset = "data", x = "AIRFLOW", y = "ACIDCONC" },`,
		`# { id = "acidconc-vs-watertemp", dataset = "data", x = "WATERTEMP", y = "ACIDCONC" },`,
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("candidate lines\ngot  %q\nwant %q", got, want)
	}
}

// TestInitDatesOnly: a date column and one measurement (the shape of the
// weekly CO2 series statsmodels publishes: a date index and co2; these
// numbers are invented) give no pair, and the message says how to get one.
func TestInitDatesOnly(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "co2.csv")
	writeFile(t, p, "date,co2\n1958-03-29,316.1\n1958-04-05,317.3\n1958-04-12,317.6\n1958-04-19,317.5\n")
	code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "m.toml"), p)
	if want := "the columns are date (dates), co2 (numeric); add a numeric column, or check that numbers are written with one decimal mark throughout; column date holds dates, which are text to bivar: to study a measurement against time, add a numeric time column beside it (a decimal year such as 1958.24, or a day count); no manifest written"; code != exitFailed || !strings.Contains(stderr, want) {
		t.Errorf("exit %d, stderr\n%s\nwant 1 and %q", code, stderr, want)
	}
}

// TestInitDates: a text column of calendar dates is recognised, not taken
// for a group, and the file is not refused (invented data).
func TestInitDates(t *testing.T) {
	prof, text := initManifestFor(t, "day,yield,ph\n2024-03-01,81.2,6.9\n2024-03-02,79.5,7.1\n2024-03-04,83.0,6.8\n2024-03-05,80.1,7.0\n")
	if !prof.cols[0].dates {
		t.Errorf("dates not recognised: %+v", prof.cols[0])
	}
	for _, want := range []string{"#   day                  text, calendar dates", `# { id = "ph-vs-yield"`} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q:\n%s", want, text)
		}
	}
	if strings.Contains(text, `group = "day"`) {
		t.Errorf("a date column offered as group:\n%s", text)
	}
}

// TestParseGrouped: numbers written with a separator between thousands.
func TestParseGrouped(t *testing.T) {
	cases := []struct {
		s            string
		decimalComma bool
		v            float64
		sep          rune
		ok           bool
	}{
		{"1,120", false, 1120, ',', true},
		{"-12,345.75", false, -12345.75, ',', true},
		{"1,234,567", false, 1234567, ',', true},
		{"1.234,5", true, 1234.5, '.', true},
		{"12 345,5", true, 12345.5, ' ', true},
		{"1\u00a0000", false, 1000, '\u00a0', true},
		{"1\u202f000,25", true, 1000.25, '\u202f', true},
		{"1'000'000", false, 1e6, '\'', true},
		{"1,12", false, 0, 0, false},      // a group of two digits
		{"1,1200", false, 0, 0, false},    // a group of four
		{"1234,567", false, 0, 0, false},  // a first group of four
		{"1,234.5.6", false, 0, 0, false}, // two marks
		{"1.234", false, 0, 0, false},     // a plain number (the point is the mark)
		{"1,234", true, 0, 0, false},      // likewise with a decimal comma
		{",123", false, 0, 0, false},
		{"1,234 567", false, 0, 0, false}, // two separators
		{"1x234", false, 0, 0, false},
		{"--1,234", false, 0, 0, false},
	}
	for _, c := range cases {
		v, sep, ok := parseGrouped(c.s, c.decimalComma)
		if ok != c.ok || ok && (v != c.v || sep != c.sep) {
			t.Errorf("parseGrouped(%q, %v) = %v, %q, %v; want %v, %q, %v", c.s, c.decimalComma, v, sep, ok, c.v, c.sep, c.ok)
		}
	}
}

// TestInitThousands: numbers with thousands separators are read as numbers
// and init says which separator it took (invented data; the first file has
// the shape of the Nile data with separators, as a spreadsheet exports
// them).
func TestInitThousands(t *testing.T) {
	cases := []struct {
		name, csv, col, sep, key string
	}{
		{"comma", "year,volume\n1871,\"1,120\"\n1872,\"1,160\"\n1873,963\n1874,\"1,210\"\n", "volume", `a comma ","`, `","`},
		{"point, decimal comma", "lot;mass;temp\na;1.234,5;20,5\nb;1.302,0;21,0\nc;998,5;21,5\nd;1.100,25;22,0\n", "mass", `a point "."`, `"."`},
		{"space", "x;y\n1,5;12 500\n2,5;13 250\n3,0;12 980\n4,5;14 010\n", "y", "a space", `" "`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			p := filepath.Join(dir, "d.csv")
			writeFile(t, p, tc.csv)
			dest := filepath.Join(dir, "bivar.toml")
			code, _, stderr := call(t, "init", "-o", dest, p)
			if code != exitOK {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			want := "column \"" + tc.col + "\": thousands separated by " + tc.sep
			if !strings.Contains(stderr, want) || !strings.Contains(stderr, "the manifest declares thousands = "+tc.key+" for the dataset, so 'bivar run' reads them as numbers") {
				t.Errorf("stderr lacks %q and the key it declares:\n%s", want, stderr)
			}
			b, _ := os.ReadFile(dest)
			text := string(b)
			if !strings.Contains(text, "thousands = "+tc.key+" ") || !strings.Contains(text, "#   "+tc.col+": thousands separated by "+tc.sep) || strings.Contains(text, "non_numeric = \"missing\"") {
				t.Errorf("manifest does not declare and name the separator, or counts the numbers as bad cells:\n%s", text)
			}
			// The manifest as written, with its first candidate study
			// chosen, runs, reading the numbers (#11).
			writeFile(t, dest, strings.Replace(text, "\n# { id", "\n{ id", 1))
			if code, _, stderr := call(t, "check", dest); code != exitOK {
				t.Errorf("bivar check of the manifest init wrote: exit %d: %s", code, stderr)
			}
			if !strings.Contains(text, `y = "`+tc.col+`"`) && !strings.Contains(text, `x = "`+tc.col+`"`) {
				t.Errorf("column %q not paired:\n%s", tc.col, text)
			}
		})
	}
	// Two different separators in one column: not numbers; the cells are
	// reported as they were before.
	prof, _ := initManifestFor(t, "a,b\n1,\"1,200\"\n2,\"1 300\"\n3,5\n4,6\n5,7\n6,8\n7,9\n8,10\n9,11\n10,12\n11,13\n12,14\n13,15\n14,16\n15,17\n16,18\n17,19\n18,20\n19,21\n20,22\n")
	if c := prof.cols[1]; c.thousands != 0 || c.nonNumeric != 2 {
		t.Errorf("mixed separators: thousands %q, %d non-numeric; want none and 2", c.thousands, c.nonNumeric)
	}
}

// TestInitNotText: a spreadsheet (other than a workbook named .xlsx) or
// another binary file is named for what it is, with what to do, and no
// manifest is written. The .xlsx and .ods files are real ones written by
// pandas (testdata/README.md); the others
// are the first bytes each format's specification gives.
func TestInitNotText(t *testing.T) {
	dir := t.TempDir()
	read := func(name string) string {
		b, err := os.ReadFile(filepath.Join("testdata", name))
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	cases := []struct{ name, data, want string }{
		{"book.csv", read("invented.xlsx"), `is an Excel workbook, not a CSV text file; bivar reads workbooks named .xlsx: rename it to end in .xlsx and run bivar init on that`},
		{"book.ods", read("invented.ods"), "is an OpenDocument spreadsheet (.ods), not a CSV text file; open it"},
		{"book.xls", "\xD0\xCF\x11\xE0\xA1\xB1\x1A\xE1" + strings.Repeat("\x00", 504), "is an Excel 97-2003 workbook (.xls) or another legacy Office file (OLE compound file), not a CSV text file; open it"},
		{"data.zip", "PK\x03\x04\x14\x00\x00\x00data.csv", "is a ZIP archive, not a CSV text file; unpack it"},
		{"data.csv", "\xFF\xFEa\x00,\x00b\x00\n\x00", `is UTF-16 text (little-endian); bivar reads UTF-8: save it again as "CSV UTF-8"`},
		{"report.csv", "%PDF-1.7\n", "is a PDF document, not a CSV text file; export the data as CSV"},
		{"data.bin", "ab\x00cd", "is a binary file, not CSV text (a NUL byte at byte 3)"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			p := filepath.Join(dir, tc.name)
			writeFile(t, p, tc.data)
			dest := filepath.Join(dir, tc.name+".toml")
			code, _, stderr := call(t, "init", "-o", dest, p)
			if code != exitFailed || !strings.Contains(stderr, "bivar init: "+p+" "+tc.want) {
				t.Errorf("exit %d, stderr\n%s\nwant 1 and %q", code, stderr, tc.want)
			}
			if strings.Contains(stderr, "UTF-8 text (a byte") {
				t.Errorf("the encoding message for a binary file: %s", stderr)
			}
			if _, err := os.Stat(dest); err == nil {
				t.Error("a manifest was written")
			}
		})
	}
}

// FuzzParseGrouped: any text gives an answer without a panic, and a number
// read with separators equals the number with them taken out.
func FuzzParseGrouped(f *testing.F) {
	for _, s := range []string{"1,120", "1.234,5", "12 345", "1'000'000.5", "-1,234", "1,2,3"} {
		f.Add(s, false)
		f.Add(s, true)
	}
	f.Fuzz(func(t *testing.T, s string, decimalComma bool) {
		v, sep, ok := parseGrouped(s, decimalComma)
		if !ok {
			return
		}
		plain := strings.ReplaceAll(s, string(sep), "")
		if decimalComma {
			plain = strings.Replace(plain, ",", ".", 1)
		}
		if w, err := strconv.ParseFloat(plain, 64); err != nil || w != v {
			t.Fatalf("parseGrouped(%q, %v) = %v, %q; without the separator %q reads %v, %v", s, decimalComma, v, sep, plain, w, err)
		}
	})
}

// A workbook gives one dataset per sheet with numeric columns, each with
// its sheet named; a sheet of text only gets none, and says so; the
// manifest, with its studies kept, runs.
func TestInitWorkbook(t *testing.T) {
	dir := t.TempDir()
	book := filepath.Join(dir, "line7.xlsx")
	f := excelize.NewFile()
	if err := f.SetSheetName("Sheet1", "Read me"); err != nil {
		t.Fatal(err)
	}
	if err := f.SetCellValue("Read me", "A1", "invented data"); err != nil {
		t.Fatal(err)
	}
	// Invented numbers: two sheets of the same shape.
	for k, sheet := range []string{"Oct 2026", "Nov 2026"} {
		if _, err := f.NewSheet(sheet); err != nil {
			t.Fatal(err)
		}
		rows := [][]any{{"melt_temp", "hardness", "lot"}}
		for i := range 12 {
			rows = append(rows, []any{1400 + 2.5*float64(i) + float64(k), 240 + 1.1*float64(i) + float64((i*7)%5), "L" + strconv.Itoa(i%3)})
		}
		rows[5][1] = "#DIV/0!"
		for r, row := range rows {
			if err := f.SetSheetRow(sheet, "A"+strconv.Itoa(r+1), &row); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := f.SaveAs(book); err != nil {
		t.Fatal(err)
	}
	dest := filepath.Join(dir, "bivar.toml")
	code, _, stderr := call(t, "init", book)
	if code != exitOK {
		t.Fatalf("init: exit %d, %s", code, stderr)
	}
	for _, want := range []string{`sheet "Read me": no data rows; no dataset for it`,
		`2 datasets, one per sheet ("Oct 2026", "Nov 2026")`} {
		if !strings.Contains(stderr, want) {
			t.Errorf("stderr lacks %q:\n%s", want, stderr)
		}
	}
	b, err := os.ReadFile(dest)
	if err != nil {
		t.Fatal(err)
	}
	text := string(b)
	for _, want := range []string{`sheet   = "Oct 2026"`, `sheet   = "Nov 2026"`, `id      = "oct-2026"`, `dataset = "nov-2026"`,
		`# Columns found in line7.xlsx, sheet "Nov 2026" (12 data rows):`} {
		if !strings.Contains(text, want) {
			t.Errorf("manifest lacks %q", want)
		}
	}
	writeFile(t, dest, uncommentStudies(text))
	if code, _, stderr := call(t, "run", "-o", filepath.Join(dir, "out"), dest); code != exitOK {
		t.Fatalf("run on the manifest written: exit %d, %s", code, stderr)
	}

	// A workbook written by pandas (testdata/README.md), named .xlsx, is read.
	b, err = os.ReadFile(filepath.Join("testdata", "invented.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	pandas := filepath.Join(dir, "pandas.xlsx")
	writeFile(t, pandas, string(b))
	if code, _, stderr := call(t, "init", "-o", filepath.Join(dir, "pandas.toml"), pandas); code != exitOK || !strings.Contains(stderr, "1 dataset, one sheet") {
		t.Errorf("init on pandas' workbook: exit %d, %s", code, stderr)
	}
}
