package manifest

import (
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// The manifests in these tests are invented for the tests; the data file
// testdata/cell4.csv is two invented rows that only need to exist.

const head = `[[dataset]]
id   = "nov"
file = "cell4.csv"
`

func parse(t *testing.T, src string) (*Manifest, error) {
	t.Helper()
	return Parse("bivar.toml", []byte(src), "testdata")
}

// checkErrors parses src and checks that it fails with exactly the errors
// want (of file bivar.toml), in order, with their keys and places.
func checkErrors(t *testing.T, src string, want []Error) {
	t.Helper()
	_, err := parse(t, src)
	var got Errors
	if !errors.As(err, &got) {
		t.Fatalf("Parse error = %v (%T), want Errors", err, err)
	}
	var texts []string
	for _, w := range want {
		w.File = "bivar.toml"
		texts = append(texts, w.Error())
	}
	if g, w := err.Error(), strings.Join(texts, "\n"); g != w {
		t.Errorf("Parse error:\ngot  %s\nwant %s", g, w)
	}
	for i := range min(len(got), len(want)) {
		if got[i].Key != want[i].Key || got[i].Line != want[i].Line || got[i].Col != want[i].Col {
			t.Errorf("error %d: Key, Line, Col = %q, %d, %d; want %q, %d, %d", i,
				got[i].Key, got[i].Line, got[i].Col, want[i].Key, want[i].Line, want[i].Col)
		}
	}
}

func TestLoadGood(t *testing.T) {
	t.Parallel()
	m, err := Load("testdata/good.toml")
	if err != nil {
		t.Fatalf("Load(good.toml): %v", err)
	}
	abs, _ := filepath.Abs("testdata")
	checks := []struct {
		name      string
		got, want any
	}{
		{"Path", m.Path, "testdata/good.toml"},
		{"Dir", m.Dir, abs},
		{"Title", m.Title, "Cell 4 moulding — test manifest"},
		{"Seed (default)", m.Seed, uint64(DefaultSeed)},
		{"Output.Dir", m.Output.Dir, filepath.Join(abs, "out")},
		{"Output.Formats", strings.Join(m.Output.Formats, ","), "html,json"},
		{"datasets", len(m.Datasets), 1},
		{"Dataset.File", m.Datasets[0].File, filepath.Join(abs, "cell4.csv")},
		{"Dataset.Missing", strings.Join(m.Datasets[0].Missing, "|"), "|NA|-"},
		{"Dataset.NonNumeric (default)", m.Datasets[0].NonNumeric, "error"},
		{"Dataset.Units", m.Datasets[0].Units["melt_temp"], "Cel"},
		{"Dataset.Labels", m.Datasets[0].Labels["melt_temp"], "Melt temperature"},
		{"Dataset.Line", m.Datasets[0].Line, 12},
		{"studies", len(m.Studies), 2},
		{"Study[0].Line", m.Studies[0].Line, 23},
		{"Study[1].Line", m.Studies[1].Line, 40},
		{"AlsoIn.X (string)", strings.Join(m.Studies[0].AlsoIn.X, ","), "[degF]"},
		{"AlsoIn.Y (list)", strings.Join(m.Studies[0].AlsoIn.Y, ","), "1"},
		{"PredictAt", len(m.Studies[0].PredictAt), 2},
		{"Notes keep key-like lines", strings.Contains(m.Studies[0].Notes, "x = \"not a key\""), true},
		{"Expect.Line", m.Studies[0].Expect.Line, 35},
		{"Expect.Direction", m.Studies[0].Expect.Direction, "negative"},
		{"Expect.MinAbsR", *m.Studies[0].Expect.MinAbsR, 0.6},
		{"Expect.RWithin", len(m.Studies[0].Expect.RWithin), 2},
		{"Study[1].Expect", m.Studies[1].Expect == nil, true},
	}
	for _, c := range checks {
		if c.got != c.want {
			t.Errorf("%s = %#v, want %#v", c.name, c.got, c.want)
		}
	}
}

func TestDefaults(t *testing.T) {
	t.Parallel()
	m, err := parse(t, head+"[[study]]\nid = \"s\"\ndataset = \"nov\"\nx = \"a\"\ny = \"b\"\n")
	if err != nil {
		t.Fatal(err)
	}
	if m.Design != DefaultDesign || m.Alpha != DefaultAlpha || m.Adjust != DefaultAdjust ||
		m.Seed != DefaultSeed || m.Output.Theme != DefaultTheme ||
		filepath.Base(m.Output.Dir) != DefaultOutputDir ||
		strings.Join(m.Output.Formats, ",") != "html,markdown,json" ||
		strings.Join(m.Datasets[0].Missing, ",") != ",NA" || m.Datasets[0].NonNumeric != "error" {
		t.Errorf("defaults not applied: %+v", m)
	}
	// Explicit values that equal the zero value are kept, not defaulted.
	m, err = parse(t, "seed = 0\n"+head+"missing = []\n[[study]]\nid = \"s\"\ndataset = \"nov\"\nx = \"a\"\ny = \"b\"\n")
	if err != nil {
		t.Fatal(err)
	}
	if m.Seed != 0 || m.Datasets[0].Missing == nil || len(m.Datasets[0].Missing) != 0 {
		t.Errorf("seed = %d, missing = %#v; want 0 and an empty list", m.Seed, m.Datasets[0].Missing)
	}
}

const study = `[[study]]
id      = "s1"
dataset = "nov"
x       = "a"
y       = "b"
`

// TestErrors pins whole messages: they are the interface.
func TestErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		src  string
		want []Error // File is always bivar.toml
	}{
		{"unknown key with suggestion", head + study + "yy = \"c\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.yy", Msg: `unknown key "study.yy" — did you mean "study.y"?`}}},
		{"wrong case", head + strings.Replace(study, "x ", "X ", 1),
			[]Error{
				{Line: 7, Col: 1, Key: "study.X", Msg: `unknown key "study.X" — did you mean "study.x"? (keys are case-sensitive)`},
			}},
		{"wrong case of a table", head + strings.Replace(study, "x ", "X ", 1) + "[Study.expect]\nmin_abs_r = 2\n",
			[]Error{
				{Line: 7, Col: 1, Key: "study.X", Msg: `unknown key "study.X" — did you mean "study.x"? (keys are case-sensitive)`},
				{Line: 9, Col: 1, Key: "Study", Msg: `unknown key "Study" — did you mean "study"? (keys are case-sensitive)`},
			}},
		{"unknown key without suggestion", "colour = \"red\"\n" + head + study,
			[]Error{{Line: 1, Col: 1, Key: "colour", Msg: `unknown key "colour"; the keys of the top level are: title, design, alpha, adjust, seed, output, thresholds, dataset, study`}}},
		{"key one level too high", "theme = \"paper\"\n" + head + study,
			[]Error{{Line: 1, Col: 1, Key: "theme", Msg: `unknown key "theme" — did you mean "output.theme"?`}}},
		{"top-level key inside a table", head + "alpha = 0.1\n" + study,
			[]Error{{Line: 4, Col: 1, Key: "dataset.alpha", Msg: `unknown key "dataset.alpha" — "alpha" is a top-level key: move it above the first table`}}},
		{"unknown sub-table", head + study + "[study.expects]\ndirection = \"positive\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.expects", Msg: `unknown key "study.expects" — did you mean "study.expect"?`}}},
		{"inline table key", head + study + "also_in = { z = \"[degF]\" }\n",
			[]Error{{Line: 9, Col: 13, Key: "study.also_in.z", Msg: `unknown key "study.also_in.z"; the keys of [study.also_in] are: x, y`}}},
		{"wrong type", "alpha = \"0.05\"\n" + head + study,
			[]Error{{Line: 1, Col: 9, Key: "alpha", Msg: `"alpha" must be a number, not a string`}}},
		{"wrong list element type", head + study + "predict_at = [1, \"two\"]\n",
			[]Error{{Line: 9, Col: 18, Key: "study.predict_at", Msg: `"study.predict_at" must be a list of numbers, not a list of numbers and strings`}}},
		{"numbers in quotes", head + study + "predict_at = [\"12\"]\n",
			[]Error{{Line: 9, Col: 15, Key: "study.predict_at", Msg: `"study.predict_at" must be a list of numbers, not a list of strings (numbers in quotes): write them without quotes, as [12, 15.5]`}}},
		{"numbers where strings belong", head + study + "covariates = [1, 2]\n",
			[]Error{{Line: 9, Col: 14, Key: "study.covariates", Msg: `"study.covariates" must be a list of strings, not a list of numbers`}}},
		{"also_in neither string nor list", head + study + "also_in = { x = 3 }\n",
			[]Error{{Line: 9, Col: 17, Key: "study.also_in.x", Msg: `"study.also_in.x" must be a string or a list of strings, not a whole number`}}},
		{"unit not a string", head + "[dataset.units]\na = 1\n" + study,
			[]Error{{Line: 5, Col: 1, Key: "dataset.units.a", Msg: `"dataset.units.a" must be a string, not a whole number`}}},
		{"negative seed", "seed = -1\n" + head + study,
			[]Error{{Line: 1, Col: 8, Key: "seed", Msg: `"seed" must be a whole number of 0 or more, not -1: a negative number is not allowed here`}}},
		{"Bonferroni pointed to Holm", "adjust = \"bonf\"\n" + head + study,
			[]Error{{Line: 1, Col: 10, Key: "adjust", Msg: `adjust = "bonf" is not allowed; use one of "holm", "bh", "none" — for Bonferroni use "holm": Holm's step-down method controls the same family-wise error rate and rejects whatever Bonferroni rejects, sometimes more, so it is uniformly more powerful`}}},
		{"false discovery rate pointed to bh", "adjust = \"FDR\"\n" + head + study,
			[]Error{{Line: 1, Col: 10, Key: "adjust", Msg: `adjust = "FDR" is not allowed; use one of "holm", "bh", "none" — for a false discovery rate use "bh" (Benjamini–Hochberg)`}}},
		{"syntax error", "alpha = \n" + head + study,
			[]Error{{Line: 1, Col: 9, Key: "alpha", Msg: `TOML syntax: expected value but found '\n' instead`}}},
		{"duplicate key", "alpha = 0.1\nalpha = 0.2\n" + head + study,
			[]Error{{Line: 2, Col: 1, Key: "alpha", Msg: `TOML syntax: Key 'alpha' has already been defined.`}}},
		{"empty manifest", "",
			[]Error{
				{Key: "dataset", Msg: `the manifest has no dataset: add a [[dataset]] table with id = "…" and file = "…" (the data file, such as data/run.csv), and name that id in each study's dataset = "…"; 'bivar init DATA.csv' writes a starting manifest for a data file`},
				{Key: "study", Msg: `no [[study]] declared: a manifest needs at least one study`},
			}},
		{"no dataset, study names none", "alpha = 0.05\n\n[[study]]\nid = \"s1\"\nx = \"a\"\ny = \"b\"\n",
			[]Error{
				{Line: 3, Col: 1, Key: "dataset", Msg: `the manifest has no dataset: add a [[dataset]] table above this [[study]] with id = "…" and file = "…" (the data file, such as data/run.csv), and name that id in each study's dataset = "…"; 'bivar init DATA.csv' writes a starting manifest for a data file`},
			}},
		{"dataset without id, study names none", "[[dataset]]\nfile = \"cell4.csv\"\n[[study]]\nid = \"s1\"\nx = \"a\"\ny = \"b\"\n",
			[]Error{
				{Line: 1, Col: 1, Key: "dataset.id", Msg: `[[dataset]] number 1 has no id: add id = "…" (a short name the studies refer to)`},
				{Line: 3, Col: 1, Key: "study.dataset", Msg: `study "s1" has no dataset, and no [[dataset]] has a usable id: declare a [[dataset]] with an id, then add dataset = "…" naming it`},
			}},
		{"no dataset, study names one", study,
			[]Error{
				{Line: 1, Col: 1, Key: "dataset", Msg: `the manifest has no dataset: add a [[dataset]] table above this [[study]] with id = "…" and file = "…" (the data file, such as data/run.csv), and name that id in each study's dataset = "…"; 'bivar init DATA.csv' writes a starting manifest for a data file`},
				{Line: 3, Col: 1, Key: "study.dataset", Msg: `study "s1": dataset "nov" is not declared, and the manifest declares no dataset: add a [[dataset]] with id = "nov" and file = "…"`},
			}},
		{"bad enums and alpha, all reported", "design = \"observatonal\"\nadjust = \"bonferroni\"\nalpha = 0.7\n[output]\nformats = [\"html\", \"pdf\", \"html\"]\n" + head + study,
			[]Error{
				{Line: 1, Col: 1, Key: "design", Msg: `design = "observatonal" is not allowed; use one of "observational", "designed-experiment", "randomized-experiment" (did you mean "observational"?)`},
				{Line: 2, Col: 10, Key: "adjust", Msg: `adjust = "bonferroni" is not allowed; use one of "holm", "bh", "none" — for Bonferroni use "holm": Holm's step-down method controls the same family-wise error rate and rejects whatever Bonferroni rejects, sometimes more, so it is uniformly more powerful`},
				{Line: 3, Col: 1, Key: "alpha", Msg: `alpha = 0.7 is outside (0, 0.5]: give the significance level as a fraction, such as 0.05`},
				{Line: 5, Col: 1, Key: "output.formats", Msg: `output.formats = "pdf" is not allowed; use one of "html", "markdown", "json"`},
				{Line: 5, Col: 1, Key: "output.formats", Msg: `output.formats lists "html" twice`},
			}},
		{"dataset problems", "[[dataset]]\nfile = \"nope.csv\"\ndelimiter = \"|\"\ndecimal = \",\"\nnon_numeric = \"skip\"\n" + head + "[[dataset]]\nid = \"nov\"\nfile = \"cell4.csv\"\n" + study,
			[]Error{
				{Line: 1, Col: 1, Key: "dataset.id", Msg: `[[dataset]] number 1 has no id: add id = "…" (a short name the studies refer to)`},
				{Line: 2, Col: 1, Key: "dataset.file", Msg: `dataset "number 1": file "nope.csv" not found (looked for testdata/nope.csv)`},
				{Line: 3, Col: 1, Key: "dataset.delimiter", Msg: `dataset.delimiter = "|" is not allowed; use one of ",", ";", "\t"`},
				{Line: 5, Col: 1, Key: "dataset.non_numeric", Msg: `dataset.non_numeric = "skip" is not allowed; use one of "error", "missing"`},
				{Line: 10, Col: 1, Key: "dataset.id", Msg: `dataset id "nov" is used twice (first at line 6)`},
			}},
		{"workbook keys on a CSV file", head + "sheet = 2\nheader_row = 0\n" + study,
			[]Error{
				{Line: 4, Col: 1, Key: "dataset.sheet", Msg: `dataset "nov": sheet applies to Excel workbooks (a file ending .xlsx or .xlsm) only; remove it`},
				{Line: 5, Col: 1, Key: "dataset.header_row", Msg: `dataset "nov": header_row applies to Excel workbooks (a file ending .xlsx or .xlsm) only; remove it`},
			}},
		{"study design not a design", head + study + "design = \"randomised\"\n",
			[]Error{{Line: 9, Col: 1, Key: "study.design", Msg: `study.design = "randomised" is not allowed; use one of "observational", "designed-experiment", "randomized-experiment" (did you mean "randomized-experiment"?)`}}},
		{"sheet of the wrong type", head + "sheet = true\n" + study,
			[]Error{{Line: 4, Col: 9, Key: "dataset.sheet", Msg: `"dataset.sheet" must be a string (a name) or a whole number, not true/false`}}},
		{"database problems", head + study + "[[dataset]]\nid = \"db\"\nquery = \"DELETE FROM t\"\nconnection = \"postgres://u:s3cret@h/db\"\nstatement_timeout = \"soon\"\nwhere = \"a > 1\"\ndelimiter = \";\"\n",
			[]Error{
				{Line: 11, Col: 1, Key: "dataset.query", Msg: `dataset "db": query must be a SELECT (or WITH … SELECT) statement; bivar only reads, in a read-only transaction`},
				{Line: 12, Col: 1, Key: "dataset.connection", Msg: `dataset "db": connection must name an environment variable (such as LINE7_DB), not hold the connection string itself: a password written here would be kept with the manifest; set the variable to the URL and give its name`},
				{Line: 13, Col: 1, Key: "dataset.statement_timeout", Msg: `dataset "db": statement_timeout = "soon" is not a positive duration: write it as "90s", "5m" or "1h"`},
				{Line: 14, Col: 1, Key: "dataset.where", Msg: `dataset "db": where applies with table only; with query, write the filter into the query`},
				{Line: 15, Col: 1, Key: "dataset.delimiter", Msg: `dataset "db": delimiter applies to CSV files only, and this dataset reads a database (cells hold numbers, not text); remove it`},
			}},
		{"database and file, no connection", head + study + "[[dataset]]\nid = \"db\"\ntable = \"t\"\nfile = \"cell4.csv\"\n",
			[]Error{
				{Line: 11, Col: 1, Key: "dataset.table", Msg: `dataset "db" has no connection: add connection = "NAME", naming the environment variable that holds the PostgreSQL URL (postgres://user@host/db); the URL and its password stay out of the manifest`},
				{Line: 12, Col: 1, Key: "dataset.file", Msg: `dataset "db" has both file and table: a dataset reads a file or a database, not both; keep one`},
			}},
		{"dataset limits", head + "max_rows = 0\nmax_levels = -3\nmax_bytes = 1.5\n" + study,
			[]Error{
				{Line: 6, Col: 13, Key: "dataset.max_bytes", Msg: `"dataset.max_bytes" must be a whole number, not a number`},
			}},
		{"dataset limits not positive", head + "max_rows = 0\nmax_levels = -3\nmax_bytes = 100\n" + study,
			[]Error{
				{Line: 4, Col: 1, Key: "dataset.max_rows", Msg: `dataset "nov": max_rows = 0 is not allowed; give a positive whole number, or leave the key out for the default`},
				{Line: 5, Col: 1, Key: "dataset.max_levels", Msg: `dataset "nov": max_levels = -3 is not allowed; give a positive whole number, or leave the key out for the default`},
			}},
		{"study problems", head + "[[study]]\ndataset = \"nvo\"\nx = \"a\"\ny = \"a\"\ncovariates = [\"a\"]\n" + study + study + "[[study]]\nid = \"bad id\"\n",
			[]Error{
				{Line: 4, Col: 1, Key: "study.id", Msg: `[[study]] number 1 has no id: add id = "…" (a short name, used in reports and in diffs between runs)`},
				{Line: 5, Col: 1, Key: "study.dataset", Msg: `study "number 1": dataset "nvo" is not declared — did you mean "nov"? (declared: nov)`},
				{Line: 7, Col: 1, Key: "study.y", Msg: `study "number 1": x and y are the same column "a"`},
				{Line: 8, Col: 1, Key: "study.covariates", Msg: `study "number 1": covariate "a" is x or y itself; list other columns`},
				{Line: 15, Col: 1, Key: "study.id", Msg: `study id "s1" is used twice (first at line 9)`},
				{Line: 19, Col: 1, Key: "study.dataset", Msg: `study "bad id" has no dataset: add dataset = "…" naming one of: nov`},
				{Line: 19, Col: 1, Key: "study.x", Msg: `study "bad id" has no x: add x = "…" (the column of the explanatory variable)`},
				{Line: 19, Col: 1, Key: "study.y", Msg: `study "bad id" has no y: add y = "…" (the column of the response)`},
				{Line: 20, Col: 1, Key: "study.id", Msg: `study id "bad id" may hold only the ASCII letters a–z and A–Z, digits, '-', '_' and '.' (it names the study's files and anchors)`},
			}},
		{"expectations", head + study + "[study.expect]\ndirection = \"up\"\nform = \"curvy\"\nmin_abs_r = 1.5\nr_within = [0.9, 0.5]\nslope_within = [1]\nmax_p = 0\nmin_n = 2\n",
			[]Error{
				{Line: 10, Col: 1, Key: "study.expect.direction", Msg: `study.expect.direction = "up" is not allowed; use one of "positive", "negative", "none"`},
				{Line: 11, Col: 1, Key: "study.expect.form", Msg: `study.expect.form = "curvy" is not allowed; use one of "linear", "curved", "nonlinear", "none" (did you mean "curved"?)`},
				{Line: 12, Col: 1, Key: "study.expect.min_abs_r", Msg: `study "s1": expect.min_abs_r = 1.5 is outside [0, 1]`},
				{Line: 13, Col: 1, Key: "study.expect.r_within", Msg: `study "s1": expect.r_within must be two numbers [low, high] with low ≤ high, both in [-1, 1]; got [0.9, 0.5]: write the lower first, [0.5, 0.9]`},
				{Line: 14, Col: 1, Key: "study.expect.slope_within", Msg: `study "s1": expect.slope_within must be two numbers [low, high] with low ≤ high; got [1]`},
				{Line: 15, Col: 1, Key: "study.expect.max_p", Msg: `study "s1": expect.max_p = 0 is outside (0, 1]`},
				{Line: 16, Col: 1, Key: "study.expect.min_n", Msg: `study "s1": expect.min_n = 2 is below 3, the fewest rows a study runs on`},
			}},
		{"units", head + "[dataset.units]\na = \"degC\"\nb = \"mm\"\n\"c.d\" = \"kgg\"\ne = \"Cel\"\n" +
			"[[study]]\nid = \"s1\"\ndataset = \"nov\"\nx = \"e\"\ny = \"b\"\nalso_in = { x = [\"K\", \"kg\"], y = \"[in_i]\" }\n" +
			"[[study]]\nid = \"s2\"\ndataset = \"nov\"\nx = \"a\"\ny = \"f\"\nalso_in.y = \"m\"\n",
			[]Error{
				{Line: 5, Col: 1, Key: "dataset.units.a", Msg: `dataset "nov", column "a": unknown unit "degC" — the UCUM code is "Cel"`},
				{Line: 7, Col: 1, Key: `dataset.units."c.d"`, Msg: `dataset "nov", column "c.d": unknown unit "kgg" — did you mean "kg"?`},
				{Line: 14, Col: 13, Key: "study.also_in.x", Msg: `study "s1": also_in.x: cannot convert "Cel" (temperature) to "kg" (mass): they measure different quantities`},
				{Line: 20, Col: 1, Key: "study.also_in.y", Msg: `study "s2": also_in.y converts column "f", but [dataset.units] of dataset "nov" gives it no unit: declare the unit it was recorded in, or correct y`},
			}},
		{"units for a misspelt column", head + "[dataset.units]\ntemper_temp = \"Cel\"\n" +
			"[[study]]\nid = \"s1\"\ndataset = \"nov\"\nx = \"temper_tmp\"\ny = \"b\"\nalso_in.x = \"[degF]\"\n",
			[]Error{
				{Line: 11, Col: 1, Key: "study.also_in.x", Msg: `study "s1": also_in.x converts column "temper_tmp", but [dataset.units] of dataset "nov" gives it no unit (is x = "temper_tmp" a misspelling of "temper_temp"?): declare the unit it was recorded in, or correct x`},
			}},
		{"inline array of tables", "study = [\n  { id = \"a\", dataset = \"nov\", x = \"p\", y = \"q\" },\n  { id = \"a\", dataset = \"nov\", x = \"p\" },\n]\n" + head,
			[]Error{
				{Line: 3, Col: 3, Key: "study.y", Msg: `study "a" has no y: add y = "…" (the column of the response)`},
				{Line: 3, Col: 5, Key: "study.id", Msg: `study id "a" is used twice (first at line 2)`},
			}},
		{"thresholds", "[thresholds]\nstrong = 0.4\nmoderate = 0.5\noutlier_z = -3\nreversal_min_group = 1\n" +
			"cooks_d = 2\noutlier_family_alpha = 1\ndrift_dw = 2.5\nform_dw = -0.1\n" + head + study,
			[]Error{
				{Line: 3, Col: 1, Key: "thresholds.moderate", Msg: `thresholds.moderate = 0.5 must be below thresholds.strong = 0.4`},
				{Line: 4, Col: 1, Key: "thresholds.outlier_z", Msg: `thresholds.outlier_z = -3 must be a positive number`},
				{Line: 5, Col: 1, Key: "thresholds.reversal_min_group", Msg: `thresholds.reversal_min_group = 1 is below 3, the fewest rows a fit needs`},
				{Line: 6, Col: 1, Key: "thresholds.cooks_d", Msg: `thresholds.cooks_d = 2 is outside (0, 1)`},
				{Line: 7, Col: 1, Key: "thresholds.outlier_family_alpha", Msg: `thresholds.outlier_family_alpha = 1 is outside [0, 1) (a family-wise significance level; 0 turns the rule off)`},
				{Line: 8, Col: 1, Key: "thresholds.drift_dw", Msg: `thresholds.drift_dw = 2.5 is outside [0, 2) (a Durbin–Watson statistic below 2, the value for independent residuals; 0 turns the rule off)`},
				{Line: 9, Col: 1, Key: "thresholds.form_dw", Msg: `thresholds.form_dw = -0.1 is outside [0, 2) (a Durbin–Watson statistic below 2, the value for independent residuals; 0 turns the rule off)`},
			}},
		{"theme misspelt", "[output]\ntheme = \"papr\"\n" + head + study, // issue 10, item 7
			[]Error{{Line: 2, Col: 1, Key: "output.theme", Msg: `output.theme = "papr" is not allowed; use one of "paper", "night", "contrast" (did you mean "paper"?)`}}},
		{"output at the root", "[output]\ndir = \"/\"\n" + head + study, // issue 10, item 6
			[]Error{{Line: 2, Col: 1, Key: "output.dir", Msg: `output.dir = "/" is the root of the file system: give the report a folder of its own, such as "report"`}}},
		{"output is the data file", "[output]\ndir = \"cell4.csv\"\n" + head + study,
			[]Error{{Line: 2, Col: 1, Key: "output.dir", Msg: `output.dir = "cell4.csv" is the data file of dataset "nov": give the report a folder of its own, such as "report"`}}},
		{"output is another file", "[output]\ndir = \"README.md\"\n" + head + study,
			[]Error{{Line: 2, Col: 1, Key: "output.dir", Msg: `output.dir = "README.md" is a file, not a folder: give the report a folder of its own, such as "report"`}}},
		{"output holds the data", "[output]\ndir = \".\"\n" + head + study,
			[]Error{{Line: 2, Col: 1, Key: "output.dir", Msg: `output.dir = "." holds the data file of dataset "nov" (cell4.csv), and each run replaces its output folder as a whole: give the report a folder of its own, such as "report"`}}},
		{"threshold key misspelt", "[thresholds]\nform_wd = 1.2\n" + head + study,
			[]Error{{Line: 2, Col: 1, Key: "thresholds.form_wd", Msg: `unknown key "thresholds.form_wd" — did you mean "thresholds.form_dw"?`}}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			checkErrors(t, c.src, c.want)
		})
	}
}

func TestPaths(t *testing.T) {
	t.Parallel()
	abs, err := filepath.Abs("testdata/cell4.csv")
	if err != nil {
		t.Fatal(err)
	}
	outAbs := filepath.Join(t.TempDir(), "out")
	src := "[output]\ndir = " + strconv.Quote(outAbs) + "\n[[dataset]]\nid = \"a\"\nfile = " + strconv.Quote(abs) + "\n" +
		"[[dataset]]\nid = \"b\"\nfile = \"sub/../cell4.csv\"\n" + strings.Replace(study, `"nov"`, `"a"`, 1)
	m, err := Parse("bivar.toml", []byte(src), "testdata")
	if err != nil {
		// sub/ does not exist, but the path is cleaned before it is looked up.
		t.Fatal(err)
	}
	if m.Datasets[0].File != abs || m.Datasets[1].File != filepath.Join("testdata", "cell4.csv") || m.Output.Dir != outAbs {
		t.Errorf("files %q, %q, output %q; want %q, testdata/cell4.csv, %q", m.Datasets[0].File, m.Datasets[1].File, m.Output.Dir, abs, outAbs)
	}
}

// TestOutputDirIsManifest: output.dir naming the manifest itself, or its
// folder, is refused at the key's line and column.
func TestOutputDirIsManifest(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "cell4.csv"), []byte("a,b\n1,2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	data := "[[dataset]]\nid = \"nov\"\nfile = \"../cell4.csv\"\n" + study
	for _, tc := range []struct{ out, want string }{
		{"bivar.toml", `bivar.toml:2:3: output.dir = "bivar.toml" is the manifest: give the report a folder of its own, such as "report"`},
		{".", `bivar.toml:2:3: output.dir = "." holds the manifest (bivar.toml), and each run replaces its output folder as a whole: give the report a folder of its own, such as "report"`},
	} {
		sub := filepath.Join(dir, "m")
		os.MkdirAll(sub, 0o755)
		path := filepath.Join(sub, "bivar.toml")
		if err := os.WriteFile(path, []byte("[output]\n  dir = "+strconv.Quote(tc.out)+"\n"+data), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := Load(path)
		if err == nil || strings.TrimPrefix(err.Error(), sub+string(filepath.Separator)) != tc.want {
			t.Errorf("dir = %q: %v\nwant %s", tc.out, err, tc.want)
		}
	}
}
